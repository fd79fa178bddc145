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

// econYear is one line's year in one case: energy bought, its cost and CO2, and the
// installed cost (nil where no price is known).
type econYear struct {
	kwh, cost, co2 float64
	invest         *float64
}

func econYearOf(r analysis.EconomicsRow) econYear {
	return econYear{kwh: r.AnnualKWh, cost: r.AnnualCost, co2: r.CO2Kg, invest: r.InstalledCost}
}

// econTotal sums one case over the lines of one energy basis.
type econTotal struct {
	kwh, cost, co2, invest float64
	unpriced               int // lines whose investment is unknown
	lines                  int
}

func (t *econTotal) add(y econYear) {
	t.lines++
	t.kwh += y.kwh
	t.cost += y.cost
	t.co2 += y.co2
	if y.invest != nil {
		t.invest += *y.invest
	} else {
		t.unpriced++
	}
}

// econBasisTotals are one energy basis's three cases.
type econBasisTotals struct{ spec, bare, eco econTotal }

// economicsProject shows GET /projects/{id}/economics: totals as specified, bare and at
// each line's economic thickness, kept apart by energy basis (heating: fuel or heat
// bought for hot lines; cooling: electricity for cold lines), the lines one by one, and
// the annual energy by service. Everything is read from the lines' stored answers
// (recomputed only where stale): the as-specified row, the bare row and the row of the
// economic thickness of each answer's economics.
func (s *Server) economicsProject(w http.ResponseWriter, r *http.Request) {
	p, set := projectOf(r)
	lines, err := s.projectLines(r)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	sys := projectSystem(p)
	cur := set.Economics.CurrencyCode()
	v := web.EconomicsView{Assets: s.assets.urls, Title: "Economics: " + p.Name, ProjectURL: projectURL(p.ID),
		CostsURL: costsURL(p.ID), AuditURL: projectURL(p.ID) + "/audit", EnergyHead: "Energy bought, kWh/year", Currency: cur}
	if sys == units.US {
		v.Energy2Head = "Energy bought, MMBtu/year"
	}
	totals := map[string]*econBasisTotals{analysis.BasisHeating: {}, analysis.BasisCooling: {}}
	byService := map[string]float64{}
	var noPrice, failed, noEconomic, example int
	for _, lv := range lines {
		row := web.EconLineRow{Tag: cmp.Or(lv.Line.Tag, fmt.Sprintf("line %d", lv.Line.ID)), Service: lv.Line.Service,
			URL: lineURL(p.ID, lv.Line.ID), CompareURL: compareURL(p.ID, lv.Line.ID)}
		out := lv.Result.Output
		if out == nil {
			failed++
			row.Note = "the line has input errors"
			v.Lines = append(v.Lines, row)
			continue
		}
		if out.EnergyBasis == nil || out.EconomicsAsSpecified == nil || len(out.Economics) == 0 {
			noPrice++
			row.Note = "not priced: no energy price for its basis"
			v.Lines = append(v.Lines, row)
			continue
		}
		if slices.Contains(out.Assumptions, analysis.ExampleCostsAssumption) {
			example++
		}
		basis := out.EnergyBasis.Basis
		row.Basis = basis
		specRow := *out.EconomicsAsSpecified
		spec := econYearOf(specRow)
		bare := econYear{kwh: out.Economics[0].AnnualKWh, cost: out.Economics[0].AnnualCost, co2: out.Economics[0].CO2Kg, invest: ptrTo(0.0)}
		eco := spec
		row.Specified = units.Format(units.Length, sys, specRow.ThicknessMM)
		switch e := out.Sizing.EconomicMM; {
		case e == nil:
			noEconomic++
			row.Economic, row.Note = "—", "no installed costs: counted as specified"
		case *e == 0:
			eco = bare
			row.Economic = "bare"
		default:
			row.Economic = units.Format(units.Length, sys, *e)
			for _, er := range out.Economics {
				if er.ThicknessMM == *e && !er.AsFound {
					eco = econYearOf(er)
				}
			}
		}
		t := totals[basis]
		t.spec.add(spec)
		t.bare.add(bare)
		t.eco.add(eco)
		byService[cmp.Or(lv.Line.Service, "(no service)")] += spec.kwh
		row.EnergySpec, row.EnergyEco = numberText(spec.kwh), numberText(eco.kwh)
		row.CostSpec, row.CostEco = moneyText(spec.cost), moneyText(eco.cost)
		v.Lines = append(v.Lines, row)
	}
	scen := func(key, name string, t, bare econTotal, invest bool) web.EconScenario {
		sc := web.EconScenario{Key: key, Name: name, Energy: numberText(t.kwh), Energy2: units.Format(units.Energy, units.US, t.kwh),
			Cost: moneyText(t.cost), CO2: numberText(t.co2), Investment: "—", Payback: "—"}
		if !invest {
			return sc
		}
		priced := t.lines - t.unpriced
		if priced == 0 { // no investment known: no payback either
			sc.Note = "no installed costs"
			return sc
		}
		sc.Investment = moneyText(t.invest)
		if saving := bare.cost - t.cost; saving > 0 {
			y := t.invest / saving
			sc.Payback = yearsText(&y)
		} else {
			sc.Payback = "none"
		}
		if t.unpriced > 0 {
			sc.Note = fmt.Sprintf("%d line(s) without an installed cost are not in the investment", t.unpriced)
		}
		return sc
	}
	for _, b := range []struct{ key, name string }{{analysis.BasisHeating, "Heating (hot lines: fuel or heat bought)"},
		{analysis.BasisCooling, "Cooling (cold lines: electricity bought)"}} {
		t := totals[b.key]
		if t.spec.lines == 0 {
			continue
		}
		v.Bases = append(v.Bases, web.EconBasisTotals{Key: b.key, Name: b.name, Lines: t.spec.lines, Scenarios: []web.EconScenario{
			scen("specified", "As specified", t.spec, t.bare, true),
			scen("bare", "Bare (no insulation)", t.bare, t.bare, false),
			scen("economic", "Each line at its economic thickness", t.eco, t.bare, true),
		}})
	}
	switch {
	case len(lines) == 0:
		v.Notices = append(v.Notices, "This project has no lines yet.")
	case noPrice == len(lines):
		v.Notices = append(v.Notices, "No line is priced: set a heating and/or cooling price in the project's settings.")
	}
	if noPrice > 0 && noPrice < len(lines) {
		v.Notices = append(v.Notices, fmt.Sprintf("%d line(s) have no energy price for their basis (heating for hot lines, cooling for cold ones) and are left out.", noPrice))
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
		chart := web.BarChartView{ID: "chart-energy-by-service", Title: "Annual energy bought by service, as specified", XLabel: "energy bought, " + label}
		for svc, kwh := range byService {
			val := units.FromSI(q, sys, kwh)
			chart.Bars = append(chart.Bars, web.Bar{Label: svc, Value: val, ValueText: units.Format(q, sys, kwh) + " " + label})
		}
		slices.SortFunc(chart.Bars, func(a, b web.Bar) int { return cmp.Or(cmp.Compare(b.Value, a.Value), cmp.Compare(a.Label, b.Label)) })
		v.Chart = &chart
	}
	v.Assumptions = []string{
		"Hot lines are priced on the heating basis: energy bought = heat lost × hours ÷ plant efficiency, at the heating price. Cold lines are priced on the cooling basis: electricity bought = heat gained × hours ÷ COP, at the cooling price. A line never takes the other basis; the two are totalled apart (a kWh of fuel and a kWh of electricity are not added).",
		"Heat flows are per (length + fittings' equivalent length), at each line's economics conditions, from the lines' stored answers.",
		"Money is in " + cur + " (ISO 4217). Investment is the installed cost from the project's cost table at the thickness in question; simple payback = investment ÷ first-year saving against bare. Without any installed cost there is no investment and no payback (—).",
		"The economic thickness of a line is the least life-cycle cost among its priced thicknesses (present worth by NIST Handbook 135's modified uniform present-worth factor).",
	}
	w.Header().Set("Cache-Control", "no-store")
	templ.Handler(web.Economics(v)).ServeHTTP(w, r)
}

func ptrTo[T any](v T) *T { return &v }
