package calc

import (
	"errors"
	"fmt"
	"math"
)

const (
	solveTolK    = 1e-7 // K: |fluid-side temperature − fluid temperature| at convergence
	solveTolTs   = 1e-6 // K: width of the surface-temperature bracket that ends the search
	solveMaxEval = 100  // residual evaluations per path
	guessPasses  = 3    // linearised passes of the starting guess (see guess)
	guessCoeff   = 5.0  // W/m²·K: a typical still-air convective coefficient, for guess's first pass
)

// Solve computes the steady heat balance of sys carrying a fluid at fluidC (°C) in the
// environment air. The surface temperature is found by a bracketed Newton iteration
// safeguarded by bisection: the residual marches from the surface inward with the surface
// heat flow (each layer's k at its own mean temperature) and compares the fluid-side
// temperature with fluidC. Ducts solve each face as a parallel path (see solveDuct).
func Solve(sys System, fluidC float64, air Air) (Result, error) {
	if err := sys.Validate(); err != nil {
		return Result{}, err
	}
	if err := validateConditions(fluidC, air); err != nil {
		return Result{}, err
	}
	if sys.Shape == Duct {
		return solveDuct(sys, fluidC, air)
	}
	var p path
	p.build(sys)
	pr, err := p.solve(fluidC, air)
	if err != nil {
		return Result{}, err
	}
	res := Result{
		HeatFlowPerM:  pr.q,
		HeatFlux:      pr.q / p.area,
		SurfaceC:      pr.ts,
		PipeSurfaceC:  pr.under,
		Layers:        pr.layers,
		HConv:         pr.sf.hConv,
		HRad:          pr.sf.hRad,
		OuterAreaPerM: p.area,
		Evaluations:   pr.evals,
	}
	res.Warnings = p.warnings(sys, pr, air, "")
	if sys.Shape.IsPipe() {
		res.OuterDiameter = p.surf.d
		if w := criticalRadius(p.surf.d/2, pr); w != "" {
			res.Warnings = append(res.Warnings, w)
		}
	}
	return res, nil
}

// build lays out a pipe or flat system as one heat path.
func (p *path) build(sys System) {
	p.init(len(sys.Layers))
	p.surf = surface{emit: sys.Emittance, fixed: sys.FixedCoeff}
	if sys.Shape.IsPipe() {
		r := sys.PipeOD / 2
		ri := r - sys.PipeWall // inner wetted radius (the OD when the wall is not modelled)
		if sys.InnerCoeff > 0 {
			p.addG(sys.InnerCoeff * 2 * math.Pi * ri)
		}
		if sys.PipeWall > 0 {
			p.addG(2 * math.Pi * sys.WallK / math.Log(r/ri))
		}
		for _, l := range sys.Layers {
			r2 := r + l.Thickness
			p.addLayer(pathLayer{s: 2 * math.Pi / math.Log(r2/r), curve: l.K})
			r = r2
		}
		p.area = 2 * math.Pi * r
		p.surf.d, p.surf.lWind, p.surf.kind = 2*r, 2*r, surfCylH
		if sys.Shape == PipeVertical {
			p.surf.kind, p.surf.l = surfCylV, sys.Height
		}
		p.surf.solar = sys.SolarAbsorptance * solarShare(p.surf.kind)
		return
	}
	// Flat surfaces, per m²; the pipe wall does not apply.
	if sys.InnerCoeff > 0 {
		p.addG(sys.InnerCoeff)
	}
	for _, l := range sys.Layers {
		p.addLayer(pathLayer{s: 1 / l.Thickness, curve: l.K})
	}
	p.area = 1
	switch sys.Shape {
	case FlatVertical:
		p.surf.kind, p.surf.l, p.surf.lWind = surfPlateV, sys.Height, sys.Width
	case FlatUp, FlatDown:
		p.surf.kind = surfPlateUp
		if sys.Shape == FlatDown {
			p.surf.kind = surfPlateDown
		}
		p.surf.l = sys.PlateLength * sys.PlateWidth / (2 * (sys.PlateLength + sys.PlateWidth))
		p.surf.lWind = sys.PlateLength
	}
	p.surf.solar = sys.SolarAbsorptance * solarShare(p.surf.kind)
}

// pathResult is the solved state of one heat path.
type pathResult struct {
	ts, under float64 // surface and under-insulation temperatures, °C
	q         float64 // heat flow per path unit (W/m or W/m²), positive to the air
	sf        surfState
	layers    []LayerState
	evals     int
	jump      bool // the surface sits on a jump of the surface heat flow (see settleJump)
}

// settleJump finishes a solve whose residual jumps across zero at res.ts: it finds, by
// bisection on the heat flow between the two sides' values, the heat flow that conducts
// from the fluid temperature to res.ts, and reports the convective coefficient that carries
// it (between the two correlation branches).
func (p *path) settleJump(res *pathResult, fluid float64, air Air, qLo, qHi float64) error {
	if !finite(qLo) || !finite(qHi) {
		return nil // one side never evaluated: the last evaluation stands
	}
	var tin float64
	var err error
	q := res.q
	for range 200 {
		q = (qLo + qHi) / 2
		if tin, res.under, _, err = p.march(res.ts, q, 0); err != nil {
			return err
		}
		if math.Abs(tin-fluid) <= solveTolK || qHi-qLo <= 1e-12*math.Abs(q) {
			break
		}
		if tin < fluid {
			qLo = q
		} else {
			qHi = q
		}
	}
	res.q, res.jump = q, true
	flux := q / p.area
	if dt := res.ts - air.TempC; dt != 0 && p.surf.fixed == 0 {
		res.sf.hConv = (flux + p.surf.solar*air.SolarWm2 - RadiationFlux(p.surf.emit, res.ts, air.SurroundingsC)) / dt
	}
	res.sf.flux = flux
	return nil
}

// solve finds the surface temperature of the path.
func (p *path) solve(fluid float64, air Air) (res pathResult, err error) {
	eval := func(ts float64) (r, dr float64, err error) {
		res.evals++
		sf := p.surf.exchange(ts, air) // with its analytic slope d(flux)/dts
		q := sf.flux * p.area
		tin, under, dtin, err := p.march(ts, q, sf.slope*p.area)
		if err != nil {
			return 0, 0, err
		}
		res.ts, res.under, res.q, res.sf = ts, under, q, sf
		return tin - fluid, dtin, nil
	}
	// Layer states of the last evaluation, which is the reported one: p.states is this
	// path's own slice, written by every march and handed over with the result.
	defer func() { res.layers = p.states }()

	if p.nLayer == 0 && p.ng == 0 { // bare surface at the fluid temperature
		sf := p.surf.exchange(fluid, air)
		res.ts, res.under, res.q, res.sf = fluid, fluid, sf.flux*p.area, sf
		if !finite(res.q) {
			return res, errors.New("calc: surface heat flow is not finite")
		}
		return res, nil
	}
	// The surface lies between the fluid and the environment temperatures: at lo the
	// surface gains heat (residual ≤ 0), at hi it loses heat (residual ≥ 0).
	lo := math.Min(fluid, math.Min(air.TempC, air.SurroundingsC))
	hi := math.Max(fluid, math.Max(air.TempC, air.SurroundingsC))
	if p.surf.solar*air.SolarWm2 > 0 {
		// Sunlight can hold the surface above every other temperature: raise hi until
		// the surface loses heat there (past the sol-air temperature).
		for step := 10.0; p.surf.exchange(hi, air).flux < 0 && step < 1e4; step *= 2 {
			hi += step
		}
	}
	x := p.guess(fluid, air, lo, hi)
	dxOld := hi - lo // Newton steps must keep shrinking (Numerical Recipes' rtsafe)
	qLo, qHi := math.NaN(), math.NaN()
	for res.evals < solveMaxEval {
		r, dr, err := eval(x)
		if err != nil {
			return res, err
		}
		if math.Abs(r) <= solveTolK {
			return res, nil
		}
		if r < 0 {
			lo, qLo = x, res.q
		} else {
			hi, qHi = x, res.q
		}
		if hi-lo <= solveTolTs {
			// The residual jumps across the root: a correlation switches range at this
			// surface temperature (or a k curve extended far beyond its data makes a
			// layer non-monotone). Keep the surface temperature and take the heat flow
			// between the two sides that matches the fluid temperature.
			return res, p.settleJump(&res, fluid, air, qLo, qHi)
		}
		step := r / dr
		if next := x - step; !(dr > 0) || !(next > lo && next < hi) || math.Abs(2*step) > dxOld {
			step = x - (lo+hi)/2
		}
		dxOld = math.Abs(step)
		x -= step
	}
	return res, fmt.Errorf("calc: surface temperature did not converge in %d evaluations", solveMaxEval)
}

// guess estimates the surface temperature with cheap passes of a linearised balance: the
// conduction as series resistances with each layer's k at its mean from the previous pass,
// the surface exchange linearised at the current estimate (its flux and slope), so that
// each pass is a Newton step on the surface side. From a crude start, the first pass takes
// a typical still-air coefficient (guessCoeff) with linearised radiation, the later ones the
// rough exchange (see roughExchange: within about 1e-4 of the correlations, and much
// cheaper), so that the Newton iteration on the exact residual starts within about a
// millikelvin and mostly needs two evaluations.
func (p *path) guess(fluid float64, air Air, lo, hi float64) float64 {
	ts := air.TempC + 0.1*(fluid-air.TempC)
	for i := range p.states {
		p.states[i].MeanC = (fluid + ts) / 2
	}
	for pass := range guessPasses {
		rin := 0.0 // per path unit
		for _, g := range p.fixedG() {
			rin += 1 / g
		}
		for i, l := range p.layers() {
			k, _ := l.curve.At(p.states[i].MeanC)
			rin += 1 / (l.s * k)
		}
		// area·(F + S·(x − ts)) = (fluid − x)/rin, F and S the surface flux and slope at ts.
		var flux, slope float64
		switch {
		case p.surf.fixed > 0: // exact and cheap
			sf := p.surf.exchange(ts, air)
			flux, slope = sf.flux, sf.slope
		case pass == 0:
			t1, t2 := ts+kelvin, air.SurroundingsC+kelvin
			hr := p.surf.emit * StefanBoltzmann * (t1*t1 + t2*t2) * (t1 + t2)
			flux = guessCoeff*(ts-air.TempC) + hr*(ts-air.SurroundingsC) - p.surf.solar*air.SolarWm2
			slope = guessCoeff + hr
		default:
			flux, slope = p.surf.roughExchange(ts, air)
		}
		x := (fluid/rin - p.area*(flux-slope*ts)) / (1/rin + p.area*slope)
		if !(x > lo && x < hi) {
			x = (lo + hi) / 2
		}
		q := (fluid - x) / rin
		ts = x
		t := fluid
		for _, g := range p.fixedG() {
			t -= q / g
		}
		for i, l := range p.layers() {
			k, _ := l.curve.At(p.states[i].MeanC)
			t2 := t - q/(l.s*k)
			p.states[i].MeanC = (t + t2) / 2
			t = t2
		}
	}
	if !(ts > lo && ts < hi) {
		return (lo + hi) / 2
	}
	return ts
}
