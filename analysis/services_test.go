package analysis

import (
	"fmt"
	"math"
	"slices"
	"strings"
	"testing"

	"lagwright/field"
)

// fieldNames lists the fields a field.Errors names.
func fieldNames(fe field.Errors) []string {
	var out []string
	for _, e := range fe {
		out = append(out, e.Field)
	}
	return out
}

// A line at the air temperature under a clear night sky: radiation to the sky cools the
// jacket below the air and below the dew point. Condensation must be judged although the
// line is not colder than the air.
func TestCondensationUnderColdSky(t *testing.T) {
	out := mustRun(t, `{"geometry":"pipe","pipe_size":"NPS 2","operating_temp_c":20,"ambient_temp_c":20,"surroundings_temp_c":-20,
		"relative_humidity_pct":85,"layers":[{"material":"mineral_fiber_pipe_c547_t1","thickness_mm":50.8}],"jacket":"painted_metal"}`)
	// Dew point at 20 °C, 85 %: 17.4027 °C (PsychroLib 1.1.1, GetTDewPointFromRelHum, computed).
	if out.DewPointC == nil {
		t.Fatal("no dew point")
	}
	near(t, "dew_point_c", *out.DewPointC, 17.4027, 0.001)
	// A painted jacket (ε 0.9) facing a sky 40 K below the air in still air loses about
	// 0.9·σ·(293⁴ − 253⁴) ≈ 180 W/m² by radiation, which the air can resupply only through a
	// film of a few W/m²·K: the surface sits well below the air (physics of the night-sky
	// radiation, common practice); the issue measured about 2 °C.
	if out.SurfaceTempC > 10 {
		t.Errorf("surface %.2f °C: want well below the air under a −20 °C sky", out.SurfaceTempC)
	}
	if out.CondensationMarginK == nil || *out.CondensationMarginK >= 0 {
		t.Fatalf("condensation_margin_k = %v, want negative", out.CondensationMarginK)
	}
	if !containsAny(out.Warnings, "condensation: with the insulation as specified") || !containsAny(out.Warnings, "night sky") {
		t.Errorf("want the condensation and night-sky warnings, got %q", out.Warnings)
	}
	// Sized the same way: the thinnest candidate that keeps the surface above dew point + margin.
	// More insulation only makes the surface colder here, so that is the bare pipe (0 mm).
	if out.Sizing.CondensationMM == nil || *out.Sizing.CondensationMM != 0 {
		t.Errorf("condensation_mm = %v, want 0 (the bare pipe stays at the fluid temperature)", out.Sizing.CondensationMM)
	}
	// The same line under surroundings at the air temperature cannot condense: not judged.
	warm := mustRun(t, `{"geometry":"pipe","pipe_size":"NPS 2","operating_temp_c":20,"ambient_temp_c":20,
		"relative_humidity_pct":85,"layers":[{"material":"mineral_fiber_pipe_c547_t1","thickness_mm":50.8}],"jacket":"painted_metal"}`)
	if warm.Sizing.CondensationMM != nil || containsAny(warm.Warnings, "condensation:") {
		t.Errorf("a 20 °C line in 20 °C surroundings cannot reach a 17 °C dew point: %v %q", warm.Sizing.CondensationMM, warm.Warnings)
	}
}

// A hot line whose economic or other governing thickness condenses under the sky is warned.
func TestCondensationAtGoverningUnderSky(t *testing.T) {
	out := mustRun(t, `{"geometry":"pipe","pipe_size":"NPS 2","operating_temp_c":25,"ambient_temp_c":10,"surroundings_temp_c":-30,
		"relative_humidity_pct":95,"layers":[{"material":"mineral_fiber_pipe_c547_t1","thickness_mm":25.4}],"jacket":"painted_metal",
		"criteria":{"max_heat_flow_w_per_m":5}}`)
	if out.Sizing.Governing == nil || *out.Sizing.Governing != "max_heat_flow" {
		t.Fatalf("governing = %v", out.Sizing.Governing)
	}
	if !containsAny(out.Warnings, "condensation: with the insulation at the governing") {
		t.Errorf("want a warning that the governing thickness condenses, got %q", out.Warnings)
	}
}

// The design dew point as an input: the same air given by its humidity or its dew point
// gives the same answer.
func TestDewPointInput(t *testing.T) {
	line := `{"geometry":"pipe","pipe_size":"NPS 2","operating_temp_c":5,"ambient_temp_c":25,%s,
		"layers":[{"material":"elastomeric_c534_gr1","thickness_mm":19}],"jacket":"pvc_jacket"}`
	byDew := mustRun(t, strings.Replace(line, "%s", `"dew_point_c":18`, 1))
	// RH at 25 °C with an 18 °C dew point: 65.1357 % (PsychroLib 1.1.1, GetRelHumFromTDewPoint, computed).
	byRH := mustRun(t, strings.Replace(line, "%s", `"relative_humidity_pct":65.1357`, 1))
	near(t, "dew_point_c", *byDew.DewPointC, 18, 1e-6)
	near(t, "dew_point_c by RH", *byRH.DewPointC, 18, 0.0005)
	rh := byDew.ConditionsUsed.Condensation.RelativeHumidityPct
	if rh == nil {
		t.Fatal("conditions_used.condensation.relative_humidity_pct: want the derived humidity")
	}
	near(t, "derived relative humidity", *rh, 65.1357, 0.0002)
	if *byDew.Sizing.CondensationMM != *byRH.Sizing.CondensationMM {
		t.Errorf("condensation_mm %v by dew point, %v by humidity", *byDew.Sizing.CondensationMM, *byRH.Sizing.CondensationMM)
	}
	if !containsAny(byDew.Assumptions, "dew point given, 18 °C") {
		t.Errorf("assumptions must state the given dew point: %q", byDew.Assumptions)
	}
	// A condition set takes its own dew point.
	set := mustRun(t, strings.Replace(line, "%s", `"relative_humidity_pct":50,"conditions":{"condensation":{"dew_point_c":21}}`, 1))
	near(t, "condensation set dew point", *set.DewPointC, 21, 1e-6)
}

func TestDewPointBadCombinations(t *testing.T) {
	cases := []struct {
		name, js string
		want     []string
	}{
		{"both at design", `{"geometry":"pipe","pipe_size":"NPS 2","operating_temp_c":5,"ambient_temp_c":25,"relative_humidity_pct":60,"dew_point_c":15,"layers":[]}`,
			[]string{"dew_point_c", "relative_humidity_pct"}},
		{"both in a set", `{"geometry":"pipe","pipe_size":"NPS 2","operating_temp_c":5,"ambient_temp_c":25,"layers":[],
			"conditions":{"condensation":{"relative_humidity_pct":60,"dew_point_c":15}},"relative_humidity_over":"steam"}`,
			[]string{"conditions.condensation.dew_point_c", "conditions.condensation.relative_humidity_pct", "relative_humidity_over"}},
		{"dew above the air", `{"geometry":"pipe","pipe_size":"NPS 2","operating_temp_c":5,"ambient_temp_c":25,"dew_point_c":26,"layers":[]}`,
			[]string{"dew_point_c"}},
		{"set colder than the design dew point", `{"geometry":"pipe","pipe_size":"NPS 2","operating_temp_c":5,"ambient_temp_c":25,"dew_point_c":15,"layers":[],
			"conditions":{"condensation":{"ambient_temp_c":10}}}`,
			[]string{"conditions.condensation.ambient_temp_c"}},
	}
	for _, c := range cases {
		got := fieldNames(fieldErrors(t, c.js))
		for _, f := range c.want {
			if !slices.Contains(got, f) {
				t.Errorf("%s: errors name %v, want %s", c.name, got, f)
			}
		}
	}
}

// Below 0 °C an RH is over liquid water by default (weather data) and the answer says so.
func TestHumidityBelowFreezingBasis(t *testing.T) {
	line := `{"geometry":"pipe","pipe_size":"NPS 2","operating_temp_c":-30,"ambient_temp_c":-10,"relative_humidity_pct":80%s,
		"layers":[{"material":"elastomeric_c534_gr1","thickness_mm":25}],"jacket":"pvc_jacket"}`
	water := mustRun(t, strings.Replace(line, "%s", "", 1))
	ice := mustRun(t, strings.Replace(line, "%s", `,"relative_humidity_over":"ice"`, 1))
	// Frost point at −10 °C, 80 % over water: p_v = 0.8 × 286.45 Pa (Murphy & Koop 2005 eq. 10,
	// supercooled water) saturates over ice near −11.4 °C (ASHRAE Fundamentals 2017 ch. 1
	// Table 3 brackets it between −12 and −11 °C).
	near(t, "frost point over water", *water.DewPointC, -11.43, 0.005)
	if water.DewPointKind != "frost point" {
		t.Errorf("dew_point_kind = %q", water.DewPointKind)
	}
	if !(*ice.DewPointC < *water.DewPointC) {
		t.Errorf("over ice %v must be below over water %v", *ice.DewPointC, *water.DewPointC)
	}
	if !containsAny(water.Assumptions, "over liquid water") || !containsAny(ice.Assumptions, "over ice") {
		t.Errorf("assumptions must state the basis: %q / %q", water.Assumptions, ice.Assumptions)
	}
}

// Superheated steam: the pressure and a temperature above saturation. The steam cools
// along the run and condenses only after it reaches saturation.
func TestSuperheatedSteam(t *testing.T) {
	base := `{"geometry":"pipe","pipe_size":"NPS 4","steam_gauge_pressure_kpa":1000,"operating_temp_c":250,"ambient_temp_c":10,
		"length_m":100,%s"layers":[{"material":"mineral_fiber_pipe_c547_t1","thickness_mm":25.4}],"jacket":"aluminium_new"}`
	out := mustRun(t, strings.Replace(base, "%s", `"flow":{"mass_flow_kg_s":0.05},`, 1))
	// Saturation at 1101.3 kPa abs: 184.1 °C (steam tables, from memory), so 65.9 K of superheat.
	near(t, "steam_saturation_temp_c", *out.SteamSatTempC, 184.1, 0.001)
	near(t, "steam_superheat_k", *out.SteamSuperheatK, 250-184.12, 0.002)
	if out.OperatingTempC != 250 {
		t.Errorf("operating_temp_c = %v, want 250", out.OperatingTempC)
	}
	if out.SteamSaturatedAtM == nil || out.CondensateKgPerH == nil {
		t.Fatalf("saturated at %v, condensate %v", out.SteamSaturatedAtM, out.CondensateKgPerH)
	}
	// Energy balance with steam-table enthalpies (Cengel Table A-6, from memory, interpolated
	// to 1.1013 MPa): h(250 °C) ≈ 2939.2 kJ/kg, h_g ≈ 2780.5 kJ/kg, so the steam gives up
	// about 158.7 kJ/kg before it condenses. The heat loss per metre falls as it cools, so the
	// point of saturation lies between ṁΔh/q'(250 °C) and ṁΔh/q'(184 °C).
	heat := 0.05 * 158.7e3
	qHot := *out.HeatFlowWPerM
	cold := mustRun(t, `{"geometry":"pipe","pipe_size":"NPS 4","steam_gauge_pressure_kpa":1000,"ambient_temp_c":10,
		"length_m":100,"layers":[{"material":"mineral_fiber_pipe_c547_t1","thickness_mm":25.4}],"jacket":"aluminium_new"}`)
	qSat := *cold.HeatFlowWPerM
	x := *out.SteamSaturatedAtM
	if !(x > heat/qHot*0.99 && x < heat/qSat*1.01) {
		t.Errorf("saturated at %.2f m, want between %.2f and %.2f m", x, heat/qHot, heat/qSat)
	}
	// After it, the rest of the run condenses as saturated steam does: q'(T_s)·(L − x)/h_fg.
	near(t, "condensate after saturation", *out.CondensateKgPerH, *cold.CondensateKgPerH*(100-x)/100, 0.001)
	if math.Abs(*out.OutletTempC-*out.SteamSatTempC) > 0.001 {
		t.Errorf("outlet %v, want the saturation temperature %v", *out.OutletTempC, *out.SteamSatTempC)
	}

	// Without flow: the superheat and heat loss, no condensate, and a warning asking for flow.
	noFlow := mustRun(t, strings.Replace(base, "%s", "", 1))
	if noFlow.CondensateKgPerH != nil || !containsAny(noFlow.Warnings, "give flow.mass_flow_kg_s") {
		t.Errorf("no flow: condensate %v, warnings %q", noFlow.CondensateKgPerH, noFlow.Warnings)
	}
	// A large flow stays superheated: no condensate, and it cools by about q'·L/(ṁ·c_p) with
	// c_p ≈ 2.2 kJ/kg·K for steam near 1.1 MPa and 250 °C (steam tables, from memory).
	big := mustRun(t, strings.Replace(base, "%s", `"flow":{"mass_flow_kg_s":5},`, 1))
	if big.SteamSaturatedAtM != nil || *big.CondensateKgPerH != 0 {
		t.Errorf("5 kg/s: saturated at %v, condensate %v", big.SteamSaturatedAtM, *big.CondensateKgPerH)
	}
	near(t, "5 kg/s temperature drop", 250-*big.OutletTempC, qHot*100/(5*2.2e3), 0.1)

	// Bad combinations: a temperature below saturation, a specific heat for superheated steam.
	fe := fieldNames(fieldErrors(t, `{"geometry":"pipe","pipe_size":"NPS 4","steam_gauge_pressure_kpa":1000,"operating_temp_c":150,"ambient_temp_c":10,"layers":[]}`))
	if !slices.Contains(fe, "operating_temp_c") {
		t.Errorf("below saturation: errors %v", fe)
	}
	fe = fieldNames(fieldErrors(t, strings.Replace(base, "%s", `"flow":{"mass_flow_kg_s":0.05,"cp_j_kgk":2100},`, 1)))
	if !slices.Contains(fe, "flow.cp_j_kgk") {
		t.Errorf("cp for superheated steam: errors %v", fe)
	}
}

// Heat tracing for any fluid: criteria.maintain_temp_c above the cold-design air asks for
// the tracing load on the handbook basis (ASHRAE Fundamentals ch. 23: q = (t_m − t_a)/R_T,
// insulation resistance only), times the safety factor, per metre and per run.
func TestHeatTracingAnyFluid(t *testing.T) {
	out := mustRun(t, `{"geometry":"pipe","pipe_size":"NPS 3","fluid":"other","operating_temp_c":60,"ambient_temp_c":-20,"wind_m_s":5,
		"length_m":50,"fittings_equiv_length_m":5,"supports":{"spacing_m":5,"w_per_k":0.1},
		"layers":[{"k_w_mk":0.045,"thickness_mm":50}],"jacket":"aluminium_new","criteria":{"maintain_temp_c":40}}`)
	// Hand calculation: NPS 3 OD 88.9 mm (ASME B36.10M); D3 = 188.9 mm; R_T = ln(188.9/88.9)/(2π·0.045)
	// = 2.66458 K·m/W; q = 60 K / R_T = 22.518 W/m; × 1.2 = 27.021 W/m; × 55 m = 1486.2 W; plus
	// 10 supports (50 m at 5 m) × 0.1 W/K × 60 K × 1.2 = 72 W: 1558.2 W.
	if out.HeatTraceWPerM == nil || out.HeatTraceW == nil {
		t.Fatalf("heat tracing: %v W/m, %v W", out.HeatTraceWPerM, out.HeatTraceW)
	}
	near(t, "heat_trace_w_per_m", *out.HeatTraceWPerM, 27.021, 0.0005)
	near(t, "heat_trace_w", *out.HeatTraceW, 1558.2, 0.0005)
	if !containsAny(out.Assumptions, "safety factor 1.2 on the load (our default 1.2)") || !containsAny(out.Assumptions, "10 supports at 0.1 W/K") {
		t.Errorf("assumptions must name the safety factor and what the run counts: %q", out.Assumptions)
	}
	// The fuller model counts the outer film too, so it needs less.
	full := mustRun(t, `{"geometry":"pipe","pipe_size":"NPS 3","fluid":"glycol","operating_temp_c":60,"ambient_temp_c":-20,"wind_m_s":5,
		"layers":[{"k_w_mk":0.045,"thickness_mm":50}],"jacket":"aluminium_new","criteria":{"maintain_temp_c":40,"freeze_model":"full","heat_trace_factor":1.5}}`)
	if full.HeatTraceWPerM == nil || !(*full.HeatTraceWPerM/1.5 < 22.518) || !(*full.HeatTraceWPerM/1.5 > 22.518*0.9) {
		t.Errorf("full model: %v W/m at factor 1.5, want a little under 22.518 × 1.5", full.HeatTraceWPerM)
	}
	// Air at or above the maintain temperature: none needed, and said.
	warm := mustRun(t, `{"geometry":"pipe","pipe_size":"NPS 3","operating_temp_c":60,"ambient_temp_c":20,
		"layers":[{"k_w_mk":0.045,"thickness_mm":50}],"jacket":"aluminium_new","criteria":{"maintain_temp_c":15}}`)
	if warm.HeatTraceWPerM != nil || !containsAny(warm.Assumptions, "none is needed") {
		t.Errorf("warm air: %v, %q", warm.HeatTraceWPerM, warm.Assumptions)
	}
	// Bad combinations, each named.
	fe := fieldNames(fieldErrors(t, `{"geometry":"duct","duct_width_mm":400,"duct_height_mm":300,"operating_temp_c":30,"ambient_temp_c":-10,
		"layers":[],"criteria":{"maintain_temp_c":20,"freeze_model":"full"}}`))
	for _, f := range []string{"criteria.maintain_temp_c", "criteria.freeze_model"} {
		if !slices.Contains(fe, f) {
			t.Errorf("duct with tracing: errors %v, want %s", fe, f)
		}
	}
	fe = fieldNames(fieldErrors(t, `{"geometry":"pipe","pipe_size":"NPS 3","operating_temp_c":30,"ambient_temp_c":-10,"layers":[],"criteria":{"heat_trace_factor":1.3}}`))
	if !slices.Contains(fe, "criteria.heat_trace_factor") {
		t.Errorf("factor without tracing: errors %v", fe)
	}
}

// Vapour-retarder systems: the retarder is judged apart from the cover that gives the
// emittance, against the permeance limit for the service temperature (common practice:
// about 0.02 perm for chilled service, 0.01 below 0 °C).
func TestVapourRetarderSystems(t *testing.T) {
	chilled := `{"geometry":"pipe","pipe_size":"NPS 2","operating_temp_c":6,"ambient_temp_c":25,"relative_humidity_pct":60,
		"layers":[{"material":"%s","thickness_mm":%s}],%s}`
	run := func(mat, th, rest string) *Output {
		return mustRun(t, fmt.Sprintf(chilled, mat, th, rest))
	}
	// Elastomeric with no jacket (painted): the insulation is its own retarder. 0.10 perm·in
	// (ASTM C534 maximum, as recalled) over 1 in is 0.10 perm, above 0.02: judged, not refused.
	el := run("elastomeric_c534_gr1", "25.4", `"surface_emittance":0.9`)
	if el.VapourRetarder == nil || el.VapourRetarder.Source != "insulation" || el.VapourRetarder.PermeancePerm == nil {
		t.Fatalf("elastomeric: %+v", el.VapourRetarder)
	}
	near(t, "elastomeric permeance", *el.VapourRetarder.PermeancePerm, 0.10, 1e-6)
	// 1 perm = 57.2 ng/(s·m²·Pa) (ASTM E96 units, from memory).
	near(t, "metric permeance", *el.VapourRetarder.PermeanceMetric, 5.72, 1e-6)
	if *el.VapourRetarder.LimitPerm != 0.02 || el.VapourRetarder.Pass == nil || *el.VapourRetarder.Pass {
		t.Errorf("elastomeric 1 in: limit %v pass %v, want 0.02 and false", *el.VapourRetarder.LimitPerm, el.VapourRetarder.Pass)
	}
	if containsAny(el.Warnings, "no vapour retarder") || containsAny(el.Warnings, "jacket given is not") {
		t.Errorf("elastomeric must not be told it lacks a retarder: %q", el.Warnings)
	}
	// FSK (0.02 perm, jacket library) over the same elastomeric: in series, 1/(1/0.02 + 1/0.10)
	// = 0.01667 perm (vapour resistances add, as thermal ones do): it passes.
	fsk := run("elastomeric_c534_gr1", "25.4", `"jacket":"aluminium_new","vapour_retarder":"fsk"`)
	if r := fsk.VapourRetarder; r == nil || r.PermeancePerm == nil || r.Pass == nil || !*r.Pass {
		t.Fatalf("FSK over elastomeric: %+v", fsk.VapourRetarder)
	}
	near(t, "series permeance", *fsk.VapourRetarder.PermeancePerm, 0.0167, 0.003)
	// Mineral fiber under an aluminium cover with an ASJ (0.02 perm) retarder beneath: the
	// cover gives the emittance, the retarder passes.
	under := run("mineral_fiber_pipe_c547_t1", "38.1", `"jacket":"aluminium_new","vapour_retarder":"all_service_jacket"`)
	if r := under.VapourRetarder; r == nil || r.Source != "retarder" || r.Pass == nil || !*r.Pass {
		t.Errorf("retarder under metal: %+v", under.VapourRetarder)
	}
	bare := run("mineral_fiber_pipe_c547_t1", "38.1", `"jacket":"aluminium_new"`)
	if bare.VapourRetarder == nil || bare.VapourRetarder.Source != "none" || !containsAny(bare.Warnings, "this build has no vapour retarder") {
		t.Errorf("no retarder: %+v %q", bare.VapourRetarder, bare.Warnings)
	}
	// The cover's emittance, not the retarder's, sets the surface: the same build with the
	// ASJ as the outer jacket (ε 0.90) has a different surface temperature.
	asj := run("mineral_fiber_pipe_c547_t1", "38.1", `"jacket":"all_service_jacket"`)
	if under.SurfaceTempC == asj.SurfaceTempC {
		t.Errorf("retarder under aluminium and ASJ outside gave the same surface %.3f °C", under.SurfaceTempC)
	}
	// Below 0 °C the limit is lower: the 0.02-perm ASJ fails 0.01.
	cold := mustRun(t, `{"geometry":"pipe","pipe_size":"NPS 2","operating_temp_c":-20,"ambient_temp_c":25,"relative_humidity_pct":60,
		"layers":[{"material":"polyiso_c591","thickness_mm":50.8}],"jacket":"aluminium_new","vapour_retarder":"all_service_jacket"}`)
	if r := cold.VapourRetarder; r == nil || *r.LimitPerm != 0.01 || r.Pass == nil || *r.Pass {
		t.Errorf("refrigerant service: %+v", cold.VapourRetarder)
	}
	// Bad combinations, each named.
	fe := fieldNames(fieldErrors(t, `{"geometry":"pipe","pipe_size":"NPS 2","operating_temp_c":6,"ambient_temp_c":25,
		"layers":[{"material":"mineral_fiber_pipe_c547_t1","thickness_mm":25.4}],"jacket":"aluminium_new","vapour_retarder":"insulation",
		"criteria":{"max_retarder_permeance_perm":-1}}`))
	for _, f := range []string{"vapour_retarder", "criteria.max_retarder_permeance_perm"} {
		if !slices.Contains(fe, f) {
			t.Errorf("errors %v, want %s", fe, f)
		}
	}
	fe = fieldNames(fieldErrors(t, `{"geometry":"pipe","pipe_size":"NPS 2","operating_temp_c":6,"ambient_temp_c":25,
		"layers":[{"material":"mineral_fiber_pipe_c547_t1","thickness_mm":25.4}],"jacket":"aluminium_new","vapour_retarder":"canvas"}`))
	if !slices.Contains(fe, "vapour_retarder") {
		t.Errorf("canvas is not a retarder: errors %v", fe)
	}
}
