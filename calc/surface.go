package calc

import (
	"fmt"
	"math"
)

// surfKind selects the natural-convection correlation of an outer surface.
type surfKind int

const (
	surfCylH      surfKind = iota // horizontal cylinder: Churchill–Chu on D
	surfCylV                      // vertical cylinder: Churchill–Chu plate on L + Popiel
	surfPlateV                    // vertical plate: Churchill–Chu on L
	surfPlateUp                   // horizontal plate, face looking up, L = area/perimeter
	surfPlateDown                 // horizontal plate, face looking down
)

// surface is the outer (jacket) surface as the correlations see it.
type surface struct {
	kind  surfKind
	d     float64 // outer diameter (cylinders), m
	l     float64 // natural-convection length, m (unused for horizontal cylinders)
	lWind float64 // forced-convection length: D across a cylinder, plate length along the wind
	emit  float64
	fixed float64 // fixed combined coefficient, replaces convection + radiation when > 0
	// solar is the absorbed part of Air.SolarWm2 per m² of this surface: absorptance
	// times the share of the projected area (1/π for a cylinder, 1 for a face, 0 facing down).
	solar float64
}

// solarShare is the absorbed sunlight per m² of surface for each W/m² on the projected
// area, per unit absorptance (see Air.SolarWm2).
func solarShare(kind surfKind) float64 {
	switch kind {
	case surfCylH, surfCylV:
		return 1 / math.Pi
	case surfPlateDown:
		return 0
	}
	return 1
}

// surfState is the outer-surface exchange at one surface temperature.
type surfState struct {
	flux        float64 // W/m², positive from the surface to the environment
	slope       float64 // d(flux)/d(ts), W/m²·K, analytic
	hConv, hRad float64 // W/m²·K
	note        string  // correlation used outside its range, "" if none
}

// exchange returns the heat flux from the surface at ts (°C) to the air and surroundings,
// and its slope with respect to ts. Cold surfaces use |ΔT| in Gr and Ra, and horizontal
// plates swap their hot/cold-side correlations.
func (s *surface) exchange(ts float64, air Air) surfState {
	dt := ts - air.TempC
	sun := s.solar * air.SolarWm2
	if s.fixed > 0 {
		return surfState{flux: s.fixed*dt - sun, slope: s.fixed, hConv: s.fixed}
	}
	hc, g, note := s.hConvD(ts, air, false)
	qr := RadiationFlux(s.emit, ts, air.SurroundingsC)
	t := ts + kelvin
	st := surfState{
		flux:  hc*dt + qr - sun,
		slope: hc + g + 4*s.emit*StefanBoltzmann*t*t*t,
		hConv: hc,
		note:  note,
	}
	if dt > 1e-9 || dt < -1e-9 { // RadiationCoeff, from the flux already at hand
		st.hRad = qr / dt
	} else {
		st.hRad = RadiationCoeff(s.emit, ts, air.TempC, air.SurroundingsC)
	}
	return st
}

// hConv is the convective coefficient at surface temperature ts: natural convection,
// forced convection when there is wind, mixed as (h_n³ + h_f³)^(1/3).
func (s *surface) hConv(ts float64, air Air) (float64, string) {
	h, _, note := s.hConvD(ts, air, false)
	return h, note
}

// hConvD returns hConv and g = (ts − Ta)·dh/dts, the analytic derivative of the
// coefficient (film properties included) times ΔT, so that d(h·ΔT)/dts = h + g stays
// finite at ΔT = 0. Quantities named g… are ΔT·d(…)/dts; for logarithms, ΔT·d ln(…)/dts.
// rough takes the cheap stand-ins of roughExchange and words no notes.
func (s *surface) hConvD(ts float64, air Air, rough bool) (h, g float64, note string) {
	dT := ts - air.TempC
	film := (ts + air.TempC) / 2
	var p airProps
	var sl airSlopes
	if rough {
		p, sl = dryAirRough(film)
	} else {
		p, sl = dryAirD(film)
	}
	dt := math.Abs(dT)
	hot := ts > air.TempC
	grPerL3 := gravity * p.beta * dt / (p.nu * p.nu) // Gr = grPerL3 · L³
	half := dT / 2                                   // dT_film/dts = 1/2
	gK, gPr := half*sl.k, half*sl.pr
	gGr := 1 + half*(sl.beta-2*sl.nu) // ΔT·d ln|ΔT|/dts = 1
	gRa := gGr + gPr

	var hn, gn float64
	var ra float64
	switch s.kind {
	case surfCylH:
		ra = grPerL3 * s.d * s.d * s.d * p.pr
		t, w := churchillChuAt(ra, p.pr, 0.559, rough)
		n := 0.60 + t
		hn = n * n * p.k / s.d
		gn = hn * (2*t*(gRa+w*gPr)/(6*n) + gK)
		if ra > 0 && (ra < 1e-5 || ra > 1e12) && !rough {
			note = fmt.Sprintf("natural convection Ra_D %.2g outside the Churchill–Chu horizontal-cylinder range 1e-5…1e12; extrapolated", ra)
		}
	case surfCylV, surfPlateV:
		gr := grPerL3 * s.l * s.l * s.l
		ra = gr * p.pr
		t, w := churchillChuAt(ra, p.pr, 0.492, rough)
		n := 0.825 + t
		nu := n * n
		gNu := nu * 2 * t * (gRa + w*gPr) / (6 * n)
		if s.kind == surfCylV && gr > 0 && SlenderCylinderApplies(gr, s.l, s.d) {
			f, gf := slenderFactorD(gr, p.pr, s.l, s.d, gGr, gPr)
			gNu = gNu*f + nu*gf
			nu *= f
		}
		hn = nu * p.k / s.l
		gn = hn*gK + gNu*p.k/s.l
		if ra > 1e12 && !rough {
			note = fmt.Sprintf("natural convection Ra_L %.2g above the Churchill–Chu vertical-plate range (1e12); extrapolated", ra)
		}
	case surfPlateUp, surfPlateDown:
		ra = grPerL3 * s.l * s.l * s.l * p.pr
		up := s.kind == surfPlateUp
		if up == hot { // hot face up or cold face down
			hn = NuPlateUpNatural(ra) * p.k / s.l
			if ra < 1e7 {
				gn = hn * (gRa/4 + gK)
			} else {
				gn = hn * (gRa/3 + gK)
			}
			if ra > 1e11 && !rough {
				note = fmt.Sprintf("natural convection Ra %.2g above the horizontal-plate range (1e11); extrapolated", ra)
			}
		} else {
			hn = NuPlateDownNatural(ra) * p.k / s.l
			gn = hn * (gRa/4 + gK)
			if ra > 1e10 && !rough {
				note = fmt.Sprintf("natural convection Ra %.2g above the horizontal-plate range (1e10); extrapolated", ra)
			}
		}
	}
	if air.WindMS <= 0 {
		return hn, gn, note
	}
	re := air.WindMS * s.lWind / p.nu
	gRe := -half * sl.nu
	var nuF, gNuF float64
	if s.kind == surfCylH || s.kind == surfCylV {
		nuF, gNuF = crossFlowD(re, p.pr, gRe, gPr)
	} else {
		nuF, gNuF = flatPlateForcedD(re, p.pr, gRe, gPr)
	}
	hf := nuF * p.k / s.lWind
	gf := hf*gK + gNuF*p.k/s.lWind
	h = MixedConvection(hn, hf)
	if h > 0 {
		g = (hn*hn*gn + hf*hf*gf) / (h * h)
	}
	return h, g, note
}

// roughExchange is exchange with cheap stand-ins for the costly Pr-dependent terms: air's
// heat capacity from a quadratic fit (dryAirRough) and the Churchill–Chu Prandtl factor
// from a quadratic expansion (churchillChuAt). Near room temperature it is within about
// 1e-4 of exchange, at about half the cost. It serves only the starting guess: the Newton
// iteration that follows evaluates the exact exchange.
func (s *surface) roughExchange(ts float64, air Air) (flux, slope float64) {
	dt := ts - air.TempC
	sun := s.solar * air.SolarWm2
	if s.fixed > 0 {
		return s.fixed*dt - sun, s.fixed
	}
	hc, g, _ := s.hConvD(ts, air, true)
	t := ts + kelvin
	return hc*dt + RadiationFlux(s.emit, ts, air.SurroundingsC) - sun, hc + g + 4*s.emit*StefanBoltzmann*t*t*t
}
