package handlers

import (
	"cmp"
	"fmt"
	"net/http"
	"slices"
	"strconv"
	"strings"

	"github.com/a-h/templ"

	"lagwright/analysis"
	"lagwright/field"
	"lagwright/store"
	"lagwright/units"
	"lagwright/web"
)

// sideResult is one material's comparison: the line's full answer (criteria, economic
// thickness over the priced thicknesses) and a row for every candidate thickness.
type sideResult struct {
	slug, name string
	out        *analysis.Output
	rows       []analysis.EconomicsRow
	priced     bool
}

// compareSide analyses a line's own input with the project's settings twice: as the
// project prices it (the priced rows, the economic thickness, every criterion), and
// over every candidate of the sized material without prices (heat flow, surface
// temperature, energy and its cost for each), then merges the two by thickness.
func compareSide(set analysis.ProjectSettings, l store.Line, own analysis.Input, fit analysis.Fittings,
	lib *store.Library) (sideResult, error) {
	var side sideResult
	eff := set.Effective(l.Location, own, fit)
	out, err := analysis.Analyse(eff, lib)
	if err != nil {
		return side, err
	}
	side.out = out
	thick := slices.Clone(out.Sizing.Candidates)
	priced := map[float64]analysis.EconomicsRow{}
	for _, r := range out.Economics {
		if r.InstalledCost != nil && r.ThicknessMM > 0 && !r.AsFound { // not the bare or as-found row
			priced[r.ThicknessMM] = r
			side.priced = true
			if !slices.Contains(thick, r.ThicknessMM) {
				thick = append(thick, r.ThicknessMM)
			}
		}
	}
	slices.Sort(thick)
	if len(thick) > 40 {
		thick = thick[:40]
	}
	all := eff
	all.ThicknessesMM = thick
	if eff.Economics != nil {
		e := *eff.Economics
		e.InstalledCostPerM, e.InstalledCostSource = nil, ""
		all.Economics = &e
	} else {
		zero := 0.0 // energy at the default efficiency or COP, priced at nothing
		all.Economics = &analysis.Economics{Heating: &analysis.HeatingBasis{PricePerKWh: &zero}, Cooling: &analysis.CoolingBasis{PricePerKWh: &zero}}
	}
	cr := analysis.Criteria{}
	all.Criteria = &cr // criteria are judged on the first pass
	every, err := analysis.Analyse(all, lib)
	if err != nil {
		return side, err
	}
	for _, r := range every.Economics {
		if p, ok := priced[r.ThicknessMM]; ok && !r.AsFound {
			r = p
		} else if eff.Economics == nil {
			r.AnnualCost = 0
		}
		side.rows = append(side.rows, r)
	}
	if m, ok := lib.Material(outerMaterial(own)); ok {
		side.slug, side.name = m.Slug, m.Name
	} else {
		side.slug, side.name = "custom", "Outer layer (conductivity given)"
	}
	return side, nil
}

func outerMaterial(in analysis.Input) string {
	if n := len(in.Layers); n > 0 {
		return in.Layers[n-1].Material
	}
	return ""
}

// withMaterial is the line's input with its outer layer of another material (its
// thickness kept); the candidates become that material's series and costs its rows.
func withMaterial(own analysis.Input, slug string) analysis.Input {
	in := own
	in.Layers = slices.Clone(own.Layers)
	n := len(in.Layers)
	in.Layers[n-1] = analysis.LayerInput{Material: slug, ThicknessMM: own.Layers[n-1].ThicknessMM}
	in.ThicknessesMM = nil
	if own.Economics != nil {
		e := *own.Economics
		e.InstalledCostPerM, e.InstalledCostSource = nil, ""
		in.Economics = &e
	}
	return in
}

// comparePage shows GET /projects/{id}/lines/{line}/compare[?alt=slug].
func (s *Server) comparePage(w http.ResponseWriter, r *http.Request) {
	c, err := loadCompareLine(r)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	if len(c.Own.Layers) == 0 {
		s.fail(w, r, Invalid(field.Error{Field: "layers", Message: "this line is bare: add an insulation layer on the line page to compare thicknesses"}))
		return
	}
	lib, err := s.library(r.Context())
	if err != nil {
		s.fail(w, r, err)
		return
	}
	own, err := compareSide(c.Set, c.Line, c.Own, c.Fit, lib)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	sides := []sideResult{own}
	alt := r.URL.Query().Get("alt")
	if alt != "" && alt != outerMaterial(c.Own) {
		if _, ok := lib.Material(alt); !ok {
			s.fail(w, r, Invalid(field.Error{Field: "alt", Message: "no such material in the library"}))
			return
		}
		side, err := compareSide(c.Set, c.Line, withMaterial(c.Own, alt), c.Fit, lib)
		if err != nil {
			s.fail(w, r, err)
			return
		}
		sides = append(sides, side)
	}
	v := s.compareView(c, sides, lib, alt)
	w.Header().Set("Cache-Control", "no-store")
	templ.Handler(web.Compare(v)).ServeHTTP(w, r)
}

// criterionMins lists each criterion's thinnest thickness (sized layer) by label.
func criterionMins(sz analysis.Sizing) []struct {
	label string
	mm    *float64
} {
	return []struct {
		label string
		mm    *float64
	}{
		{"personnel protection", sz.PersonnelProtectionMM}, {"condensation", sz.CondensationMM},
		{"maximum heat flow", sz.MaxHeatFlowMM}, {"maximum temperature change", sz.MaxTempChangeMM},
		{"freeze protection", sz.FreezeMM}, {"energy code", sz.EnergyCodeMM},
	}
}

func (s *Server) compareView(c compareLine, sides []sideResult, lib *store.Library, alt string) web.CompareView {
	sys := projectSystem(c.Project)
	pid, lid := c.Project.ID, c.Line.ID
	main := sides[0].out
	flat := main.Geometry == "flat"
	qQty := units.HeatFlowPerLength
	if flat {
		qQty = units.HeatFlux
	}
	cur := c.Set.Economics.CurrencyCode()
	runLen := 0.0
	if main.EquivalentLengthM != nil {
		runLen = *main.EquivalentLengthM
	}
	v := web.CompareView{
		Assets:       s.assets.urls,
		Title:        "Compare thicknesses: " + cmp.Or(c.Line.Tag, "line "+strconv.FormatInt(lid, 10)),
		LineURL:      lineURL(pid, lid),
		ProjectURL:   projectURL(pid),
		CostsURL:     costsURL(pid),
		EconomicsURL: economicsURL(pid),
		ThicknessURL: lineURL(pid, lid) + "/thickness",
		Version:      c.Line.Version,
		Head: web.CompareHead{
			Thickness: "Thickness, " + units.Label(units.Length, sys),
			HeatFlow:  "Heat flow, " + units.Label(qQty, sys),
			HeatRun:   "Heat flow per run, " + units.Label(units.HeatFlow, sys),
			HasRun:    runLen > 0 && !flat,
			Surface:   "Surface, " + units.Label(units.Temp, sys),
			Energy:    "Energy, kWh/year",
			Cost:      "Energy cost/year, " + cur,
			CO2:       "CO2, kg/year",
			Installed: "Installed cost, " + cur,
			Money:     cur,
		},
	}
	if b := main.EnergyBasis; b != nil {
		v.Head.Basis = basisText(*b)
	}
	if sys == units.US {
		v.Head.Energy2 = "Energy, MMBtu/year"
	}
	intro := []string{c.Line.Service, fmt.Sprintf("operating %s", units.FormatUnit(units.Temp, sys, main.OperatingTempC))}
	if main.PipeODmm != nil {
		intro = append(intro, "pipe OD "+units.FormatUnit(units.Length, sys, *main.PipeODmm))
	}
	if runLen > 0 {
		intro = append(intro, "run "+units.FormatUnit(units.LongLength, sys, runLen)+" with fittings")
	}
	econ := main.ConditionsUsed.Economics
	intro = append(intro, "economics at "+units.FormatUnit(units.Temp, sys, econ.AmbientTempC)+" ambient, wind "+units.FormatUnit(units.Speed, sys, econ.WindMS))
	v.Intro = strings.Join(slices.DeleteFunc(intro, func(s string) bool { return s == "" }), " · ")

	eff := c.Set.Effective(c.Line.Location, c.Own, c.Fit)
	if eff.Economics == nil {
		v.Notices = append(v.Notices, "The project has no energy price: set one in the project's settings to see energy costs, paybacks and the economic thickness. Energy is shown at the default plant efficiency or COP.")
	}
	if !sides[0].priced {
		v.Notices = append(v.Notices, "No installed costs for this material and size: add them to the project's cost table (Installed costs) for paybacks, life-cycle cost and the economic thickness.")
	}
	if slices.Contains(main.Assumptions, analysis.ExampleCostsAssumption) {
		v.Notices = append(v.Notices, "Installed costs are the labelled example, not prices: replace them in the cost table.")
	}

	for _, m := range lib.MaterialChoices() {
		if m.Slug == sides[0].slug {
			continue
		}
		v.AltOptions = append(v.AltOptions, web.CompareOption{Value: m.Slug, Label: m.Name, Selected: m.Slug == alt})
	}

	thick := func(mm float64) string { return units.FormatUnit(units.Length, sys, mm) }
	for _, m := range criterionMins(main.Sizing) {
		if m.mm != nil {
			v.Criteria = append(v.Criteria, web.CompareCriterion{Label: m.label, Value: thickOrBare(thick, *m.mm)})
		}
	}
	for _, k := range main.Sizing.Unmet {
		v.Criteria = append(v.Criteria, web.CompareCriterion{Label: strings.ReplaceAll(k, "_", " "), Value: "no available thickness meets it"})
	}
	if e := main.Sizing.EconomicMM; e != nil {
		v.Criteria = append(v.Criteria, web.CompareCriterion{Label: "economic (least life-cycle cost)", Value: thickOrBare(thick, *e), Economic: true})
	}
	if g := main.Sizing.Governing; g != nil && main.Sizing.GoverningThicknessMM != nil {
		v.Criteria = append(v.Criteria, web.CompareCriterion{Label: "governing", Value: strings.ReplaceAll(*g, "_", " ") + ", " + thickOrBare(thick, *main.Sizing.GoverningThicknessMM)})
	}

	outerNow := 0.0
	if n := len(c.Own.Layers); n > 0 && c.Own.Layers[n-1].ThicknessMM != nil {
		outerNow = *c.Own.Layers[n-1].ThicknessMM
	}
	for i, sd := range sides {
		vs := web.CompareSide{Material: sd.name, Slug: sd.slug, CanUse: i == 0, Economic: "not known (no installed costs)"}
		if i > 0 {
			vs.Material = sd.name + " (second material)"
		}
		if e := sd.out.Sizing.EconomicMM; e != nil {
			vs.Economic = thickOrBare(thick, *e)
		}
		if !sd.priced {
			vs.PricesNote = "no installed costs match this material and size"
		}
		mins := criterionMins(sd.out.Sizing)
		var found *analysis.EconomicsRow
		for i := range sd.rows {
			if sd.rows[i].AsFound {
				found = &sd.rows[i]
				v.Head.HasFound = true
			}
		}
		for _, r := range sd.rows {
			row := web.CompareRow{
				ThicknessMM: strconv.FormatFloat(r.ThicknessMM, 'f', -1, 64),
				Thickness:   units.Format(units.Length, sys, r.ThicknessMM),
				HeatFlow:    units.Format(qQty, sys, r.HeatFlowWPerM),
				HeatRun:     groupThousands(units.Format(units.HeatFlow, sys, r.HeatFlowWPerM*runLen)),
				Surface:     units.Format(units.Temp, sys, r.SurfaceTempC),
				Energy:      numberText(r.AnnualKWh),
				Energy2:     units.Format(units.Energy, units.US, r.AnnualKWh),
				Cost:        moneyText(r.AnnualCost),
				CO2:         numberText(r.CO2Kg),
				Installed:   moneyPtrText(r.InstalledCost),
				Simple:      yearsText(r.SimplePaybackYears),
				Incremental: yearsText(r.IncrementalPaybackYears),
				NPV:         moneyPtrText(r.NPV),
				LCC:         moneyPtrText(r.LifeCycleCost),
				Current:     i == 0 && !r.AsFound && absDiff(r.ThicknessMM-outerNow) < 0.005,
			}
			row.SavingBare = "—"
			if r.AnnualSavings != nil {
				row.SavingBare = moneyText(r.AnnualSavings.Cost)
			}
			if eff.Economics == nil || sd.out.EnergyBasis == nil {
				row.Cost, row.SavingBare = "—", "—"
			}
			row.SavingFound = "—"
			if found != nil && !r.AsFound && row.Cost != "—" {
				row.SavingFound = moneyText(found.AnnualCost - r.AnnualCost)
			}
			switch {
			case r.AsFound:
				row.Thickness, row.AsFound = "as found ("+units.Format(units.Length, sys, r.ThicknessMM)+")", true
				row.Installed, row.Simple, row.Incremental, row.NPV, row.LCC = "in place", "—", "—", "—", "—"
			case r.ThicknessMM == 0:
				row.Thickness, row.Bare = "bare", true
			}
			if r.InstalledCost == nil {
				row.Simple, row.Incremental = "—", "—"
			}
			if e := sd.out.Sizing.EconomicMM; e != nil && *e == r.ThicknessMM && !r.AsFound {
				row.Economic = true
			}
			for _, m := range mins {
				if m.mm != nil && *m.mm == r.ThicknessMM && !r.AsFound {
					row.Minimums = append(row.Minimums, m.label)
				}
			}
			vs.Rows = append(vs.Rows, row)
		}
		v.Sides = append(v.Sides, vs)
	}
	v.Charts = charts(sides, sys, qQty)
	v.Warnings = withUSValuesAll(sys, main.Warnings)
	v.Assumptions = withUSValuesAll(sys, main.Assumptions)
	return v
}

// basisText names the energy basis a line is priced on, in words.
func basisText(b analysis.EnergyBasis) string {
	conv := ""
	switch {
	case b.Efficiency != nil:
		conv = "efficiency " + strconv.FormatFloat(*b.Efficiency*100, 'f', -1, 64) + " %"
	case b.COP != nil:
		conv = "COP " + strconv.FormatFloat(*b.COP, 'f', -1, 64)
	}
	what := map[string]string{analysis.BasisHeating: "heat lost, bought as fuel or heat", analysis.BasisCooling: "heat gained, removed by electric cooling"}[b.Basis]
	return fmt.Sprintf("Priced on the %s basis (%s): %s %s per kWh bought, %s, %s h a year, %s kg CO2 per kWh bought.",
		b.Basis, what, strconv.FormatFloat(b.PricePerKWh, 'f', -1, 64), b.Currency, conv, strconv.FormatFloat(b.HoursPerYear, 'f', -1, 64),
		strconv.FormatFloat(b.CO2KgPerKWh, 'f', -1, 64))
}

func thickOrBare(thick func(float64) string, mm float64) string {
	if mm == 0 {
		return "bare (no insulation needed)"
	}
	return thick(mm)
}

func absDiff(v float64) float64 {
	if v < 0 {
		return -v
	}
	return v
}
