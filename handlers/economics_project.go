package handlers

import (
	"cmp"
	"fmt"
	"net/http"
	"slices"

	"github.com/a-h/templ"

	"lagwright/analysis"
	"lagwright/units"
	"lagwright/web"
)

// econTotal sums one case over the lines.
type econTotal struct {
	kwh, cost, co2, invest float64
	unpriced               int // lines whose investment is unknown
}

func (t *econTotal) add(y analysis.EnergyYear) {
	t.kwh += y.AnnualKWh
	t.cost += y.AnnualCost
	t.co2 += y.CO2Kg
	if y.InstalledCost != nil {
		t.invest += *y.InstalledCost
	} else {
		t.unpriced++
	}
}

// economicsProject shows GET /projects/{id}/economics: totals as specified, bare and
// at each line's economic thickness, the lines one by one, and the annual energy by
// service. Stored answers give the economic thicknesses; the as-specified and bare
// energies take two heat balances per line at its economics conditions.
func (s *Server) economicsProject(w http.ResponseWriter, r *http.Request) {
	p, _ := projectOf(r)
	lines, err := s.projectLines(r)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	lib, err := s.library(r.Context())
	if err != nil {
		s.fail(w, r, err)
		return
	}
	sys := cmpSystem(p)
	v := web.EconomicsView{Assets: s.assets.urls, Title: "Economics: " + p.Name, ProjectURL: cmpProjectURL(p.ID),
		CostsURL: cmpCostsURL(p.ID), EnergyHead: "Energy, kWh/year"}
	if sys == units.US {
		v.Energy2Head = "Energy, MMBtu/year"
	}
	var spec, bare, eco econTotal
	byService := map[string]float64{}
	var noPrice, failed, noEconomic, example int
	for _, lv := range lines {
		row := web.EconLineRow{Tag: cmp.Or(lv.Line.Tag, fmt.Sprintf("line %d", lv.Line.ID)), Service: lv.Line.Service,
			URL: cmpLineURL(p.ID, lv.Line.ID), CompareURL: cmpCompareURL(p.ID, lv.Line.ID)}
		out := lv.Result.Output
		if out == nil {
			failed++
			row.Note = "the line has input errors"
			v.Lines = append(v.Lines, row)
			continue
		}
		le, err := analysis.AnnualEnergy(lv.Effective, lib)
		if err != nil || le == nil {
			if err != nil {
				failed++
				row.Note = "not computed"
			} else {
				noPrice++
				row.Note = "no energy price"
			}
			v.Lines = append(v.Lines, row)
			continue
		}
		if slices.Contains(out.Assumptions, analysis.ExampleCostsAssumption) {
			example++
		}
		ecoYear := le.Specified
		row.Specified = units.Format(units.Length, sys, le.Specified.ThicknessMM)
		switch e := out.Sizing.EconomicMM; {
		case e == nil:
			noEconomic++
			row.Economic, row.Note = "—", "no installed costs: counted as specified"
		case *e == 0:
			ecoYear = le.Bare
			row.Economic = "bare"
		default:
			row.Economic = units.Format(units.Length, sys, *e)
			for _, er := range out.Economics {
				if er.ThicknessMM == *e {
					ecoYear = analysis.EnergyYear{ThicknessMM: *e, AnnualKWh: er.AnnualKWh, AnnualCost: er.AnnualCost, CO2Kg: er.CO2Kg, InstalledCost: er.InstalledCost}
				}
			}
		}
		spec.add(le.Specified)
		bare.add(le.Bare)
		eco.add(ecoYear)
		byService[cmp.Or(lv.Line.Service, "(no service)")] += le.Specified.AnnualKWh
		row.EnergySpec, row.EnergyEco = cmpNumber(le.Specified.AnnualKWh), cmpNumber(ecoYear.AnnualKWh)
		row.CostSpec, row.CostEco = cmpMoney(le.Specified.AnnualCost), cmpMoney(ecoYear.AnnualCost)
		v.Lines = append(v.Lines, row)
	}
	scen := func(key, name string, t econTotal, invest bool) web.EconScenario {
		sc := web.EconScenario{Key: key, Name: name, Energy: cmpNumber(t.kwh), Energy2: units.Format(units.Energy, units.US, t.kwh),
			Cost: cmpMoney(t.cost), CO2: cmpNumber(t.co2), Investment: "—", Payback: "—"}
		if invest {
			sc.Investment = cmpMoney(t.invest)
			if saving := bare.cost - t.cost; saving > 0 {
				y := t.invest / saving
				sc.Payback = cmpYears(&y)
			} else {
				sc.Payback = "none"
			}
			if t.unpriced > 0 {
				sc.Note = fmt.Sprintf("%d line(s) without an installed cost are not in the investment", t.unpriced)
			}
		}
		return sc
	}
	v.Scenarios = []web.EconScenario{
		scen("specified", "As specified", spec, true),
		scen("bare", "Bare (no insulation)", bare, false),
		scen("economic", "Each line at its economic thickness", eco, true),
	}
	switch {
	case len(lines) == 0:
		v.Notices = append(v.Notices, "This project has no lines yet.")
	case noPrice == len(lines):
		v.Notices = append(v.Notices, "The project has no energy price: set one in the project's settings.")
	}
	if noPrice > 0 && noPrice < len(lines) {
		v.Notices = append(v.Notices, fmt.Sprintf("%d line(s) have no energy price and are left out.", noPrice))
	}
	if failed > 0 {
		v.Notices = append(v.Notices, fmt.Sprintf("%d line(s) have input errors and are left out.", failed))
	}
	if noEconomic > 0 {
		v.Notices = append(v.Notices, fmt.Sprintf("%d line(s) have no installed costs, so no economic thickness: they count as specified in the economic case. Add costs in Installed costs.", noEconomic))
	}
	if example > 0 {
		v.Notices = append(v.Notices, "Installed costs are the labelled example, not prices: replace them.")
	}
	if len(byService) > 0 {
		q, label := units.Energy, "kWh/year"
		if sys == units.US {
			label = "MMBtu/year"
		}
		chart := web.BarChartView{ID: "chart-energy-by-service", Title: "Annual energy by service, as specified", XLabel: "energy bought, " + label}
		for svc, kwh := range byService {
			val := units.FromSI(q, sys, kwh)
			chart.Bars = append(chart.Bars, web.Bar{Label: svc, Value: val, ValueText: units.Format(q, sys, kwh) + " " + label})
		}
		slices.SortFunc(chart.Bars, func(a, b web.Bar) int { return cmp.Or(cmp.Compare(b.Value, a.Value), cmp.Compare(a.Label, b.Label)) })
		v.Chart = &chart
	}
	v.Assumptions = []string{
		"Energy bought = heat flow × (length + fittings' equivalent length) × hours ÷ plant efficiency (hot lines) or COP (cold lines), at each line's economics conditions.",
		"Investment is the installed cost from the project's cost table at the thickness in question; simple payback = investment ÷ first-year saving against bare.",
		"The economic thickness of a line is the least life-cycle cost among its priced thicknesses (present worth by NIST Handbook 135's modified uniform present-worth factor).",
	}
	w.Header().Set("Cache-Control", "no-store")
	templ.Handler(web.Economics(v)).ServeHTTP(w, r)
}
