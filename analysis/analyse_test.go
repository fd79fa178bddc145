package analysis

import (
	"encoding/json"
	"errors"
	"math"
	"slices"
	"strings"
	"testing"

	"lagwright/field"
)

// run analyses a JSON literal with the catalog resolver and fails the test on error.
func mustRun(t *testing.T, js string) *Output {
	t.Helper()
	out, err := Run([]byte(js), CatalogResolver{})
	if err != nil {
		t.Fatalf("Run: %v\ninput: %s", err, js)
	}
	if _, err := json.Marshal(out); err != nil {
		t.Fatalf("output does not marshal (NaN or Inf?): %v", err)
	}
	return out
}

func fieldErrors(t *testing.T, js string) field.Errors {
	t.Helper()
	_, err := Run([]byte(js), CatalogResolver{})
	var fe field.Errors
	if !errors.As(err, &fe) {
		t.Fatalf("want field errors, got %v", err)
	}
	return fe
}

func near(t *testing.T, name string, got, want, relTol float64) {
	t.Helper()
	if math.Abs(got-want) > relTol*math.Abs(want) {
		t.Errorf("%s = %.6g, want %.6g (±%.2g %%)", name, got, want, 100*relTol)
	}
}

// The acceptance case of the engine issue. The independent estimate (about 63 W/m and a
// surface near 40 °C) is confirmed by calc's own hand-calculation test; here the whole
// JSON path must give the same.
func TestAcceptanceHotPipe(t *testing.T) {
	out := mustRun(t, `{"geometry":"pipe","pipe_od_mm":114.3,"operating_temp_c":180,"ambient_temp_c":20,
		"layers":[{"k_w_mk":0.045,"thickness_mm":50}],"surface_emittance":0.1}`)
	// The estimate is stated to two figures, so the answer must round to it: 63 ± 0.5 W/m
	// and 40 ± 0.5 °C.
	near(t, "heat_flow_w_per_m", *out.HeatFlowWPerM, 63, 0.5/63)
	near(t, "surface_temp_c", out.SurfaceTempC, 40, 0.5/40)
	if out.MethodVersion == "" || len(out.Assumptions) == 0 || out.Warnings == nil {
		t.Errorf("method_version, assumptions and warnings must always be present: %+v", out)
	}
	if out.EfficiencyPct == nil || *out.EfficiencyPct < 80 || *out.EfficiencyPct > 99 {
		t.Errorf("efficiency_pct = %v, want a high insulation efficiency", out.EfficiencyPct)
	}
	// Heat flux × outer area per metre = heat flow per metre (energy balance of the answer).
	near(t, "flux × area", out.HeatFluxWm2**out.OuterAreaM2PerM, *out.HeatFlowWPerM, 1e-4)
}

func TestValidationListsEveryBadField(t *testing.T) {
	fe := fieldErrors(t, `{"geometry":"pipe","pipe_size":"NPS 7","operating_temp_c":"hot","ambient_temp_c":20,
		"wind_m_s":-3,"layers":[{"material":"no_such_material","thickness_mm":0},{"k_w_mk":0.04}],
		"colour":"blue","criteria":{"freeze_basis":"sometime"}}`)
	want := []string{"pipe_size", "operating_temp_c", "wind_m_s", "layers[0].thickness_mm", "layers[0].material",
		"layers[1].thickness_mm", "colour", "criteria.freeze_basis"}
	var got []string
	for _, e := range fe {
		got = append(got, e.Field)
		if e.Message == "" {
			t.Errorf("field %s has no message", e.Field)
		}
	}
	for _, w := range want {
		if !slices.Contains(got, w) {
			t.Errorf("missing error for %s; got %v", w, fe)
		}
	}
}

func TestValidationMessages(t *testing.T) {
	cases := []struct {
		name, js, field, contains string
	}{
		{"not json", `{"geometry":`, "", "not valid JSON"},
		{"not an object", `[1,2]`, "", "must be a JSON object"},
		{"geometry missing", `{"operating_temp_c":50,"ambient_temp_c":20,"layers":[]}`, "geometry", "required"},
		{"ambient missing", `{"geometry":"pipe","pipe_size":"NPS 2","operating_temp_c":50,"layers":[]}`, "ambient_temp_c", "required"},
		{"od and size", `{"geometry":"pipe","pipe_size":"NPS 2","pipe_od_mm":60,"operating_temp_c":50,"ambient_temp_c":20,"layers":[]}`, "pipe_size", "not both"},
		{"jacket needed", `{"geometry":"pipe","pipe_size":"NPS 2","operating_temp_c":50,"ambient_temp_c":20,"layers":[{"k_w_mk":0.04,"thickness_mm":25}]}`, "jacket", "jacket or surface_emittance"},
		{"k points order", `{"geometry":"flat","operating_temp_c":50,"ambient_temp_c":20,"surface_emittance":0.9,"layers":[{"k_points":[[50,0.04],[10,0.03]],"thickness_mm":25}]}`, "layers[0].k_points[1][0]", "strictly increasing"},
		{"duct size", `{"geometry":"duct","duct_width_mm":600,"operating_temp_c":12,"ambient_temp_c":28,"layers":[]}`, "duct_height_mm", "required"},
		{"rh range", `{"geometry":"pipe","pipe_size":"NPS 2","operating_temp_c":6,"ambient_temp_c":30,"relative_humidity_pct":140,"layers":[]}`, "relative_humidity_pct", "between"},
		{"economics price", `{"geometry":"pipe","pipe_size":"NPS 2","operating_temp_c":80,"ambient_temp_c":20,"surface_emittance":0.9,"layers":[{"k_w_mk":0.04,"thickness_mm":25}],"economics":{"heating":{"hours_per_year":8000}}}`, "economics.heating.price_per_kwh", "required"},
		{"too many layers", `{"geometry":"flat","operating_temp_c":50,"ambient_temp_c":20,"surface_emittance":0.9,"layers":[` + strings.Repeat(`{"k_w_mk":0.04,"thickness_mm":5},`, 11) + `{"k_w_mk":0.04,"thickness_mm":5}]}`, "layers", "at most"},
		{"steam vs water", `{"geometry":"pipe","pipe_size":"NPS 2","fluid":"water","steam_gauge_pressure_kpa":500,"ambient_temp_c":20,"layers":[]}`, "steam_gauge_pressure_kpa", "steam"},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			fe := fieldErrors(t, tc.js)
			for _, e := range fe {
				if e.Field == tc.field && strings.Contains(e.Message, tc.contains) {
					return
				}
			}
			t.Errorf("want %q on %q, got %v", tc.contains, tc.field, fe)
		})
	}
}

// Acceptance of the sizing issue: a chilled-water line at 6 °C, NPS 2, condensation
// conditions 30 °C and 80 % RH.
func TestAcceptanceChilledWater(t *testing.T) {
	out := mustRun(t, `{"geometry":"pipe","pipe_size":"NPS 2","fluid":"water","operating_temp_c":6,
		"ambient_temp_c":24,"relative_humidity_pct":50,
		"conditions":{"condensation":{"ambient_temp_c":30,"relative_humidity_pct":80}},
		"layers":[{"material":"elastomeric_c534_gr1","thickness_mm":25.4}],"jacket":"pvc_jacket",
		"criteria":{"energy_code":"ashrae-90.1-2016"}}`)
	if out.DewPointC == nil {
		t.Fatal("no dew point")
	}
	// Magnus form with the WMO coefficients (17.62, 243.12 °C), computed: 30 °C / 80 % → 26.17 °C.
	near(t, "dew_point_c", *out.DewPointC, 26.17, 0.005)
	if out.Sizing.CondensationMM == nil || *out.Sizing.CondensationMM <= 0 {
		t.Fatalf("condensation_mm = %v", out.Sizing.CondensationMM)
	}
	if out.EnergyCode == nil || !out.EnergyCode.Required || out.EnergyCode.TableThicknessMM == nil {
		t.Fatalf("energy_code = %+v", out.EnergyCode)
	}
	// ASHRAE 90.1-2016 Table 6.8.3-2 (docs/references.md): cooling 40–60 °F, NPS 1½–<4 → 1 in.
	near(t, "table thickness", *out.EnergyCode.TableThicknessMM, 25.4, 1e-6)
	if out.Sizing.Governing == nil || out.Sizing.GoverningThicknessMM == nil {
		t.Fatalf("no governing criterion: %+v", out.Sizing)
	}
	if *out.Sizing.GoverningThicknessMM < *out.Sizing.CondensationMM {
		t.Errorf("governing %v below condensation %v", *out.Sizing.GoverningThicknessMM, *out.Sizing.CondensationMM)
	}
	if !containsAny(out.Warnings, "vapour retarder") {
		t.Errorf("cold line without the vapour-retarder caution: %v", out.Warnings)
	}
	if out.HeatFlowWPerM == nil || *out.HeatFlowWPerM >= 0 {
		t.Errorf("a cold line gains heat: heat_flow_w_per_m = %v", out.HeatFlowWPerM)
	}
}

// Acceptance: a steam line at 1,000 kPa gauge (about 184 °C saturated).
func TestAcceptanceSteam(t *testing.T) {
	out := mustRun(t, `{"geometry":"pipe","pipe_size":"NPS 4","steam_gauge_pressure_kpa":1000,"ambient_temp_c":25,
		"length_m":80,"layers":[{"material":"mineral_fiber_pipe_c547_t1","thickness_mm":25.4}],"jacket":"aluminium_new"}`)
	// IAPWS-IF97 saturation at 1101.325 kPa abs: 184.1 °C (steam tables, from memory).
	near(t, "operating_temp_c", out.OperatingTempC, 184.1, 0.002)
	if out.Sizing.PersonnelProtectionMM == nil || *out.Sizing.PersonnelProtectionMM <= 0 {
		t.Fatalf("personnel_protection_mm = %v (%v)", out.Sizing.PersonnelProtectionMM, out.Warnings)
	}
	if out.CondensateKgPerH == nil || *out.CondensateKgPerH <= 0 {
		t.Fatalf("condensate_kg_per_h = %v", out.CondensateKgPerH)
	}
	// Hand calculation: condensate = q'·L / h_fg; h_fg at 1.1013 MPa ≈ 2000 kJ/kg, interpolated between
	// 1.0 MPa (2014.6) and 1.2 MPa (1985.4) in a saturated-steam table (Cengel Table A-5, from memory).
	want := *out.HeatFlowWPerM * 80 / 2000e3 * 3600
	near(t, "condensate", *out.CondensateKgPerH, want, 0.005)
}

// Acceptance: an outdoor water line at −20 °C with wind: freeze hours, and a
// heat-tracing load where insulation cannot protect it.
func TestAcceptanceFreeze(t *testing.T) {
	out := mustRun(t, `{"geometry":"pipe","pipe_size":"NPS 1","operating_temp_c":10,"ambient_temp_c":-20,"wind_m_s":8,
		"layers":[{"material":"mineral_fiber_pipe_c547_t1","thickness_mm":25.4}],"jacket":"aluminium_new",
		"criteria":{"freeze_hours":48}}`)
	if out.FreezeHoursTo0C == nil || *out.FreezeHoursTo0C <= 0 || out.FreezeHoursToFreeze == nil ||
		*out.FreezeHoursToFreeze <= *out.FreezeHoursTo0C {
		t.Fatalf("freeze hours: %v, %v", out.FreezeHoursTo0C, out.FreezeHoursToFreeze)
	}
	if out.Sizing.FreezeMM != nil {
		t.Errorf("48 h on an NPS 1 line at −20 °C should not be met by insulation alone, got %v mm", *out.Sizing.FreezeMM)
	}
	if out.HeatTraceWPerM == nil || *out.HeatTraceWPerM <= 0 {
		t.Fatalf("heat_trace_w_per_m = %v", out.HeatTraceWPerM)
	}
	if !slices.Contains(out.Sizing.Unmet, "freeze") {
		t.Errorf("unmet = %v, want freeze", out.Sizing.Unmet)
	}
	if out.ConditionsUsed.Freeze == nil || out.ConditionsUsed.Freeze.WindMS != 8 {
		t.Errorf("freeze conditions must keep the design wind: %+v", out.ConditionsUsed.Freeze)
	}
}

func containsAny(list []string, sub string) bool {
	for _, s := range list {
		if strings.Contains(s, sub) {
			return true
		}
	}
	return false
}
