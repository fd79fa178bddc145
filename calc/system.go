// Package calc holds Lagwright's physics and economics: steady conduction through
// insulation layers with temperature-dependent conductivity, outer-surface convection
// and radiation from published correlations, psychrometrics, steam properties, freeze
// times, temperature change along a run and engineering economics.
//
// Everything is SI (m, °C, W, W/m·K, W/m²·K, Pa, J/kg). The package imports only the
// standard library: no I/O, no logging. Functions are deterministic and return errors
// instead of NaN or Inf.
package calc

// MethodVersion changes whenever a method in this package changes results, so stored
// results computed with an older method are recognised as stale.
const MethodVersion = "1.7"

// Shape is the geometry and orientation of the insulated surface.
type Shape int

const (
	// PipeHorizontal is a horizontal pipe, tube or round duct.
	PipeHorizontal Shape = iota
	// PipeVertical is a vertical pipe of length System.Height.
	PipeVertical
	// FlatVertical is a vertical wall or tank side, System.Height high and
	// System.Width long in the direction of the wind.
	FlatVertical
	// FlatUp is a horizontal surface whose insulated face looks up (a tank top).
	FlatUp
	// FlatDown is a horizontal surface whose insulated face looks down (a tank bottom).
	FlatDown
	// Duct is a rectangular duct, DuctWidth wide and DuctHeight high, run horizontally.
	Duct
)

// IsPipe reports whether the shape is cylindrical.
func (s Shape) IsPipe() bool { return s == PipeHorizontal || s == PipeVertical }

// IsFlat reports whether the shape is a plane surface (results per m²).
func (s Shape) IsFlat() bool { return s == FlatVertical || s == FlatUp || s == FlatDown }

// KPoint is one apparent conductivity at a mean temperature, as material
// specifications and data sheets publish it.
type KPoint struct {
	MeanC float64 // mean temperature of the test specimen, °C
	K     float64 // apparent thermal conductivity, W/m·K
}

// KCurve is a conductivity-versus-mean-temperature curve, points strictly increasing in
// MeanC. One point means a constant conductivity. Between points it is linear; beyond the
// ends the end segment is extended (never clamped) and the caller is told.
type KCurve []KPoint

// Layer is one insulation layer, innermost first in System.Layers.
type Layer struct {
	Name      string  // for warnings ("layer 1 (mineral fiber pipe, C547 Type I)")
	Thickness float64 // m, > 0
	K         KCurve
	// Service limits of the material, °C; used only when HasLimits.
	MinC, MaxC float64
	HasLimits  bool
}

// System is one insulated (or bare) surface, ready for the heat balance.
type System struct {
	Shape Shape

	// Pipes: outside diameter of the pipe or tube; wall thickness and its conductivity
	// (PipeWall 0 = wall not modelled); optional inside film coefficient (0 = none: the
	// inner surface sits at the fluid temperature, the conservative choice).
	PipeOD     float64 // m
	PipeWall   float64 // m
	WallK      float64 // W/m·K
	InnerCoeff float64 // W/m²·K, applies to pipes, ducts and flats alike

	// Rectangular ducts: outside dimensions of the duct sheet, m.
	DuctWidth, DuctHeight float64

	// Vertical pipes and vertical flats: height, m. Vertical flats: Width along the wind, m.
	Height, Width float64
	// Horizontal flats: plate length (along the wind) and width, m.
	PlateLength, PlateWidth float64

	Layers []Layer // inner to outer; empty = bare surface

	// Outer surface: emittance of the jacket (or of the bare surface when Layers is empty),
	// and an optional fixed combined surface coefficient that replaces convection plus
	// radiation (0 = use the correlations).
	Emittance  float64
	FixedCoeff float64 // W/m²·K
	// SolarAbsorptance is the fraction of Air.SolarWm2 the outer surface absorbs.
	SolarAbsorptance float64
}

// Air is the environment around the outer surface.
type Air struct {
	TempC         float64 // dry-bulb air temperature, °C
	SurroundingsC float64 // mean radiant temperature of the surroundings, °C
	WindMS        float64 // air speed past the surface, m/s (0 = still air)
	// SolarWm2 is sunlight on the surface's projected area, W/m² (0 = none). A pipe
	// absorbs it over its diameter and spreads it round its circumference (1/π of it per
	// m² of surface); a flat surface or a duct face takes it whole, as if the sun stood
	// square to it (the safe side for personnel protection); a face looking down, none.
	SolarWm2 float64
}

// LayerState is the solved state of one layer.
type LayerState struct {
	InnerC, OuterC float64 // face temperatures, °C
	MeanC          float64 // (InnerC+OuterC)/2, where K was taken
	K              float64 // conductivity used, W/m·K
	Beyond         bool    // MeanC lay outside the curve's points (end segment extended)
}

// Face is the solved state of one face of a rectangular duct.
type Face struct {
	Name         string  // "top", "bottom", "side" (each of the two sides)
	SurfaceC     float64 // °C
	HeatFlowPerM float64 // W per metre of duct through this face (one side, for "side")
	HeatFlux     float64 // W/m² of this face's outer surface
	HConv, HRad  float64 // W/m²·K
	Layers       []LayerState
}

// Result is the steady heat balance of a System.
type Result struct {
	// HeatFlowPerM is W per metre of pipe or duct, positive from the fluid to the air;
	// for flat surfaces it equals HeatFlux (W per m²).
	HeatFlowPerM float64
	// HeatFlux is W per m² of outer (jacket) surface.
	HeatFlux float64
	// SurfaceC is the outer surface temperature. For a duct it is the face farthest from
	// the air temperature (the hottest face of a hot duct, the coldest of a cold one).
	SurfaceC float64
	// PipeSurfaceC is the temperature of the surface under the insulation (outside of
	// the pipe wall, duct sheet or flat surface).
	PipeSurfaceC float64
	// Layers holds each layer's state, inner to outer (the worst face's, for ducts).
	Layers []LayerState
	// Surface coefficients at the outer surface (the worst face's, for ducts).
	HConv, HRad float64
	// Faces is set for ducts only: top, bottom, side.
	Faces []Face
	// OuterAreaPerM is m² of outer surface per metre (pipes, ducts); 1 for flats.
	OuterAreaPerM float64
	// OuterDiameter is the insulated outside diameter of a pipe, m (0 otherwise).
	OuterDiameter float64
	// Evaluations counts residual evaluations of the surface-temperature solve (summed
	// over faces for a duct).
	Evaluations int
	// Warnings are plain-language notes on the solution (conductivity curve extended,
	// layer outside its service range, insulation below the critical radius …).
	Warnings []string
}
