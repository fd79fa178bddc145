package catalog

import "fmt"

// PipeMaterial is the material of a pipe wall: its conductivity (for the optional wall
// resistance), the emittance of the bare surface (for the bare-pipe comparison) and
// material-specific cautions.
//
// Temperature bands: a band whose Max is not above its Min (both 0) does not apply.
type PipeMaterial struct {
	Slug, Name    string
	WallK         float64 // W/(m·K)
	BareEmittance float64
	Source        string
	Cautions      []string // general cautions, for display with the material

	// CUIMinC, CUIMaxC: the operating-temperature band in which corrosion under insulation of
	// carbon steel is most likely; the engine warns only inside it.
	CUIMinC, CUIMaxC float64
	// SCCMinC, SCCMaxC: the band in which external chloride stress-corrosion cracking of
	// austenitic stainless steel under wet insulation is most likely.
	SCCMinC, SCCMaxC float64
	// MaxServiceC: the pipe's own service temperature limit; 0 = none given.
	MaxServiceC float64
	// Density (kg/m³) and SpecificHeat (J/kg·K) of the wall, for the heat the wall gives
	// up while stagnant water cools towards freezing.
	Density, SpecificHeat float64
}

var pipeMaterials = []PipeMaterial{
	{
		Slug: "carbon_steel", Name: "Carbon steel", WallK: 50, BareEmittance: 0.79,
		Source: "k: " + labelCommon + "; emittance 0.79: oxidised steel, mid-range of 0.74–0.82 in published " +
			"emissivity tables (e.g. Incropera, Fundamentals of Heat and Mass Transfer, 6th ed., Table A.11); CUI band −4 to 175 °C (25–350 °F): NACE SP0198, " + labelMemory,
		Cautions: []string{
			"Corrosion under insulation (CUI) is most likely at operating temperatures between about −4 °C and " +
				"175 °C, worst in cyclic service and where the jacket lets water in (NACE SP0198 range, " +
				labelMemory + "): coat the pipe under the insulation and keep the jacket sealed.",
		},
		CUIMinC: -4, CUIMaxC: 175,
		Density: 7850, SpecificHeat: 480, // plain carbon steel near 20 °C, common practice
	},
	{
		Slug: "stainless_steel", Name: "Stainless steel (austenitic)", WallK: 16, BareEmittance: 0.30,
		Source: "k: " + labelCommon + "; emittance 0.30 dull stainless, " + labelMemory +
			" (published tables give 0.07–0.28, e.g. Incropera, Fundamentals of Heat and Mass Transfer, 6th ed., Table A.11); SCC band 50–150 °C " + labelMemory,
		Cautions: []string{
			"Use insulation tested for leachable chlorides (ASTM C795) on austenitic stainless steel: " +
				"chlorides leached from wet insulation cause external stress-corrosion cracking, most likely " +
				"between about 50 °C and 150 °C (" + labelMemory + ").",
		},
		SCCMinC: 50, SCCMaxC: 150,
		Density: 7900, SpecificHeat: 477, // AISI 304, Incropera Table A.1, from memory
	},
	{
		Slug: "copper", Name: "Copper", WallK: 385, BareEmittance: 0.65,
		Source: "k: " + labelCommon + "; emittance 0.65 oxidised copper, " + labelMemory,
		Cautions: []string{
			"The bare emittance assumes oxidised copper; new, bright copper is about 0.03–0.05 (" +
				labelMemory + "), which lowers the bare heat loss a great deal: edit bare_emittance to suit.",
		},
		Density: 8933, SpecificHeat: 385, // pure copper, Incropera Table A.1, from memory
	},
	{
		Slug: "galvanised_steel", Name: "Galvanised steel", WallK: 50, BareEmittance: 0.27,
		Source: "k: " + labelCommon + "; emittance 0.27: dull galvanised steel, 0.26–0.28 in published " +
			"emissivity tables (e.g. Incropera, Fundamentals of Heat and Mass Transfer, 6th ed., Table A.11)",
		Density: 7850, SpecificHeat: 480, // as carbon steel, common practice
	},
	{
		Slug: "pvc", Name: "PVC", WallK: 0.19, BareEmittance: 0.92,
		Source: "k: " + labelCommon + "; emittance 0.92: PVC, 0.90–0.94 in published emissivity tables " +
			"(e.g. Incropera, Fundamentals of Heat and Mass Transfer, 6th ed., Table A.11); service limit about 60 °C: " + labelCommon,
		Cautions: []string{
			"PVC pipe has a service temperature limit of about 60 °C (" + labelCommon + "); check the pipe maker's rating.",
		},
		MaxServiceC: 60,
		Density:     1400, SpecificHeat: 1000, // rigid PVC, from memory
	},
}

func (m PipeMaterial) clone() PipeMaterial {
	m.Cautions = append([]string(nil), m.Cautions...)
	return m
}

// PipeMaterials returns every pipe-wall material.
func PipeMaterials() []PipeMaterial {
	out := make([]PipeMaterial, len(pipeMaterials))
	for i, m := range pipeMaterials {
		out[i] = m.clone()
	}
	return out
}

// PipeMaterialBySlug finds a pipe-wall material by its slug.
func PipeMaterialBySlug(slug string) (PipeMaterial, bool) {
	for _, m := range pipeMaterials {
		if m.Slug == slug {
			return m.clone(), true
		}
	}
	return PipeMaterial{}, false
}

func inBand(t, lo, hi float64) bool { return hi > lo && t >= lo && t <= hi }

// InCUIRange reports whether an operating temperature lies in the corrosion-under-insulation band.
func (m PipeMaterial) InCUIRange(tC float64) bool { return inBand(tC, m.CUIMinC, m.CUIMaxC) }

// InSCCRange reports whether an operating temperature lies in the stress-corrosion-cracking band.
func (m PipeMaterial) InSCCRange(tC float64) bool { return inBand(tC, m.SCCMinC, m.SCCMaxC) }

// AboveServiceLimit reports whether an operating temperature exceeds the pipe's own limit.
func (m PipeMaterial) AboveServiceLimit(tC float64) bool {
	return m.MaxServiceC != 0 && tC > m.MaxServiceC
}

// CautionsAt returns the warnings that apply at an operating temperature (°C): CUI and SCC
// only inside their bands, the service limit only above it. Nil when none applies.
func (m PipeMaterial) CautionsAt(tC float64) []string {
	var out []string
	if m.InCUIRange(tC) {
		out = append(out, fmt.Sprintf("%s at %g °C is in the band where corrosion under insulation is most "+
			"likely (%g to %g °C, NACE SP0198 range, %s): coat the pipe and keep the jacket sealed",
			m.Name, tC, m.CUIMinC, m.CUIMaxC, labelMemory))
	}
	if m.InSCCRange(tC) {
		out = append(out, fmt.Sprintf("%s at %g °C is in the band where external stress-corrosion cracking "+
			"under wet insulation is most likely (%g to %g °C, %s): use insulation tested for leachable "+
			"chlorides (ASTM C795)", m.Name, tC, m.SCCMinC, m.SCCMaxC, labelMemory))
	}
	if m.AboveServiceLimit(tC) {
		out = append(out, fmt.Sprintf("%s at %g °C is above its service temperature limit of about %g °C (%s)",
			m.Name, tC, m.MaxServiceC, labelCommon))
	}
	return out
}
