package handlers

import (
	"math"
	"net/http"
	"strconv"
	"strings"

	"lagwright/analysis"
	"lagwright/results"
	"lagwright/schedule"
	"lagwright/store"
	"lagwright/units"
)

// compareLine is one stored line with its own input, for the compare screen and its action.
type compareLine struct {
	Project store.Project
	Set     analysis.ProjectSettings
	Line    store.Line
	Own     analysis.Input
	Fit     analysis.Fittings
}

// loadCompareLine decodes the route's line (withLine).
func loadCompareLine(r *http.Request) (compareLine, error) {
	c := compareLine{Line: lineOf(r)}
	c.Project, c.Set = projectOf(r)
	var err error
	c.Own, c.Fit, err = results.Decode(c.Line)
	return c, err
}

// money writes an amount of money to whole units with thin-space thousands ("12 340");
// below 100 with two decimals.
func moneyText(v float64) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return ""
	}
	if math.Abs(v) < 100 {
		return strconv.FormatFloat(v, 'f', 2, 64)
	}
	s := schedule.GroupThousands(strconv.FormatFloat(math.Round(v), 'f', 0, 64))
	if rest, neg := strings.CutPrefix(s, "-"); neg {
		return "−" + rest
	}
	return s
}

func moneyPtrText(p *float64) string {
	if p == nil {
		return "—"
	}
	return moneyText(*p)
}

func yearsText(p *float64) string {
	if p == nil {
		return "none"
	}
	if *p >= 100 {
		return "> 100"
	}
	return strconv.FormatFloat(*p, 'f', 1, 64)
}

// groupThousands groups the thousands of a formatted number as the schedule does
// ("57633" → "57 633", with a narrow no-break space).
func groupThousands(s string) string { return schedule.GroupThousands(s) }

// numberText writes a plain quantity with about 3 significant digits and thousands spaces.
func numberText(v float64) string {
	if math.Abs(v) >= 1000 {
		return moneyText(v)
	}
	return units.Format(units.Energy, units.SI, v) // 3 significant digits, no unit conversion
}
