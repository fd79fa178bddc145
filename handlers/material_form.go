package handlers

import (
	"fmt"
	"math"
	"net/http"
	"strconv"
	"strings"

	"lagwright/catalog"
	"lagwright/field"
	"lagwright/store"
	"lagwright/units"
	"lagwright/web"
)

const (
	blankRows   = 6  // blank k-point rows offered below the filled ones
	maxFormRows = 60 // rows read from a post, filled or blank
)

// materialForm is a custom-material form as typed: the values by field name, the k
// point rows, and the problems found while reading them. The numbers are in the
// system the form's "units" choice names; each may carry its own unit.
type materialForm struct {
	values       map[string]string
	compressible bool
	rows         []web.MaterialKInput
	errors       map[string]string
}

var textFields = []string{"slug", "name", "category", "spec", "source", "units", "min_temp", "max_temp",
	"thicknesses", "max_layer", "compression_pct", "k_paste", "version"}

// readMaterialForm reads a posted form.
func readMaterialForm(r *http.Request) (*materialForm, error) {
	if err := r.ParseForm(); err != nil {
		return nil, err
	}
	f := &materialForm{values: map[string]string{}, errors: map[string]string{}}
	for _, k := range textFields {
		f.values[k] = strings.TrimSpace(r.PostForm.Get(k))
	}
	if f.values["units"] != "us" {
		f.values["units"] = "si"
	}
	f.compressible = r.PostForm.Get("compressible") != ""
	ts, ks := r.PostForm["kp_t"], r.PostForm["kp_k"]
	for i := 0; i < max(len(ts), len(ks)) && i < maxFormRows; i++ {
		var row web.MaterialKInput
		if i < len(ts) {
			row.Mean = strings.TrimSpace(ts[i])
		}
		if i < len(ks) {
			row.K = strings.TrimSpace(ks[i])
		}
		f.rows = append(f.rows, row)
	}
	return f, nil
}

// materialFormOf fills a form from a stored material, its numbers in sys.
func materialFormOf(m store.Material, sys units.System) *materialForm {
	f := &materialForm{values: map[string]string{
		"slug": m.Slug, "name": m.Name, "category": m.Category, "spec": m.Spec, "source": m.Source,
		"units":    string(sys),
		"min_temp": plainNumber(units.FromSI(units.Temp, sys, m.MinC)), "max_temp": plainNumber(units.FromSI(units.Temp, sys, m.MaxC)),
		"max_layer": thicknessText(m.MaxLayerMM, sys), "version": strconv.Itoa(m.Version),
	}, compressible: m.Compressible, errors: map[string]string{}}
	if m.Compressible {
		f.values["compression_pct"] = plainNumber(m.CompressionPct)
	}
	th := make([]string, len(m.ThicknessesMM))
	for i, t := range m.ThicknessesMM {
		th[i] = thicknessText(t, sys)
	}
	f.values["thicknesses"] = strings.Join(th, ", ")
	for _, p := range m.KPoints {
		f.rows = append(f.rows, web.MaterialKInput{
			Mean: plainNumber(units.FromSI(units.Temp, sys, p.MeanC)), K: plainNumber(units.FromSI(units.Conductivity, sys, p.K))})
	}
	return f
}

// plainNumber writes a number as typed: at most 6 significant digits, no exponent, so
// SI data round-trips and converted data reads cleanly.
func plainNumber(v float64) string {
	r, _ := strconv.ParseFloat(strconv.FormatFloat(v, 'g', 6, 64), 64)
	return strconv.FormatFloat(r, 'f', -1, 64)
}

// thicknessText writes a thickness in sys: mm, or inches as a fraction where exact.
func thicknessText(mm float64, sys units.System) string {
	if sys == units.US {
		return units.Format(units.Length, units.US, mm)
	}
	return plainNumber(mm)
}

// hundredth rounds a length to 0.01 mm, as the catalog does, so that 1-1/2 in
// reads 38.1 mm and not 38.099999999999994.
func hundredth(mm float64) float64 { return math.Round(mm*100) / 100 }

// kOrigin says where a k point came from: a row (index) or a pasted line (number).
type kOrigin struct {
	row, line int // row −1 for a pasted line
}

// material reads the typed values into a material. Problems reading a field go to
// f.errors (or the row); the material is then incomplete and must not be saved.
func (f *materialForm) material() (store.Material, []kOrigin) {
	sys := units.System(f.values["units"])
	m := store.Material{Material: catalog.Material{
		Slug: f.values["slug"], Name: f.values["name"], Category: f.values["category"], Spec: f.values["spec"],
		Source: f.values["source"], Compressible: f.compressible,
	}}
	m.Version, _ = parseVersion(f.values["version"])
	num := func(key string, q units.Quantity) float64 {
		s := f.values[key]
		if s == "" {
			f.errors[key] = "is required"
			return math.NaN()
		}
		v, err := units.Parse(q, sys, s)
		if err != nil {
			f.errors[key] = err.Error()
			return math.NaN()
		}
		return v
	}
	m.MinC = num("min_temp", units.Temp)
	m.MaxC = num("max_temp", units.Temp)
	m.MaxLayerMM = hundredth(num("max_layer", units.Length))
	if f.compressible {
		if f.values["compression_pct"] == "" {
			f.values["compression_pct"] = "0"
		}
		v, err := strconv.ParseFloat(strings.TrimSuffix(strings.TrimSpace(f.values["compression_pct"]), "%"), 64)
		if err != nil {
			f.errors["compression_pct"] = "must be a number of percent"
		}
		m.CompressionPct = v
	} else if f.values["compression_pct"] != "" && f.values["compression_pct"] != "0" {
		f.errors["compression_pct"] = "applies only to a compressible material: tick Compressible or clear this"
	}
	for i, part := range strings.FieldsFunc(f.values["thicknesses"], func(r rune) bool { return r == ',' || r == ';' || r == '\n' }) {
		part = strings.TrimSpace(part)
		if part == "" {
			continue
		}
		v, err := units.Parse(units.Length, sys, part)
		if err != nil {
			f.errors["thicknesses"] = fmt.Sprintf("thickness %d: %v", i+1, err)
			continue
		}
		m.ThicknessesMM = append(m.ThicknessesMM, hundredth(v))
	}

	var origins []kOrigin
	for i := range f.rows {
		row := &f.rows[i]
		if row.Mean == "" && row.K == "" {
			continue
		}
		t, k, err := kPointRow(sys, row.Mean, row.K)
		if err != nil {
			row.Err = err.Error()
			continue
		}
		m.KPoints = append(m.KPoints, catalog.KPoint{MeanC: t, K: k})
		origins = append(origins, kOrigin{row: i})
	}
	header := true
	for n, line := range strings.Split(f.values["k_paste"], "\n") {
		line = strings.TrimSpace(line)
		if line == "" {
			continue
		}
		cols := materialColumns(line)
		if header && len(cols) > 0 && !strings.ContainsRune("0123456789+-−.", []rune(cols[0])[0]) {
			header = false // a column heading pasted with the table
			continue
		}
		header = false
		if len(cols) != 2 {
			f.errors["k_paste"] = fmt.Sprintf("line %d: give two columns, mean temperature and k", n+1)
			continue
		}
		t, k, err := kPointRow(sys, cols[0], cols[1])
		if err != nil {
			f.errors["k_paste"] = fmt.Sprintf("line %d: %v", n+1, err)
			continue
		}
		m.KPoints = append(m.KPoints, catalog.KPoint{MeanC: t, K: k})
		origins = append(origins, kOrigin{row: -1, line: n + 1})
	}
	return m, origins
}

// materialColumns splits a pasted line on tabs, else semicolons, else commas, else spaces.
func materialColumns(line string) []string {
	var cols []string
	switch {
	case strings.Contains(line, "\t"):
		cols = strings.Split(line, "\t")
	case strings.Contains(line, ";"):
		cols = strings.Split(line, ";")
	case strings.Contains(line, ","):
		cols = strings.Split(line, ",")
	default:
		cols = strings.Fields(line)
	}
	out := cols[:0]
	for _, c := range cols {
		if c = strings.TrimSpace(c); c != "" {
			out = append(out, c)
		}
	}
	return out
}

// kPointRow reads one (mean temperature, k) pair.
func kPointRow(sys units.System, mean, k string) (float64, float64, error) {
	if mean == "" || k == "" {
		return 0, 0, fmt.Errorf("give both the mean temperature and k")
	}
	t, err := units.Parse(units.Temp, sys, mean)
	if err != nil {
		return 0, 0, fmt.Errorf("mean temperature: %v", err)
	}
	kv, err := units.Parse(units.Conductivity, sys, k)
	if err != nil {
		return 0, 0, fmt.Errorf("k: %v", err)
	}
	return t, kv, nil
}

// formKey is the form field that shows a store field's problem.
var formKey = map[string]string{
	"min_temp_c": "min_temp", "max_temp_c": "max_temp", "thicknesses_mm": "thicknesses", "max_layer_mm": "max_layer",
}

// addStoreErrors puts the store's validation problems beside the form's fields,
// keeping any problem already found while reading a field.
func (f *materialForm) addStoreErrors(fe field.Errors, origins []kOrigin) {
	readProblem := f.errors["k_paste"] != ""
	for _, r := range f.rows {
		readProblem = readProblem || r.Err != ""
	}
	set := func(key, msg string) {
		if _, ok := f.errors[key]; !ok {
			f.errors[key] = msg
		}
	}
	for _, e := range fe {
		field, idx := e.Field, -1
		if i := strings.IndexByte(field, '['); i > 0 {
			idx, _ = strconv.Atoi(strings.TrimSuffix(field[i+1:], "]"))
			field = field[:i]
		}
		msg := e.Message
		switch {
		case field == "k_points" && idx < 0 && readProblem:
			// a row that could not be read explains the missing points
		case field == "k_points" && idx >= 0 && idx < len(origins):
			if o := origins[idx]; o.row >= 0 {
				if f.rows[o.row].Err == "" {
					f.rows[o.row].Err = msg
				}
			} else {
				set("k_paste", fmt.Sprintf("line %d: %s", o.line, msg))
			}
		case field == "thicknesses_mm" && idx >= 0:
			set("thicknesses", fmt.Sprintf("thickness %d: %s", idx+1, msg))
		case formKey[field] != "":
			set(formKey[field], msg)
		default:
			set(field, msg)
		}
	}
}

// hasErrors reports whether reading or checking found any problem.
func (f *materialForm) hasErrors() bool {
	if len(f.errors) > 0 {
		return true
	}
	for _, r := range f.rows {
		if r.Err != "" {
			return true
		}
	}
	return false
}

// view renders the form. Rows keep what was typed, with at least blankRows blank
// rows after the last filled one.
func (s *Server) materialFormView(f *materialForm, editing bool, message string) web.MaterialFormView {
	rows := append([]web.MaterialKInput(nil), f.rows...)
	last := -1
	for i, r := range rows {
		if r.Mean != "" || r.K != "" || r.Err != "" {
			last = i
		}
	}
	for len(rows) < last+1+blankRows {
		rows = append(rows, web.MaterialKInput{})
	}
	v := web.MaterialFormView{
		Assets: s.assets.urls, Editing: editing, Values: f.values, Compressible: f.compressible,
		Rows: rows, Errors: f.errors, Message: message,
	}
	if editing {
		v.Title = "Edit " + f.values["name"]
		v.Action = materialHref(f.values["slug"], "/edit")
		v.CancelHref = materialHref(f.values["slug"], "")
	} else {
		v.Title = "New custom material"
		v.Action = "/materials/new"
		v.CancelHref = "/materials"
	}
	return v
}
