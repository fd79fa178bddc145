package calc

import "fmt"

// Bounds on the inputs Solve accepts; beyond them the methods are not meant to be used.
const (
	maxPipeOD     = 5.0    // m
	maxDuctSide   = 10.0   // m
	maxLength     = 1000.0 // m: heights, widths and plate sizes
	maxLayers     = 10
	maxThickness  = 1.0    // m per layer
	maxSolar      = 1500.0 // W/m²: above the solar constant (1361 W/m²)
	maxWallK      = 1000   // W/m·K
	maxCoeff      = 1e13   // W/m²·K: inside film (1e12 stands for "no film" in published examples)
	maxFixedCoeff = 1e5    // W/m²·K
	minFluidC     = -273   // °C
	maxFluidC     = 1000   // °C: keeps film temperatures ≤ 600 °C
	minAirC       = -100   // °C
	maxAirC       = 200    // °C
	maxSurrC      = 1000   // °C
	maxWind       = 100.0  // m/s
)

// Validate checks the geometry, layers and surface inputs of a system.
func (s System) Validate() error {
	switch {
	case s.Shape < PipeHorizontal || s.Shape > Duct:
		return fmt.Errorf("calc: unknown shape %d", int(s.Shape))
	case !inRange(s.InnerCoeff, 0, maxCoeff):
		return fmt.Errorf("calc: inside film coefficient %v W/m²·K must be ≥ 0 and ≤ %g", s.InnerCoeff, float64(maxCoeff))
	case !inRange(s.Emittance, 0, 1):
		return fmt.Errorf("calc: surface emittance %v must be between 0 and 1", s.Emittance)
	case !inRange(s.FixedCoeff, 0, maxFixedCoeff):
		return fmt.Errorf("calc: fixed surface coefficient %v W/m²·K must be ≥ 0 and ≤ %g", s.FixedCoeff, float64(maxFixedCoeff))
	}
	if err := s.validateGeometry(); err != nil {
		return err
	}
	if len(s.Layers) > maxLayers {
		return fmt.Errorf("calc: %d layers; at most %d", len(s.Layers), maxLayers)
	}
	for i, l := range s.Layers {
		if !inRange(l.Thickness, 0, maxThickness) || l.Thickness == 0 {
			return fmt.Errorf("calc: %s: thickness %v m must be > 0 and ≤ %g m", layerName(i, l), l.Thickness, maxThickness)
		}
		if err := l.K.check(); err != nil {
			return fmt.Errorf("calc: %s: %w", layerName(i, l), err)
		}
		if l.HasLimits && (!finite(l.MinC) || !finite(l.MaxC) || l.MinC > l.MaxC) {
			return fmt.Errorf("calc: %s: service limits %v…%v °C are not a range", layerName(i, l), l.MinC, l.MaxC)
		}
	}
	return nil
}

func (s System) validateGeometry() error {
	switch s.Shape {
	case PipeHorizontal, PipeVertical:
		if !positive(s.PipeOD, maxPipeOD) {
			return fmt.Errorf("calc: pipe outside diameter %v m must be > 0 and ≤ %g m", s.PipeOD, maxPipeOD)
		}
		if !inRange(s.PipeWall, 0, s.PipeOD/2) || s.PipeWall == s.PipeOD/2 {
			return fmt.Errorf("calc: pipe wall %v m must be ≥ 0 and less than half the outside diameter", s.PipeWall)
		}
		if s.PipeWall > 0 && !positive(s.WallK, maxWallK) {
			return fmt.Errorf("calc: pipe wall conductivity %v W/m·K must be > 0 and ≤ %d", s.WallK, maxWallK)
		}
		if s.Shape == PipeVertical && !positive(s.Height, maxLength) {
			return fmt.Errorf("calc: vertical pipe height %v m must be > 0 and ≤ %g m", s.Height, maxLength)
		}
	case Duct:
		if !positive(s.DuctWidth, maxDuctSide) || !positive(s.DuctHeight, maxDuctSide) {
			return fmt.Errorf("calc: duct %v × %v m: each side must be > 0 and ≤ %g m", s.DuctWidth, s.DuctHeight, maxDuctSide)
		}
	case FlatVertical:
		if !positive(s.Height, maxLength) || !positive(s.Width, maxLength) {
			return fmt.Errorf("calc: vertical surface %v m high × %v m wide: each must be > 0 and ≤ %g m", s.Height, s.Width, maxLength)
		}
	case FlatUp, FlatDown:
		if !positive(s.PlateLength, maxLength) || !positive(s.PlateWidth, maxLength) {
			return fmt.Errorf("calc: horizontal surface %v × %v m: each side must be > 0 and ≤ %g m", s.PlateLength, s.PlateWidth, maxLength)
		}
	}
	return nil
}

// validateConditions checks the fluid temperature and the environment.
func validateConditions(fluidC float64, air Air) error {
	switch {
	case !inRange(fluidC, minFluidC, maxFluidC):
		return fmt.Errorf("calc: fluid temperature %v °C must be between %d and %d °C", fluidC, minFluidC, maxFluidC)
	case !inRange(air.TempC, minAirC, maxAirC):
		return fmt.Errorf("calc: air temperature %v °C must be between %d and %d °C", air.TempC, minAirC, maxAirC)
	case !inRange(air.SurroundingsC, minAirC, maxSurrC):
		return fmt.Errorf("calc: surroundings temperature %v °C must be between %d and %d °C", air.SurroundingsC, minAirC, maxSurrC)
	case !inRange(air.WindMS, 0, maxWind):
		return fmt.Errorf("calc: wind speed %v m/s must be between 0 and %g m/s", air.WindMS, maxWind)
	case !inRange(air.SolarWm2, 0, maxSolar):
		return fmt.Errorf("calc: solar flux %v W/m² must be between 0 and %g W/m²", air.SolarWm2, maxSolar)
	}
	return nil
}

func inRange(x, lo, hi float64) bool { return finite(x) && x >= lo && x <= hi }
func positive(x, hi float64) bool    { return finite(x) && x > 0 && x <= hi }

// layerName names layer i (0-based) for messages: "layer 2 (cellular glass)".
func layerName(i int, l Layer) string {
	if l.Name == "" {
		return fmt.Sprintf("layer %d", i+1)
	}
	return fmt.Sprintf("layer %d (%s)", i+1, l.Name)
}
