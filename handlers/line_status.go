package handlers

import (
	"math"

	"lagwright/analysis"
	"lagwright/web"
)

// Status flags of a line, derived from its stored analysis. A line may carry several;
// with none it meets every criterion it is judged by.
const (
	StatusOK         = "ok"         // meets all criteria
	StatusTooHot     = "too_hot"    // too hot to touch
	StatusCondenses  = "condenses"  // condensation risk
	StatusBelowCode  = "below_code" // below the energy-code minimum
	StatusThin       = "thin"       // thinner than another criterion needs
	StatusUnmet      = "unmet"      // no available thickness meets a criterion
	StatusInputIssue = "input"      // the line's input has a problem: nothing computed
)

var statusLabels = map[string]string{
	StatusOK:         "Meets all criteria",
	StatusTooHot:     "Too hot to touch",
	StatusCondenses:  "Condensation risk",
	StatusBelowCode:  "Below code minimum",
	StatusThin:       "Thinner than sized",
	StatusUnmet:      "No available thickness meets a criterion",
	StatusInputIssue: "Input problem",
}

var statusClass = map[string]string{
	StatusOK: "ok", StatusTooHot: "bad", StatusCondenses: "bad", StatusBelowCode: "warn",
	StatusThin: "warn", StatusUnmet: "warn", StatusInputIssue: "bad",
}

// statusRank orders lines by their worst flag (sorting by status).
var statusRank = map[string]int{StatusInputIssue: 0, StatusTooHot: 1, StatusCondenses: 2, StatusBelowCode: 3,
	StatusUnmet: 4, StatusThin: 5, StatusOK: 6}

// lineStatus judges a line from its stored answer and its effective input:
//   - too hot to touch: the hottest surface (any duct face) above the touch limit at the
//     design conditions, or personnel protection governing a thickness above the one
//     specified (it is judged at its own, hotter conditions);
//   - condensation risk: the condensation margin below the dew margin, or condensation
//     control needing more than is specified;
//   - below code minimum: an energy-code row that is required and fails;
//   - thinner than sized: another criterion needs more than the specified outer layer;
//   - no available thickness: sizing names an unmet criterion;
//   - input problem: the analysis stopped on field errors.
func lineStatus(eff analysis.Input, st analysis.Stored) []string {
	if len(st.Errors) > 0 || st.Output == nil {
		return []string{StatusInputIssue}
	}
	o := st.Output
	limit, margin := 60.0, 1.0
	if c := eff.Criteria; c != nil {
		if c.MaxSurfaceTempC != nil {
			limit = *c.MaxSurfaceTempC
		}
		if c.DewMarginK != nil {
			margin = *c.DewMarginK
		}
	}
	personnelOn := eff.Criteria == nil || eff.Criteria.PersonnelProtection == nil || *eff.Criteria.PersonnelProtection
	specified := 0.0
	if n := len(eff.Layers); n > 0 && eff.Layers[n-1].ThicknessMM != nil {
		specified = *eff.Layers[n-1].ThicknessMM
	}
	needs := func(p *float64) bool { return p != nil && *p > specified+1e-6 }
	var out []string
	add := func(s string) {
		for _, x := range out {
			if x == s {
				return
			}
		}
		out = append(out, s)
	}
	hottest := o.SurfaceTempC
	for _, f := range o.Faces {
		hottest = math.Max(hottest, f.SurfaceTempC)
	}
	sz := o.Sizing
	if personnelOn && (hottest > limit || needs(sz.PersonnelProtectionMM)) {
		add(StatusTooHot)
	}
	if (o.CondensationMarginK != nil && *o.CondensationMarginK < margin) || needs(sz.CondensationMM) {
		add(StatusCondenses)
	}
	if ec := o.EnergyCode; ec != nil && ec.Required && !ec.Pass {
		add(StatusBelowCode)
	}
	if needs(sz.MaxHeatFlowMM) || needs(sz.MaxTempChangeMM) || needs(sz.FreezeMM) ||
		(sz.Governing != nil && *sz.Governing == "economic" && needs(sz.EconomicMM)) {
		add(StatusThin)
	}
	if len(sz.Unmet) > 0 {
		add(StatusUnmet)
	}
	if len(out) == 0 {
		out = append(out, StatusOK)
	}
	return out
}

// statusFlags turns status keys into badges.
func statusFlags(keys []string) []web.StatusFlag {
	out := make([]web.StatusFlag, len(keys))
	for i, k := range keys {
		out[i] = web.StatusFlag{Key: k, Label: statusLabels[k], Class: statusClass[k]}
	}
	return out
}

func worstRank(keys []string) int {
	r := 99
	for _, k := range keys {
		r = min(r, statusRank[k])
	}
	return r
}
