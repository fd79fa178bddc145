package analysis

import (
	"math"
	"strconv"

	"lagwright/calc"
)

// checks judges every active criterion on the build as specified, each at its own
// conditions, into the answer's checks: the verdict the badges, counts and schedule
// read. Sizing says what would be enough; checks say whether what is drawn is.
func (a *analyser) checks() error {
	l, o := a.l, a.out
	k := l.crit
	o.Checks = make([]Check, 0, 6)
	add := func(c Check) {
		c.Value = round(c.Value, 3)
		c.Limit = round(c.Limit, 3)
		o.Checks = append(o.Checks, c)
	}
	if k.personnel {
		r, err := a.solve(asSpecified, l.opC, l.personnel.air)
		if err != nil {
			return err
		}
		t := hottest(r)
		add(Check{Criterion: "personnel_protection", Label: "personnel protection: hottest surface",
			Pass: t <= k.maxSurfaceC, Value: t, Limit: k.maxSurfaceC, Unit: "°C", Sense: "max"})
	}
	if k.condensation {
		set := l.condensation
		r, err := a.solve(asSpecified, l.opC, set.air)
		if err != nil {
			return err
		}
		dp, err := calc.DewPoint(set.air.TempC, *set.rh)
		if err != nil {
			return err
		}
		t, need := coldest(r), dp+k.dewMarginK
		add(Check{Criterion: "condensation", Label: "condensation control: coldest surface against dew point + margin",
			Pass: t >= need, Value: t, Limit: need, Unit: "°C", Sense: "min"})
	}
	if k.maxHeatFlow != nil {
		r, err := a.solve(asSpecified, l.opC, l.design.air)
		if err != nil {
			return err
		}
		q, unit := r.HeatFlowPerM, "W/m"
		if l.shape.IsFlat() {
			q, unit = r.HeatFlux, "W/m²"
		}
		add(Check{Criterion: "max_heat_flow", Label: "maximum heat flow",
			Pass: math.Abs(q) <= *k.maxHeatFlow, Value: math.Abs(q), Limit: *k.maxHeatFlow, Unit: unit, Sense: "max"})
	}
	if k.maxTempChange != nil && l.in.Flow != nil && l.lengthM > 0 {
		outC, err := a.outlet(asSpecified)
		if err != nil {
			return err
		}
		d := math.Abs(l.opC - outC)
		add(Check{Criterion: "max_temp_change", Label: "maximum temperature change over the run",
			Pass: d <= *k.maxTempChange, Value: d, Limit: *k.maxTempChange, Unit: "K", Sense: "max"})
	}
	if k.freezeHours != nil && a.freezeApplies() {
		h0, hf, err := a.freezeHours(asSpecified)
		if err != nil {
			return err
		}
		h, label := h0, "freeze protection: hours of still water to 0 °C"
		if k.freezeBasis == "fraction" {
			h, label = hf, "freeze protection: hours of still water until the frozen fraction"
		}
		add(Check{Criterion: "freeze", Label: label, Pass: h >= *k.freezeHours, Value: finiteHours(h),
			Limit: *k.freezeHours, Unit: "h", Sense: "min"})
	}
	if ec := o.EnergyCode; ec != nil && ec.Required && ec.CorrectedMM != nil {
		c := Check{Criterion: "energy_code", Label: "energy code minimum thickness", Pass: ec.Pass,
			Value: ec.SpecifiedMM, Limit: *ec.CorrectedMM, Unit: "mm", Sense: "min"}
		if a.codeResistance != nil {
			c.Label = "energy code minimum, by the build's thermal resistance"
			c.Value, c.Limit, c.Unit = a.codeResistance[0], a.codeResistance[1], "m·K/W"
		}
		add(c)
	}
	return a.limitChecks()
}

// finiteHours keeps an unbounded freeze time (the water never reaches 0 °C) printable.
func finiteHours(h float64) float64 {
	if math.IsInf(h, 1) || h > 1e6 {
		return 1e6
	}
	return h
}

// limitChecks adds the checks of the materials' own limits on the build as specified:
// the jacket's surface-temperature limit (at the hottest of the design and personnel
// conditions) and each layer's service range (at the design conditions).
func (a *analyser) limitChecks() error {
	l, o := a.l, a.out
	if len(l.base.Layers) == 0 {
		return nil
	}
	if j := l.jacket; j != nil && j.MaxSurfaceC > 0 && l.opC > j.MaxSurfaceC { // a colder line cannot heat it past its limit
		t, err := a.jacketSurface(asSpecified)
		if err != nil {
			return err
		}
		o.Checks = append(o.Checks, Check{Criterion: CheckJacketMaxTemp, Label: "jacket surface against the jacket's temperature limit",
			Pass: t <= j.MaxSurfaceC, Value: round(t, 3), Limit: j.MaxSurfaceC, Unit: "°C", Sense: "max"})
	}
	r, err := a.solve(asSpecified, l.opC, l.design.air)
	if err != nil {
		return err
	}
	if v, ok := serviceWorst(l.base.Layers, r, 0, l.opC >= l.design.air.TempC); ok {
		v.Value, v.Limit = round(v.Value, 3), round(v.Limit, 3)
		o.Checks = append(o.Checks, v)
	}
	return nil
}

// jacketSurface is the hottest surface of the build with the sized layer at tMM, at the
// design and at the personnel conditions (the jacket meets both).
func (a *analyser) jacketSurface(tMM float64) (float64, error) {
	l := a.l
	r, err := a.solve(tMM, l.opC, l.design.air)
	if err != nil {
		return 0, err
	}
	p, err := a.solve(tMM, l.opC, l.personnel.air)
	if err != nil {
		return 0, err
	}
	return math.Max(hottest(r), hottest(p)), nil
}

// serviceWorst judges the layers from index first on against their materials' service
// ranges (the upper limit on a hot line, the lower on a cold one): the face with the
// least room (or the farthest outside), as a check. ok is false when no layer has limits.
func serviceWorst(layers []calc.Layer, r calc.Result, first int, hotLine bool) (c Check, ok bool) {
	room := math.Inf(1)
	for i := first; i < len(layers) && i < len(r.Layers); i++ {
		ly, st := layers[i], r.Layers[i]
		if !ly.HasLimits {
			continue
		}
		hot, cold := math.Max(st.InnerC, st.OuterC), math.Min(st.InnerC, st.OuterC)
		name := ly.Name
		if name == "" {
			name = "layer " + strconv.Itoa(i+1)
		}
		if d := ly.MaxC - hot; hotLine && d < room {
			room, ok = d, true
			c = Check{Criterion: CheckServiceTemp, Label: "hottest face of " + name + " against its service limit",
				Pass: d >= 0, Value: hot, Limit: ly.MaxC, Unit: "°C", Sense: "max"}
		}
		if d := cold - ly.MinC; !hotLine && d < room {
			room, ok = d, true
			c = Check{Criterion: CheckServiceTemp, Label: "coldest face of " + name + " against its service limit",
				Pass: d >= 0, Value: cold, Limit: ly.MinC, Unit: "°C", Sense: "min"}
		}
	}
	return c, ok
}

// admissible reports whether the sized layers at tMM stay within their service range
// (design conditions): a material outside it is never proposed.
func (a *analyser) admissible(tMM float64) (bool, error) {
	l := a.l
	n := len(l.base.Layers)
	if tMM <= 0 || n == 0 {
		return true, nil
	}
	if n == 1 && len(a.layerPlan(tMM)) == 1 {
		// One layer: its faces span the pipe and the surface at any thickness, so the
		// build as specified (solved already) tells, without another solve.
		tMM = asSpecified
	}
	r, err := a.solve(tMM, l.opC, l.design.air)
	if err != nil {
		return false, err
	}
	sys := a.system(tMM)
	c, ok := serviceWorst(sys.Layers, r, n-1, l.opC >= l.design.air.TempC)
	return !ok || c.Pass, nil
}
