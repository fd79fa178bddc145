package calc

import (
	"fmt"
	"math"
)

// CodeCorrectedThickness returns the minimum insulation thickness for a material whose
// conductivity differs from the table's, by the footnote formula of the ASHRAE 90.1 pipe
// insulation tables (6.8.3-1/-2; the IECC uses the same form):
//
//	T = r·[(1 + t/r)^(K/k) − 1]
//
// r is the actual outside radius of the pipe, t the table thickness (the same length unit
// as r; the result is in that unit), K the material's conductivity at the table's mean
// rating temperature and k the reference conductivity the table names (for 90.1 the upper
// end of the row's range (from memory)). Any consistent conductivity unit works.
func CodeCorrectedThickness(pipeRadiusM, tableThicknessM, kMaterial, kRef float64) (float64, error) {
	for _, v := range []float64{pipeRadiusM, tableThicknessM, kMaterial, kRef} {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return 0, fmt.Errorf("calc: code thickness inputs must be finite (r %g, t %g, K %g, k %g)", pipeRadiusM, tableThicknessM, kMaterial, kRef)
		}
	}
	switch {
	case pipeRadiusM <= 0:
		return 0, fmt.Errorf("calc: pipe radius %g must be greater than 0", pipeRadiusM)
	case tableThicknessM < 0:
		return 0, fmt.Errorf("calc: table thickness %g must not be negative", tableThicknessM)
	case kMaterial <= 0 || kRef <= 0:
		return 0, fmt.Errorf("calc: conductivities %g and %g must be greater than 0", kMaterial, kRef)
	}
	t := pipeRadiusM * (math.Pow(1+tableThicknessM/pipeRadiusM, kMaterial/kRef) - 1)
	if math.IsInf(t, 0) || math.IsNaN(t) {
		return 0, fmt.Errorf("calc: corrected thickness overflows (r %g, t %g, K/k %g)", pipeRadiusM, tableThicknessM, kMaterial/kRef)
	}
	return t, nil
}
