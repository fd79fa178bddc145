// Package analysis is Lagwright's machine interface: it parses and validates one line's
// JSON, resolves pipe sizes, materials and jackets through a Resolver, runs calc for the
// heat balance and every sizing criterion, and shapes the answer. The `calc` command,
// POST /api/v1/calc, stored lines and imports all go through it, so they agree.
//
// The full schema, with every key, unit, default and bound, is docs/calc-json.md.
package analysis

// Input is one line's calculation request. Keys are snake_case with the unit in the
// name; SI throughout. Pointers mark optional values: nil means "take the default".
type Input struct {
	Geometry    string `json:"geometry"`              // "pipe" | "duct" | "flat"
	Orientation string `json:"orientation,omitempty"` // "horizontal" (default) | "vertical"
	Facing      string `json:"facing,omitempty"`      // flat horizontal: "up" (default) | "down"

	PipeODmm     *float64 `json:"pipe_od_mm,omitempty"`
	PipeSize     string   `json:"pipe_size,omitempty"`     // "NPS 4", "DN100", "CTS 1"
	PipeSchedule string   `json:"pipe_schedule,omitempty"` // steel "40"/"80"; copper "K"/"L"/"M"
	PipeWallMM   *float64 `json:"pipe_wall_mm,omitempty"`  // wall for a plain OD (optional)
	PipeMaterial string   `json:"pipe_material,omitempty"` // default "carbon_steel"

	DuctWidthMM  *float64 `json:"duct_width_mm,omitempty"`
	DuctHeightMM *float64 `json:"duct_height_mm,omitempty"`

	HeightM      *float64 `json:"height_m,omitempty"`
	WidthM       *float64 `json:"width_m,omitempty"`
	PlateLengthM *float64 `json:"plate_length_m,omitempty"`
	PlateWidthM  *float64 `json:"plate_width_m,omitempty"`

	InnerCoeff *float64 `json:"inner_coeff_w_m2k,omitempty"`

	Fluid string `json:"fluid,omitempty"` // water (default) | steam | glycol | refrigerant | air | other
	// System is the building or process system the line serves (catalog.Systems, e.g.
	// "chilled_water", "domestic_cold_water", "supply_air"): the energy-code check runs only
	// where the table covers it. Empty: the table applies by temperature alone.
	System                string   `json:"system,omitempty"`
	OperatingTempC        *float64 `json:"operating_temp_c,omitempty"`
	SteamGaugePressureKPa *float64 `json:"steam_gauge_pressure_kpa,omitempty"`

	AmbientTempC        *float64 `json:"ambient_temp_c,omitempty"`
	SurroundingsTempC   *float64 `json:"surroundings_temp_c,omitempty"`
	WindMS              *float64 `json:"wind_m_s,omitempty"`
	RelativeHumidityPct *float64 `json:"relative_humidity_pct,omitempty"`
	DewPointC           *float64 `json:"dew_point_c,omitempty"` // design dew point, instead of the humidity
	// RelativeHumidityOver is what an RH below 0 °C is relative to: "water" (default, the
	// weather-data convention) or "ice".
	RelativeHumidityOver string      `json:"relative_humidity_over,omitempty"`
	Conditions           *Conditions `json:"conditions,omitempty"`

	Layers []LayerInput `json:"layers"`
	Jacket string       `json:"jacket,omitempty"`
	// VapourRetarder is the build's vapour retarder when it is not the jacket: a jacket
	// slug of a film, facing or mastic under the cover, "insulation" (the outer layer is
	// closed-cell and retards vapour itself) or "none".
	VapourRetarder   string   `json:"vapour_retarder,omitempty"`
	SurfaceEmittance *float64 `json:"surface_emittance,omitempty"`
	BareEmittance    *float64 `json:"bare_emittance,omitempty"`
	SurfaceCoeff     *float64 `json:"surface_coeff_w_m2k,omitempty"`
	// SurfaceAbsorptance is the solar absorptance of the outer surface (wins over the
	// jacket's); Location says whether the line is outdoors (sunlight for personnel protection).
	SurfaceAbsorptance *float64 `json:"surface_absorptance,omitempty"`
	Location           string   `json:"location,omitempty"` // "indoor" (default) | "outdoor"

	LengthM              *float64 `json:"length_m,omitempty"`
	AreaM2               *float64 `json:"area_m2,omitempty"`                 // flat surfaces: area for per-run totals
	FittingsEquivLengthM *float64 `json:"fittings_equiv_length_m,omitempty"` // override of the fittings' insulated equivalent length

	Fittings        *Fittings       `json:"fittings,omitempty"`          // counts by kind
	FittingFinish   *FittingFinish  `json:"fitting_finish,omitempty"`    // by kind; default insulated
	FittingLengthsM *FittingLengths `json:"fitting_lengths_m,omitempty"` // per fitting by kind; default the table by size
	FittingCover    *FittingCover   `json:"fitting_cover,omitempty"`     // removable covers' build-up
	Supports        *Supports       `json:"supports,omitempty"`

	Flow          *Flow     `json:"flow,omitempty"`
	Criteria      *Criteria `json:"criteria,omitempty"`
	ThicknessesMM []float64 `json:"thicknesses_mm,omitempty"`
	// ThicknessSeries is "inch" or "metric"; default by pipe_size (DN: metric).
	ThicknessSeries string     `json:"thickness_series,omitempty"`
	Economics       *Economics `json:"economics,omitempty"`
	// Existing is the line as found (an audit); Layers are then the proposed build.
	Existing *Existing `json:"existing,omitempty"`
}

// Conditions holds the optional per-criterion condition sets.
type Conditions struct {
	Personnel    *ConditionSet `json:"personnel,omitempty"`
	Condensation *ConditionSet `json:"condensation,omitempty"`
	Freeze       *ConditionSet `json:"freeze,omitempty"`
	Economics    *ConditionSet `json:"economics,omitempty"`
}

// ConditionSet is the air around the line for one criterion. Absent values fall back
// to the line's design conditions (wind to 0 for personnel and condensation).
type ConditionSet struct {
	AmbientTempC        *float64 `json:"ambient_temp_c,omitempty"`
	SurroundingsTempC   *float64 `json:"surroundings_temp_c,omitempty"`
	WindMS              *float64 `json:"wind_m_s,omitempty"`
	RelativeHumidityPct *float64 `json:"relative_humidity_pct,omitempty"`
	DewPointC           *float64 `json:"dew_point_c,omitempty"`
	InitialTempC        *float64 `json:"initial_temp_c,omitempty"`  // freeze only
	SolarFluxWm2        *float64 `json:"solar_flux_w_m2,omitempty"` // personnel only: sunlight on the projected area
}

// LayerInput is one insulation layer: exactly one of Material, KWmK or KPoints.
type LayerInput struct {
	Material    string       `json:"material,omitempty"`
	KWmK        *float64     `json:"k_w_mk,omitempty"`
	KPoints     [][2]float64 `json:"k_points,omitempty"` // [[mean_temp_c, k_w_mk], …]
	ThicknessMM *float64     `json:"thickness_mm"`
}

// Flow is the fluid flow through the run, for its temperature change.
type Flow struct {
	MassFlowKgS *float64 `json:"mass_flow_kg_s"`
	CpJkgK      *float64 `json:"cp_j_kgk,omitempty"` // default by fluid
}

// Criteria switches on the sizing criteria and sets their limits.
type Criteria struct {
	PersonnelProtection *bool    `json:"personnel_protection,omitempty"` // default true on lines hotter than the limit
	MaxSurfaceTempC     *float64 `json:"max_surface_temp_c,omitempty"`   // default 60
	TouchExposure       string   `json:"touch_exposure,omitempty"`       // "industrial" (default, 60 °C) | "public" (give the limit)
	Condensation        *bool    `json:"condensation,omitempty"`         // default true on lines colder than ambient
	DewMarginK          *float64 `json:"dew_margin_k,omitempty"`         // default 1
	MaxHeatFlowWPerM    *float64 `json:"max_heat_flow_w_per_m,omitempty"`
	MaxTempChangeK      *float64 `json:"max_temp_change_k,omitempty"`
	FreezeHours         *float64 `json:"freeze_hours,omitempty"`
	FreezeBasis         string   `json:"freeze_basis,omitempty"`      // "onset" (default) | "fraction"
	FreezeFraction      *float64 `json:"freeze_fraction,omitempty"`   // default 0.25
	FreezeModel         string   `json:"freeze_model,omitempty"`      // "handbook" (default) | "full"
	MaintainTempC       *float64 `json:"maintain_temp_c,omitempty"`   // default 5
	HeatTraceFactor     *float64 `json:"heat_trace_factor,omitempty"` // default 1.2
	EnergyCode          string   `json:"energy_code,omitempty"`       // table id, e.g. "ashrae-90.1-2016"
	// MaxRetarderPermeancePerm replaces the common-practice permeance limit of the vapour
	// retarder on below-ambient lines, US perm.
	MaxRetarderPermeancePerm *float64 `json:"max_retarder_permeance_perm,omitempty"`
	Economic                 *bool    `json:"economic,omitempty"` // economic thickness may govern
}

// Economics holds the prices and rates for the thickness economics. Heat lost by hot
// lines is bought on the heating basis, heat gained by cold lines is removed on the
// cooling basis; a line never takes a value from the other basis (an absent value
// takes its stated default, an absent price leaves the line unpriced).
type Economics struct {
	Heating *HeatingBasis `json:"heating,omitempty"`
	Cooling *CoolingBasis `json:"cooling,omitempty"`
	// Currency is the ISO 4217 code of every money figure (default USD).
	Currency          string      `json:"currency,omitempty"`
	DiscountRate      *float64    `json:"discount_rate,omitempty"`
	EscalationRate    *float64    `json:"escalation_rate,omitempty"`
	LifeYears         *int        `json:"life_years,omitempty"`
	InstalledCostPerM []CostPoint `json:"installed_cost_per_m,omitempty"`
	// InstalledCostSource says where InstalledCostPerM came from, for the assumptions:
	// "" (given), "cost_table" (the project's cost table), "example" (the labelled example
	// table, not prices) or "no_match" (a cost table with no row for this line).
	InstalledCostSource string `json:"installed_cost_source,omitempty"`
}

// HeatingBasis prices heat lost by hot lines: fuel or heat bought, per kWh bought.
type HeatingBasis struct {
	PricePerKWh  *float64 `json:"price_per_kwh,omitempty"`
	Efficiency   *float64 `json:"efficiency,omitempty"` // heat delivered per energy bought (≤ 1), default 0.8
	HoursPerYear *float64 `json:"hours_per_year,omitempty"`
	CO2KgPerKWh  *float64 `json:"co2_kg_per_kwh,omitempty"` // per kWh bought
}

// CoolingBasis prices heat gained by cold lines: electricity bought for the chiller.
type CoolingBasis struct {
	PricePerKWh  *float64 `json:"price_per_kwh,omitempty"`
	COP          *float64 `json:"cop,omitempty"` // heat removed per electricity bought (> 1), default 3.0
	HoursPerYear *float64 `json:"hours_per_year,omitempty"`
	CO2KgPerKWh  *float64 `json:"co2_kg_per_kwh,omitempty"` // per kWh of electricity
}

// CostPoint is the installed cost of one thickness, per metre of pipe or duct (per m²
// for flat surfaces).
type CostPoint struct {
	ThicknessMM float64 `json:"thickness_mm"`
	Cost        float64 `json:"cost"`
}
