package analysis

// Output is the answer for one line. Values are SI; nil pointers are JSON null: "not
// applicable" or "not computed", with a warning or assumption saying why where it matters.
type Output struct {
	MethodVersion string `json:"method_version"`

	Geometry          string   `json:"geometry"`
	PipeODmm          *float64 `json:"pipe_od_mm"`
	OperatingTempC    float64  `json:"operating_temp_c"`
	InsulationMM      float64  `json:"insulation_thickness_mm"`
	OuterDiameterMM   *float64 `json:"outer_diameter_mm"`
	OuterAreaM2PerM   *float64 `json:"outer_area_m2_per_m"`
	EquivalentLengthM *float64 `json:"equivalent_length_m"`
	StraightRunHeatW  *float64 `json:"straight_run_heat_w"` // heat of length_m alone

	// FittingsHeatW is the heat of each counted fitting kind, W (with the override,
	// the insulated fittings' heat is under "fittings_equiv_length"); Fittings tells each
	// kind's count, finish, equivalent length and bare area.
	FittingsHeatW map[string]float64 `json:"fittings_heat_w"`
	Fittings      []FittingOut       `json:"fittings_detail"`
	Supports      *SupportsOut       `json:"supports"`

	HeatFlowWPerM   *float64     `json:"heat_flow_w_per_m"`
	HeatFluxWm2     float64      `json:"heat_flux_w_m2"`
	HeatFlowW       *float64     `json:"heat_flow_w"`
	SurfaceTempC    float64      `json:"surface_temp_c"`
	PipeSurfaceC    float64      `json:"pipe_surface_temp_c"`
	InterfaceTempsC []float64    `json:"interface_temps_c"`
	Faces           []FaceOut    `json:"faces,omitempty"`
	Layers          []LayerOut   `json:"layers"`
	SurfaceCoeff    SurfaceCoeff `json:"surface_coeff_w_m2k"`
	BareHeatFlow    *float64     `json:"bare_heat_flow_w_per_m"`
	BareHeatFluxWm2 float64      `json:"bare_heat_flux_w_m2"`
	BareSurfaceC    float64      `json:"bare_surface_temp_c"`
	EfficiencyPct   *float64     `json:"efficiency_pct"`

	DewPointC           *float64 `json:"dew_point_c"`
	DewPointKind        string   `json:"dew_point_kind,omitempty"` // "dew point" | "frost point"
	CondensationMarginK *float64 `json:"condensation_margin_k"`

	OutletTempC         *float64 `json:"outlet_temp_c"`
	TempChangeK         *float64 `json:"temp_change_k"`
	CondensateKgPerH    *float64 `json:"condensate_kg_per_h"`
	SteamSatTempC       *float64 `json:"steam_saturation_temp_c"`
	SteamSuperheatK     *float64 `json:"steam_superheat_k"`
	SteamSaturatedAtM   *float64 `json:"steam_saturated_at_m"`
	FreezeHoursTo0C     *float64 `json:"freeze_hours_to_0c"`
	FreezeHoursToFreeze *float64 `json:"freeze_hours_to_freeze"`
	HeatTraceWPerM      *float64 `json:"heat_trace_w_per_m"`
	HeatTraceW          *float64 `json:"heat_trace_w"` // per run: length plus fittings

	Checks     []Check        `json:"checks"`
	Sizing     Sizing         `json:"sizing"`
	EnergyCode *EnergyCodeRow `json:"energy_code"`
	// VapourRetarder judges the build's vapour retarder on below-ambient lines.
	VapourRetarder *RetarderOut   `json:"vapour_retarder"`
	Economics      []EconomicsRow `json:"economics"`
	// AsFound is the line as found (with existing), beside the proposed build and bare.
	AsFound *AsFoundOut `json:"as_found"`
	// EnergyBasis is the basis the economics used (nil without economics or a price).
	EnergyBasis *EnergyBasis `json:"energy_basis"`
	// EconomicsAsSpecified prices the line's own build (project totals, audit).
	EconomicsAsSpecified *EconomicsRow `json:"economics_as_specified"`

	ConditionsUsed ConditionsUsed `json:"conditions_used"`
	Assumptions    []string       `json:"assumptions"`
	Cautions       []string       `json:"cautions"`
	Warnings       []string       `json:"warnings"`
}

// FaceOut is one face of a rectangular duct.
type FaceOut struct {
	Face          string  `json:"face"`
	SurfaceTempC  float64 `json:"surface_temp_c"`
	HeatFlowWPerM float64 `json:"heat_flow_w_per_m"`
	HeatFluxWm2   float64 `json:"heat_flux_w_m2"`
}

// LayerOut is one layer's solved state.
type LayerOut struct {
	Material           string  `json:"material,omitempty"`
	ThicknessMM        float64 `json:"thickness_mm"` // installed (compressed blankets: less than nominal)
	NominalThicknessMM float64 `json:"nominal_thickness_mm"`
	KUsed              float64 `json:"k_used_w_mk"`
	MeanTempC          float64 `json:"mean_temp_c"`
	InnerTempC         float64 `json:"inner_temp_c"`
	OuterTempC         float64 `json:"outer_temp_c"`
}

// SurfaceCoeff is the outer-surface coefficient split into its parts.
type SurfaceCoeff struct {
	Convection float64 `json:"convection"`
	Radiation  float64 `json:"radiation"`
}

// Sizing is the thinnest available thickness per criterion and the governing one.
// Thicknesses are of the sized (outermost) layer; 0 means bare meets it.
type Sizing struct {
	PersonnelProtectionMM *float64    `json:"personnel_protection_mm"`
	CondensationMM        *float64    `json:"condensation_mm"`
	MaxHeatFlowMM         *float64    `json:"max_heat_flow_mm"`
	MaxTempChangeMM       *float64    `json:"max_temp_change_mm"`
	FreezeMM              *float64    `json:"freeze_mm"`
	EnergyCodeMM          *float64    `json:"energy_code_mm"`
	EconomicMM            *float64    `json:"economic_mm"`
	JacketMaxTempMM       *float64    `json:"jacket_max_temp_mm"` // thinnest build keeping the jacket within its own limit
	Governing             *string     `json:"governing"`
	GoverningThicknessMM  *float64    `json:"governing_thickness_mm"`
	LayersProposed        []LayerPlan `json:"layers_proposed"`
	Candidates            []float64   `json:"candidates_mm"`
	Unmet                 []string    `json:"unmet"`
}

// Check is one active criterion judged on the build as specified, at the criterion's own
// conditions: the one place that says whether the line as drawn is acceptable. Badges,
// project counts and the schedule read it; sizing (what would be enough) is separate.
type Check struct {
	Criterion string  `json:"criterion"` // personnel_protection, condensation, max_heat_flow, max_temp_change, freeze, energy_code, jacket_max_temp, service_temp
	Label     string  `json:"label"`     // the criterion in words
	Pass      bool    `json:"pass"`
	Value     float64 `json:"value"` // what the build gives
	Limit     float64 `json:"limit"` // what the criterion allows or needs
	Unit      string  `json:"unit"`  // "°C", "K", "W/m", "W/m²", "h", "mm", "m·K/W"
	Sense     string  `json:"sense"` // "max": value must be at most limit; "min": at least limit
}

// Check criteria keys beyond the sizing criteria.
const (
	CheckJacketMaxTemp = "jacket_max_temp" // the jacket's own surface-temperature limit
	CheckServiceTemp   = "service_temp"    // a layer outside its material's service range
)

// LayerPlan is one layer of the proposed build-up.
type LayerPlan struct {
	Material    string  `json:"material,omitempty"`
	ThicknessMM float64 `json:"thickness_mm"`
}

// EnergyCodeRow is the compliance row against an energy-code minimum table.
type EnergyCodeRow struct {
	Table   string `json:"table"`
	Edition string `json:"edition"`
	// Applies is false when the table does not cover the line's system (or shape); Reason
	// then says so ("not covered by <name> (<edition>)") and nothing else is checked.
	Applies          bool      `json:"applies"`
	Reason           string    `json:"reason,omitempty"`
	System           string    `json:"system,omitempty"`
	Row              string    `json:"row"`
	Column           string    `json:"column"`
	SizeUsed         string    `json:"size_used"`  // the size the column was read for: "CTS 1", "DN65", "OD 30 mm"
	SizeBasis        string    `json:"size_basis"` // "pipe_size", "matched_od" (a standard OD within 0.5 mm) or "od" (the OD itself)
	Required         bool      `json:"required"`
	TableThicknessMM *float64  `json:"table_thickness_mm"`
	KAtMeanWmK       *float64  `json:"k_at_mean_w_mk"`
	KRangeWmK        []float64 `json:"k_range_w_mk"`
	CorrectedMM      *float64  `json:"corrected_mm"`
	SpecifiedMM      float64   `json:"specified_mm"`
	Pass             bool      `json:"pass"`
	Source           string    `json:"source"`
}

// EconomicsRow is one candidate thickness priced over the life.
type EconomicsRow struct {
	ThicknessMM             float64  `json:"thickness_mm"`
	AsFound                 bool     `json:"as_found,omitempty"` // the line as found (existing), not a candidate
	HeatFlowWPerM           float64  `json:"heat_flow_w_per_m"`
	SurfaceTempC            float64  `json:"surface_temp_c"`
	AnnualKWh               float64  `json:"annual_kwh"`
	AnnualCost              float64  `json:"annual_cost"`
	InstalledCost           *float64 `json:"installed_cost"`
	SimplePaybackYears      *float64 `json:"simple_payback_years"`
	IncrementalPaybackYears *float64 `json:"incremental_payback_years"`
	NPV                     *float64 `json:"npv"`
	LifeCycleCost           *float64 `json:"life_cycle_cost"`
	CO2Kg                   float64  `json:"co2_kg"`
	// AnnualSavings is energy, money and CO2 saved a year against the bare row.
	AnnualSavings *Savings `json:"annual_savings"`
}

// Savings is what a build saves a year against another: energy bought, money, CO2.
type Savings struct {
	KWh   float64 `json:"kwh"`
	Cost  float64 `json:"cost"`
	CO2Kg float64 `json:"co2_kg"`
}

// EnergyBasis is the one energy basis a line was priced on, echoed for every figure:
// "heating" (Efficiency set) for hot lines, "cooling" (COP set) for cold lines.
type EnergyBasis struct {
	Basis        string   `json:"basis"`
	Currency     string   `json:"currency"`
	PricePerKWh  float64  `json:"price_per_kwh"`
	Efficiency   *float64 `json:"efficiency,omitempty"`
	COP          *float64 `json:"cop,omitempty"`
	HoursPerYear float64  `json:"hours_per_year"`
	CO2KgPerKWh  float64  `json:"co2_kg_per_kwh"`
}

// ConditionsUsed echoes the air each criterion was judged in.
type ConditionsUsed struct {
	Design       AirOut  `json:"design"`
	Personnel    AirOut  `json:"personnel"`
	Condensation AirOut  `json:"condensation"`
	Freeze       *AirOut `json:"freeze"`
	Economics    AirOut  `json:"economics"`
}

// AirOut is one resolved condition set.
type AirOut struct {
	AmbientTempC        float64  `json:"ambient_temp_c"`
	SurroundingsTempC   float64  `json:"surroundings_temp_c"`
	WindMS              float64  `json:"wind_m_s"`
	RelativeHumidityPct *float64 `json:"relative_humidity_pct"`
	DewPointC           *float64 `json:"dew_point_c"`
	InitialTempC        *float64 `json:"initial_temp_c,omitempty"`
	SolarFluxWm2        *float64 `json:"solar_flux_w_m2,omitempty"`   // personnel: sunlight on the projected area
	SolarAbsorptance    *float64 `json:"solar_absorptance,omitempty"` // personnel: of the outer surface
}

// RetarderOut is the vapour retarder of the build and its judgement against the
// permeance limit for the service temperature.
type RetarderOut struct {
	Source          string   `json:"source"` // "jacket" | "retarder" (under the cover) | "insulation" | "none"
	Name            string   `json:"name,omitempty"`
	PermeancePerm   *float64 `json:"permeance_perm"`           // US perm; null: unknown
	PermeanceMetric *float64 `json:"permeance_ng_per_s_m2_pa"` // ng/(s·m²·Pa)
	LimitPerm       *float64 `json:"limit_perm"`               // null where not judged (line not below ambient)
	Basis           string   `json:"basis,omitempty"`          // of the limit
	Pass            *bool    `json:"pass"`                     // null: not judged or permeance unknown
}
