package analysis

import (
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"fmt"
	"slices"
	"strconv"
	"strings"

	"lagwright/calc"
)

// ProjectSettings are a project's design conditions, default criteria, economics and
// fitting allowances, stored as JSON with the project (SI). A line takes from them what
// it does not set itself.
type ProjectSettings struct {
	Indoor    Location          `json:"indoor"`
	Outdoor   Location          `json:"outdoor"`
	Criteria  ProjectCriteria   `json:"criteria"`
	Economics *Economics        `json:"economics,omitempty"`
	Fittings  FittingAllowances `json:"fittings"`
	// FittingTable and SupportTable are the project's edits of the built-in tables by
	// size (catalog): rows of the line's size win over "any" rows.
	FittingTable []FittingRow `json:"fitting_table,omitempty"`
	SupportTable []SupportRow `json:"support_spacing,omitempty"`
	// CostTable is the installed cost per metre by material, size and thickness that
	// Effective turns into each line's economics.installed_cost_per_m.
	CostTable []CostRow `json:"cost_table,omitempty"`
	// ThicknessSeries is the series lines are proposed from when they do not say
	// ("inch" or "metric"; "" = by each line's size: DN metric, NPS and CTS inch).
	ThicknessSeries string `json:"thickness_series,omitempty"`
}

// Location holds the design conditions of one location (indoor or outdoor) with its
// per-criterion condition sets.
type Location struct {
	AmbientTempC        float64     `json:"ambient_temp_c"`
	SurroundingsTempC   *float64    `json:"surroundings_temp_c,omitempty"`
	WindMS              float64     `json:"wind_m_s"`
	RelativeHumidityPct *float64    `json:"relative_humidity_pct,omitempty"`
	DewPointC           *float64    `json:"dew_point_c,omitempty"` // design dew point, instead of the humidity
	Conditions          *Conditions `json:"conditions,omitempty"`
}

// ProjectCriteria are the project's default criteria.
type ProjectCriteria struct {
	MaxSurfaceTempC *float64 `json:"max_surface_temp_c,omitempty"`
	TouchExposure   string   `json:"touch_exposure,omitempty"` // "industrial" | "public", see Criteria
	DewMarginK      *float64 `json:"dew_margin_k,omitempty"`
	EnergyCode      string   `json:"energy_code,omitempty"`
}

// FittingAllowances are a project's equivalent lengths for every size, one per kind,
// metres of run per fitting: a given value replaces the table by size for that kind
// (nil: the project's fitting_table rows, then the built-in table by the line's size).
type FittingAllowances struct {
	ElbowM    *float64 `json:"elbow_m,omitempty"`
	TeeM      *float64 `json:"tee_m,omitempty"`
	ValveM    *float64 `json:"valve_m,omitempty"`
	FlangeM   *float64 `json:"flange_m,omitempty"`
	CapM      *float64 `json:"cap_m,omitempty"`
	StrainerM *float64 `json:"strainer_m,omitempty"`
	ReducerM  *float64 `json:"reducer_m,omitempty"`
}

// ByKind gives the allowance of a fitting kind (catalog.FittingKinds).
func (a FittingAllowances) ByKind(kind string) *float64 {
	switch kind {
	case "elbows":
		return a.ElbowM
	case "tees":
		return a.TeeM
	case "valves":
		return a.ValveM
	case "flange_pairs":
		return a.FlangeM
	case "caps":
		return a.CapM
	case "strainers":
		return a.StrainerM
	case "reducers":
		return a.ReducerM
	}
	return nil
}

// Fittings counts the fittings on a run, by kind (the keys of catalog.FittingKinds).
type Fittings struct {
	Elbows      int `json:"elbows"`
	Tees        int `json:"tees"`
	Valves      int `json:"valves"`
	FlangePairs int `json:"flange_pairs"`
	Caps        int `json:"caps"`
	Strainers   int `json:"strainers"`
	Reducers    int `json:"reducers"`
}

// UnmarshalJSON reads counts, and the key "flanges" that counts stored before the
// rename to "flange_pairs" carry (issued schedules keep them as they were issued).
func (f *Fittings) UnmarshalJSON(b []byte) error {
	type plain Fittings
	var v struct {
		plain
		Flanges *int `json:"flanges"`
	}
	if err := json.Unmarshal(b, &v); err != nil {
		return err
	}
	*f = Fittings(v.plain)
	if v.Flanges != nil && f.FlangePairs == 0 {
		f.FlangePairs = *v.Flanges
	}
	return nil
}

// Count gives the count of a fitting kind.
func (f Fittings) Count(kind string) int {
	if p := f.at(kind); p != nil {
		return *p
	}
	return 0
}

// Set sets the count of a fitting kind (unknown kinds are ignored).
func (f *Fittings) Set(kind string, n int) {
	if p := f.at(kind); p != nil {
		*p = n
	}
}

// Any reports whether any fitting is counted.
func (f Fittings) Any() bool { return f != Fittings{} }

func (f *Fittings) at(kind string) *int {
	switch kind {
	case "elbows":
		return &f.Elbows
	case "tees":
		return &f.Tees
	case "valves":
		return &f.Valves
	case "flange_pairs":
		return &f.FlangePairs
	case "caps":
		return &f.Caps
	case "strainers":
		return &f.Strainers
	case "reducers":
		return &f.Reducers
	}
	return nil
}

// FittingRow is one row of a project's fitting table: the equivalent insulated length
// of one fitting of a kind at a nominal size ("any": every size).
type FittingRow struct {
	Kind         string  `json:"kind"` // catalog.FittingKinds
	NominalSize  string  `json:"nominal_size"`
	EquivLengthM float64 `json:"equiv_length_m"`
}

// SupportRow is one row of a project's support-spacing table.
type SupportRow struct {
	NominalSize string  `json:"nominal_size"`
	SpacingM    float64 `json:"spacing_m"`
}

// maxTableRows bounds a project's fitting and support tables.
const maxTableRows = 500

// DefaultSettings is a new project's settings: a temperate indoor plant room and a
// mild outdoor design day. Users are expected to edit them.
func DefaultSettings() ProjectSettings {
	return ProjectSettings{
		Indoor:   Location{AmbientTempC: 24, RelativeHumidityPct: ptr(50.0)},
		Outdoor:  Location{AmbientTempC: 30, WindMS: 3, RelativeHumidityPct: ptr(70.0)},
		Criteria: ProjectCriteria{MaxSurfaceTempC: ptr(60.0), DewMarginK: ptr(1.0)},
	}
}

// fittingLengths gives the project's per-fitting lengths for a line of the given
// nominal size: the all-size allowance, else the row of the line's size, else the
// "any" row; nil where the project has none (the built-in table by size applies).
func (p ProjectSettings) fittingLengths(size string) *FittingLengths {
	want := NormalSize(size)
	var out FittingLengths
	found := false
	for _, kind := range catalogFittingKinds() {
		v := p.Fittings.ByKind(kind)
		if v == nil {
			var anyRow *float64
			for _, r := range p.FittingTable {
				if r.Kind != kind {
					continue
				}
				rs := NormalSize(r.NominalSize)
				if want != "" && rs == want {
					v = ptr(r.EquivLengthM)
					break
				}
				if rs == AnySize && anyRow == nil {
					anyRow = ptr(r.EquivLengthM)
				}
			}
			if v == nil {
				v = anyRow
			}
		}
		if v != nil {
			*out.at(kind) = v
			found = true
		}
	}
	if !found {
		return nil
	}
	return &out
}

// supportSpacing gives the project's support spacing for a nominal size: the row of
// that size, else the "any" row; nil when the project has neither.
func (p ProjectSettings) supportSpacing(size string) *float64 {
	want := NormalSize(size)
	var anyRow *float64
	for _, r := range p.SupportTable {
		rs := NormalSize(r.NominalSize)
		if want != "" && rs == want {
			return ptr(r.SpacingM)
		}
		if rs == AnySize && anyRow == nil {
			anyRow = ptr(r.SpacingM)
		}
	}
	return anyRow
}

// Validate checks the settings into field errors (paths as in the project JSON).
func (p ProjectSettings) Validate() error {
	var c errs
	for name, loc := range map[string]Location{"indoor": p.Indoor, "outdoor": p.Outdoor} {
		pre := "settings." + name + "."
		rangeCheck(&c, pre+"ambient_temp_c", &loc.AmbientTempC, -70, 80, "°C")
		rangeCheck(&c, pre+"surroundings_temp_c", loc.SurroundingsTempC, -100, 300, "°C")
		rangeCheck(&c, pre+"wind_m_s", &loc.WindMS, 0, 40, "m/s")
		rangeCheck(&c, pre+"relative_humidity_pct", loc.RelativeHumidityPct, 0.1, 100, "%")
		rangeCheck(&c, pre+"dew_point_c", loc.DewPointC, -70, 80, "°C")
		bothHumidities(&c, pre, loc.RelativeHumidityPct, loc.DewPointC)
		if loc.DewPointC != nil && *loc.DewPointC > loc.AmbientTempC {
			c.add(pre+"dew_point_c", "must not be above the ambient temperature")
		}
	}
	rangeCheck(&c, "settings.criteria.max_surface_temp_c", p.Criteria.MaxSurfaceTempC, 20, 200, "°C")
	rangeCheck(&c, "settings.criteria.dew_margin_k", p.Criteria.DewMarginK, 0, 20, "K")
	if p.Economics != nil {
		checkEconomics(p.Economics, "settings.economics.", false, &c)
	}
	if te := p.Criteria.TouchExposure; te != "" && te != "industrial" && te != "public" {
		c.add("settings.criteria.touch_exposure", `must be "industrial" or "public"`)
	} else if te == "public" && p.Criteria.MaxSurfaceTempC == nil {
		c.add("settings.criteria.max_surface_temp_c", "give the touch limit for areas used by the public or patients")
	}
	if ts := p.ThicknessSeries; ts != "" && ts != "inch" && ts != "metric" {
		c.add("settings.thickness_series", `must be "inch" or "metric"`)
	}
	for _, fe := range CostTable(p.CostTable).Validate() {
		c.add(fmt.Sprintf("settings.cost_table[%d].%s", fe.Row, fe.Field), "%s", fe.Message)
	}
	for name, v := range map[string]*float64{"elbow_m": p.Fittings.ElbowM, "tee_m": p.Fittings.TeeM, "valve_m": p.Fittings.ValveM,
		"flange_m": p.Fittings.FlangeM, "cap_m": p.Fittings.CapM, "strainer_m": p.Fittings.StrainerM, "reducer_m": p.Fittings.ReducerM} {
		rangeCheck(&c, "settings.fittings."+name, v, 0, 50, "m")
	}
	validateFittingTable(&c, p.FittingTable)
	validateSupportTable(&c, p.SupportTable)
	return c.err()
}

// Effective is the calculation input of a stored line: the line's own input, with the
// project's design conditions for its location, default criteria, economics and
// fitting allowances filling what the line leaves unset.
func (p ProjectSettings) Effective(location string, line Input, fit Fittings) Input {
	in := line
	loc := p.Indoor
	if location == "outdoor" {
		loc = p.Outdoor
	}
	if in.AmbientTempC == nil {
		in.AmbientTempC = ptr(loc.AmbientTempC)
		if in.SurroundingsTempC == nil {
			in.SurroundingsTempC = loc.SurroundingsTempC
		}
	}
	if in.WindMS == nil {
		in.WindMS = ptr(loc.WindMS)
	}
	if in.RelativeHumidityPct == nil && in.DewPointC == nil { // the line's own moisture wins, in either form
		in.RelativeHumidityPct, in.DewPointC = loc.RelativeHumidityPct, loc.DewPointC
	}
	if in.Conditions == nil && loc.Conditions != nil {
		cs := *loc.Conditions
		in.Conditions = &cs
	}
	cr := Criteria{}
	if in.Criteria != nil {
		cr = *in.Criteria
	}
	if cr.MaxSurfaceTempC == nil {
		cr.MaxSurfaceTempC = p.Criteria.MaxSurfaceTempC
	}
	if cr.DewMarginK == nil {
		cr.DewMarginK = p.Criteria.DewMarginK
	}
	if cr.TouchExposure == "" {
		cr.TouchExposure = p.Criteria.TouchExposure
	}
	if cr.EnergyCode == "" && in.Geometry == "pipe" {
		cr.EnergyCode = p.Criteria.EnergyCode
	}
	in.Criteria = &cr
	if in.Location == "" {
		in.Location = location
	}
	if in.ThicknessSeries == "" {
		in.ThicknessSeries = p.ThicknessSeries
	}
	if in.Economics == nil && p.Economics.Priced() {
		e := *p.Economics // both bases: the analysis picks the line's own
		if len(e.InstalledCostPerM) == 0 && len(p.CostTable) > 0 {
			mat := ""
			if n := len(in.Layers); n > 0 {
				mat = in.Layers[n-1].Material
			}
			size := in.PipeSize
			if in.Geometry == "flat" {
				size = FlatSize
			}
			pts, example := CostTable(p.CostTable).Match(mat, size)
			e.InstalledCostPerM, e.InstalledCostSource = pts, costFromTable
			switch {
			case len(pts) == 0:
				e.InstalledCostSource = costNoMatch
			case example:
				e.InstalledCostSource = costExample
			}
		}
		in.Economics = &e
	}
	if in.Fittings == nil && fit.Any() {
		in.Fittings = &fit
	}
	if in.Geometry == "pipe" && in.PipeSize != "" {
		if in.FittingLengthsM == nil && in.Fittings != nil && in.Fittings.Any() {
			in.FittingLengthsM = p.fittingLengths(in.PipeSize)
		}
		if sp := p.supportSpacing(in.PipeSize); sp != nil && (in.Supports == nil || in.Supports.SpacingM == nil) {
			s := Supports{}
			if in.Supports != nil {
				s = *in.Supports
			}
			s.SpacingM = sp
			in.Supports = &s
		}
	} else if in.FittingLengthsM == nil && in.Fittings != nil && in.Fittings.Any() {
		in.FittingLengthsM = p.fittingLengths("")
	}
	return in
}

// Versions names the version of every material and jacket a result depends on.
type Versions map[string]int

// ResultHash keys a stored result: the effective input, the versions of the materials
// and jackets it names and the method version. A stored result whose hash differs is
// stale and is computed again.
func ResultHash(in Input, v Versions) string {
	h := sha256.New()
	js, _ := json.Marshal(in) // Input holds only marshalable values
	h.Write(js)
	keys := make([]string, 0, len(v))
	for k := range v {
		keys = append(keys, k)
	}
	slices.Sort(keys)
	for _, k := range keys {
		fmt.Fprintf(h, "|%s=%d", k, v[k])
	}
	fmt.Fprintf(h, "|method=%s", calc.MethodVersion)
	return hex.EncodeToString(h.Sum(nil))
}

// Slugs lists the material and jacket slugs an input names, for ResultHash and for the
// store's record of which lines use which material.
func (in Input) Slugs() (materials []string, jacket string) {
	layers := in.Layers
	if in.Existing != nil {
		layers = append(slices.Clone(in.Layers), in.Existing.Layers...)
	}
	for _, l := range layers {
		if l.Material != "" && !slices.Contains(materials, l.Material) {
			materials = append(materials, l.Material)
		}
	}
	return materials, in.Jacket
}

// AnySize is the nominal size of a cost row that prices every pipe and duct size of its
// material (per metre).
const AnySize = "any"

// FlatSize is the "nominal size" of a cost row that prices flat surfaces of its material,
// per m². A flat surface takes only such rows, and pipes and ducts never do: a cost per
// metre of pipe is not a cost per m² of tank.
const FlatSize = "flat"

// CostRow is one installed cost in a project's cost table: per metre of pipe or duct of
// one material, nominal size and thickness, or per m² of flat surface for size "flat". Example rows
// are the labelled example the user must replace; results priced with them say so.
type CostRow struct {
	Material    string  `json:"material"`     // material slug
	NominalSize string  `json:"nominal_size"` // "NPS 4", "DN100", "CTS 1" … or "any"
	ThicknessMM float64 `json:"thickness_mm"`
	CostPerM    float64 `json:"cost_per_m"`
	Example     bool    `json:"example,omitempty"`
}

// CostTable is a project's installed costs.
type CostTable []CostRow

// CostRowError is a problem with one row of a cost table (Row counts from 0).
type CostRowError struct {
	Row     int
	Field   string // "material", "nominal_size", "thickness_mm", "cost_per_m"
	Message string
}

// MaxCostRows bounds a project's cost table.
const MaxCostRows = 2000

// Validate checks each row: a material, a size (or "any"), a thickness 0 < t ≤ 600 mm,
// a cost 0 … 10⁷, and no two rows for the same material, size and thickness.
func (t CostTable) Validate() []CostRowError {
	var out []CostRowError
	if len(t) > MaxCostRows {
		return []CostRowError{{Row: MaxCostRows, Field: "material", Message: fmt.Sprintf("at most %d rows", MaxCostRows)}}
	}
	type key struct {
		mat, size string
		t         float64
	}
	seen := map[key]int{}
	for i, r := range t {
		switch {
		case r.Material == "":
			out = append(out, CostRowError{i, "material", "is required"})
		case len(r.Material) > 100:
			out = append(out, CostRowError{i, "material", "is longer than 100 characters"})
		}
		if NormalSize(r.NominalSize) == "" {
			out = append(out, CostRowError{i, "nominal_size", `is required (a nominal size such as "NPS 4", "DN100", "any", or "flat" for flat surfaces per m²)`})
		}
		if !(r.ThicknessMM > 0 && r.ThicknessMM <= maxThicknessMM) {
			out = append(out, CostRowError{i, "thickness_mm", fmt.Sprintf("must be greater than 0 and at most %d mm", maxThicknessMM)})
		}
		if !(r.CostPerM >= 0 && r.CostPerM <= 1e7) {
			out = append(out, CostRowError{i, "cost_per_m", "must be between 0 and 10000000"})
		}
		k := key{r.Material, NormalSize(r.NominalSize), round(r.ThicknessMM, 2)}
		if j, ok := seen[k]; ok && r.Material != "" && k.size != "" {
			out = append(out, CostRowError{i, "thickness_mm", fmt.Sprintf("repeats row %d (same material, size and thickness)", j+1)})
		} else {
			seen[k] = i
		}
	}
	return out
}

// Match gives the installed cost points of a material at a nominal size, ascending by
// thickness: for each thickness the row of that exact size wins over the "any" row.
// example reports whether any point came from an example row. A pipe or duct without a
// nominal size (plain OD, ducts) matches only "any" rows; size "flat" (flat surfaces)
// matches only "flat" rows, per m².
func (t CostTable) Match(material, size string) (points []CostPoint, example bool) {
	want := NormalSize(size)
	type pick struct {
		row   CostRow
		exact bool
	}
	by := map[float64]pick{}
	for _, r := range t {
		if r.Material != material || material == "" {
			continue
		}
		rs := NormalSize(r.NominalSize)
		exact := want != "" && want != AnySize && rs == want
		if !exact && (rs != AnySize || want == FlatSize) {
			continue
		}
		k := round(r.ThicknessMM, 2)
		if p, ok := by[k]; ok && p.exact && !exact {
			continue
		}
		by[k] = pick{r, exact}
	}
	for k, p := range by {
		points = append(points, CostPoint{ThicknessMM: k, Cost: p.row.CostPerM})
		example = example || p.row.Example
	}
	slices.SortFunc(points, func(a, b CostPoint) int {
		switch {
		case a.ThicknessMM < b.ThicknessMM:
			return -1
		case a.ThicknessMM > b.ThicknessMM:
			return 1
		}
		return 0
	})
	return points, example
}

// NormalSize writes a nominal size in one form so that "NPS 4", "4", "4\"", "4 in" and
// "nps4" match, as do "NPS 1-1/2", "1 1/2" and "1.5"; "DN100" and "dn 100" match; "CTS 1"
// and "cts1" match; "any", "*" and "all" are AnySize. Empty or unreadable text gives "".
func NormalSize(s string) string {
	s = strings.ToLower(strings.TrimSpace(s))
	switch s {
	case "":
		return ""
	case "any", "*", "all":
		return AnySize
	case "flat", "flats", "flat surface", "flat surfaces":
		return FlatSize
	}
	prefix := "NPS "
	for _, p := range []struct{ in, out string }{{"nps", "NPS "}, {"dn", "DN"}, {"cts", "CTS "}} {
		if strings.HasPrefix(s, p.in) {
			prefix, s = p.out, strings.TrimSpace(s[len(p.in):])
			break
		}
	}
	s = strings.TrimSpace(strings.TrimSuffix(strings.TrimSuffix(strings.TrimSuffix(s, "in"), "\""), "″"))
	v, ok := parseSizeNumber(s)
	if !ok {
		return ""
	}
	return prefix + strconv.FormatFloat(v, 'f', -1, 64)
}

// parseSizeNumber reads "4", "1.5", "3/4", "1-1/2" or "1 1/2".
func parseSizeNumber(s string) (float64, bool) {
	whole, frac := s, ""
	if i := strings.IndexAny(s, "- "); i > 0 {
		whole, frac = s[:i], strings.TrimSpace(s[i+1:])
	} else if strings.Contains(s, "/") {
		whole, frac = "0", s
	}
	w, err := strconv.ParseFloat(whole, 64)
	if err != nil || w < 0 || w > 1e4 {
		return 0, false
	}
	if frac == "" {
		return w, true
	}
	n, d, ok := strings.Cut(frac, "/")
	nv, err1 := strconv.ParseFloat(n, 64)
	dv, err2 := strconv.ParseFloat(d, 64)
	if !ok || err1 != nil || err2 != nil || dv <= 0 || nv < 0 {
		return 0, false
	}
	return w + nv/dv, true
}

// ExampleCostRows is the labelled example cost model: for each material, size "any", a
// convex cost per metre of 18 + 0.5·t + 0.004·t² (t in mm) at each thickness given.
// Invented numbers to show how the table works, never prices: every row is marked
// Example, and every result priced with them says so.
func ExampleCostRows(materials []string, thicknessesMM func(slug string) []float64) []CostRow {
	var out []CostRow
	for _, m := range materials {
		for _, t := range thicknessesMM(m) {
			out = append(out, CostRow{Material: m, NominalSize: AnySize, ThicknessMM: t,
				CostPerM: round(18+0.5*t+0.004*t*t, 2), Example: true})
		}
	}
	return out
}

// validateFittingTable checks a project's fitting rows: a known kind, a size (or
// "any"), a length 0 … 50 m, no two rows for the same kind and size.
func validateFittingTable(c *errs, rows []FittingRow) {
	if len(rows) > maxTableRows {
		c.add("settings.fitting_table", "must have at most %d rows", maxTableRows)
		return
	}
	seen := map[[2]string]int{}
	for i, r := range rows {
		p := fmt.Sprintf("settings.fitting_table[%d].", i)
		if !slices.Contains(catalogFittingKinds(), r.Kind) {
			c.add(p+"kind", "must be one of %s", strings.Join(catalogFittingKinds(), ", "))
		}
		size := NormalSize(r.NominalSize)
		if size == "" {
			c.add(p+"nominal_size", `is required (a nominal size such as "NPS 4", "DN100", or "any")`)
		}
		rangeCheck(c, p+"equiv_length_m", &r.EquivLengthM, 0, 50, "m")
		k := [2]string{r.Kind, size}
		if j, ok := seen[k]; ok && size != "" {
			c.add(p+"nominal_size", "repeats row %d (same kind and size)", j+1)
		} else {
			seen[k] = i
		}
	}
}

// validateSupportTable checks a project's support rows: a size (or "any"), a spacing
// 0.3 … 100 m, no size twice.
func validateSupportTable(c *errs, rows []SupportRow) {
	if len(rows) > maxTableRows {
		c.add("settings.support_spacing", "must have at most %d rows", maxTableRows)
		return
	}
	seen := map[string]int{}
	for i, r := range rows {
		p := fmt.Sprintf("settings.support_spacing[%d].", i)
		size := NormalSize(r.NominalSize)
		if size == "" {
			c.add(p+"nominal_size", `is required (a nominal size such as "NPS 4", "DN100", or "any")`)
		}
		rangeCheck(c, p+"spacing_m", &r.SpacingM, 0.3, 100, "m")
		if j, ok := seen[size]; ok && size != "" {
			c.add(p+"nominal_size", "repeats row %d (same size)", j+1)
		} else {
			seen[size] = i
		}
	}
}
