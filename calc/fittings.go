package calc

import "math"

// FlangePairBareArea is the bare outer surface a flanged joint adds to a bare pipe, m²:
// the back face (an annulus from the pipe to the flange OD) and the rim of each of its
// two flanges; the mating faces are hidden. Bolts and hubs are neglected.
func FlangePairBareArea(pipeOD, flangeOD, thick float64) float64 {
	back := math.Pi / 4 * (flangeOD*flangeOD - pipeOD*pipeOD)
	rim := math.Pi * flangeOD * thick
	return 2 * (back + rim)
}

// ValveBareArea is the bare outer surface of a flanged valve with its two end joints,
// m²: two flange pairs, and the body and bonnet taken as twice a cylinder of the flange
// OD between the valve's flanges (our estimate for gate and globe valves).
func ValveBareArea(pipeOD, flangeOD, thick, faceToFace float64) float64 {
	body := math.Max(faceToFace-2*thick, 0)
	return 2*FlangePairBareArea(pipeOD, flangeOD, thick) + 2*math.Pi*flangeOD*body
}

// InfiniteFinConductance is the heat a long fin carries per kelvin of base excess,
// √(h·P·k·A), W/K (Incropera & DeWitt, Fundamentals of Heat and Mass Transfer, ch. 3,
// the infinite fin): h the surface coefficient, P the fin's perimeter, k its
// conductivity and A its cross-section.
func InfiniteFinConductance(h, perimeter, k, area float64) float64 {
	if h <= 0 || perimeter <= 0 || k <= 0 || area <= 0 {
		return 0
	}
	return math.Sqrt(h * perimeter * k * area)
}
