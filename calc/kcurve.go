package calc

import (
	"errors"
	"fmt"
	"math"
)

// kFloorFraction is the smallest conductivity an extended k curve may return, as a
// fraction of the nearest end point: extending a falling end segment far enough would
// otherwise reach zero or below.
const kFloorFraction = 0.1

// At returns the conductivity at a mean temperature (°C): linear between points, constant
// for a single point. Beyond the ends the end segment is extended (never clamped) and
// beyond is true; an extension never falls below kFloorFraction of the nearest end point.
// An empty curve returns (0, true); Validate rejects it.
func (c KCurve) At(meanC float64) (k float64, beyond bool) {
	k, _, beyond = c.eval(meanC)
	return k, beyond
}

// eval returns k, dk/dT and beyond at meanC. At a point shared by two segments the slope of
// the upper segment is returned.
func (c KCurve) eval(m float64) (k, dk float64, beyond bool) {
	n := len(c)
	switch n {
	case 0:
		return 0, 0, true
	case 1:
		return c[0].K, 0, false
	}
	i := 0 // segment c[i]..c[i+1]
	switch {
	case m < c[0].MeanC:
		beyond = true
	case m > c[n-1].MeanC:
		beyond = true
		i = n - 2
	default:
		for i < n-2 && m >= c[i+1].MeanC {
			i++
		}
	}
	a, b := c[i], c[i+1]
	dk = (b.K - a.K) / (b.MeanC - a.MeanC)
	k = a.K + dk*(m-a.MeanC)
	if beyond {
		end := c[0].K
		if m > c[n-1].MeanC {
			end = c[n-1].K
		}
		if floor := kFloorFraction * end; k < floor {
			return floor, 0, true
		}
	}
	return k, dk, beyond
}

// minK is a lower bound of the conductivity over all temperatures.
func (c KCurve) minK() float64 {
	m := math.Inf(1)
	for _, p := range c {
		m = math.Min(m, p.K)
	}
	return kFloorFraction * m
}

// Validate checks that the curve has 1 to 64 points, strictly increasing finite mean
// temperatures above absolute zero and conductivities in (0, 1000] W/m·K.
func (c KCurve) Validate() error {
	if err := c.check(); err != nil {
		return fmt.Errorf("calc: %w", err)
	}
	return nil
}

func (c KCurve) check() error {
	if len(c) == 0 {
		return errors.New("conductivity curve has no points")
	}
	if len(c) > 64 {
		return fmt.Errorf("conductivity curve has %d points; at most 64", len(c))
	}
	for i, p := range c {
		if !finite(p.MeanC) || p.MeanC <= -273.15 || p.MeanC > 3000 {
			return fmt.Errorf("conductivity point %d: mean temperature %v °C out of range", i+1, p.MeanC)
		}
		if !finite(p.K) || p.K <= 0 || p.K > 1000 {
			return fmt.Errorf("conductivity point %d: k %v W/m·K must be > 0 and ≤ 1000", i+1, p.K)
		}
		if i > 0 && p.MeanC <= c[i-1].MeanC {
			return fmt.Errorf("conductivity points must have strictly increasing mean temperatures (point %d)", i+1)
		}
	}
	return nil
}

func finite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }
