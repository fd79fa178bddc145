package handlers

import (
	"fmt"
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

// cmpLine is one stored line with its own input, for the compare screen and its action.
type cmpLine struct {
	Project store.Project
	Set     analysis.ProjectSettings
	Line    store.Line
	Own     analysis.Input
	Fit     analysis.Fittings
}

// cmpLoadLine decodes the route's line (withLine).
func cmpLoadLine(r *http.Request) (cmpLine, error) {
	c := cmpLine{Line: lineOf(r)}
	c.Project, c.Set = projectOf(r)
	var err error
	c.Own, c.Fit, err = results.Decode(c.Line)
	return c, err
}

func cmpProjectURL(id int64) string       { return fmt.Sprintf("/projects/%d", id) }
func cmpLineURL(pid, lid int64) string    { return fmt.Sprintf("/projects/%d/lines/%d", pid, lid) }
func cmpCompareURL(pid, lid int64) string { return cmpLineURL(pid, lid) + "/compare" }
func cmpCostsURL(pid int64) string        { return cmpProjectURL(pid) + "/costs" }
func cmpEconomicsURL(pid int64) string    { return cmpProjectURL(pid) + "/economics" }

func cmpSystem(p store.Project) units.System {
	if units.System(p.Units) == units.US {
		return units.US
	}
	return units.SI
}

// money writes an amount of money to whole units with thin-space thousands ("12 340");
// below 100 with two decimals.
func cmpMoney(v float64) string {
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

func cmpMoneyPtr(p *float64) string {
	if p == nil {
		return "—"
	}
	return cmpMoney(*p)
}

func cmpYears(p *float64) string {
	if p == nil {
		return "none"
	}
	if *p >= 100 {
		return "> 100"
	}
	return strconv.FormatFloat(*p, 'f', 1, 64)
}

// cmpGroup groups the thousands of a formatted number as the schedule does
// ("57633" → "57 633", with a narrow no-break space).
func cmpGroup(s string) string { return schedule.GroupThousands(s) }

// cmpNumber writes a plain quantity with about 3 significant digits and thousands spaces.
func cmpNumber(v float64) string {
	if math.Abs(v) >= 1000 {
		return cmpMoney(v)
	}
	return units.Format(units.Energy, units.SI, v) // 3 significant digits, no unit conversion
}
