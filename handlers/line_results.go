package handlers

import (
	"fmt"
	"math"
	"strings"

	"lagwright/analysis"
	"lagwright/catalog"
	"lagwright/field"
	"lagwright/units"
	"lagwright/web"
)

// buildResults formats one line's answer (or its problems) in the project's units for the
// results panel beside the line form.
func buildResults(eff analysis.Input, st analysis.Stored, sys units.System, names nameLookup) web.LineResults {
	v := web.LineResults{Computed: st.Output != nil}
	for _, e := range st.Errors {
		v.Problems = append(v.Problems, lineProblemText(e))
	}
	o := st.Output
	if o == nil {
		v.Cautions = []string{analysis.Caution}
		return v
	}
	v.Flags = statusFlags(lineStatus(eff, st))
	f := func(q units.Quantity, x float64) string { return units.FormatUnit(q, sys, x) }
	fp := func(q units.Quantity, p *float64) string {
		if p == nil {
			return ""
		}
		return f(q, *p)
	}
	row := func(id, label, value string) {
		if value != "" {
			v.Summary = append(v.Summary, web.ResultRow{ID: id, Label: label, Value: value})
		}
	}
	if o.HeatFlowWPerM != nil {
		row("heat-flow", "Heat flow per length", f(units.HeatFlowPerLength, *o.HeatFlowWPerM))
	}
	row("heat-flux", "Heat flux at the surface", f(units.HeatFlux, o.HeatFluxWm2))
	row("heat-run", "Heat flow per run", fp(units.HeatFlow, o.HeatFlowW))
	if o.EquivalentLengthM != nil {
		row("equiv-length", "Run with fittings", f(units.LongLength, *o.EquivalentLengthM))
	}
	if o.StraightRunHeatW != nil && (len(o.Fittings) > 0 || o.Supports != nil) {
		row("heat-straight", "  straight run", f(units.HeatFlow, *o.StraightRunHeatW))
	}
	for _, fo := range o.Fittings {
		if fo.HeatW != nil {
			row("heat-"+fo.Kind, fmt.Sprintf("  %d × %s, %s", fo.Count, catalog.FittingKindName(fo.Kind), fo.Finish), f(units.HeatFlow, *fo.HeatW))
		}
	}
	if w, ok := o.FittingsHeatW["fittings_equiv_length"]; ok {
		row("heat-fittings", "  fittings (equivalent length given)", f(units.HeatFlow, w))
	}
	if sp := o.Supports; sp != nil {
		v := fmt.Sprintf("%d %s at %s", sp.Count, sp.Kind, f(units.LongLength, sp.SpacingM))
		if sp.HeatW != nil {
			v += ", " + f(units.HeatFlow, *sp.HeatW)
		}
		row("supports", "  supports", v)
	}
	row("surface-temp", "Surface temperature", f(units.Temp, o.SurfaceTempC))
	for _, fc := range o.Faces {
		row("face-"+fc.Face, "  "+fc.Face+" face", f(units.Temp, fc.SurfaceTempC)+", "+f(units.HeatFlowPerLength, fc.HeatFlowWPerM))
	}
	row("pipe-surface", "Surface under the insulation", f(units.Temp, o.PipeSurfaceC))
	if o.BareHeatFlow != nil {
		row("bare", "Bare heat flow", f(units.HeatFlowPerLength, *o.BareHeatFlow)+" (bare surface "+f(units.Temp, o.BareSurfaceC)+")")
	} else {
		row("bare", "Bare heat flux", f(units.HeatFlux, o.BareHeatFluxWm2))
	}
	if o.EfficiencyPct != nil {
		row("efficiency", "Insulation efficiency", fmt.Sprintf("%.1f %%", *o.EfficiencyPct))
	}
	row("coeff", "Surface coefficient", f(units.SurfaceCoeff, o.SurfaceCoeff.Convection+o.SurfaceCoeff.Radiation)+
		" (convection "+units.Format(units.SurfaceCoeff, sys, o.SurfaceCoeff.Convection)+", radiation "+
		units.Format(units.SurfaceCoeff, sys, o.SurfaceCoeff.Radiation)+")")
	if o.DewPointC != nil {
		kind := o.DewPointKind
		if kind == "" {
			kind = "dew point"
		}
		row("dew-point", strings.ToUpper(kind[:1])+kind[1:], f(units.Temp, *o.DewPointC))
	}
	if m := dewMargin(o); m != nil {
		row("margin", "Condensation margin", fp(units.TempDiff, m))
	} else if o.CondensationMarginK != nil {
		row("margin", "Condensation margin", "— (hot line, surface above the dew point)")
	}
	row("outlet", "Outlet temperature", fp(units.Temp, o.OutletTempC))
	row("temp-change", "Temperature change", fp(units.TempDiff, o.TempChangeK))
	row("steam-sat", "Steam saturation temperature", fp(units.Temp, o.SteamSatTempC))
	if o.CondensateKgPerH != nil {
		kgh := *o.CondensateKgPerH
		if sys == units.US {
			row("condensate", "Condensate", fmt.Sprintf("%.3g lb/h", kgh/units.Pound))
		} else {
			row("condensate", "Condensate", fmt.Sprintf("%.3g kg/h", kgh))
		}
	}
	hours := func(p *float64) string {
		if p == nil {
			return ""
		}
		if math.IsInf(*p, 1) || *p > 1e6 {
			return "does not freeze"
		}
		return fmt.Sprintf("%.1f h", *p)
	}
	row("freeze-0c", "Still water reaches "+units.FormatUnit(units.Temp, sys, 0)+" in", hours(o.FreezeHoursTo0C))
	row("freeze-frac", "Freezes (fraction) in", hours(o.FreezeHoursToFreeze))
	row("heat-trace", "Heat tracing needed", fp(units.HeatFlowPerLength, o.HeatTraceWPerM))

	for i, l := range o.Layers {
		name := l.Material
		if name != "" {
			name = names.material(name)
		} else {
			name = fmt.Sprintf("layer %d", i+1)
		}
		th := f(units.Length, l.ThicknessMM)
		if math.Abs(l.NominalThicknessMM-l.ThicknessMM) > 0.01 {
			th += " installed (" + f(units.Length, l.NominalThicknessMM) + " nominal)"
		}
		v.Layers = append(v.Layers, web.LayerResult{Name: name, Thickness: th, K: f(units.Conductivity, l.KUsed),
			Mean: f(units.Temp, l.MeanTempC), Inner: f(units.Temp, l.InnerTempC), Outer: f(units.Temp, l.OuterTempC)})
	}
	for _, t := range o.InterfaceTempsC {
		v.Interfaces = append(v.Interfaces, f(units.Temp, t))
	}

	sz := o.Sizing
	for _, c := range []struct {
		key string
		p   *float64
	}{{"personnel_protection", sz.PersonnelProtectionMM}, {"condensation", sz.CondensationMM}, {"max_heat_flow", sz.MaxHeatFlowMM},
		{"max_temp_change", sz.MaxTempChangeMM}, {"freeze", sz.FreezeMM}, {"energy_code", sz.EnergyCodeMM}, {"economic", sz.EconomicMM}} {
		unmet := false
		for _, u := range sz.Unmet {
			unmet = unmet || u == c.key
		}
		if c.p == nil && !unmet {
			continue
		}
		r := web.SizingRow{Criterion: lineCriterionLabel(c.key), Governing: sz.Governing != nil && *sz.Governing == c.key}
		switch {
		case unmet:
			r.Thickness, r.Unmet = "none available", true
		case *c.p == 0:
			r.Thickness = "met bare"
		default:
			r.Thickness = f(units.Length, *c.p)
		}
		v.Sizing = append(v.Sizing, r)
	}
	if sz.Governing != nil && sz.GoverningThicknessMM == nil { // an unmet requirement governs
		v.Governing = lineCriterionLabel(*sz.Governing) + ": no available build meets it (see the warnings)"
	}
	if sz.Governing != nil && sz.GoverningThicknessMM != nil {
		v.Governing = lineCriterionLabel(*sz.Governing) + ": " + f(units.Length, *sz.GoverningThicknessMM)
		var plan []string
		for _, lp := range sz.LayersProposed {
			plan = append(plan, f(units.Length, lp.ThicknessMM)+" "+names.material(lp.Material))
		}
		if len(plan) > 0 {
			v.Governing += " (build-up: " + strings.Join(plan, " + ") + ")"
		}
	}
	if ec := o.EnergyCode; ec != nil {
		e := &web.EnergyCodeResult{Table: ec.Table + " (" + ec.Edition + ")", Row: codeRowIn(sys, ec.Row), Column: ec.Column,
			Specified: f(units.Length, ec.SpecifiedMM), Required: ec.Required, Pass: ec.Pass, NotCovered: ec.Reason}
		if ec.Column != "" {
			e.Column = "NPS " + ec.Column
		}
		if ec.TableThicknessMM != nil {
			e.TableThickness = f(units.Length, *ec.TableThicknessMM)
		}
		if ec.CorrectedMM != nil {
			e.Corrected = f(units.Length, *ec.CorrectedMM)
		}
		v.EnergyCode = e
	}
	v.Warnings, v.Assumptions, v.Cautions = withUSValuesAll(sys, o.Warnings), withUSValuesAll(sys, o.Assumptions), o.Cautions
	if len(v.Cautions) == 0 {
		v.Cautions = []string{analysis.Caution}
	}
	v.Profile = profileChart(eff, o, sys)
	return v
}

// problemText writes a field error for people.
func lineProblemText(e field.Error) string {
	if e.Field == "" {
		return e.Message
	}
	return e.Field + ": " + e.Message
}

// profileChart draws the temperature through the build-up: x is the radius from the
// pipe axis (pipes) or the depth from the duct or wall surface, in the project's length
// unit, on a true numeric axis; y is temperature.
func profileChart(in analysis.Input, o *analysis.Output, sys units.System) *web.Profile {
	if len(o.Layers) == 0 {
		return nil
	}
	const W, H, left, right, top, bottom = 560.0, 300.0, 64.0, 16.0, 16.0, 44.0
	x0 := 0.0
	xLabel := "depth from the surface under the insulation"
	if o.PipeODmm != nil && o.Geometry == "pipe" {
		x0 = *o.PipeODmm / 2
		xLabel = "radius from the pipe axis"
	}
	type pt struct {
		x, t  float64
		label string
	}
	pts := []pt{{x0, o.PipeSurfaceC, "pipe surface"}}
	x := x0
	for i, l := range o.Layers {
		x += l.ThicknessMM
		label := fmt.Sprintf("interface %d", i+1)
		if i == len(o.Layers)-1 {
			label = "outer surface"
		}
		pts = append(pts, pt{x, l.OuterTempC, label})
	}
	amb := o.ConditionsUsed.Design.AmbientTempC
	fluid := o.OperatingTempC
	// Axes in display units.
	dx := func(mm float64) float64 { return units.FromSI(units.Length, sys, mm) }
	dt := func(c float64) float64 { return units.FromSI(units.Temp, sys, c) }
	xmin, xmax := dx(x0), dx(x)
	tmin, tmax := math.Min(dt(amb), dt(fluid)), math.Max(dt(amb), dt(fluid))
	for _, p := range pts {
		tmin, tmax = math.Min(tmin, dt(p.t)), math.Max(tmax, dt(p.t))
	}
	xt := profileTicks(xmin, xmax, 6)
	yt := profileTicks(tmin, tmax, 6)
	xmin, xmax = xt[0], xt[len(xt)-1]
	tmin, tmax = yt[0], yt[len(yt)-1]
	sx := func(v float64) float64 { return left + (v-xmin)/(xmax-xmin)*(W-left-right) }
	sy := func(v float64) float64 { return top + (tmax-v)/(tmax-tmin)*(H-top-bottom) }
	p := &web.Profile{Width: W, Height: H, Left: left, Right: W - right, Top: top, Bottom: H - bottom,
		XLabel: xLabel + " (" + units.Label(units.Length, sys) + ")", YLabel: "temperature (" + units.Label(units.Temp, sys) + ")"}
	for _, v := range xt {
		p.XTicks = append(p.XTicks, web.ProfileTick{Pos: sx(v), Label: profileNum(v)})
	}
	for _, v := range yt {
		p.YTicks = append(p.YTicks, web.ProfileTick{Pos: sy(v), Label: profileNum(v)})
	}
	var poly []string
	for _, q := range pts {
		px, py := sx(dx(q.x)), sy(dt(q.t))
		poly = append(poly, fmt.Sprintf("%.1f,%.1f", px, py))
		p.Points = append(p.Points, web.ProfilePoint{X: px, Y: py, Label: q.label + ": " + units.FormatUnit(units.Temp, sys, q.t) +
			" at " + units.FormatUnit(units.Length, sys, q.x)})
	}
	p.Polyline = strings.Join(poly, " ")
	p.AmbientY, p.AmbientLabel = sy(dt(amb)), "ambient "+units.FormatUnit(units.Temp, sys, amb)
	p.FluidY, p.FluidLabel = sy(dt(fluid)), "fluid "+units.FormatUnit(units.Temp, sys, fluid)
	p.FluidX2 = sx(dx(x0))
	for i := range o.Layers {
		a, b := pts[i].x, pts[i+1].x
		p.Bands = append(p.Bands, web.ProfileBand{X: sx(dx(a)), W: sx(dx(b)) - sx(dx(a)), Odd: i%2 == 1})
	}
	return p
}

// niceTicks spans [lo, hi] with round steps (1, 2, 2.5 or 5 × 10ⁿ).
func profileTicks(lo, hi float64, n int) []float64 {
	if hi-lo < 1e-9 {
		lo, hi = lo-1, hi+1
	}
	raw := (hi - lo) / float64(n-1)
	mag := math.Pow(10, math.Floor(math.Log10(raw)))
	step := mag * 10
	for _, m := range []float64{1, 2, 2.5, 5, 10} {
		if m*mag >= raw {
			step = m * mag
			break
		}
	}
	start := math.Floor(lo/step) * step
	var out []float64
	for v := start; v <= hi+step*1e-9 || len(out) < 2; v += step {
		out = append(out, math.Round(v/step)*step)
		if len(out) > 20 {
			break
		}
	}
	if out[len(out)-1] < hi {
		out = append(out, out[len(out)-1]+step)
	}
	return out
}

func profileNum(v float64) string {
	s := fmt.Sprintf("%.2f", v)
	s = strings.TrimRight(strings.TrimRight(s, "0"), ".")
	if s == "-0" {
		return "0"
	}
	return s
}
