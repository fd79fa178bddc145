package analysis

import (
	"fmt"
	"math"
	"slices"
	"strings"

	"lagwright/calc"
	"lagwright/catalog"
)

// criterion is one sizing criterion: its output key (its thickness goes to setSizing); meets
// tests one thickness against it and unmet says why nothing meets it. (Plain data, no
// closures: the analyser stays on its caller's stack.)
type criterion struct {
	kind  critKind
	key   string
	label string
	dew   float64 // condensation: the dew point at its conditions, °C
}

type critKind int

const (
	critPersonnel critKind = iota
	critCondensation
	critMaxHeatFlow
	critMaxTempChange
	critFreeze
	critJacket
)

// candidates are the thicknesses the sized layer may take in one layer, ascending. It
// also sets up the layered builds: the material's largest single layer and its series.
func (a *analyser) candidates() []float64 {
	l := a.l
	var c []float64
	m := l.outerMaterial
	switch {
	case len(l.in.ThicknessesMM) > 0:
		c = slices.Clone(l.in.ThicknessesMM)
	case a.metric() && m != nil && len(m.ThicknessesMetricMM) > 0:
		c = slices.Clone(m.ThicknessesMetricMM)
		l.assumeText("candidate thicknesses: the metric series of " + m.Name + " (" + a.seriesWhy() + ")")
	case a.metric() && m != nil && len(m.ThicknessesMM) > 0:
		c = catalog.MetricFromInch(m.ThicknessesMM)
		l.assumeText("candidate thicknesses: " + m.Name + " gives no metric series, so its inch series rounded to the nearest 5 mm (" + a.seriesWhy() + ")")
	case a.metric():
		c = catalog.MetricFromInch(catalog.ThicknessSeriesInch())
		l.assumeText("candidate thicknesses: 15 to 150 mm in 5 mm steps rounded from the ½ in steps (no material series; " + a.seriesWhy() + ")")
	case m != nil && len(m.ThicknessesMM) > 0:
		c = slices.Clone(m.ThicknessesMM)
		l.assumeText("candidate thicknesses: the series of " + m.Name)
	default:
		c = catalog.ThicknessSeriesInch()
		l.assume("candidate thicknesses: ½ in steps (no material series for the sized layer)")
	}
	slices.Sort(c)
	c = slices.Compact(c)
	if m != nil && m.MaxLayerMM > 0 {
		l.maxLayerMM = m.MaxLayerMM
		if len(l.in.ThicknessesMM) == 0 {
			l.series = c
			for _, t := range c {
				if t <= m.MaxLayerMM+0.005 {
					l.bigLayerMM = t
				}
			}
		}
	}
	return c
}

// metric reports whether the sized layer is proposed from a metric series: as
// thickness_series says, else for a line sized by DN.
func (a *analyser) metric() bool {
	l := a.l
	switch l.in.ThicknessSeries {
	case "metric":
		return true
	case "inch":
		return false
	}
	return strings.HasPrefix(strings.ToUpper(strings.TrimSpace(l.in.PipeSize)), "DN")
}

// seriesWhy says why the metric series was taken.
func (a *analyser) seriesWhy() string {
	if a.l.in.ThicknessSeries == "metric" {
		return "thickness_series metric"
	}
	return "a DN size"
}

// maxBuildLayers bounds a layered build of the sized layer (our choice: beyond four
// layers another material or a guard is the sane answer).
const maxBuildLayers = 4

// layeredTotals are the totals of layered builds thicker than every single-layer
// candidate: up to maxBuildLayers layers of the material's series, each at most its
// largest single layer, the inner ones the largest and the outermost sized last, up to
// the thickest a line may have. Empty when the material gives no largest layer.
func (a *analyser) layeredTotals(cands []float64) []float64 {
	l := a.l
	if l.bigLayerMM <= 0 || len(cands) == 0 {
		return nil
	}
	var out []float64
	top := cands[len(cands)-1]
	for n := 2; n <= maxBuildLayers; n++ {
		for _, s := range l.series {
			t := round(float64(n-1)*l.bigLayerMM+s, 2)
			if s <= l.bigLayerMM+0.005 && t > top+0.005 && t <= maxThicknessMM {
				out = append(out, t)
			}
		}
	}
	slices.Sort(out)
	return slices.Compact(out)
}

// layerPlan splits a thickness of the sized layer into the layers that install it (nominal
// mm): one layer up to the material's largest single layer; beyond it, equal layers when
// that thickness is in the series (or there is no series), else the largest single layer
// inside and the rest outermost (common practice: staggered joints). The slice is
// scratch, valid until the next call.
func (a *analyser) layerPlan(tMM float64) []float64 {
	l := a.l
	out := a.plan[:0]
	maxL := l.maxLayerMM
	if maxL <= 0 || tMM <= maxL+0.005 {
		return append(out, tMM)
	}
	n := int(math.Ceil(tMM/maxL - 1e-9))
	eq := tMM / float64(n)
	inSeries := func(t float64) bool {
		return slices.ContainsFunc(l.series, func(s float64) bool { return math.Abs(s-t) < 0.005 })
	}
	if len(l.series) == 0 || inSeries(eq) || l.bigLayerMM <= 0 {
		for range n {
			out = append(out, eq)
		}
		return out
	}
	rest := tMM - float64(n-1)*l.bigLayerMM
	if rest <= 0.005 || rest > l.bigLayerMM+0.005 {
		for range n {
			out = append(out, eq)
		}
		return out
	}
	for range n - 1 {
		out = append(out, l.bigLayerMM)
	}
	return append(out, round(rest, 2))
}

// size judges every criterion at its own conditions, each by bisection over the
// candidate thicknesses (monotone criteria), and picks the governing one.
func (a *analyser) size() error {
	l, o := a.l, a.out
	o.Sizing.LayersProposed = []LayerPlan{}
	o.Sizing.Unmet = []string{}
	o.Economics = []EconomicsRow{}
	if len(l.base.Layers) == 0 {
		o.Sizing.Candidates = []float64{}
		if a.anyCriterion() {
			l.warn("no insulation layer given, so nothing to size: add a layer with the material to size (its thickness is replaced by each candidate)")
		}
		return a.economicsBare()
	}
	cands := a.candidates()
	o.Sizing.Candidates = cands
	layered := a.layeredTotals(cands)
	crits, n := a.criteria()
	for i := range n {
		c := &crits[i]
		find := thinnest
		if c.kind == critCondensation && !a.condensationMonotone() {
			find = thinnestScan
		}
		meets := func(t float64) (bool, error) { return a.meets(c, t) }
		t, found, err := find(cands, meets)
		if err == nil && !found && len(layered) > 0 {
			if t, found, err = thinnestAbove(find, layered, meets); found {
				l.assume("%s: no single layer of the series is enough, so a layered build of %s mm is proposed (at most %d layers, each at most %s mm)",
					c.label, fmtRound(t, 1), maxBuildLayers, fmtRound(l.maxLayerMM, 1))
			}
		}
		if err != nil {
			return fmt.Errorf("%s: %w", c.label, err)
		}
		if found {
			if ok, err := a.admissible(t); err != nil {
				return err
			} else if !ok {
				o.Sizing.Unmet = append(o.Sizing.Unmet, c.key)
				l.warn("%s: %s", c.label, a.outOfService())
				continue
			}
		}
		if !found {
			o.Sizing.Unmet = append(o.Sizing.Unmet, c.key)
			l.warn("%s: %s", c.label, a.unmet(c))
			continue
		}
		a.setSizing(c.kind, a.num(t))
	}
	if err := a.energyCode(append(cands[:len(cands):len(cands)], layered...)); err != nil {
		return err
	}
	if err := a.economics(cands); err != nil {
		return err
	}
	if e := o.Sizing.EconomicMM; e != nil && *e > 0 {
		if ok, err := a.admissible(*e); err != nil {
			return err
		} else if !ok {
			o.Sizing.EconomicMM = nil
			if l.crit.economic {
				o.Sizing.Unmet = append(o.Sizing.Unmet, "economic")
			}
			l.warn("economic thickness: %s", a.outOfService())
		}
	}
	a.governing()
	if err := a.condensationAtGoverning(); err != nil {
		return err
	}
	return a.heatTrace()
}

func (a *analyser) anyCriterion() bool {
	k := a.l.crit
	return k.personnel || k.condensation || k.maxHeatFlow != nil || k.maxTempChange != nil ||
		k.freezeHours != nil || k.energyCode != nil || k.economic
}

// thinnest finds the thinnest candidate that meets a criterion: 0 when the surface
// already meets it without the sized layer, else by bisection, assuming a thicker layer
// never does worse. found is false when even the thickest fails.
func thinnest(cands []float64, meets func(float64) (bool, error)) (float64, bool, error) {
	ok, err := meets(0)
	if err != nil || ok {
		return 0, ok, err
	}
	hi := len(cands) - 1
	if ok, err := meets(cands[hi]); err != nil || !ok {
		return 0, false, err
	}
	lo := -1 // cands[lo] fails (lo = -1: bare fails)
	for hi-lo > 1 {
		mid := (lo + hi) / 2
		ok, err := meets(cands[mid])
		if err != nil {
			return 0, false, err
		}
		if ok {
			hi = mid
		} else {
			lo = mid
		}
	}
	return cands[hi], true, nil
}

// thinnestScan is thinnest without assuming that a thicker layer never does worse: each
// candidate in turn (a line at or above the air temperature under a cold sky has a colder
// surface the more it is insulated).
func thinnestScan(cands []float64, meets func(float64) (bool, error)) (float64, bool, error) {
	for _, t := range append([]float64{0}, cands...) {
		ok, err := meets(t)
		if err != nil || ok {
			return t, ok, err
		}
	}
	return 0, false, nil
}

// condensationMonotone reports whether more insulation can only warm the coldest surface:
// a line colder than both the air and the surroundings at the condensation conditions.
func (a *analyser) condensationMonotone() bool {
	l := a.l
	air := l.condensation.air
	return l.opC < air.TempC && l.opC < air.SurroundingsC
}

// thinnestAbove is find over thicker builds only: the bare surface is not tried again.
func thinnestAbove(find func([]float64, func(float64) (bool, error)) (float64, bool, error),
	cands []float64, meets func(float64) (bool, error)) (float64, bool, error) {
	return find(cands, func(t float64) (bool, error) {
		if t == 0 {
			return false, nil
		}
		return meets(t)
	})
}

// criteria lists the criteria switched on for this line: the first n of list.
func (a *analyser) criteria() (list [6]criterion, n int) {
	l := a.l
	k := l.crit
	add := func(c criterion) {
		list[n] = c
		n++
	}
	if k.personnel {
		add(criterion{kind: critPersonnel, key: "personnel_protection", label: "personnel protection"})
	}
	if k.condensation {
		set := l.condensation
		add(criterion{kind: critCondensation, key: "condensation", label: "condensation control", dew: *set.dew})
		if *set.rh > 88 && l.opC < set.air.TempC {
			l.warn("relative humidity above about 88 %%: the thickness needed to prevent condensation grows without bound as the air nears saturation")
		}
	}
	if k.maxHeatFlow != nil {
		add(criterion{kind: critMaxHeatFlow, key: "max_heat_flow", label: "maximum heat flow"})
	}
	if k.maxTempChange != nil {
		add(criterion{kind: critMaxTempChange, key: "max_temp_change", label: "maximum temperature change"})
	}
	if k.freezeHours != nil && a.freezeApplies() {
		add(criterion{kind: critFreeze, key: "freeze", label: "freeze protection"})
	}
	if j := l.jacket; j != nil && j.MaxSurfaceC > 0 && l.opC > j.MaxSurfaceC {
		add(criterion{kind: critJacket, key: CheckJacketMaxTemp, label: "jacket temperature limit"})
	}
	return list, n
}

// setSizing records criterion kind's thinnest thickness.
func (a *analyser) setSizing(kind critKind, t *float64) {
	s := &a.out.Sizing
	switch kind {
	case critPersonnel:
		s.PersonnelProtectionMM = t
	case critCondensation:
		s.CondensationMM = t
	case critMaxHeatFlow:
		s.MaxHeatFlowMM = t
	case critMaxTempChange:
		s.MaxTempChangeMM = t
	case critFreeze:
		s.FreezeMM = t
	case critJacket:
		s.JacketMaxTempMM = t
	}
}

// meets tests the sized layer at tMM against criterion c, at the criterion's conditions.
func (a *analyser) meets(c *criterion, tMM float64) (bool, error) {
	l := a.l
	k := l.crit
	switch c.kind {
	case critPersonnel:
		r, err := a.solve(tMM, l.opC, l.personnel.air)
		return hottest(r) <= k.maxSurfaceC, err
	case critCondensation:
		r, err := a.solve(tMM, l.opC, l.condensation.air)
		return coldest(r) >= c.dew+k.dewMarginK, err
	case critMaxHeatFlow:
		r, err := a.solve(tMM, l.opC, l.design.air)
		q := r.HeatFlowPerM
		if l.shape.IsFlat() {
			q = r.HeatFlux
		}
		return math.Abs(q) <= *k.maxHeatFlow, err
	case critMaxTempChange:
		outC, err := a.outlet(tMM)
		return math.Abs(l.opC-outC) <= *k.maxTempChange, err
	case critJacket:
		t, err := a.jacketSurface(tMM)
		return t <= l.jacket.MaxSurfaceC, err
	default: // critFreeze
		h0, hf, err := a.freezeHours(tMM)
		if k.freezeBasis == "fraction" {
			return hf >= *k.freezeHours, err
		}
		return h0 >= *k.freezeHours, err
	}
}

// outOfService says why a build of the sized material is not proposed.
func (a *analyser) outOfService() string {
	name := "the sized material"
	if m := a.l.outerMaterial; m != nil {
		name = m.Name + fmt.Sprintf(" (service range %s to %s °C)", fmtRound(m.MinC, 0), fmtRound(m.MaxC, 0))
	}
	return "not proposed: " + name + " would lie outside its service temperature range; use a material rated for this temperature, or an inner layer of one"
}

// unmet says in words why no available build meets criterion c, and what would help.
func (a *analyser) unmet(c *criterion) string {
	l := a.l
	k := l.crit
	switch c.kind {
	case critPersonnel:
		if air := l.personnel.air; math.Max(air.TempC, air.SurroundingsC) >= k.maxSurfaceC {
			return fmt.Sprintf("the personnel ambient (%s °C air, %s °C surroundings) is itself at or above the %s °C touch limit, "+
				"so no insulation can bring the surface below it: guard the line, or give the personnel conditions where people can touch it",
				fmtRound(air.TempC, 1), fmtRound(air.SurroundingsC, 1), fmtRound(k.maxSurfaceC, 1))
		}
		return fmt.Sprintf("no available build keeps the surface at or below %s °C: guard the line, use a jacket of higher emittance "+
			"(painted or non-metallic) or a material of lower conductivity", fmtRound(k.maxSurfaceC, 1))
	case critCondensation:
		if rh := *l.condensation.rh; rh > 88 {
			return fmt.Sprintf("at %.0f %% relative humidity the air is close to saturation: no practical thickness prevents condensation; "+
				"control the humidity, or accept and manage condensation", rh)
		}
		return "no available build keeps the surface above the dew point plus margin: use a material of lower conductivity, " +
			"a jacket of higher emittance, or lower the humidity"
	case critMaxHeatFlow:
		return fmt.Sprintf("no available build keeps the heat flow at or below %s %s: use a material of lower conductivity "+
			"or a jacket of lower emittance", fmtRound(*k.maxHeatFlow, 1), heatFlowUnit(l))
	case critMaxTempChange:
		return fmt.Sprintf("no available build keeps the temperature change within %s K; raise the flow or shorten the run", fmtRound(*k.maxTempChange, 1))
	case critJacket:
		return fmt.Sprintf("no available build keeps the surface within the %s °C limit of %s: use a metal jacket", fmtRound(l.jacket.MaxSurfaceC, 1), l.jacket.Name)
	default: // critFreeze
		return fmt.Sprintf("no available build holds the water above freezing for %s h: heat tracing is needed", fmtRound(*k.freezeHours, 1))
	}
}

// energyCode builds the compliance row and the thinnest candidate that meets the code.
func (a *analyser) energyCode(cands []float64) error {
	l, o := a.l, a.out
	t := l.crit.energyCode
	if t == nil {
		return nil
	}
	if !t.Covers(l.in.System) || (t.Kind == "pipe") != l.shape.IsPipe() {
		// Not checked: the table does not govern this line. No thickness follows from it.
		why := "not covered by " + t.Title()
		if t.Kind == "pipe" && !l.shape.IsPipe() {
			why += ": a pipe table, and this line is not a pipe"
		}
		o.EnergyCode = &EnergyCodeRow{Table: t.Name, Edition: t.Edition, Reason: why, System: l.in.System,
			SpecifiedMM: o.InsulationMM, Source: t.Source}
		l.assumeText("energy code: " + why)
		return nil
	}
	row, _, col, required := t.Lookup(l.opC, l.nominalIn)
	out := &EnergyCodeRow{Table: t.Name, Edition: t.Edition, Applies: true, System: l.in.System, Required: required,
		SpecifiedMM: o.InsulationMM, Pass: true, Source: t.Source, SizeUsed: l.sizeUsed, SizeBasis: l.sizeBasis}
	if l.sizeBasis == "matched_od" {
		l.assumeText("energy code: the outside diameter matches " + l.sizeUsed + " within 0.5 mm, so its column is read for that size")
	} else if l.sizeBasis == "od" {
		l.assumeText("energy code: the outside diameter matches no standard size of its family, so the column is read for the diameter itself in inches")
	}
	if col >= 0 {
		out.Column = t.Columns[col].Label
	}
	o.EnergyCode = out
	if !required || col < 0 {
		out.Row = "no requirement (between the cooling and heating ranges)"
		o.Sizing.EnergyCodeMM = a.num(0.0)
		return nil
	}
	out.Row = row.Service + " " + row.Label + " °F"
	tableMM := row.ThicknessIn[col] * 25.4
	out.TableThicknessMM = a.num(round(tableMM, 2))
	out.KRangeWmK = []float64{round(row.KMin*btuInToSI, 5), round(row.KMax*btuInToSI, 5)}
	meanC := (row.MeanRatingF - 32) * 5 / 9
	outer := l.base.Layers[len(l.base.Layers)-1]
	kSI, _ := outer.K.At(meanC)
	out.KAtMeanWmK = a.num(round(kSI, 5))
	kBtu := kSI / btuInToSI
	corrected := tableMM
	if kBtu < row.KMin || kBtu > row.KMax {
		ref := t.RefK(*row)
		c, err := calc.CodeCorrectedThickness(l.base.PipeOD/2, tableMM/1000, kBtu, ref)
		if err != nil {
			return fmt.Errorf("energy-code correction: %w", err)
		}
		corrected = c * 1000
		var buf [256]byte
		l.assumeText(words{buf[:0]}.s("energy code: k ").f(kBtu, 3).s(" Btu·in/h·ft²·°F at ").f(row.MeanRatingF, 0).
			s(" °F lies outside the row's ").f(row.KMin, 2).s("–").f(row.KMax, 2).
			s(", so the table thickness is corrected by T = r[(1 + t/r)^(K/k) − 1] with k = ").f(ref, 2).
			s(" (the ").s(t.RefEnd).s(" end of the row's range)").String())
	}
	out.CorrectedMM = a.num(round(corrected, 2))
	out.Pass = o.InsulationMM >= corrected-0.005
	inner := o.InsulationMM - outer.Thickness*1000/l.installed[len(l.installed)-1]
	need := corrected - inner
	if n := len(l.base.Layers); n > 1 {
		// Several layers: by thermal resistance per metre, each layer at its own k at the
		// table's mean rating temperature, against the table thickness at the reference k
		// (the basis of the footnote correction, which assumes one material).
		r0 := l.base.PipeOD / 2
		r, rInner := r0, 0.0
		for _, ly := range l.base.Layers[:n-1] {
			k, _ := ly.K.At(meanC)
			rInner += math.Log((r+ly.Thickness)/r) / (2 * math.Pi * k)
			r += ly.Thickness
		}
		rReq := math.Log((r0+tableMM/1000)/r0) / (2 * math.Pi * t.RefK(*row) * btuInToSI)
		rBuild := rInner + math.Log((r+outer.Thickness)/r)/(2*math.Pi*kSI)
		out.Pass = rBuild >= rReq*(1-1e-9)
		a.codeResistance = &[2]float64{rBuild, rReq}
		x := 0.0 // the outer layer (installed) that brings the inner ones to the requirement
		if rReq > rInner {
			x = r * (math.Exp((rReq-rInner)*2*math.Pi*kSI) - 1)
		}
		need = x * 1000 / l.installed[n-1]
		corrected = inner + need
		out.CorrectedMM = a.num(round(corrected, 2))
		var buf [256]byte
		l.assumeText(words{buf[:0]}.s("energy code: a build of several layers is judged by its thermal resistance per metre, each layer at its own k at ").
			f(row.MeanRatingF, 0).s(" °F: ").f(rBuild, 3).s(" m·K/W against ").f(rReq, 3).
			s(" m·K/W for the table thickness at k = ").f(t.RefK(*row), 2).s(" Btu·in/h·ft²·°F; corrected_mm is the total that meets it with the inner layers as given").String())
	}
	for _, c := range cands {
		if c >= need-0.005 {
			if ok, err := a.admissible(c); err != nil {
				return err
			} else if !ok {
				o.Sizing.Unmet = append(o.Sizing.Unmet, "energy_code")
				l.warn("energy code: %s", a.outOfService())
				return nil
			}
			o.Sizing.EnergyCodeMM = a.num(c)
			break
		}
	}
	if need <= 0 {
		o.Sizing.EnergyCodeMM = a.num(0.0)
	}
	if o.Sizing.EnergyCodeMM == nil {
		o.Sizing.Unmet = append(o.Sizing.Unmet, "energy_code")
		l.warn("energy code: no available build reaches the required %.1f mm: use a material of lower conductivity "+
			"(the required thickness grows with it)", corrected)
	}
	return nil
}

// btuInToSI converts Btu·in/(h·ft²·°F) to W/m·K.
const btuInToSI = catalog.BtuInToWmK

// governing picks the criterion that needs the most insulation, and the layers to
// install it. A criterion no available build meets governs with no thickness: the
// line is never proposed below an unmet requirement.
func (a *analyser) governing() {
	l, s := a.l, &a.out.Sizing
	for _, u := range s.Unmet {
		if u != "economic" {
			s.Governing = ptr(u)
			return
		}
	}
	type cand struct {
		key string
		t   *float64
	}
	list := []cand{{"personnel_protection", s.PersonnelProtectionMM}, {"condensation", s.CondensationMM},
		{"max_heat_flow", s.MaxHeatFlowMM}, {"max_temp_change", s.MaxTempChangeMM}, {"freeze", s.FreezeMM},
		{"energy_code", s.EnergyCodeMM}, {CheckJacketMaxTemp, s.JacketMaxTempMM}}
	if l.crit.economic {
		list = append(list, cand{"economic", s.EconomicMM})
	}
	best := -1
	for i, c := range list {
		if c.t != nil && (best < 0 || *c.t > *list[best].t) {
			best = i
		}
	}
	if best < 0 {
		return
	}
	s.Governing = ptr(list[best].key)
	s.GoverningThicknessMM = a.num(*list[best].t)
	n := len(l.base.Layers)
	for i := 0; i < n-1; i++ {
		s.LayersProposed = append(s.LayersProposed, LayerPlan{Material: l.layerMaterials[i], ThicknessMM: round(l.base.Layers[i].Thickness*1000, 2)})
	}
	t := *s.GoverningThicknessMM
	if t == 0 {
		return
	}
	slug := l.layerMaterials[n-1]
	plan := a.layerPlan(t)
	for _, p := range plan {
		s.LayersProposed = append(s.LayersProposed, LayerPlan{Material: slug, ThicknessMM: round(p, 2)})
	}
	if len(plan) > 1 {
		name := "the sized layer"
		if m := l.outerMaterial; m != nil {
			name = m.Name
		}
		l.warn("%.0f mm is more than the largest single layer of %s (%.0f mm): proposed as %d layers with staggered joints (common practice)",
			t, name, l.maxLayerMM, len(plan))
	}
}

// heatTrace gives the heat-tracing load: on any pipe line whose criteria give a
// maintain temperature above the cold-design air, and on water lines whose insulation as
// specified cannot hold the water above freezing for the required time.
func (a *analyser) heatTrace() error {
	l, o := a.l, a.out
	k := l.crit
	air := l.freeze.air
	why := "to hold the fluid at it"
	switch {
	case k.maintainGiven && l.shape.IsPipe():
		if air.TempC >= k.maintainC {
			l.assume("heat tracing: the cold-design air %s °C is not below the maintain temperature %s °C, so none is needed",
				fmtRound(air.TempC, 1), fmtRound(k.maintainC, 1))
			return nil
		}
	case k.freezeHours != nil && o.FreezeHoursTo0C != nil:
		have := *o.FreezeHoursTo0C
		if k.freezeBasis == "fraction" {
			have = *o.FreezeHoursToFreeze
		}
		if have >= *k.freezeHours {
			return nil
		}
		why = "because the insulation alone does not meet freeze_hours"
	default:
		return nil
	}
	r, err := a.solve(asSpecified, k.maintainC, air)
	if err != nil {
		return err
	}
	q := r.HeatFlowPerM
	basis := "freeze_model \"full\": wall and films counted"
	if a.handbookBasis(asSpecified) {
		rt, err := a.insulationResistance(asSpecified, r)
		if err != nil {
			return err
		}
		q = (k.maintainC - air.TempC) / rt
		basis = "handbook basis: insulation resistance only, wall and films neglected (conservative)"
	}
	o.HeatTraceWPerM = a.num(round(q*k.heatTraceFactor, 3))
	l.assume("heat tracing maintains %s °C (%s) in the cold-design air %s °C (the freeze conditions) with the insulation as specified, "+
		"%s; safety factor %s on the load (%s)",
		fmtRound(k.maintainC, 1), why, fmtRound(air.TempC, 1), basis, fmtNum(k.heatTraceFactor), traceFactorSource(l))
	if l.lengthM > 0 {
		extra, err := a.traceExtrasW(q)
		if err != nil {
			return err
		}
		o.HeatTraceW = a.num(round((q*l.equivLengthM+extra)*k.heatTraceFactor, 1))
		l.assume("heat tracing per run: the length plus the insulated fittings' equivalent lengths (%s m), bare fittings by their bare area, "+
			"and the supports, all at the maintain temperature and times the safety factor", fmtRound(l.equivLengthM, 1))
	}
	return nil
}

// traceExtrasW is the heat, W, that the run loses at the maintain temperature in the
// cold-design air beyond q' × equivalent length: bare fittings (bare area at the bare
// flux, as the run's heat does), removable covers (taken as the line's insulation,
// q' per metre) and the supports (clamps as a hanger-rod fin, or the given W/K each).
func (a *analyser) traceExtrasW(qPerM float64) (float64, error) {
	l := a.l
	k := l.crit
	air := l.freeze.air
	dT := k.maintainC - air.TempC
	var w float64
	var bare *calc.Result
	bareRes := func() (calc.Result, error) {
		if bare == nil {
			r, err := a.solve(bareSurface, k.maintainC, air)
			if err != nil {
				return r, err
			}
			bare = &r
		}
		return *bare, nil
	}
	for _, f := range l.fittings {
		switch f.finish {
		case FinishBare:
			r, err := bareRes()
			if err != nil {
				return 0, err
			}
			w += r.HeatFlux * float64(f.count) * f.bareAreaM
		case FinishCover:
			w += qPerM * float64(f.count) * f.lengthM
		}
	}
	if s := l.supports; s != nil && l.supportSpacing > 0 {
		n := math.Ceil(l.lengthM/l.supportSpacing - 1e-9)
		var chi float64
		switch {
		case s.WPerK != nil:
			chi = *s.WPerK
		case s.Kind == SupportInsert:
			// An insert under the insulation adds little beside the fin of a bare clamp;
			// counted as the clamp's rod would be is conservative.
			fallthrough
		default:
			r, err := bareRes()
			if err != nil {
				return 0, err
			}
			d := catalog.SupportRodDiameterMM(l.fittingNominalIn()) / 1000
			chi = calc.InfiniteFinConductance(r.HConv+r.HRad, math.Pi*d, catalog.SupportRodKWmK, math.Pi*d*d/4)
		}
		w += n * chi * dT
		l.assume("heat tracing: %.0f supports at %s W/K each (a hanger rod as an infinite fin unless supports.w_per_k is given; conservative for inserts)",
			n, fmtRound(chi, 3))
	}
	return w, nil
}

// traceFactorSource says where the heat-tracing safety factor came from.
func traceFactorSource(l *line) string {
	if l.in.Criteria != nil && l.in.Criteria.HeatTraceFactor != nil {
		return "given"
	}
	return "our default 1.2"
}

// condensationAtGoverning warns when the governing thickness, chosen by another criterion,
// lets the surface fall below the dew point plus margin (possible only where more
// insulation makes the surface colder: a line at or above the air under a cold sky).
func (a *analyser) condensationAtGoverning() error {
	l, s := a.l, &a.out.Sizing
	if !l.crit.condensation || s.GoverningThicknessMM == nil || a.condensationMonotone() {
		return nil
	}
	r, err := a.solve(*s.GoverningThicknessMM, l.opC, l.condensation.air)
	if err != nil {
		return err
	}
	if dp := *l.condensation.dew; coldest(r) < dp+l.crit.dewMarginK {
		a.condensationWarning(r, dp, "at the governing "+fmtRound(*s.GoverningThicknessMM, 1)+" mm")
	}
	return nil
}
