package catalog

// Jacket is an outer jacket or coating over the insulation.
type Jacket struct {
	Slug, Name     string
	Emittance      float64 // of the exposed face
	VapourRetarder bool    // serves as the vapour retarder on below-ambient lines when sealed at laps
	PermeancePerm  float64 // water-vapour permeance, US perm; 0 = unknown or not applicable
	Use            string  // "indoor", "outdoor", "indoor, cold service" …
	Source         string
	// SolarAbsorptance is the fraction of sunlight the exposed face absorbs (personnel
	// protection outdoors); AbsorptanceSource says where it comes from.
	SolarAbsorptance  float64
	AbsorptanceSource string
	// MaxSurfaceC is the hottest surface the jacket is made for, °C (0 = no limit given
	// here); MaxSurfaceSource says where it comes from.
	MaxSurfaceC      float64
	MaxSurfaceSource string
}

const (
	srcAbsorptance = "solar absorptance as recalled from published solar-absorptance tables (ASHRAE Fundamentals), check before use"
	srcDarkAssumed = "colour not known: a dark face assumed (0.9), the safe side for personnel protection (common practice)"
	srcJacket65    = "about 65 °C (150 °F) for PVC and paper or kraft facings (common practice; check the maker's limit)"
)

// jacketLimits are the solar absorptance and surface limit of each built-in jacket.
var jacketLimits = map[string]struct {
	alpha    float64
	alphaSrc string
	maxC     float64
	maxSrc   string
}{
	"aluminium_new":          {0.15, srcAbsorptance, 0, ""},
	"aluminium_weathered":    {0.35, srcAbsorptance, 0, ""},
	"stainless_steel_jacket": {0.40, srcAbsorptance, 0, ""},
	"stainless_steel_dull":   {0.50, srcAbsorptance, 0, ""},
	"galvanised_new":         {0.65, srcAbsorptance, 0, ""},
	"galvanised_dull":        {0.90, srcAbsorptance, 0, ""},
	"painted_metal":          {0.90, srcDarkAssumed, 0, ""},
	"pvc_jacket":             {0.90, srcDarkAssumed, 65, srcJacket65},
	"all_service_jacket":     {0.40, "white kraft facing: " + srcAbsorptance, 65, srcJacket65},
	"fsk":                    {0.15, "exposed aluminium foil: " + srcAbsorptance, 65, srcJacket65},
	"mastic":                 {0.90, srcDarkAssumed, 0, ""},
	"canvas":                 {0.90, srcDarkAssumed, 0, ""},
}

func init() {
	for i := range jackets {
		if v, ok := jacketLimits[jackets[i].Slug]; ok {
			jackets[i].SolarAbsorptance, jackets[i].AbsorptanceSource = v.alpha, v.alphaSrc
			jackets[i].MaxSurfaceC, jackets[i].MaxSurfaceSource = v.maxC, v.maxSrc
		}
	}
}

// Slugs are our own names in trade terms. Emittance basis: docs/references.md "Jacket and surface
// emittance"; where a range was read, the preset is a value inside it.
var jackets = []Jacket{
	{Slug: "aluminium_new", Name: "Aluminium jacket, new/bright", Emittance: 0.05,
		Use:    "indoor, outdoor",
		Source: "emittance 0.05: new/bright aluminium, 0.04–0.09 in published emissivity tables (e.g. Incropera, Fundamentals of Heat and Mass Transfer, 6th ed., Table A.11)"},
	{Slug: "aluminium_weathered", Name: "Aluminium jacket, oxidised/weathered", Emittance: 0.15,
		Use:    "indoor, outdoor",
		Source: "emittance 0.15: oxidised/dull aluminium, 0.1–0.3 in published emissivity tables (e.g. Incropera, Fundamentals of Heat and Mass Transfer, 6th ed., Table A.11)"},
	{Slug: "stainless_steel_jacket", Name: "Stainless steel jacket, new", Emittance: 0.13,
		Use:    "indoor, outdoor",
		Source: "emittance 0.13 " + labelMemory + " (published tables give 0.07–0.28 for stainless steel, e.g. Incropera, Fundamentals of Heat and Mass Transfer, 6th ed., Table A.11)"},
	{Slug: "stainless_steel_dull", Name: "Stainless steel jacket, dull", Emittance: 0.30,
		Use:    "indoor, outdoor",
		Source: "emittance 0.30 " + labelMemory + " (published tables give 0.07–0.28 for stainless steel, e.g. Incropera, Fundamentals of Heat and Mass Transfer, 6th ed., Table A.11)"},
	{Slug: "galvanised_new", Name: "Galvanised steel jacket, new", Emittance: 0.10,
		Use:    "indoor, outdoor",
		Source: "emittance 0.10: new galvanised steel, 0.07–0.13 in published emissivity tables (e.g. Incropera, Fundamentals of Heat and Mass Transfer, 6th ed., Table A.11)"},
	{Slug: "galvanised_dull", Name: "Galvanised steel jacket, dull", Emittance: 0.27,
		Use:    "indoor, outdoor",
		Source: "emittance 0.27: dull galvanised steel, 0.26–0.28 in published emissivity tables (e.g. Incropera, Fundamentals of Heat and Mass Transfer, 6th ed., Table A.11)"},
	{Slug: "painted_metal", Name: "Painted metal jacket", Emittance: 0.90,
		Use:    "indoor, outdoor",
		Source: "emittance 0.90: painted metal of any colour, 0.90–0.96 in published emissivity tables (e.g. Incropera, Fundamentals of Heat and Mass Transfer, 6th ed., Table A.11)"},
	{Slug: "pvc_jacket", Name: "PVC jacket", Emittance: 0.92, VapourRetarder: true,
		Use: "indoor; outdoor only in UV-resistant grades; cold service when laps and joints are sealed",
		Source: "emittance 0.92: PVC, 0.90–0.94 in published emissivity tables (e.g. Incropera, Fundamentals of Heat and Mass Transfer, 6th ed., Table A.11); " +
			"vapour retarder when sealed: " + labelMemory + "; permeance unknown"},
	{Slug: "all_service_jacket", Name: "All-service jacket (ASJ, paper)", Emittance: 0.90,
		VapourRetarder: true, PermeancePerm: 0.02,
		Use: "indoor, hot and cold service",
		Source: "emittance 0.90: paper, 0.88–0.97 in published emissivity tables (e.g. Incropera, Fundamentals of Heat and Mass Transfer, 6th ed., Table A.11); " +
			"vapour retarder, permeance ≤ 0.02 perm: " + labelMemory},
	{Slug: "fsk", Name: "Foil-scrim-kraft (FSK) facing, foil exposed", Emittance: 0.05,
		VapourRetarder: true, PermeancePerm: 0.02,
		Use: "indoor, duct wrap facing, cold service",
		Source: "emittance 0.05 for the exposed aluminium-foil face: within 0.04–0.09 for new/bright aluminium in " +
			"published emissivity tables (e.g. Incropera, Fundamentals of Heat and Mass Transfer, 6th ed., Table A.11); vapour retarder, permeance ≤ 0.02 perm: " + labelMemory},
	{Slug: "mastic", Name: "Vapour-retarder mastic", Emittance: 0.90,
		VapourRetarder: true, PermeancePerm: 0.05,
		Use: "indoor, outdoor (weather-barrier grades), cold service; permeance depends on the dry film thickness",
		Source: "emittance 0.90 " + labelMemory + "; " +
			"permeance 0.05 perm at the maker's dry film thickness " + labelMemory},
	{Slug: "canvas", Name: "Canvas, coated with lagging adhesive", Emittance: 0.90,
		Use:    "indoor",
		Source: "emittance 0.90 " + labelMemory + "; not a vapour retarder"},
}

// Jackets returns every jacket and coating. There is no "none" jacket: a bare insulation
// surface takes an explicit surface emittance.
func Jackets() []Jacket { return append([]Jacket(nil), jackets...) }

// JacketBySlug finds a jacket by its slug.
func JacketBySlug(slug string) (Jacket, bool) {
	for _, j := range jackets {
		if j.Slug == slug {
			return j, true
		}
	}
	return Jacket{}, false
}
