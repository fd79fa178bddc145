package handlers

import (
	"encoding/json"
	"fmt"
	"math"
	"net/http"
	"strconv"
	"strings"

	"lagwright/analysis"
	"lagwright/store"
	"lagwright/units"
	"lagwright/web"
)

// blankCostRows are the empty rows offered below the table for adding by hand.
const blankCostRows = 3

// costToSI converts a cost per display length to per metre: per ft in US units (1 ft =
// 0.3048 m exactly). Rows of size "flat" price flat surfaces per area: per ft² in US
// units (1 ft² = 0.09290304 m² exactly), per m² in SI.
func costToSI(sys units.System, size string, v float64) float64 {
	if sys == units.US {
		if analysis.NormalSize(size) == analysis.FlatSize {
			return v / (units.Foot * units.Foot)
		}
		return v / units.Foot
	}
	return v
}

func costFromSI(sys units.System, size string, v float64) float64 {
	if sys == units.US {
		if analysis.NormalSize(size) == analysis.FlatSize {
			return v * units.Foot * units.Foot
		}
		return v * units.Foot
	}
	return v
}

// costUnit is the unit of a pipe or duct row's cost; flatCostUnit of a "flat" row's.
func costUnit(sys units.System) string {
	if sys == units.US {
		return "per ft"
	}
	return "per m"
}

func flatCostUnit(sys units.System) string {
	if sys == units.US {
		return "per ft²"
	}
	return "per m²"
}

// costText writes a cost for the form: up to 2 decimals, no trailing zeros.
func costText(v float64) string {
	return strconv.FormatFloat(math.Round(v*100)/100, 'f', -1, 64)
}

// parseCost reads a cost, allowing a currency sign and thousands separators in text
// pasted from a spreadsheet ("$1,234.50").
func parseCost(s string) (float64, error) {
	s = strings.TrimSpace(s)
	s = strings.Trim(s, "$€£¥ ")
	s = strings.ReplaceAll(s, ",", "")
	s = strings.ReplaceAll(s, " ", "")
	v, err := strconv.ParseFloat(s, 64)
	if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
		return 0, fmt.Errorf("not a cost: %q", s)
	}
	return v, nil
}

// costsForm is the cost table as submitted: the rows as typed (for re-rendering), the
// table they make, and the problems found, by row and by pasted line.
type costsForm struct {
	version     int
	rows        []web.CostRowView
	paste       string
	table       analysis.CostTable
	origin      []costOrigin // where each table row came from
	pasteErrors []string
	formErrors  []string
}

type costOrigin struct {
	row   int // grid row, or -1
	line  int // pasted line (1-based), or 0
	field string
}

func (f *costsForm) ok() bool {
	if len(f.pasteErrors) > 0 || len(f.formErrors) > 0 {
		return false
	}
	for _, r := range f.rows {
		if len(r.Errors) > 0 {
			return false
		}
	}
	return true
}

// materialResolver finds a library material by slug or, case-insensitively, by name.
func materialResolver(lib *store.Library) func(string) (string, bool) {
	byName := map[string]string{}
	for _, m := range lib.MaterialChoices() {
		byName[strings.ToLower(m.Name)] = m.Slug
	}
	return func(s string) (string, bool) {
		s = strings.TrimSpace(s)
		if _, ok := lib.Material(s); ok {
			return s, true
		}
		slug, ok := byName[strings.ToLower(s)]
		return slug, ok
	}
}

// parseCostsForm reads the grid rows and the pasted rows, in the project's units.
func parseCostsForm(r *http.Request, sys units.System, lib *store.Library) (*costsForm, error) {
	if err := r.ParseForm(); err != nil {
		return nil, err
	}
	f := &costsForm{paste: r.PostForm.Get("paste")}
	var err error
	if f.version, err = parseVersion(r.PostForm.Get("version")); err != nil {
		f.formErrors = append(f.formErrors, "The form lacks the project's version; reload the page.")
	}
	n, _ := strconv.Atoi(r.PostForm.Get("rows"))
	n = min(max(n, 0), analysis.MaxCostRows+blankCostRows)
	resolve := materialResolver(lib)
	get := func(name string, i int) string {
		return strings.TrimSpace(r.PostForm.Get(fmt.Sprintf("%s_%d", name, i)))
	}
	for i := range n {
		rv := web.CostRowView{Material: get("material", i), Size: get("size", i), Thickness: get("thickness", i),
			Cost: get("cost", i), OrigCost: get("orig_cost", i), Delete: get("delete", i) == "1"}
		rv.Example = get("example", i) == "1" && rv.Cost == rv.OrigCost // an edited cost is the user's own
		if rv.Delete || (rv.Material == "" && rv.Size == "" && rv.Thickness == "" && rv.Cost == "") {
			f.rows = append(f.rows, rv)
			continue
		}
		row, problems := costRow(sys, resolve, rv.Material, rv.Size, rv.Thickness, rv.Cost)
		row.Example = rv.Example
		rv.Errors = problems
		if len(problems) == 0 {
			f.table = append(f.table, row)
			f.origin = append(f.origin, costOrigin{row: len(f.rows)})
		}
		f.rows = append(f.rows, rv)
	}
	lines := strings.Split(strings.ReplaceAll(f.paste, "\r\n", "\n"), "\n")
	first := true
	for li, line := range lines {
		if strings.TrimSpace(line) == "" {
			continue
		}
		sep := ","
		if strings.Contains(line, "\t") {
			sep = "\t"
		}
		cells := strings.Split(line, sep)
		for i := range cells {
			cells[i] = strings.Trim(strings.TrimSpace(cells[i]), `"`)
		}
		if first && strings.EqualFold(cells[0], "material") {
			first = false
			continue // a header line
		}
		first = false
		if len(cells) < 4 {
			f.pasteErrors = append(f.pasteErrors, fmt.Sprintf("line %d: expected 4 columns (material, size, thickness, cost), found %d", li+1, len(cells)))
			continue
		}
		row, problems := costRow(sys, resolve, cells[0], cells[1], cells[2], cells[3])
		for _, p := range problems {
			f.pasteErrors = append(f.pasteErrors, fmt.Sprintf("line %d: %s", li+1, p))
		}
		if len(problems) == 0 {
			f.table = append(f.table, row)
			f.origin = append(f.origin, costOrigin{row: -1, line: li + 1})
		}
	}
	if len(f.table) > analysis.MaxCostRows {
		f.formErrors = append(f.formErrors, fmt.Sprintf("At most %d cost rows.", analysis.MaxCostRows))
	}
	// Whole-table checks (repeated rows, ranges) go back to the row or line they came from.
	for _, e := range f.table.Validate() {
		if e.Row >= len(f.origin) {
			continue
		}
		o := f.origin[e.Row]
		msg := e.Message
		if strings.HasPrefix(msg, "repeats row") {
			msg = "repeats another row (same material, size and thickness)"
		}
		if o.row >= 0 {
			f.rows[o.row].Errors = append(f.rows[o.row].Errors, costFieldLabel(e.Field)+": "+msg)
		} else {
			f.pasteErrors = append(f.pasteErrors, fmt.Sprintf("line %d: %s: %s", o.line, costFieldLabel(e.Field), msg))
		}
	}
	return f, nil
}

func costFieldLabel(field string) string {
	switch field {
	case "nominal_size":
		return "size"
	case "thickness_mm":
		return "thickness"
	case "cost_per_m":
		return "cost"
	}
	return field
}

// costRow reads one row as typed into a CostRow in SI, or says what is wrong with it.
func costRow(sys units.System, resolve func(string) (string, bool), mat, size, thick, cost string) (analysis.CostRow, []string) {
	var row analysis.CostRow
	var problems []string
	switch slug, ok := resolve(mat); {
	case mat == "":
		problems = append(problems, "material: is required")
	case !ok:
		problems = append(problems, fmt.Sprintf("material: %q is not in the library (use its slug or name)", mat))
	default:
		row.Material = slug
	}
	if norm := analysis.NormalSize(size); norm == "" {
		problems = append(problems, fmt.Sprintf(`size: %q is not a nominal size ("NPS 4", "4", "DN100", "CTS 1"), "any" or "flat"`, size))
	} else {
		row.NominalSize = strings.TrimSpace(size)
		if norm == analysis.AnySize || norm == analysis.FlatSize {
			row.NominalSize = norm
		}
	}
	if t, err := units.Parse(units.Length, sys, thick); err != nil {
		problems = append(problems, "thickness: "+err.Error())
	} else if !(t > 0 && t <= 600) {
		problems = append(problems, "thickness: must be greater than 0 and at most 600 mm")
	} else {
		row.ThicknessMM = math.Round(t*100) / 100
	}
	if c, err := parseCost(cost); err != nil {
		problems = append(problems, "cost: "+err.Error())
	} else if c < 0 {
		problems = append(problems, "cost: must not be negative")
	} else {
		row.CostPerM = costToSI(sys, size, c)
	}
	return row, problems
}

// costRowsView writes a stored table for the form, in the project's units.
func costRowsView(t analysis.CostTable, sys units.System) []web.CostRowView {
	out := make([]web.CostRowView, 0, len(t)+blankCostRows)
	for _, r := range t {
		c := costText(costFromSI(sys, r.NominalSize, r.CostPerM))
		out = append(out, web.CostRowView{Material: r.Material, Size: r.NominalSize,
			Thickness: units.Format(units.Length, sys, r.ThicknessMM), Cost: c, OrigCost: c, Example: r.Example})
	}
	return out
}

// withCostTable writes the cost table into a project's settings JSON, keeping every
// other key as stored.
func withCostTable(raw json.RawMessage, t analysis.CostTable) (json.RawMessage, error) {
	m := map[string]json.RawMessage{}
	if len(raw) > 0 {
		if err := json.Unmarshal(raw, &m); err != nil {
			return nil, fmt.Errorf("project settings: %w", err)
		}
	}
	if len(t) == 0 {
		delete(m, "cost_table")
	} else {
		js, err := json.Marshal(t)
		if err != nil {
			return nil, err
		}
		m["cost_table"] = js
	}
	return json.Marshal(m)
}
