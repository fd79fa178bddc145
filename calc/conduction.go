package calc

import (
	"errors"
	"math"
)

// Steady one-dimensional conduction in series (ASTM C680; ISO 12241): per metre of a
// cylinder q' = 2π k_m (T1 − T2)/ln(r2/r1), per m² of a plane q'' = k_m (T1 − T2)/t, with
// each insulation layer's k taken at its own mean temperature (the ISO 12241 rule; for k
// linear in T it equals ∫k dT/ΔT of ASTM C680).

// pathLayer is one insulation layer of a heat path: q = s·k(mean)·(Ti − To).
type pathLayer struct {
	s     float64 // shape factor per unit k: 2π/ln(r2/r1), 1/t, or mean width/t
	curve KCurve
}

// path is one heat path from the fluid to the air: an optional inside film and pipe wall
// (fixed conductances), the insulation layers, and the outer surface.
type path struct {
	area   float64 // outer surface per path unit (m²/m, or 1 per m²)
	surf   surface
	states []LayerState // layer states of the last march; becomes the result's Layers

	// Conductances W/K per path unit, inner to outer (film, wall), and the insulation
	// layers, inner to outer: fixed arrays, so that a path on the stack lays out a system
	// without heap allocations (System.Validate bounds the layers by maxLayers).
	g      [2]float64
	ng     int
	layer  [maxLayers]pathLayer
	nLayer int
}

// init empties the path for n insulation layers.
func (p *path) init(n int) {
	p.ng, p.nLayer = 0, 0
	p.states = nil // no layers: Result.Layers stays nil, as it always was
	if n > 0 {
		p.states = make([]LayerState, n)
	}
}

func (p *path) addG(g float64)       { p.g[p.ng] = g; p.ng++ }
func (p *path) addLayer(l pathLayer) { p.layer[p.nLayer] = l; p.nLayer++ }
func (p *path) fixedG() []float64    { return p.g[:p.ng] }
func (p *path) layers() []pathLayer  { return p.layer[:p.nLayer] }

// march sets the layer states for surface temperature ts and heat flow q (per path unit),
// working from the surface inward, and returns the fluid-side temperature, the
// temperature under the insulation, and d(fluid-side temperature)/d(ts) given dq = dq/dts.
func (p *path) march(ts, q, dq float64) (tin, under, dtin float64, err error) {
	t, dt := ts, 1.0
	layers, fixedG := p.layers(), p.fixedG()
	for i := len(layers) - 1; i >= 0; i-- {
		l := &layers[i]
		ti, k, dk, beyond, err := layerInner(l, t, q)
		if err != nil {
			return 0, 0, 0, err
		}
		d := ti - t
		gi := l.s * (k + dk*d/2)   // ∂q/∂Ti
		go_ := l.s * (-k + dk*d/2) // ∂q/∂To
		if gi > 0 {
			dt = (dq - go_*dt) / gi
		}
		p.states[i] = LayerState{InnerC: ti, OuterC: t, MeanC: (ti + t) / 2, K: k, Beyond: beyond}
		t = ti
	}
	under = t
	for i := len(fixedG) - 1; i >= 0; i-- {
		t += q / fixedG[i]
		dt += dq / fixedG[i]
	}
	if !finite(t) || !finite(dt) {
		return 0, 0, 0, errors.New("calc: conduction march produced a non-finite temperature")
	}
	return t, under, dt, nil
}

// layerInner solves s·k((Ti+To)/2)·(Ti − To) = q for the inner face temperature Ti: in
// closed form where it can (see innerExact), else by a Newton iteration safeguarded by
// bisection on [To, To + q/(s·k_min)].
func layerInner(l *pathLayer, to, q float64) (ti, k, dk float64, beyond bool, err error) {
	if q == 0 {
		k, dk, beyond = l.curve.eval(to)
		return to, k, dk, beyond, nil
	}
	if ti, ok := innerExact(l, to, q); ok {
		k, dk, beyond = l.curve.eval((ti + to) / 2)
		if f := l.s*k*(ti-to) - q; math.Abs(f) <= 1e-12*math.Abs(q) {
			return ti, k, dk, beyond, nil
		}
	}
	return layerInnerIter(l, to, q)
}

// layerInnerIter is layerInner by a Newton iteration safeguarded by bisection.
func layerInnerIter(l *pathLayer, to, q float64) (ti, k, dk float64, beyond bool, err error) {
	lo, hi := to, to+q/(l.s*l.curve.minK())
	if lo > hi {
		lo, hi = hi, lo
	}
	// f(x) = s·k·(x − to) − q rises through zero inside [lo, hi].
	k0, _, _ := l.curve.eval(to)
	x := to + q/(l.s*k0)
	for range 100 {
		if x <= lo || x >= hi || !finite(x) {
			x = (lo + hi) / 2
		}
		m := (x + to) / 2
		k, dk, beyond = l.curve.eval(m)
		d := x - to
		f := l.s*k*d - q
		if f < 0 { // f increases with x: the root lies above x
			lo = x
		} else {
			hi = x
		}
		fp := l.s * (k + dk*d/2)
		step := 0.0
		if fp > 0 {
			step = f / fp
		}
		if math.Abs(f) <= 1e-13*math.Abs(q) || (fp > 0 && math.Abs(step) <= 1e-12*(1+math.Abs(x))) {
			return x, k, dk, beyond, nil
		}
		if fp > 0 {
			x -= step
		} else {
			x = math.NaN() // force bisection
		}
		if hi-lo <= 1e-12*(1+math.Abs(x)) {
			break
		}
	}
	x = (lo + hi) / 2
	k, dk, beyond = l.curve.eval((x + to) / 2)
	if !finite(x) {
		return 0, 0, 0, false, errors.New("calc: layer temperature solve did not converge")
	}
	return x, k, dk, beyond, nil
}

// innerExact solves the layer equation in closed form. k is linear in the mean temperature
// m = To + d/2 (d = Ti − To) along each segment of the curve, so on the segment that holds
// the mean, s·(k_line(To) + b·d/2)·d = q is a quadratic in d whose root near q/(s·k) is
// d = 2Q/(k0 + √(k0² + 2bQ)), Q = q/s. The segment is found by stepping from the one that
// holds To. ok is false where this does not settle (the extension's floor, a line that is
// not positive, no real root): layerInner then iterates.
func innerExact(l *pathLayer, to, q float64) (ti float64, ok bool) {
	c := l.curve
	n := len(c)
	Q := q / l.s
	if n == 1 {
		return to + q/(l.s*c[0].K), true
	}
	i := 0 // the segment that eval uses at To
	switch {
	case to < c[0].MeanC:
	case to > c[n-1].MeanC:
		i = n - 2
	default:
		for i < n-2 && to >= c[i+1].MeanC {
			i++
		}
	}
	dir := 0
	for range n {
		a, b := c[i], c[i+1]
		slope := (b.K - a.K) / (b.MeanC - a.MeanC)
		k0 := a.K + slope*(to-a.MeanC)
		if !(k0 > 0) {
			return 0, false
		}
		disc := k0*k0 + 2*slope*Q
		if !(disc >= 0) {
			return 0, false
		}
		d := 2 * Q / (k0 + math.Sqrt(disc))
		m := to + d/2
		switch {
		case i < n-2 && m >= b.MeanC: // the mean lies on a later segment
			if dir < 0 {
				return 0, false
			}
			dir, i = 1, i+1
		case i > 0 && m < a.MeanC: // on an earlier one
			if dir > 0 {
				return 0, false
			}
			dir, i = -1, i-1
		default:
			end := c[0].K
			if m > c[n-1].MeanC {
				end = c[n-1].K
			}
			if (m < c[0].MeanC || m > c[n-1].MeanC) && k0+slope*d/2 < kFloorFraction*end {
				return 0, false // on the extension's floor: iterate
			}
			ti = to + d
			return ti, finite(ti)
		}
	}
	return 0, false
}
