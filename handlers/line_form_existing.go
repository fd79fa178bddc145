package handlers

import (
	"net/http"
	"slices"
	"strconv"
	"strings"

	"lagwright/analysis"
	"lagwright/units"
	"lagwright/web"
)

// The line form's "As found" part edits an audit survey of one existing layer. A survey
// with more layers (set through the API or an import) is kept as stored, untouched by
// the form (formHidden keeps it), and the form says so.

// existingBareKinds are the fitting kinds the form can mark as found bare.
var existingBareKinds = []string{"valves", "flange_pairs"}

// existingConditions are the survey choices of the form.
var existingConditions = []web.Choice{
	{Value: "", Label: "not surveyed"},
	{Value: "bare", Label: "found bare (no insulation)"},
	{Value: "good", Label: "good: dry and whole (k × 1)"},
	{Value: "wet", Label: "wet (k × 2, planning figure)"},
	{Value: "damaged", Label: "damaged: crushed, open joints (k × 1.5, planning figure)"},
}

// existingEditable reports whether the form edits a stored survey (none, or one layer).
func existingEditable(e *analysis.Existing) bool { return e == nil || len(e.Layers) <= 1 }

// readExisting reads the "As found" fields into in.Existing (nil: not surveyed).
func readExisting(r *http.Request, sys units.System, st *formState, in *analysis.Input) {
	if !existingEditable(in.Existing) {
		return // kept as stored
	}
	pf := r.PostForm
	keys := []string{"existing.condition", "existing.material", "existing.thickness_mm", "existing.k_factor", "existing.missing_pct"}
	for _, k := range keys {
		st.Values.Set(k, pf.Get(k))
	}
	for _, k := range existingBareKinds {
		st.Values.Set("existing.bare."+k, pf.Get("existing.bare."+k))
	}
	cond := strings.TrimSpace(pf.Get("existing.condition"))
	mat := strings.TrimSpace(pf.Get("existing.material"))
	th := strings.TrimSpace(pf.Get("existing.thickness_mm"))
	in.Existing = nil
	if cond == "" && mat == "" && th == "" {
		return
	}
	e := &analysis.Existing{Layers: []analysis.LayerInput{}}
	switch {
	case cond == "bare":
		if mat != "" || th != "" {
			st.addError("existing.material", "the line was found bare: leave the existing material and thickness blank")
		}
	case cond == "":
		st.addError("existing.condition", "choose the condition found")
	default:
		e.Condition = cond
		layer := analysis.LayerInput{Material: mat}
		if mat == "" {
			st.addError("existing.material", "choose the material found (or choose “found bare”)")
		}
		if th == "" {
			st.addError("existing.thickness_mm", "is required: the thickness as found")
		} else if v, err := units.Parse(units.Length, sys, th); err != nil {
			st.addError("existing.thickness_mm", err.Error())
		} else {
			t := formRoundSig(v)
			layer.ThicknessMM = &t
		}
		e.Layers = append(e.Layers, layer)
	}
	if v := strings.TrimSpace(pf.Get("existing.k_factor")); v != "" {
		if f, err := strconv.ParseFloat(v, 64); err != nil {
			st.addError("existing.k_factor", "must be a number (a factor on k, 1 – 20)")
		} else {
			e.KFactor = &f
		}
	}
	if v := strings.TrimSpace(pf.Get("existing.missing_pct")); v != "" {
		if f, err := strconv.ParseFloat(strings.TrimSuffix(v, "%"), 64); err != nil {
			st.addError("existing.missing_pct", "must be a percentage of the run, 0 – 100")
		} else {
			f /= 100
			e.MissingFraction = &f
		}
	}
	for _, k := range existingBareKinds {
		if pf.Get("existing.bare."+k) != "" {
			e.BareFittings = append(e.BareFittings, k)
		}
	}
	in.Existing = e
}

// existingFormValues writes a stored survey into the form.
func existingFormValues(st *formState, e *analysis.Existing, sys units.System) {
	if e == nil || !existingEditable(e) {
		return
	}
	switch {
	case len(e.Layers) == 0:
		st.Values.Set("existing.condition", "bare")
	default:
		st.Values.Set("existing.condition", e.Condition)
		if e.Condition == "" {
			st.Values.Set("existing.condition", "good")
		}
		st.Values.Set("existing.material", e.Layers[0].Material)
		if t := e.Layers[0].ThicknessMM; t != nil {
			st.Values.Set("existing.thickness_mm", numField{Q: units.Length}.format(sys, *t))
		}
	}
	if e.KFactor != nil {
		st.Values.Set("existing.k_factor", strconv.FormatFloat(*e.KFactor, 'f', -1, 64))
	}
	if e.MissingFraction != nil {
		st.Values.Set("existing.missing_pct", strconv.FormatFloat(*e.MissingFraction*100, 'f', -1, 64))
	}
	for _, k := range existingBareKinds {
		if slices.Contains(e.BareFittings, k) {
			st.Values.Set("existing.bare."+k, "1")
		}
	}
}

// existingFieldKey maps an analysis path of the survey to the form field showing it.
func existingFieldKey(path string) (string, bool) {
	switch {
	case path == "existing.condition", path == "existing.k_factor":
		return path, true
	case path == "existing.missing_fraction":
		return "existing.missing_pct", true
	case strings.HasPrefix(path, "existing.layers[0].thickness_mm"):
		return "existing.thickness_mm", true
	case strings.HasPrefix(path, "existing."):
		return "existing.material", true
	}
	return "", false
}
