package handlers

import (
	"encoding/json"
	"fmt"
	"net/http"
	"strconv"
	"strings"

	"lagwright/analysis"
	"lagwright/catalog"
	"lagwright/field"
	"lagwright/store"
	"lagwright/units"
	"lagwright/web"
)

// The line form. Fields are named by the JSON path of the analysis.Input value they set,
// so analysis field errors land beside them; a few fields (shape, layers, fittings, the
// line's own columns) are read by hand.

// minLayerRows is how many layer rows the form shows at least; blank rows are ignored.
const minLayerRows = 2

// maxLayerRows bounds the layer rows (analysis allows 10 layers).
const maxLayerRows = 10

// lineNumFields are the numeric fields of analysis.Input on the form.
var lineNumFields = []numField{
	{Key: "pipe_od_mm", Q: units.Length, Label: "Outside diameter"},
	{Key: "duct_width_mm", Q: units.Length, Label: "Duct width"},
	{Key: "duct_height_mm", Q: units.Length, Label: "Duct height"},
	{Key: "height_m", Q: units.LongLength, Label: "Height"},
	{Key: "area_m2", Q: units.Area, Label: "Area"},
	{Key: "length_m", Q: units.LongLength, Label: "Length"},
	{Key: "operating_temp_c", Q: units.Temp, Label: "Operating temperature"},
	{Key: "steam_gauge_pressure_kpa", Q: units.Pressure, Label: "Steam pressure (gauge)"},
	{Key: "flow.mass_flow_kg_s", Q: units.MassFlow, Label: "Mass flow"},
	{Key: "flow.cp_j_kgk", Q: cpQuantity, Label: "Specific heat"},
	{Key: "surface_emittance", Label: "Surface emittance"},
	{Key: "criteria.max_surface_temp_c", Q: units.Temp, Label: "Touch limit"},
	{Key: "criteria.dew_margin_k", Q: units.TempDiff, Label: "Dew-point margin"},
	{Key: "criteria.max_heat_flow_w_per_m", Q: units.HeatFlowPerLength, Label: "Maximum heat flow"},
	{Key: "criteria.max_temp_change_k", Q: units.TempDiff, Label: "Maximum temperature change"},
	{Key: "criteria.freeze_hours", Label: "Freeze protection time (h)"},
	{Key: "criteria.maintain_temp_c", Q: units.Temp, Label: "Heat tracing: maintain"},
	{Key: "criteria.heat_trace_factor", Label: "Heat tracing safety factor"},
}

// fittingFields are the fitting counts (stored beside the input).
var fittingFields = []numField{
	{Key: "fittings.elbows", Int: true, Label: "Elbows"},
	{Key: "fittings.tees", Int: true, Label: "Tees"},
	{Key: "fittings.valves", Int: true, Label: "Valves"},
	{Key: "fittings.flange_pairs", Int: true, Label: "Flange pairs"},
	{Key: "fittings.caps", Int: true, Label: "Caps"},
	{Key: "fittings.strainers", Int: true, Label: "Strainers"},
	{Key: "fittings.reducers", Int: true, Label: "Reducers"},
}

// shapes are the geometry choices: the form's "shape" sets geometry, orientation and facing.
var shapes = []struct{ value, label, geometry, orientation, facing string }{
	{"pipe-horizontal", "Pipe, horizontal", "pipe", "", ""},
	{"pipe-vertical", "Pipe, vertical", "pipe", "vertical", ""},
	{"duct", "Duct, rectangular", "duct", "", ""},
	{"flat-vertical", "Flat, vertical (wall, tank side)", "flat", "vertical", ""},
	{"flat-up", "Flat, horizontal facing up (tank top)", "flat", "", "up"},
	{"flat-down", "Flat, horizontal facing down", "flat", "", "down"},
}

// lineFields is a line as a form or the API gives it: the line's own columns and its input.
type lineFields struct {
	Tag, Service, Location, Exposure, Notes string
	Fittings                                analysis.Fittings
	Version                                 *int
	Input                                   analysis.Input
}

// validateMeta checks the line's own columns into field errors.
func (l *lineFields) validateMeta() field.Errors {
	var fe field.Errors
	add := func(f, m string) { fe = append(fe, field.Error{Field: f, Message: m}) }
	l.Tag, l.Service = strings.TrimSpace(l.Tag), strings.TrimSpace(l.Service)
	switch {
	case l.Tag == "":
		add("tag", "is required")
	case len(l.Tag) > 60:
		add("tag", "must be at most 60 characters")
	}
	if len(l.Service) > 200 {
		add("service", "must be at most 200 characters")
	}
	if len(l.Notes) > 4000 {
		add("notes", "must be at most 4000 characters")
	}
	if l.Location == "" {
		l.Location = "indoor"
	}
	if l.Exposure == "" {
		l.Exposure = "exposed"
	}
	if l.Location != "indoor" && l.Location != "outdoor" {
		add("location", `must be "indoor" or "outdoor"`)
	}
	if l.Exposure != "exposed" && l.Exposure != "concealed" {
		add("exposure", `must be "exposed" or "concealed"`)
	}
	for _, k := range catalog.FittingKinds {
		if n := l.Fittings.Count(k); n < 0 || n > 10000 {
			add("fittings."+k, "must be between 0 and 10000")
		}
	}
	return fe
}

// line builds the row to save.
func (l *lineFields) line(projectID int64) store.Line {
	in, _ := json.Marshal(l.Input)
	fit, _ := json.Marshal(l.Fittings)
	return store.Line{ProjectID: projectID, Tag: l.Tag, Service: l.Service, Location: l.Location, Exposure: l.Exposure,
		Notes: l.Notes, Input: in, Fittings: fit}
}

// lineFormFromRequest reads the line form typed in the project's units. Every typed
// value is kept as typed, for re-rendering.
//
// keep is the stored line's own input (nil for a new line): its keys that the form
// does not show (a per-line ambient or humidity, condition sets, economics, candidate
// thicknesses, fixed coefficients … set through the API or an import) are kept, so
// saving the form never drops them.
func lineFormFromRequest(r *http.Request, sys units.System, keep *analysis.Input) (*formState, lineFields) {
	st := newFormState()
	var lf lineFields
	pf := r.PostForm
	for _, k := range []string{"tag", "service", "location", "exposure", "notes", "version", "shape", "pipe_size",
		"pipe_schedule", "pipe_material", "fluid", "jacket"} {
		st.Values.Set(k, pf.Get(k))
	}
	lf.Tag, lf.Service, lf.Notes = pf.Get("tag"), pf.Get("service"), strings.ReplaceAll(pf.Get("notes"), "\r\n", "\n")
	lf.Location, lf.Exposure = pf.Get("location"), pf.Get("exposure")
	if v, err := parseVersion(pf.Get("version")); err == nil {
		lf.Version = &v
	}
	m := map[string]any{}
	shape := pf.Get("shape")
	found := false
	for _, s := range shapes {
		if s.value == shape {
			found = true
			m["geometry"] = s.geometry
			if s.orientation != "" {
				m["orientation"] = s.orientation
			}
			if s.facing != "" {
				m["facing"] = s.facing
			}
		}
	}
	if !found {
		st.addError("shape", "choose a geometry")
	}
	for _, k := range []string{"pipe_size", "pipe_schedule", "pipe_material", "fluid", "jacket"} {
		if v := strings.TrimSpace(pf.Get(k)); v != "" {
			m[k] = v
		}
	}
	nums := lineNumFields
	readNums(r, nums, sys, st, m)
	st.Values.Set("criteria.freeze_model", pf.Get("criteria.freeze_model"))
	if v := strings.TrimSpace(pf.Get("criteria.freeze_model")); v != "" {
		formSetPath(m, "criteria.freeze_model", v)
	}
	// Fields that do not apply to the chosen geometry are kept on the form but not sent.
	geom, _ := m["geometry"].(string)
	if geom != "pipe" {
		delete(m, "pipe_size")
		delete(m, "pipe_schedule")
		delete(m, "pipe_od_mm")
		delete(m, "pipe_material")
	} else if m["pipe_size"] != nil {
		delete(m, "pipe_od_mm") // a designation wins over a typed OD
	} else {
		delete(m, "pipe_schedule")
	}
	if cr, ok := m["criteria"].(map[string]any); ok && geom != "pipe" { // heat tracing and freeze basis: pipes only
		delete(cr, "maintain_temp_c")
		delete(cr, "heat_trace_factor")
		delete(cr, "freeze_model")
	}
	if geom != "duct" {
		delete(m, "duct_width_mm")
		delete(m, "duct_height_mm")
	}
	if geom == "flat" {
		delete(m, "length_m")
	} else {
		delete(m, "area_m2")
	}
	if m["orientation"] != "vertical" {
		delete(m, "height_m")
	}
	if m["steam_gauge_pressure_kpa"] != nil && m["fluid"] == nil {
		m["fluid"] = "steam"
	}
	if fl, ok := m["flow"].(map[string]any); ok && fl["mass_flow_kg_s"] == nil {
		if _, cpOnly := fl["cp_j_kgk"]; cpOnly {
			st.addError("flow.mass_flow_kg_s", "is required when a specific heat is given")
		}
		delete(m, "flow")
	}
	// Layers: rows with neither material nor thickness are ignored.
	var layers []any
	for i := 0; i < maxLayerRows; i++ {
		mk, tk := fmt.Sprintf("layers[%d].material", i), fmt.Sprintf("layers[%d].thickness_mm", i)
		mat, th := strings.TrimSpace(pf.Get(mk)), strings.TrimSpace(pf.Get(tk))
		if !pf.Has(mk) && !pf.Has(tk) {
			break
		}
		st.Values.Set(mk, pf.Get(mk))
		st.Values.Set(tk, pf.Get(tk))
		if mat == "" && th == "" {
			continue
		}
		idx := len(layers)
		layer := map[string]any{}
		if mat != "" {
			layer["material"] = mat
		} else {
			st.addError(mk, "choose a material")
		}
		if th == "" {
			st.addError(tk, "is required")
		} else if v, err := units.Parse(units.Length, sys, th); err != nil {
			st.addError(tk, err.Error())
		} else {
			layer["thickness_mm"] = formRoundSig(v)
		}
		if idx != i { // analysis numbers the layers it got; the form numbers its rows
			st.layerRow = append(st.layerRow, [2]int{idx, i})
		}
		layers = append(layers, layer)
	}
	if layers == nil {
		layers = []any{}
	}
	m["layers"] = layers
	if keep != nil {
		m = keepHidden(jsonMap(*keep), m)
	}
	js, _ := json.Marshal(m)
	if err := analysis.DecodeStrict(js, &lf.Input); err != nil {
		st.place(asFieldErrors(err), lineFieldKey(st))
	}
	fit := map[string]any{}
	readNums(r, fittingFields, sys, st, fit)
	if fm, ok := fit["fittings"]; ok {
		fjs, _ := json.Marshal(fm)
		_ = json.Unmarshal(fjs, &lf.Fittings)
	}
	st.place(lf.validateMeta(), lineFieldKey(st))
	return st, lf
}

// lineFieldKey maps an analysis field path to the form field showing it.
func lineFieldKey(st *formState) func(string) (string, bool) {
	known := map[string]bool{"tag": true, "service": true, "location": true, "exposure": true, "notes": true,
		"pipe_size": true, "pipe_schedule": true, "pipe_material": true, "fluid": true, "jacket": true, "criteria.freeze_model": true}
	for _, f := range lineNumFields {
		known[f.Key] = true
	}
	for _, f := range fittingFields {
		known[f.Key] = true
	}
	alias := map[string]string{"geometry": "shape", "orientation": "shape", "facing": "shape", "flow": "flow.mass_flow_kg_s",
		"criteria.personnel_protection": "criteria.max_surface_temp_c", "width_m": "height_m", "layers": "layers[0].material"}
	return func(path string) (string, bool) {
		for _, lr := range st.layerRow { // layers[idx] → the form's row
			pre := fmt.Sprintf("layers[%d]", lr[0])
			if strings.HasPrefix(path, pre) {
				path = fmt.Sprintf("layers[%d]", lr[1]) + strings.TrimPrefix(path, pre)
				break
			}
		}
		if known[path] {
			return path, true
		}
		if a, ok := alias[path]; ok {
			return a, true
		}
		if strings.HasPrefix(path, "layers[") {
			if !strings.Contains(path, ".") {
				return path + ".material", true
			}
			if strings.HasSuffix(path, ".k_w_mk") || strings.HasSuffix(path, ".k_points") {
				return path[:strings.Index(path, ".")] + ".material", true
			}
			return path, true
		}
		return "", false
	}
}

// lineFormValues fills the form from a stored line (SI) in the project's units.
func lineFormValues(l store.Line, in analysis.Input, fit analysis.Fittings, sys units.System) *formState {
	st := newFormState()
	st.Values.Set("tag", l.Tag)
	st.Values.Set("service", l.Service)
	st.Values.Set("location", l.Location)
	st.Values.Set("exposure", l.Exposure)
	st.Values.Set("notes", l.Notes)
	if l.ID != 0 {
		st.Values.Set("version", strconv.Itoa(l.Version))
	}
	shape := "pipe-horizontal"
	for _, s := range shapes {
		orient := in.Orientation
		if orient == "horizontal" {
			orient = ""
		}
		facing := in.Facing
		if s.geometry == "flat" && s.orientation == "" && facing == "" {
			facing = "up"
		}
		if s.geometry == in.Geometry && s.orientation == orient && (s.geometry != "flat" || s.orientation != "" || s.facing == facing) {
			shape = s.value
			break
		}
	}
	st.Values.Set("shape", shape)
	st.Values.Set("pipe_size", in.PipeSize)
	st.Values.Set("pipe_schedule", in.PipeSchedule)
	st.Values.Set("pipe_material", in.PipeMaterial)
	st.Values.Set("fluid", in.Fluid)
	st.Values.Set("jacket", in.Jacket)
	writeNums(jsonMap(in), lineNumFields, sys, st)
	writeNums(map[string]any{"fittings": jsonMap(fit)}, fittingFields, sys, st)
	for _, f := range fittingFields {
		if st.Values.Get(f.Key) == "0" {
			st.Values.Set(f.Key, "")
		}
	}
	for i, layer := range in.Layers {
		st.Values.Set(fmt.Sprintf("layers[%d].material", i), layer.Material)
		if layer.ThicknessMM != nil {
			st.Values.Set(fmt.Sprintf("layers[%d].thickness_mm", i), numField{Q: units.Length}.format(sys, *layer.ThicknessMM))
		}
	}
	return st
}

// layerRows is how many layer rows to draw: the ones typed, one blank, at least two.
func layerRows(st *formState) int {
	n := 0
	for i := 0; i < maxLayerRows; i++ {
		if st.Values.Get(fmt.Sprintf("layers[%d].material", i)) != "" || st.Values.Get(fmt.Sprintf("layers[%d].thickness_mm", i)) != "" {
			n = i + 1
		}
	}
	return min(max(n+1, minLayerRows), maxLayerRows)
}

// pipeSizeOptions lists the designations of catalog.PipeSizes(): NPS and DN for steel
// pipe, CTS for copper tube; SI projects see DN first. A stored designation the list
// lacks is kept as an option so the form never drops it.
func pipeSizeOptions(sys units.System, current string) []web.Choice {
	var nps, dn, cts []web.Choice
	for _, p := range catalog.PipeSizes() {
		od := units.FormatUnit(units.Length, sys, p.ODmm)
		if p.Kind == catalog.Copper {
			cts = append(cts, web.Choice{Value: p.Designation, Label: p.Designation + " (OD " + od + ")", Group: "Copper tube (CTS)"})
			continue
		}
		nps = append(nps, web.Choice{Value: p.Designation, Label: p.Designation + " (OD " + od + ")", Group: "Steel pipe (NPS)"})
		if p.DN > 0 {
			d := fmt.Sprintf("DN%d", p.DN)
			dn = append(dn, web.Choice{Value: d, Label: d + " (OD " + od + ")", Group: "Steel pipe (DN)"})
		}
	}
	out := []web.Choice{{Value: "", Label: "— plain outside diameter —"}}
	if sys == units.SI {
		out = append(append(append(out, dn...), nps...), cts...)
	} else {
		out = append(append(append(out, nps...), dn...), cts...)
	}
	found := false
	for _, o := range out {
		found = found || o.Value == current
	}
	if !found {
		out = append(out, web.Choice{Value: current, Label: current})
	}
	return out
}

// formInputKeys are the input keys the line form shows (criteria: the limits on the form).
var formInputKeys = []string{"geometry", "orientation", "facing", "pipe_size", "pipe_schedule", "pipe_od_mm", "pipe_material",
	"duct_width_mm", "duct_height_mm", "height_m", "area_m2", "length_m", "fluid", "operating_temp_c",
	"steam_gauge_pressure_kpa", "flow", "layers", "jacket", "surface_emittance"}

var formCriteriaKeys = []string{"max_surface_temp_c", "dew_margin_k", "max_heat_flow_w_per_m", "max_temp_change_k", "freeze_hours",
	"freeze_model", "maintain_temp_c", "heat_trace_factor"}

// keepHidden lays the form's input over the stored input's keys that the form does not show.
func keepHidden(stored, form map[string]any) map[string]any {
	for _, k := range formInputKeys {
		delete(stored, k)
	}
	if cr, ok := stored["criteria"].(map[string]any); ok {
		for _, k := range formCriteriaKeys {
			delete(cr, k)
		}
		if fc, ok := form["criteria"].(map[string]any); ok {
			for k, v := range fc {
				cr[k] = v
			}
		}
		if len(cr) == 0 {
			delete(stored, "criteria")
		}
		delete(form, "criteria")
	}
	for k, v := range form {
		stored[k] = v
	}
	return stored
}
