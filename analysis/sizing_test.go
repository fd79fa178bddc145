package analysis

import (
	"encoding/json"
	"fmt"
	"slices"
	"testing"
)

// withThickness re-runs an input with the sized layer at t mm and the criteria kept.
func withThickness(t *testing.T, base map[string]any, tMM float64) *Output {
	t.Helper()
	m := clone(t, base)
	layers := m["layers"].([]any)
	layers[len(layers)-1].(map[string]any)["thickness_mm"] = tMM
	js, _ := json.Marshal(m)
	return mustRun(t, string(js))
}

func clone(t *testing.T, m map[string]any) map[string]any {
	t.Helper()
	js, _ := json.Marshal(m)
	var out map[string]any
	if err := json.Unmarshal(js, &out); err != nil {
		t.Fatal(err)
	}
	return out
}

func parse(t *testing.T, js string) map[string]any {
	t.Helper()
	var m map[string]any
	if err := json.Unmarshal([]byte(js), &m); err != nil {
		t.Fatal(err)
	}
	return m
}

// previous returns the candidate just thinner than t (0 when t is the first).
func previous(cands []float64, t float64) float64 {
	i := slices.Index(cands, t)
	if i <= 0 {
		return 0
	}
	return cands[i-1]
}

// For every criterion the chosen thickness meets it at the criterion's own conditions
// and the next thinner candidate does not (property: each criterion as docs/calc-json.md defines it).
func TestChosenThicknessMeetsAndThinnerFails(t *testing.T) {
	hot := parse(t, `{"geometry":"pipe","pipe_size":"NPS 6","operating_temp_c":250,"ambient_temp_c":20,"wind_m_s":3,
		"conditions":{"personnel":{"ambient_temp_c":35}},
		"layers":[{"material":"calcium_silicate_c533_t1","thickness_mm":25.4}],"jacket":"aluminium_new",
		"criteria":{"max_heat_flow_w_per_m":120}}`)
	cold := parse(t, `{"geometry":"pipe","pipe_size":"NPS 3","operating_temp_c":4,"ambient_temp_c":26,"relative_humidity_pct":75,
		"layers":[{"material":"cellular_glass_c552_t1","thickness_mm":25.4}],"jacket":"pvc_jacket"}`)
	duct := parse(t, `{"geometry":"duct","duct_width_mm":800,"duct_height_mm":400,"operating_temp_c":13,"ambient_temp_c":30,
		"relative_humidity_pct":60,"layers":[{"material":"glass_blanket_c553","thickness_mm":25.4}],"jacket":"fsk"}`)

	check := func(name string, base map[string]any, pick func(*Output) *float64, ok func(*Output) bool) {
		t.Run(name, func(t *testing.T) {
			js, _ := json.Marshal(base)
			out := mustRun(t, string(js))
			chosen := pick(out)
			if chosen == nil {
				t.Fatalf("nothing chosen; warnings %v", out.Warnings)
			}
			if !ok(withThickness(t, base, *chosen)) {
				t.Errorf("%v mm does not meet the criterion", *chosen)
			}
			prev := previous(out.Sizing.Candidates, *chosen)
			if *chosen > 0 && prev > 0 && ok(withThickness(t, base, prev)) {
				t.Errorf("the thinner %v mm also meets it, so %v mm is not the thinnest", prev, *chosen)
			}
		})
	}
	check("personnel protection", hot, func(o *Output) *float64 { return o.Sizing.PersonnelProtectionMM }, func(o *Output) bool {
		// judged at the personnel conditions: 35 °C in still air
		return surfaceAt(t, hot, o, map[string]any{"ambient_temp_c": 35.0, "wind_m_s": 0.0}) <= 60
	})
	check("max heat flow", hot, func(o *Output) *float64 { return o.Sizing.MaxHeatFlowMM }, func(o *Output) bool {
		return *o.HeatFlowWPerM <= 120
	})
	check("condensation", cold, func(o *Output) *float64 { return o.Sizing.CondensationMM }, func(o *Output) bool {
		return *o.CondensationMarginK >= 1
	})
	check("condensation on the coldest duct face", duct, func(o *Output) *float64 { return o.Sizing.CondensationMM }, func(o *Output) bool {
		return *o.CondensationMarginK >= 1
	})
}

// surfaceAt re-solves the line with the given thickness at other design conditions.
func surfaceAt(t *testing.T, base map[string]any, o *Output, air map[string]any) float64 {
	t.Helper()
	m := clone(t, base)
	delete(m, "conditions")
	for k, v := range air {
		m[k] = v
	}
	layers := m["layers"].([]any)
	layers[len(layers)-1].(map[string]any)["thickness_mm"] = o.Layers[len(o.Layers)-1].ThicknessMM
	js, _ := json.Marshal(m)
	return mustRun(t, string(js)).SurfaceTempC
}

// A criterion's own conditions change its answer and no other's.
func TestConditionSetsAreIndependent(t *testing.T) {
	base := `{"geometry":"pipe","pipe_size":"NPS 2","operating_temp_c":%s,"ambient_temp_c":24,"relative_humidity_pct":55,
		"conditions":{%s},"layers":[{"material":"%s","thickness_mm":25.4}],"jacket":"%s"}`
	hotA := mustRun(t, fmt.Sprintf(base, "200", `"condensation":{"relative_humidity_pct":60}`, "mineral_fiber_pipe_c547_t1", "aluminium_new"))
	hotB := mustRun(t, fmt.Sprintf(base, "200", `"condensation":{"relative_humidity_pct":60},"personnel":{"ambient_temp_c":45}`, "mineral_fiber_pipe_c547_t1", "aluminium_new"))
	if hotA.Sizing.PersonnelProtectionMM == nil || hotB.Sizing.PersonnelProtectionMM == nil {
		t.Fatal("personnel protection not sized")
	}
	if *hotB.Sizing.PersonnelProtectionMM <= *hotA.Sizing.PersonnelProtectionMM {
		t.Errorf("a hotter personnel ambient must need more insulation: %v vs %v", *hotB.Sizing.PersonnelProtectionMM, *hotA.Sizing.PersonnelProtectionMM)
	}
	if *hotA.HeatFlowWPerM != *hotB.HeatFlowWPerM || hotA.SurfaceTempC != hotB.SurfaceTempC {
		t.Error("personnel conditions changed the design-condition result")
	}
	coldA := mustRun(t, fmt.Sprintf(base, "5", `"condensation":{"relative_humidity_pct":60}`, "elastomeric_c534_gr1", "pvc_jacket"))
	coldB := mustRun(t, fmt.Sprintf(base, "5", `"condensation":{"relative_humidity_pct":85}`, "elastomeric_c534_gr1", "pvc_jacket"))
	if coldA.Sizing.CondensationMM == nil || coldB.Sizing.CondensationMM == nil {
		t.Fatalf("condensation not sized: %v / %v", coldA.Warnings, coldB.Warnings)
	}
	if *coldB.Sizing.CondensationMM <= *coldA.Sizing.CondensationMM {
		t.Errorf("more humid condensation conditions must need more insulation: %v vs %v", *coldB.Sizing.CondensationMM, *coldA.Sizing.CondensationMM)
	}
	if *coldA.HeatFlowWPerM != *coldB.HeatFlowWPerM {
		t.Error("condensation humidity changed the heat flow at design conditions")
	}
	if coldA.ConditionsUsed.Condensation.WindMS != 0 || coldA.ConditionsUsed.Personnel.WindMS != 0 {
		t.Error("personnel and condensation default to still air")
	}
}

// The energy-code correction of docs/references.md, through the whole path: NPS 2, 141–200 °F
// row (2 in at 1½–<4), a material with k at the 125 °F rating point outside 0.25–0.29.
func TestEnergyCodeCorrection(t *testing.T) {
	// k_points chosen so that k(125 °F = 51.667 °C) is the value wanted (constant k).
	cases := []struct {
		name   string
		kBtu   float64
		wantIn float64
		source string
	}{
		{"K 0.32 above the range", 0.32, 2.343, "docs/references.md worked value, computed from the 90.1 footnote formula"},
		{"K 0.22 below the range", 0.22, 1.324, "docs/references.md worked value, computed from the 90.1 footnote formula"},
		{"K 0.26 inside the range", 0.26, 2.0, "ASHRAE 90.1-2016 Table 6.8.3-1 via docs/references.md: unchanged"},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			js := fmt.Sprintf(`{"geometry":"pipe","pipe_size":"NPS 2","operating_temp_c":80,"ambient_temp_c":20,
				"layers":[{"k_w_mk":%g,"thickness_mm":50}],"jacket":"aluminium_new","criteria":{"energy_code":"ashrae-90.1-2016"}}`,
				tc.kBtu*btuInToSI)
			out := mustRun(t, js)
			ec := out.EnergyCode
			if ec == nil || ec.CorrectedMM == nil {
				t.Fatalf("energy_code = %+v", ec)
			}
			near(t, "corrected (in) — "+tc.source, *ec.CorrectedMM/25.4, tc.wantIn, 0.002)
			if ec.Pass != (50 >= *ec.CorrectedMM) {
				t.Errorf("pass = %v with 50 mm against %v mm", ec.Pass, *ec.CorrectedMM)
			}
		})
	}
}

// Between the cooling and heating ranges (60–105 °F) the table requires nothing.
func TestEnergyCodeNoRequirement(t *testing.T) {
	out := mustRun(t, `{"geometry":"pipe","pipe_size":"NPS 2","operating_temp_c":27,"ambient_temp_c":20,
		"layers":[{"material":"mineral_fiber_pipe_c547_t1","thickness_mm":25.4}],"jacket":"aluminium_new",
		"criteria":{"energy_code":"ashrae-90.1-2016"}}`)
	if out.EnergyCode == nil || out.EnergyCode.Required || !out.EnergyCode.Pass {
		t.Fatalf("energy_code = %+v", out.EnergyCode)
	}
}

func TestEconomicThicknessIsLeastLifeCycleCost(t *testing.T) {
	out := mustRun(t, `{"geometry":"pipe","pipe_size":"NPS 4","operating_temp_c":150,"ambient_temp_c":15,"length_m":100,
		"layers":[{"material":"mineral_fiber_pipe_c547_t1","thickness_mm":25.4}],"jacket":"aluminium_new",
		"criteria":{"economic":true},
		"economics":{"heating":{"price_per_kwh":0.06,"efficiency":0.85,"hours_per_year":8000},"life_years":15,
		"installed_cost_per_m":[{"thickness_mm":25.4,"cost":40},{"thickness_mm":38.1,"cost":48},{"thickness_mm":50.8,"cost":58},
		{"thickness_mm":76.2,"cost":80},{"thickness_mm":101.6,"cost":110}]}}`)
	if out.Sizing.EconomicMM == nil || len(out.Economics) != 6 || out.Economics[0].ThicknessMM != 0 {
		t.Fatalf("economic_mm = %v, rows %d", out.Sizing.EconomicMM, len(out.Economics))
	}
	best := out.Economics[0]
	for _, r := range out.Economics {
		if *r.LifeCycleCost < *best.LifeCycleCost {
			best = r
		}
	}
	if best.ThicknessMM != *out.Sizing.EconomicMM {
		t.Errorf("economic_mm %v, least life-cycle cost at %v", *out.Sizing.EconomicMM, best.ThicknessMM)
	}
	if out.Sizing.Governing == nil {
		t.Fatal("no governing criterion")
	}
}

func FuzzRun(f *testing.F) {
	f.Add([]byte(`{"geometry":"pipe","pipe_size":"NPS 4","operating_temp_c":180,"ambient_temp_c":20,"layers":[{"k_w_mk":0.045,"thickness_mm":50}],"surface_emittance":0.1}`))
	f.Add([]byte(`{"geometry":"duct","duct_width_mm":600,"duct_height_mm":300,"operating_temp_c":12,"ambient_temp_c":30,"relative_humidity_pct":70,"layers":[{"material":"glass_blanket_c553","thickness_mm":38}],"jacket":"fsk"}`))
	f.Add([]byte(`{"geometry":"flat","orientation":"horizontal","facing":"down","operating_temp_c":-30,"ambient_temp_c":20,"layers":[{"k_points":[[-50,0.03],[50,0.04]],"thickness_mm":100}],"surface_emittance":0.9}`))
	f.Add([]byte(`{"geometry":"pipe","pipe_od_mm":33.4,"operating_temp_c":8,"ambient_temp_c":-25,"wind_m_s":10,"layers":[{"material":"cellular_glass_c552_t1","thickness_mm":40}],"jacket":"aluminium_new","criteria":{"freeze_hours":12}}`))
	f.Fuzz(func(t *testing.T, data []byte) {
		out, err := Run(data, CatalogResolver{})
		if err != nil {
			return
		}
		if _, err := json.Marshal(out); err != nil {
			t.Fatalf("output does not marshal: %v", err)
		}
	})
}

// benchLine is the line of BenchmarkAnalyse: NPS 4 at 180 °C with 2 in of mineral fiber,
// aluminium jacket, the energy code, a maximum heat flow and six priced thicknesses;
// personnel judged at the design air (given, so that every criterion shares it).
var benchLine = []byte(`{"geometry":"pipe","pipe_size":"NPS 4","operating_temp_c":180,"ambient_temp_c":20,"relative_humidity_pct":60,
		"conditions":{"personnel":{"ambient_temp_c":20}},
		"length_m":50,"layers":[{"material":"mineral_fiber_pipe_c547_t1","thickness_mm":50.8}],"jacket":"aluminium_new",
		"criteria":{"energy_code":"ashrae-90.1-2016","max_heat_flow_w_per_m":80},
		"economics":{"heating":{"price_per_kwh":0.05},"installed_cost_per_m":[{"thickness_mm":25.4,"cost":30},{"thickness_mm":38.1,"cost":36},
		{"thickness_mm":50.8,"cost":44},{"thickness_mm":63.5,"cost":52},{"thickness_mm":76.2,"cost":60},{"thickness_mm":101.6,"cost":80}]}}`)

// solvesOf analyses js and counts the distinct heat balances it solved and their residual
// evaluations.
func solvesOf(tb testing.TB, js []byte) (solves, evals int) {
	tb.Helper()
	var in Input
	if err := DecodeStrict(js, &in); err != nil {
		tb.Fatal(err)
	}
	l, err := resolve(in, CatalogResolver{})
	if err != nil {
		tb.Fatal(err)
	}
	a := analyser{l: l, out: new(Output)}
	if _, err := a.run(); err != nil {
		tb.Fatal(err)
	}
	for _, m := range a.memo[:a.nMemo] {
		evals += m.res.Evaluations
	}
	for _, r := range a.cache {
		evals += r.Evaluations
	}
	return a.nMemo + len(a.cache), evals
}

// The criteria and the economics share their heat balances wherever the conditions match.
// In benchLine every criterion and the economics are judged in the design air (still), so
// the analysis solves 9 balances (computed): the bare surface, the six priced thicknesses
// (50.8 mm is the thickness as specified), and 12.7 and 152.4 mm, which only the bisections
// of personnel protection and maximum heat flow probe. The energy code needs no balance.
// Each solve takes at most 6 residual evaluations (our own bound on the sizing search).
func TestSolvesShared(t *testing.T) {
	solves, evals := solvesOf(t, benchLine)
	t.Logf("%d solves, %d residual evaluations", solves, evals)
	if solves != 9 || evals > 6*solves {
		t.Errorf("%d solves with %d evaluations; want 9 solves, at most 6 evaluations each", solves, evals)
	}
}

func BenchmarkAnalyse(b *testing.B) {
	var in Input
	if err := DecodeStrict(benchLine, &in); err != nil {
		b.Fatal(err)
	}
	solves, evals := solvesOf(b, benchLine)
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Analyse(in, CatalogResolver{}); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(solves), "solves/op")
	b.ReportMetric(float64(evals), "evals/op")
}
