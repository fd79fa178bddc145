package analysis

import (
	"fmt"
	"math"
	"slices"

	"lagwright/calc"
	"lagwright/catalog"
)

// criterion is one sizing criterion: its output key and a test of one thickness.
type criterion struct {
	key   string
	label string
	dst   **float64
	meets func(tMM float64) (bool, error)
	unmet func() string // why nothing meets it, in words (only worded when needed)
}

// candidates are the thicknesses the sized layer may take, ascending.
func (a *analyser) candidates() []float64 {
	l := a.l
	var c []float64
	switch {
	case len(l.in.ThicknessesMM) > 0:
		c = slices.Clone(l.in.ThicknessesMM)
	case l.outerMaterial != nil && len(l.outerMaterial.ThicknessesMM) > 0:
		c = slices.Clone(l.outerMaterial.ThicknessesMM)
		l.assumeText("candidate thicknesses: the series of " + l.outerMaterial.Name)
	default:
		c = catalog.ThicknessSeriesInch()
		l.assume("candidate thicknesses: ½ in steps (no material series for the sized layer)")
	}
	slices.Sort(c)
	return slices.Compact(c)
}

// size judges every criterion at its own conditions, each by bisection over the
// candidate thicknesses (monotone criteria), and picks the governing one.
func (a *analyser) size() error {
	l, o := a.l, &a.out
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
	crits := a.criteria()
	for _, c := range crits {
		t, found, err := thinnest(cands, c.meets)
		if err != nil {
			return fmt.Errorf("%s: %w", c.label, err)
		}
		if !found {
			o.Sizing.Unmet = append(o.Sizing.Unmet, c.key)
			l.warn("%s: %s", c.label, c.unmet())
			continue
		}
		*c.dst = a.num(t)
	}
	if err := a.energyCode(cands); err != nil {
		return err
	}
	if err := a.economics(cands); err != nil {
		return err
	}
	a.governing()
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

// criteria lists the criteria switched on for this line.
func (a *analyser) criteria() []criterion {
	l, s := a.l, &a.out.Sizing
	k := l.crit
	var out []criterion
	if k.personnel {
		set := l.personnel
		out = append(out, criterion{key: "personnel_protection", label: "personnel protection", dst: &s.PersonnelProtectionMM,
			meets: func(t float64) (bool, error) {
				r, err := a.solve(t, l.opC, set.air)
				return hottest(r) <= k.maxSurfaceC, err
			},
			unmet: func() string {
				return fmt.Sprintf("no available thickness keeps the surface at or below %.0f °C; consider a guard or a different jacket", k.maxSurfaceC)
			}})
	}
	if k.condensation {
		set := l.condensation
		dp, _ := calc.DewPoint(set.air.TempC, *set.rh)
		msg := func() string {
			if *set.rh > 88 {
				return fmt.Sprintf("at %.0f %% relative humidity the air is close to saturation: no practical thickness prevents condensation; "+
					"control the humidity, or accept and manage condensation", *set.rh)
			}
			return "no available thickness keeps the surface above the dew point plus margin"
		}
		out = append(out, criterion{key: "condensation", label: "condensation control", dst: &s.CondensationMM,
			meets: func(t float64) (bool, error) {
				r, err := a.solve(t, l.opC, set.air)
				return coldest(r) >= dp+k.dewMarginK, err
			}, unmet: msg})
		if *set.rh > 88 {
			l.warn("relative humidity above about 88 %%: the thickness needed to prevent condensation grows without bound as the air nears saturation")
		}
	}
	if k.maxHeatFlow != nil {
		out = append(out, criterion{key: "max_heat_flow", label: "maximum heat flow", dst: &s.MaxHeatFlowMM,
			meets: func(t float64) (bool, error) {
				r, err := a.solve(t, l.opC, l.design.air)
				q := r.HeatFlowPerM
				if l.shape.IsFlat() {
					q = r.HeatFlux
				}
				return math.Abs(q) <= *k.maxHeatFlow, err
			},
			unmet: func() string {
				return fmt.Sprintf("no available thickness keeps the heat flow at or below %s", fmtNum(*k.maxHeatFlow))
			}})
	}
	if k.maxTempChange != nil {
		out = append(out, criterion{key: "max_temp_change", label: "maximum temperature change", dst: &s.MaxTempChangeMM,
			meets: func(t float64) (bool, error) {
				outC, err := a.outlet(t)
				return math.Abs(l.opC-outC) <= *k.maxTempChange, err
			},
			unmet: func() string {
				return fmt.Sprintf("no available thickness keeps the temperature change within %s K; raise the flow or shorten the run", fmtNum(*k.maxTempChange))
			}})
	}
	if k.freezeHours != nil && a.freezeApplies() {
		out = append(out, criterion{key: "freeze", label: "freeze protection", dst: &s.FreezeMM,
			meets: func(t float64) (bool, error) {
				h0, hf, err := a.freezeHours(t)
				if k.freezeBasis == "fraction" {
					return hf >= *k.freezeHours, err
				}
				return h0 >= *k.freezeHours, err
			},
			unmet: func() string {
				return fmt.Sprintf("no available thickness holds the water above freezing for %s h: heat tracing is needed", fmtNum(*k.freezeHours))
			}})
	}
	return out
}

// energyCode builds the compliance row and the thinnest candidate that meets the code.
func (a *analyser) energyCode(cands []float64) error {
	l, o := a.l, &a.out
	t := l.crit.energyCode
	if t == nil {
		return nil
	}
	row, _, col, required := t.Lookup(l.opC, l.nominalIn)
	out := &EnergyCodeRow{Table: t.Name, Edition: t.Edition, Required: required,
		SpecifiedMM: o.InsulationMM, Pass: true, Source: t.Source}
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
		l.assumeText("energy code: k " + fmtF(kBtu, 3) + " Btu·in/h·ft²·°F at " + fmtF(row.MeanRatingF, 0) + " °F lies outside the row's " +
			fmtF(row.KMin, 2) + "–" + fmtF(row.KMax, 2) + ", so the table thickness is corrected " +
			"by T = r[(1 + t/r)^(K/k) − 1] with k = " + fmtF(ref, 2) + " (the " + t.RefEnd + " end)")
	}
	if len(l.base.Layers) > 1 {
		l.assume("energy code: the total insulation thickness is compared, with the outermost layer's conductivity")
	}
	out.CorrectedMM = a.num(round(corrected, 2))
	out.Pass = o.InsulationMM >= corrected-0.005
	inner := o.InsulationMM - outer.Thickness*1000/l.installed[len(l.installed)-1]
	need := corrected - inner
	for _, c := range cands {
		if c >= need-0.005 {
			o.Sizing.EnergyCodeMM = a.num(c)
			break
		}
	}
	if need <= 0 {
		o.Sizing.EnergyCodeMM = a.num(0.0)
	}
	if o.Sizing.EnergyCodeMM == nil {
		o.Sizing.Unmet = append(o.Sizing.Unmet, "energy_code")
		l.warn("energy code: no available thickness reaches the required %.1f mm", corrected)
	}
	return nil
}

// btuInToSI converts Btu·in/(h·ft²·°F) to W/m·K.
const btuInToSI = catalog.BtuInToWmK

// governing picks the criterion that needs the most insulation, and the layers to
// install it (two layers with staggered joints above the largest single layer).
func (a *analyser) governing() {
	l, s := a.l, &a.out.Sizing
	type cand struct {
		key string
		t   *float64
	}
	list := []cand{{"personnel_protection", s.PersonnelProtectionMM}, {"condensation", s.CondensationMM},
		{"max_heat_flow", s.MaxHeatFlowMM}, {"max_temp_change", s.MaxTempChangeMM}, {"freeze", s.FreezeMM},
		{"energy_code", s.EnergyCodeMM}}
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
	if m := l.outerMaterial; m != nil && m.MaxLayerMM > 0 && t > m.MaxLayerMM+0.005 {
		k := int(math.Ceil(t / m.MaxLayerMM))
		for i := 0; i < k; i++ {
			s.LayersProposed = append(s.LayersProposed, LayerPlan{Material: slug, ThicknessMM: round(t/float64(k), 2)})
		}
		l.warn("%.0f mm is more than the largest single layer of %s (%.0f mm): proposed as %d layers with staggered joints (common practice)",
			t, m.Name, m.MaxLayerMM, k)
		return
	}
	s.LayersProposed = append(s.LayersProposed, LayerPlan{Material: slug, ThicknessMM: t})
}

// heatTrace gives the heat-tracing load where the insulation as specified cannot hold
// the water above freezing for the required time.
func (a *analyser) heatTrace() error {
	l, o := a.l, &a.out
	k := l.crit
	if k.freezeHours == nil || o.FreezeHoursTo0C == nil {
		return nil
	}
	have := *o.FreezeHoursTo0C
	if k.freezeBasis == "fraction" {
		have = *o.FreezeHoursToFreeze
	}
	if have >= *k.freezeHours {
		return nil
	}
	r, err := a.solve(asSpecified, k.maintainC, l.freeze.air)
	if err != nil {
		return err
	}
	o.HeatTraceWPerM = a.num(round(r.HeatFlowPerM*k.heatTraceFactor, 3))
	l.assume("heat tracing holds %s °C at the freeze conditions with the insulation as specified, times a safety factor %s (our default 1.2)",
		fmtNum(k.maintainC), fmtNum(k.heatTraceFactor))
	return nil
}
