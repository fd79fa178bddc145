package handlers

import (
	"slices"

	"lagwright/analysis"
	"lagwright/web"
)

// Status flags of a line, read from the checks of its stored analysis (each active
// criterion judged on the build as specified). A line may carry several; with none it
// passes every check it is judged by.
const (
	StatusOK         = "ok"         // passes every check
	StatusTooHot     = "too_hot"    // fails the personnel-protection check
	StatusCondenses  = "condenses"  // fails the condensation check
	StatusBelowCode  = "below_code" // fails the energy-code check
	StatusFails      = "fails"      // fails another check (heat flow, temperature change, freeze, jacket or service limit)
	StatusUnmet      = "unmet"      // no available build meets a criterion
	StatusInputIssue = "input"      // the line's input has a problem: nothing computed
)

var statusLabels = map[string]string{
	StatusOK:         "Meets all criteria",
	StatusTooHot:     "Too hot to touch",
	StatusCondenses:  "Condensation risk",
	StatusBelowCode:  "Below code minimum",
	StatusFails:      "Fails a check",
	StatusUnmet:      "No available thickness meets a criterion",
	StatusInputIssue: "Input problem",
}

var statusClass = map[string]string{
	StatusOK: "ok", StatusTooHot: "bad", StatusCondenses: "bad", StatusBelowCode: "warn",
	StatusFails: "warn", StatusUnmet: "warn", StatusInputIssue: "bad",
}

// statusRank orders lines by their worst flag (sorting by status).
var statusRank = map[string]int{StatusInputIssue: 0, StatusTooHot: 1, StatusCondenses: 2, StatusBelowCode: 3,
	StatusUnmet: 4, StatusFails: 5, StatusOK: 6}

// lineStatus judges a line from the checks of its stored answer (analysis.Output.Checks),
// never from sizing: a build that passes its checks is not flagged for being thinner than
// some series value.
//   - too hot to touch: the personnel-protection check fails;
//   - condensation risk: the condensation check fails;
//   - below code minimum: the energy-code check fails;
//   - fails a check: any other check fails;
//   - no available thickness: sizing names an unmet criterion;
//   - input problem: the analysis stopped on field errors.
func lineStatus(_ analysis.Input, st analysis.Stored) []string {
	if len(st.Errors) > 0 || st.Output == nil {
		return []string{StatusInputIssue}
	}
	var out []string
	add := func(s string) {
		if !slices.Contains(out, s) {
			out = append(out, s)
		}
	}
	for _, c := range st.Output.Checks {
		if c.Pass {
			continue
		}
		switch c.Criterion {
		case "personnel_protection":
			add(StatusTooHot)
		case "condensation":
			add(StatusCondenses)
		case "energy_code":
			add(StatusBelowCode)
		default:
			add(StatusFails)
		}
	}
	if len(st.Output.Sizing.Unmet) > 0 {
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
