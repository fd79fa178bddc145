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

// lineNum is a numeric field of the line form and where its value lives in the input.
type lineNum struct {
	numField
	at func(in *analysis.Input) **float64 // allocates the parent struct when needed
}

func flowAt(in *analysis.Input) *analysis.Flow {
	if in.Flow == nil {
		in.Flow = &analysis.Flow{}
	}
	return in.Flow
}

func criteriaAt(in *analysis.Input) *analysis.Criteria {
	if in.Criteria == nil {
		in.Criteria = &analysis.Criteria{}
	}
	return in.Criteria
}

// lineNums are the numeric fields of analysis.Input on the form, keyed by their JSON
// path so that analysis field errors land beside them.
var lineNums = []lineNum{
	{numField{Key: "pipe_od_mm", Q: units.Length, Label: "Outside diameter"}, func(in *analysis.Input) **float64 { return &in.PipeODmm }},
	{numField{Key: "duct_width_mm", Q: units.Length, Label: "Duct width"}, func(in *analysis.Input) **float64 { return &in.DuctWidthMM }},
	{numField{Key: "duct_height_mm", Q: units.Length, Label: "Duct height"}, func(in *analysis.Input) **float64 { return &in.DuctHeightMM }},
	{numField{Key: "height_m", Q: units.LongLength, Label: "Height"}, func(in *analysis.Input) **float64 { return &in.HeightM }},
	{numField{Key: "area_m2", Q: units.Area, Label: "Area"}, func(in *analysis.Input) **float64 { return &in.AreaM2 }},
	{numField{Key: "length_m", Q: units.LongLength, Label: "Length"}, func(in *analysis.Input) **float64 { return &in.LengthM }},
	{numField{Key: "operating_temp_c", Q: units.Temp, Label: "Operating temperature"}, func(in *analysis.Input) **float64 { return &in.OperatingTempC }},
	{numField{Key: "steam_gauge_pressure_kpa", Q: units.Pressure, Label: "Steam pressure (gauge)"},
		func(in *analysis.Input) **float64 { return &in.SteamGaugePressureKPa }},
	{numField{Key: "flow.mass_flow_kg_s", Q: units.MassFlow, Label: "Mass flow"}, func(in *analysis.Input) **float64 { return &flowAt(in).MassFlowKgS }},
	{numField{Key: "flow.cp_j_kgk", Q: cpQuantity, Label: "Specific heat"}, func(in *analysis.Input) **float64 { return &flowAt(in).CpJkgK }},
	{numField{Key: "surface_emittance", Label: "Surface emittance"}, func(in *analysis.Input) **float64 { return &in.SurfaceEmittance }},
	{numField{Key: "criteria.max_surface_temp_c", Q: units.Temp, Label: "Touch limit"},
		func(in *analysis.Input) **float64 { return &criteriaAt(in).MaxSurfaceTempC }},
	{numField{Key: "criteria.dew_margin_k", Q: units.TempDiff, Label: "Dew-point margin"},
		func(in *analysis.Input) **float64 { return &criteriaAt(in).DewMarginK }},
	{numField{Key: "criteria.max_heat_flow_w_per_m", Q: units.HeatFlowPerLength, Label: "Maximum heat flow"},
		func(in *analysis.Input) **float64 { return &criteriaAt(in).MaxHeatFlowWPerM }},
	{numField{Key: "criteria.max_temp_change_k", Q: units.TempDiff, Label: "Maximum temperature change"},
		func(in *analysis.Input) **float64 { return &criteriaAt(in).MaxTempChangeK }},
	{numField{Key: "criteria.freeze_hours", Label: "Freeze protection time (h)"},
		func(in *analysis.Input) **float64 { return &criteriaAt(in).FreezeHours }},
	{numField{Key: "criteria.maintain_temp_c", Q: units.Temp, Label: "Heat tracing: maintain"},
		func(in *analysis.Input) **float64 { return &criteriaAt(in).MaintainTempC }},
	{numField{Key: "criteria.heat_trace_factor", Label: "Heat tracing safety factor"},
		func(in *analysis.Input) **float64 { return &criteriaAt(in).HeatTraceFactor }},
	{numField{Key: "fitting_cover.thickness_mm", Q: units.Length, Label: "Cover thickness"},
		func(in *analysis.Input) **float64 { return &coverAt(in).ThicknessMM }},
	{numField{Key: "supports.spacing_m", Q: units.LongLength, Label: "Support spacing"},
		func(in *analysis.Input) **float64 { return &supportsAt(in).SpacingM }},
	{numField{Key: "supports.w_per_k", Label: "Heat-transfer value per support (W/K)"},
		func(in *analysis.Input) **float64 { return &supportsAt(in).WPerK }},
}

func coverAt(in *analysis.Input) *analysis.FittingCover {
	if in.FittingCover == nil {
		in.FittingCover = &analysis.FittingCover{}
	}
	return in.FittingCover
}

func supportsAt(in *analysis.Input) *analysis.Supports {
	if in.Supports == nil {
		in.Supports = &analysis.Supports{}
	}
	return in.Supports
}

func finishAt(in *analysis.Input) *analysis.FittingFinish {
	if in.FittingFinish == nil {
		in.FittingFinish = &analysis.FittingFinish{}
	}
	return in.FittingFinish
}

// lineChoice is a text choice of the line form and where it lives in the input.
type lineChoice struct {
	key string
	at  func(in *analysis.Input) *string // allocates the parent struct when needed
}

// lineChoices are the choices of fittings and supports on the form: each kind's
// finish, the covers' jacket and the supports' kind.
var lineChoices = func() []lineChoice {
	out := []lineChoice{
		{"fitting_cover.jacket", func(in *analysis.Input) *string { return &coverAt(in).Jacket }},
		{"supports.kind", func(in *analysis.Input) *string { return &supportsAt(in).Kind }},
	}
	for _, k := range catalog.FittingKinds {
		out = append(out, lineChoice{"fitting_finish." + k, func(in *analysis.Input) *string { return finishAt(in).Field(k) }})
	}
	return out
}()

// onShape is the field as a line of the given geometry reads it: a flat surface's
// maximum heat flow is per square metre (heat flux), a pipe's or duct's per metre.
func (n lineNum) onShape(geometry string) numField {
	f := n.numField
	if f.Key == "criteria.max_heat_flow_w_per_m" && geometry == "flat" {
		f.Q, f.Label = units.HeatFlux, "Maximum heat flux"
	}
	return f
}

// shapeGeometry is the geometry of a shape choice of the form ("" when unknown).
func shapeGeometry(shape string) string {
	for _, s := range shapes {
		if s.value == shape {
			return s.geometry
		}
	}
	return ""
}

// lineNumFields are lineNums' fields (labels and units).
var lineNumFields = func() []numField {
	out := make([]numField, len(lineNums))
	for i, n := range lineNums {
		out[i] = n.numField
	}
	return out
}()

// fittingCount is a fitting count on the form and where it lives in the counts.
type fittingCount struct {
	numField
	at func(f *analysis.Fittings) *int
}

// fittingCounts are the fitting counts (stored beside the input).
var fittingCounts = []fittingCount{
	{numField{Key: "fittings.elbows", Int: true, Label: "Elbows"}, func(f *analysis.Fittings) *int { return &f.Elbows }},
	{numField{Key: "fittings.tees", Int: true, Label: "Tees"}, func(f *analysis.Fittings) *int { return &f.Tees }},
	{numField{Key: "fittings.valves", Int: true, Label: "Valves"}, func(f *analysis.Fittings) *int { return &f.Valves }},
	{numField{Key: "fittings.flange_pairs", Int: true, Label: "Flange pairs"}, func(f *analysis.Fittings) *int { return &f.FlangePairs }},
	{numField{Key: "fittings.caps", Int: true, Label: "Caps"}, func(f *analysis.Fittings) *int { return &f.Caps }},
	{numField{Key: "fittings.strainers", Int: true, Label: "Strainers"}, func(f *analysis.Fittings) *int { return &f.Strainers }},
	{numField{Key: "fittings.reducers", Int: true, Label: "Reducers"}, func(f *analysis.Fittings) *int { return &f.Reducers }},
}

// fittingFields are fittingCounts' fields (labels).
var fittingFields = func() []numField {
	out := make([]numField, len(fittingCounts))
	for i, n := range fittingCounts {
		out[i] = n.numField
	}
	return out
}()

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
		"pipe_schedule", "pipe_material", "fluid", "system", "jacket", "vapour_retarder"} {
		st.Values.Set(k, pf.Get(k))
	}
	lf.Tag, lf.Service, lf.Notes = pf.Get("tag"), pf.Get("service"), strings.ReplaceAll(pf.Get("notes"), "\r\n", "\n")
	lf.Location, lf.Exposure = pf.Get("location"), pf.Get("exposure")
	if v, err := parseVersion(pf.Get("version")); err == nil {
		lf.Version = &v
	}
	in := &lf.Input
	if keep != nil {
		*in = formHidden(*keep)
	}
	readShape(pf.Get("shape"), in, st)
	in.PipeSize, in.PipeSchedule = strings.TrimSpace(pf.Get("pipe_size")), strings.TrimSpace(pf.Get("pipe_schedule"))
	in.PipeMaterial, in.Fluid = strings.TrimSpace(pf.Get("pipe_material")), strings.TrimSpace(pf.Get("fluid"))
	in.Jacket, in.System = strings.TrimSpace(pf.Get("jacket")), strings.TrimSpace(pf.Get("system"))
	in.VapourRetarder = strings.TrimSpace(pf.Get("vapour_retarder"))
	for _, n := range lineNums {
		if v, ok := readNum(r, n.onShape(in.Geometry), sys, st); ok {
			x := v.(float64)
			*n.at(in) = &x
		}
	}
	st.Values.Set("criteria.freeze_model", pf.Get("criteria.freeze_model"))
	if v := strings.TrimSpace(pf.Get("criteria.freeze_model")); v != "" {
		criteriaAt(in).FreezeModel = v
	}
	for _, c := range lineChoices {
		st.Values.Set(c.key, pf.Get(c.key))
		if v := strings.TrimSpace(pf.Get(c.key)); v != "" {
			*c.at(in) = v
		}
	}
	dropInapplicable(in, st)
	in.Layers = readLayers(r, sys, st)
	readExisting(r, sys, st, in)
	for _, n := range fittingCounts {
		if v, ok := readNum(r, n.numField, sys, st); ok {
			*n.at(&lf.Fittings) = v.(int)
		}
	}
	st.place(lf.validateMeta(), lineFieldKey(st))
	return st, lf
}

// readNum reads one numeric field typed in the system's units (SI, or an int for a
// count); ok is false when it is blank or wrong (then the message is on st).
func readNum(r *http.Request, f numField, sys units.System, st *formState) (any, bool) {
	raw := r.PostForm.Get(f.Key)
	st.Values.Set(f.Key, raw)
	if strings.TrimSpace(raw) == "" {
		return nil, false
	}
	v, err := f.parse(sys, raw)
	if err != nil {
		st.addError(f.Key, err.Error())
		return nil, false
	}
	if exact, ok := f.exact(r.PostForm.Get(exactKey(f.Key)), sys, raw); ok {
		st.Values.Set(exactKey(f.Key), r.PostForm.Get(exactKey(f.Key)))
		return exact, true
	}
	return v, true
}

// readShape sets geometry, orientation and facing from the form's shape.
func readShape(shape string, in *analysis.Input, st *formState) {
	for _, s := range shapes {
		if s.value == shape {
			in.Geometry, in.Orientation, in.Facing = s.geometry, s.orientation, s.facing
			return
		}
	}
	st.addError("shape", "choose a geometry")
}

// dropInapplicable clears what does not apply to the chosen geometry (kept on the
// form, not computed) and completes what the form implies.
func dropInapplicable(in *analysis.Input, st *formState) {
	switch {
	case in.Geometry != "pipe":
		in.PipeSize, in.PipeSchedule, in.PipeODmm, in.PipeMaterial = "", "", nil, ""
	case in.PipeSize != "":
		in.PipeODmm = nil // a designation wins over a typed OD
	default:
		in.PipeSchedule = ""
	}
	if in.Criteria != nil && in.Geometry != "pipe" { // heat tracing and freeze basis: pipes only
		in.Criteria.MaintainTempC, in.Criteria.HeatTraceFactor, in.Criteria.FreezeModel = nil, nil, ""
	}
	if in.Geometry != "duct" {
		in.DuctWidthMM, in.DuctHeightMM = nil, nil
	}
	if in.Geometry != "pipe" {
		in.Supports = nil
	}
	if in.Geometry == "flat" {
		in.FittingFinish, in.FittingCover = nil, nil
	}
	if in.Geometry == "flat" {
		in.LengthM = nil
	} else {
		in.AreaM2 = nil
	}
	if in.Orientation != "vertical" {
		in.HeightM = nil
	}
	if in.SteamGaugePressureKPa != nil && in.Fluid == "" {
		in.Fluid = "steam"
	}
	if in.Flow != nil && in.Flow.MassFlowKgS == nil {
		if in.Flow.CpJkgK != nil {
			st.addError("flow.mass_flow_kg_s", "is required when a specific heat is given")
		}
		in.Flow = nil
	}
}

// readLayers reads the layer rows; rows with neither material nor thickness are
// ignored, and st remembers which row each layer came from.
func readLayers(r *http.Request, sys units.System, st *formState) []analysis.LayerInput {
	pf := r.PostForm
	layers := []analysis.LayerInput{}
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
		layer := analysis.LayerInput{Material: mat}
		if mat == "" {
			st.addError(mk, "choose a material")
		}
		if th == "" {
			st.addError(tk, "is required")
		} else if v, err := units.Parse(units.Length, sys, th); err != nil {
			st.addError(tk, err.Error())
		} else {
			t := formRoundSig(v)
			layer.ThicknessMM = &t
			if exact, ok := (numField{Q: units.Length}).exact(pf.Get(exactKey(tk)), sys, th); ok {
				t = exact.(float64)
				st.Values.Set(exactKey(tk), pf.Get(exactKey(tk)))
			}
		}
		if idx := len(layers); idx != i { // analysis numbers the layers it got; the form numbers its rows
			st.layerRow = append(st.layerRow, [2]int{idx, i})
		}
		layers = append(layers, layer)
	}
	return layers
}

// lineFieldKey maps an analysis field path to the form field showing it.
func lineFieldKey(st *formState) func(string) (string, bool) {
	known := map[string]bool{"tag": true, "service": true, "location": true, "exposure": true, "notes": true,
		"pipe_size": true, "pipe_schedule": true, "pipe_material": true, "fluid": true, "system": true, "jacket": true, "criteria.freeze_model": true, "vapour_retarder": true}
	for _, f := range lineNumFields {
		known[f.Key] = true
	}
	for _, f := range fittingFields {
		known[f.Key] = true
	}
	for _, c := range lineChoices {
		known[c.key] = true
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
		if k, ok := existingFieldKey(path); ok {
			return k, true
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
	st.Values.Set("system", in.System)
	st.Values.Set("jacket", in.Jacket)
	shown := in // the accessors allocate parents: read from a copy
	for _, n := range lineNums {
		if p := *n.at(&shown); p != nil {
			setShown(st, n.onShape(in.Geometry), sys, *p)
		}
	}
	for _, n := range fittingCounts {
		if c := *n.at(&fit); c != 0 {
			st.Values.Set(n.Key, strconv.Itoa(c))
		}
	}
	for _, c := range lineChoices {
		if v := *c.at(&shown); v != "" {
			st.Values.Set(c.key, v)
		}
	}
	existingFormValues(st, in.Existing, sys)
	for i, layer := range in.Layers {
		st.Values.Set(fmt.Sprintf("layers[%d].material", i), layer.Material)
		if layer.ThicknessMM != nil {
			tk := fmt.Sprintf("layers[%d].thickness_mm", i)
			writeNums(map[string]any{fmt.Sprintf("layers[%d]", i): map[string]any{"thickness_mm": *layer.ThicknessMM}},
				[]numField{{Key: tk, Q: units.Length}}, sys, st)
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
		od := units.FormatOD(sys, p.ODmm)
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

// formHidden is the stored input less what the line form shows, so that saving the
// form keeps what was set through the API or an import.
func formHidden(stored analysis.Input) analysis.Input {
	h := stored
	h.Geometry, h.Orientation, h.Facing = "", "", ""
	h.PipeSize, h.PipeSchedule, h.PipeODmm, h.PipeMaterial = "", "", nil, ""
	h.DuctWidthMM, h.DuctHeightMM, h.HeightM, h.AreaM2, h.LengthM = nil, nil, nil, nil, nil
	h.Fluid, h.System, h.OperatingTempC, h.SteamGaugePressureKPa, h.Flow = "", "", nil, nil, nil
	h.Layers, h.Jacket, h.SurfaceEmittance, h.VapourRetarder = nil, "", nil, ""
	h.FittingFinish, h.FittingCover, h.Supports = nil, nil, nil // all on the form
	if existingEditable(stored.Existing) {
		h.Existing = nil // the form shows it
	}
	if stored.Criteria != nil {
		cr := *stored.Criteria
		cr.MaxSurfaceTempC, cr.DewMarginK, cr.MaxHeatFlowWPerM, cr.MaxTempChangeK, cr.FreezeHours = nil, nil, nil, nil, nil
		cr.FreezeModel, cr.MaintainTempC, cr.HeatTraceFactor = "", nil, nil
		h.Criteria = &cr
		if cr == (analysis.Criteria{}) {
			h.Criteria = nil
		}
	}
	return h
}
