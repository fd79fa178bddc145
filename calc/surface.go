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
}

// surfState is the outer-surface exchange at one surface temperature.
type surfState struct {
	flux        float64 // W/m², positive from the surface to the environment
	hConv, hRad float64 // W/m²·K
	note        string  // correlation used outside its range, "" if none
}

// exchange returns the heat flux from the surface at ts (°C) to the air and surroundings.
// Cold surfaces use |ΔT| in Gr and Ra, and horizontal plates swap their hot/cold-side
// correlations.
func (s *surface) exchange(ts float64, air Air) surfState {
	dt := ts - air.TempC
	if s.fixed > 0 {
		return surfState{flux: s.fixed * dt, hConv: s.fixed}
	}
	hc, note := s.hConv(ts, air)
	qr := RadiationFlux(s.emit, ts, air.SurroundingsC)
	return surfState{
		flux:  hc*dt + qr,
		hConv: hc,
		hRad:  RadiationCoeff(s.emit, ts, air.TempC, air.SurroundingsC),
		note:  note,
	}
}

// hConv is the convective coefficient at surface temperature ts: natural convection,
// forced convection when there is wind, mixed as (h_n³ + h_f³)^(1/3).
func (s *surface) hConv(ts float64, air Air) (float64, string) {
	film := (ts + air.TempC) / 2
	p := dryAir(film)
	dt := math.Abs(ts - air.TempC)
	hot := ts > air.TempC
	grPerL3 := gravity * p.beta * dt / (p.nu * p.nu) // Gr = grPerL3 · L³

	var hn float64
	var ra float64
	var note string
	switch s.kind {
	case surfCylH:
		ra = grPerL3 * s.d * s.d * s.d * p.pr
		hn = NuCylinderNatural(ra, p.pr) * p.k / s.d
		if ra > 0 && (ra < 1e-5 || ra > 1e12) {
			note = fmt.Sprintf("natural convection Ra_D %.2g outside the Churchill–Chu horizontal-cylinder range 1e-5…1e12; extrapolated", ra)
		}
	case surfCylV, surfPlateV:
		gr := grPerL3 * s.l * s.l * s.l
		ra = gr * p.pr
		nu := NuVerticalPlateNatural(ra, p.pr)
		if s.kind == surfCylV && gr > 0 && SlenderCylinderApplies(gr, s.l, s.d) {
			nu *= SlenderCylinderFactor(gr, p.pr, s.l, s.d)
		}
		hn = nu * p.k / s.l
		if ra > 1e12 {
			note = fmt.Sprintf("natural convection Ra_L %.2g above the Churchill–Chu vertical-plate range (1e12); extrapolated", ra)
		}
	case surfPlateUp, surfPlateDown:
		ra = grPerL3 * s.l * s.l * s.l * p.pr
		up := s.kind == surfPlateUp
		if up == hot { // hot face up or cold face down
			hn = NuPlateUpNatural(ra) * p.k / s.l
			if ra > 1e11 {
				note = fmt.Sprintf("natural convection Ra %.2g above the horizontal-plate range (1e11); extrapolated", ra)
			}
		} else {
			hn = NuPlateDownNatural(ra) * p.k / s.l
			if ra > 1e10 {
				note = fmt.Sprintf("natural convection Ra %.2g above the horizontal-plate range (1e10); extrapolated", ra)
			}
		}
	}
	if air.WindMS <= 0 {
		return hn, note
	}
	re := air.WindMS * s.lWind / p.nu
	var hf float64
	if s.kind == surfCylH || s.kind == surfCylV {
		hf = NuCylinderCrossFlow(re, p.pr) * p.k / s.lWind
	} else {
		hf = NuFlatPlateForced(re, p.pr) * p.k / s.lWind
	}
	return MixedConvection(hn, hf), note
}
