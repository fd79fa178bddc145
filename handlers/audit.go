package handlers

import (
	"bytes"
	"cmp"
	"fmt"
	"io"
	"net/http"
	"slices"
	"strings"
	"time"

	"github.com/a-h/templ"

	"lagwright/analysis"
	"lagwright/schedule"
	"lagwright/units"
	"lagwright/web"
)

// auditLine is one surveyed line of the audit: as found against the proposed build
// (the line's own layers), from its stored answer.
type auditLine struct {
	tag, service, basis, proposed string
	lengthM                       *float64
	foundW, proposedW             *float64 // the run's heat, W
	foundWPerM                    *float64
	saved                         analysis.Savings // a year, as found − proposed
	installed, payback            *float64
}

// auditTotal sums the surveyed lines of one energy basis.
type auditTotal struct {
	lines                 int
	foundKWh, proposedKWh float64
	saved                 analysis.Savings
	installed             float64
	unpriced              int
	savedPriced           float64 // money saved by the lines with an installed cost
}

// projectAudit builds the audit of a project from its lines' stored answers: only the
// lines with an as-found survey (existing) and a price on their basis are in it.
func (s *Server) projectAudit(r *http.Request) (schedule.Audit, error) {
	p, set := projectOf(r)
	lines, err := s.projectLines(r)
	if err != nil {
		return schedule.Audit{}, err
	}
	sys := projectSystem(p)
	cur := set.Economics.CurrencyCode()
	a := schedule.Audit{Project: p.Name, Currency: cur, Date: time.Now().UTC(), Cautions: []string{analysis.Caution,
		"Savings are estimates for planning; survey conditions (moisture, damage, missing sections) change with time: check them on site before committing money."}}
	var rows []auditLine
	totals := map[string]*auditTotal{analysis.BasisHeating: {}, analysis.BasisCooling: {}}
	var noSurvey, noPrice, failed int
	for _, lv := range lines {
		out := lv.Result.Output
		switch {
		case out == nil:
			failed++
			continue
		case out.AsFound == nil:
			noSurvey++
			continue
		case out.EnergyBasis == nil || out.EconomicsAsSpecified == nil:
			noPrice++
			continue
		}
		i := slices.IndexFunc(out.Economics, func(e analysis.EconomicsRow) bool { return e.AsFound })
		if i < 0 {
			noPrice++
			continue
		}
		found, spec := out.Economics[i], *out.EconomicsAsSpecified
		al := auditLine{tag: cmp.Or(lv.Line.Tag, fmt.Sprintf("line %d", lv.Line.ID)), service: lv.Line.Service, basis: out.EnergyBasis.Basis,
			proposed: units.FormatUnit(units.Length, sys, out.InsulationMM), foundW: out.AsFound.HeatFlowW, proposedW: out.HeatFlowW,
			foundWPerM: out.AsFound.HeatFlowWPerM, lengthM: out.EquivalentLengthM, installed: spec.InstalledCost,
			saved: analysis.Savings{KWh: found.AnnualKWh - spec.AnnualKWh, Cost: found.AnnualCost - spec.AnnualCost, CO2Kg: found.CO2Kg - spec.CO2Kg}}
		if al.installed != nil && al.saved.Cost > 0 {
			y := *al.installed / al.saved.Cost
			al.payback = &y
		}
		t := totals[al.basis]
		t.lines++
		t.foundKWh += found.AnnualKWh
		t.proposedKWh += spec.AnnualKWh
		t.saved.KWh += al.saved.KWh
		t.saved.Cost += al.saved.Cost
		t.saved.CO2Kg += al.saved.CO2Kg
		if al.installed != nil {
			t.installed += *al.installed
			t.savedPriced += al.saved.Cost
		} else {
			t.unpriced++
		}
		rows = append(rows, al)
	}
	// Best first: the shortest payback, then lines without one by the money saved.
	slices.SortStableFunc(rows, func(x, y auditLine) int {
		switch {
		case x.payback != nil && y.payback != nil:
			return cmp.Compare(*x.payback, *y.payback)
		case x.payback != nil:
			return -1
		case y.payback != nil:
			return 1
		}
		return cmp.Compare(y.saved.Cost, x.saved.Cost)
	})
	a.Rows = auditRowsTable(rows, sys, cur)
	a.Totals = auditTotalsTable(totals, cur)
	if noSurvey > 0 {
		a.Notes = append(a.Notes, fmt.Sprintf("%d line(s) have no as-found survey (existing) and are not in the audit: add it on the line page or in the line list import.", noSurvey))
	}
	if noPrice > 0 {
		a.Notes = append(a.Notes, fmt.Sprintf("%d surveyed line(s) have no energy price for their basis (heating for hot lines, cooling for cold ones) and are left out.", noPrice))
	}
	if failed > 0 {
		a.Notes = append(a.Notes, fmt.Sprintf("%d line(s) have input errors and are left out.", failed))
	}
	a.Assumptions = []string{
		"As found: the existing build with its condition factor on k, the missing fraction of the run at the bare line's heat flow, and the fittings found bare at their bare surface's heat (ASTM C1129 approach). Proposed: the line's own build.",
		"Hot lines are priced on the heating basis (fuel or heat bought: heat lost × hours ÷ plant efficiency × heating price); cold lines on the cooling basis (electricity: heat gained × hours ÷ COP × cooling price). The two bases are totalled apart.",
		"Annual savings = as found − proposed, at each line's economics conditions, over its length with the insulated fittings' equivalent length; money in " + cur + " (ISO 4217).",
		"Installed cost: the project's cost table at the proposed outer thickness; simple payback = installed cost ÷ money saved in the first year. No installed cost: no payback (—).",
		"Heat flows per run are at the design conditions and include the fittings as found and as proposed.",
	}
	return a, nil
}

func auditRowsTable(rows []auditLine, sys units.System, cur string) schedule.Table {
	num := func(v float64) schedule.Cell { return schedule.Cell{Num: v, IsNum: true} }
	opt := func(p *float64, conv func(float64) float64) schedule.Cell {
		if p == nil {
			return schedule.Cell{IsNum: true, Blank: true}
		}
		return num(conv(*p))
	}
	id := func(v float64) float64 { return v }
	q := func(qq units.Quantity) func(float64) float64 {
		return func(v float64) float64 { return units.FromSI(qq, sys, v) }
	}
	t := schedule.Table{Columns: []schedule.Column{
		{Key: "tag", Title: "Tag", Width: 10},
		{Key: "service", Title: "Service", Width: 24},
		{Key: "basis", Title: "Basis", Width: 8},
		{Key: "length", Title: "Length with fittings", Unit: units.Label(units.LongLength, sys), Numeric: true, Decimals: 1, Width: 9},
		{Key: "found_q", Title: "As found", Unit: units.Label(units.HeatFlowPerLength, sys), Numeric: true, Decimals: 1, Width: 9},
		{Key: "found_w", Title: "As found, run", Unit: units.Label(units.HeatFlow, sys), Numeric: true, Decimals: 0, Width: 10},
		{Key: "proposed", Title: "Proposed insulation", Width: 10},
		{Key: "proposed_w", Title: "Proposed, run", Unit: units.Label(units.HeatFlow, sys), Numeric: true, Decimals: 0, Width: 10},
		{Key: "saved_kwh", Title: "Energy saved a year", Unit: "kWh bought", Numeric: true, Decimals: 0, Width: 11},
		{Key: "saved_cost", Title: "Saved a year", Unit: cur, Numeric: true, Decimals: 2, Width: 11},
		{Key: "saved_co2", Title: "CO2 saved a year", Unit: "kg", Numeric: true, Decimals: 0, Width: 10},
		{Key: "installed", Title: "Installed cost", Unit: cur, Numeric: true, Decimals: 2, Width: 11},
		{Key: "payback", Title: "Simple payback", Unit: "years", Numeric: true, Decimals: 1, Width: 9},
	}}
	for _, r := range rows {
		t.Rows = append(t.Rows, []schedule.Cell{{Text: r.tag}, {Text: r.service}, {Text: r.basis},
			opt(r.lengthM, q(units.LongLength)), opt(r.foundWPerM, q(units.HeatFlowPerLength)), opt(r.foundW, q(units.HeatFlow)),
			{Text: r.proposed}, opt(r.proposedW, q(units.HeatFlow)),
			num(r.saved.KWh), num(r.saved.Cost), num(r.saved.CO2Kg), opt(r.installed, id), opt(r.payback, id)})
	}
	return t
}

func auditTotalsTable(totals map[string]*auditTotal, cur string) schedule.Table {
	num := func(v float64) schedule.Cell { return schedule.Cell{Num: v, IsNum: true} }
	t := schedule.Table{Columns: []schedule.Column{
		{Key: "basis", Title: "Energy basis", Width: 30},
		{Key: "lines", Title: "Lines", Numeric: true, Width: 6},
		{Key: "found_kwh", Title: "Bought a year as found", Unit: "kWh", Numeric: true, Width: 12},
		{Key: "proposed_kwh", Title: "Bought a year as proposed", Unit: "kWh", Numeric: true, Width: 12},
		{Key: "saved_kwh", Title: "Energy saved a year", Unit: "kWh", Numeric: true, Width: 12},
		{Key: "saved_cost", Title: "Saved a year", Unit: cur, Numeric: true, Decimals: 2, Width: 12},
		{Key: "saved_co2", Title: "CO2 saved a year", Unit: "kg", Numeric: true, Width: 11},
		{Key: "installed", Title: "Installed cost", Unit: cur, Numeric: true, Decimals: 2, Width: 12},
		{Key: "payback", Title: "Simple payback of the priced lines", Unit: "years", Numeric: true, Decimals: 1, Width: 12},
	}}
	for _, b := range []struct{ key, name string }{{analysis.BasisHeating, "Heating (fuel or heat bought)"}, {analysis.BasisCooling, "Cooling (electricity bought)"}} {
		tt := totals[b.key]
		if tt.lines == 0 {
			continue
		}
		payback := schedule.Cell{IsNum: true, Blank: true}
		if tt.unpriced < tt.lines && tt.savedPriced > 0 {
			payback = num(tt.installed / tt.savedPriced)
		}
		installed := schedule.Cell{IsNum: true, Blank: true}
		if tt.unpriced < tt.lines {
			installed = num(tt.installed)
		}
		name := b.name
		if tt.unpriced > 0 {
			name += fmt.Sprintf(" (%d line(s) without an installed cost)", tt.unpriced)
		}
		t.Rows = append(t.Rows, []schedule.Cell{{Text: name}, num(float64(tt.lines)), num(tt.foundKWh), num(tt.proposedKWh),
			num(tt.saved.KWh), num(tt.saved.Cost), num(tt.saved.CO2Kg), installed, payback})
	}
	return t
}

// auditPage shows GET /projects/{id}/audit.
func (s *Server) auditPage(w http.ResponseWriter, r *http.Request) {
	p, _ := projectOf(r)
	a, err := s.projectAudit(r)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	base := projectURL(p.ID) + "/audit"
	v := web.AuditView{Assets: s.assets.urls, Title: "Audit: " + p.Name, ProjectURL: projectURL(p.ID), EconomicsURL: economicsURL(p.ID),
		PDFURL: base + ".pdf", XLSXURL: base + ".xlsx", Currency: a.Currency, Rows: webTable(a.Rows), Totals: webTable(a.Totals),
		Notes: a.Notes, Assumptions: a.Assumptions, Cautions: a.Cautions}
	w.Header().Set("Cache-Control", "no-store")
	templ.Handler(web.Audit(v)).ServeHTTP(w, r)
}

// auditExport answers GET /projects/{id}/audit.pdf and .xlsx.
func (s *Server) auditExport(ext, contentType string, write func(io.Writer, schedule.Audit) error) http.HandlerFunc {
	return func(w http.ResponseWriter, r *http.Request) {
		p, _ := projectOf(r)
		a, err := s.projectAudit(r)
		if err != nil {
			s.fail(w, r, err)
			return
		}
		var buf bytes.Buffer
		if err := write(&buf, a); err != nil {
			s.fail(w, r, err)
			return
		}
		setDownload(w, contentType, "audit-"+safeSlug(p.Name)+"."+strings.ToLower(ext))
		_, _ = buf.WriteTo(w)
	}
}
