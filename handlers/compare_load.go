package handlers

import (
	"fmt"
	"math"
	"net/http"
	"strconv"
	"strings"

	"github.com/go-chi/chi/v5"

	"lagwright/analysis"
	"lagwright/results"
	"lagwright/schedule"
	"lagwright/store"
	"lagwright/units"
)

// cmpPathID reads a numeric id from the route; anything else is "not found".
func cmpPathID(r *http.Request, name, what string) (int64, error) {
	id, err := strconv.ParseInt(chi.URLParam(r, name), 10, 64)
	if err != nil || id <= 0 {
		return 0, NotFound(what)
	}
	return id, nil
}

// cmpProject loads the project of the route.
func (s *Server) cmpProject(r *http.Request) (store.Project, analysis.ProjectSettings, error) {
	id, err := cmpPathID(r, "id", "project")
	if err != nil {
		return store.Project{}, analysis.ProjectSettings{}, err
	}
	p, err := s.store.Project(r.Context(), id)
	if err != nil {
		return p, analysis.ProjectSettings{}, err
	}
	set, err := results.Settings(p)
	return p, set, err
}

// cmpLine is one stored line with its own input, for the compare screen and its action.
type cmpLine struct {
	Project store.Project
	Set     analysis.ProjectSettings
	Line    store.Line
	Own     analysis.Input
	Fit     analysis.Fittings
}

func (s *Server) cmpLoadLine(r *http.Request) (cmpLine, error) {
	var c cmpLine
	var err error
	if c.Project, c.Set, err = s.cmpProject(r); err != nil {
		return c, err
	}
	lid, err := cmpPathID(r, "line", "line")
	if err != nil {
		return c, err
	}
	if c.Line, err = s.store.Line(r.Context(), c.Project.ID, lid); err != nil {
		return c, err
	}
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
