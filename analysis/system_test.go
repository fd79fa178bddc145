package analysis

import (
	"strings"
	"testing"
)

// The code check runs only where the table covers the line's system. ASHRAE 90.1-2016
// section 6.8.3 covers heating, service hot water and cooling (chilled water, brine,
// refrigerant) piping; domestic cold water is outside it (the standard's scope, common
// practice), so 7 °C cold water is not checked against the chilled-water "40–60 °F" row.
func TestEnergyCodeAppliesBySystem(t *testing.T) {
	const line = `{"geometry":"pipe","pipe_size":"NPS 2","operating_temp_c":7,"ambient_temp_c":24,"system":%q,
		"layers":[{"material":"elastomeric_c534_gr1","thickness_mm":13}],"jacket":"pvc_jacket",
		"criteria":{"energy_code":"ashrae-90.1-2016","condensation":false}}`
	cases := []struct {
		system  string
		applies bool
	}{
		{"chilled_water", true},
		{"", true}, // not named: by temperature alone, as before
		{"domestic_cold_water", false},
		{"process", false},
	}
	for _, tc := range cases {
		t.Run(tc.system, func(t *testing.T) {
			out := mustRun(t, strings.Replace(line, "%q", `"`+tc.system+`"`, 1))
			ec := out.EnergyCode
			if ec == nil || ec.Applies != tc.applies {
				t.Fatalf("energy_code = %+v, want applies %v", ec, tc.applies)
			}
			if tc.applies {
				// 7 °C = 44.6 °F: the cooling 40–60 °F row, NPS 2 in the 1-1/2 to <4 column: 1 in
				// (ASHRAE 90.1-2016 Table 6.8.3-2).
				if !ec.Required || ec.TableThicknessMM == nil || *ec.TableThicknessMM != 25.4 {
					t.Errorf("table thickness = %v, required %v; want 25.4 mm", ec.TableThicknessMM, ec.Required)
				}
				if ec.Pass { // 13 mm is short of 1 in
					t.Error("13 mm passes the 1 in requirement")
				}
				return
			}
			want := "not covered by ASHRAE/IES Standard 90.1 minimum pipe insulation thickness (90.1-2016)"
			if ec.Reason != want || ec.Required || ec.Pass || out.Sizing.EnergyCodeMM != nil {
				t.Errorf("energy_code = %+v, energy_code_mm %v; want reason %q and no requirement", ec, out.Sizing.EnergyCodeMM, want)
			}
			for _, u := range out.Sizing.Unmet {
				if u == "energy_code" {
					t.Error("an uncovered table is listed as unmet")
				}
			}
		})
	}
}

// A pipe table asked of a duct says it does not apply instead of refusing the line.
func TestEnergyCodePipeTableOnDuct(t *testing.T) {
	out := mustRun(t, `{"geometry":"duct","duct_width_mm":600,"duct_height_mm":400,"operating_temp_c":13,"ambient_temp_c":24,
		"system":"supply_air","layers":[{"material":"elastomeric_c534_gr1","thickness_mm":25}],"jacket":"pvc_jacket",
		"criteria":{"energy_code":"ashrae-90.1-2016","condensation":false}}`)
	if ec := out.EnergyCode; ec == nil || ec.Applies || !strings.Contains(ec.Reason, "not covered by") {
		t.Fatalf("energy_code = %+v", ec)
	}
}

func TestSystemValidation(t *testing.T) {
	cases := []struct{ js, msg string }{
		{`{"geometry":"pipe","pipe_size":"NPS 2","operating_temp_c":60,"system":"hot_water","layers":[{"k_w_mk":0.04,"thickness_mm":25}]}`, "must be one of"},
		{`{"geometry":"pipe","pipe_size":"NPS 2","operating_temp_c":60,"system":"supply_air","layers":[{"k_w_mk":0.04,"thickness_mm":25}]}`, "air system"},
		{`{"geometry":"duct","duct_width_mm":600,"duct_height_mm":400,"operating_temp_c":13,"system":"chilled_water","layers":[{"k_w_mk":0.04,"thickness_mm":25}]}`, "piped system"},
	}
	for _, tc := range cases {
		fe := fieldErrors(t, tc.js)
		found := false
		for _, e := range fe {
			if e.Field == "system" && strings.Contains(e.Message, tc.msg) {
				found = true
			}
		}
		if !found {
			t.Errorf("%s: errors %v, want system: %s", tc.js, fe, tc.msg)
		}
	}
}
