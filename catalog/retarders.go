package catalog

// Vapour retarders of below-ambient insulation systems: which closed-cell insulations
// serve as their own retarder, and the permeance a retarder should not exceed.

// PermToMetric converts a water-vapour permeance in US perm (grains/(h·ft²·inHg)) to
// ng/(s·m²·Pa): 1 perm = 57.2 ng/(s·m²·Pa) (value as recalled from ASTM E96, check before use).
const PermToMetric = 57.2

// ClosedCell is a closed-cell insulation that is itself the vapour retarder: its
// water-vapour permeability, perm·in (permeance × thickness in inches).
type ClosedCell struct {
	PermIn float64
	Source string
}

// closedCell holds the materials of the built-in classes that retard vapour by
// themselves, at their specification's maximum permeability.
var closedCell = map[string]ClosedCell{
	"elastomeric_c534_gr1":   {0.10, "maximum water-vapour permeability 0.10 perm·in (value as recalled from ASTM C534, check before use)"},
	"elastomeric_c534_gr2":   {0.10, "maximum water-vapour permeability 0.10 perm·in (value as recalled from ASTM C534, check before use)"},
	"cellular_glass_c552_t1": {0.005, "maximum water-vapour permeability 0.005 perm·in (value as recalled from ASTM C552, check before use)"},
	"cellular_glass_c552_t2": {0.005, "maximum water-vapour permeability 0.005 perm·in (value as recalled from ASTM C552, check before use)"},
}

// ClosedCellBySlug reports whether the material of slug is its own vapour retarder.
func ClosedCellBySlug(slug string) (ClosedCell, bool) {
	c, ok := closedCell[slug]
	return c, ok
}

// RetarderLimit is the highest permeance, US perm, a below-ambient line's vapour
// retarder should have at operating temperature opC, and its basis in words: about 0.02
// perm for chilled service and lower (0.01, or a metal or foil facing) below 0 °C
// (common practice).
func RetarderLimit(opC float64) (perm float64, basis string) {
	if opC < 0 {
		return 0.01, "0.01 perm for service below 0 °C (refrigerant and cold service; " + labelCommon + ": a metal or foil facing or an equally tight retarder)"
	}
	return 0.02, "0.02 perm for chilled service at 0 °C and above (" + labelCommon + ")"
}
