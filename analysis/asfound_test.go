package analysis

import (
	"math"
	"slices"
	"strings"
	"testing"

	"lagwright/field"
)

// The audit line of the tests: hot water 80 °C in 20 °C air, NPS 4 (OD 114.3 mm, ASME
// B36.10M), wall not modelled, a fixed surface coefficient 8 W/m²·K, 100 m of run. The
// proposed build is 40 mm of k 0.035; the existing build is 40 mm of k 0.035 found wet.
const auditLine = `{"geometry":"pipe","pipe_od_mm":114.3,"operating_temp_c":80,"ambient_temp_c":20,"length_m":100,
	"layers":[{"k_w_mk":0.035,"thickness_mm":40}],"surface_coeff_w_m2k":8,"thicknesses_mm":[40],
	"existing":EXISTING,
	"economics":{"currency":"EUR","heating":{"price_per_kwh":0.06,"efficiency":0.85,"hours_per_year":8000,"co2_kg_per_kwh":0.2},
	"installed_cost_per_m":[{"thickness_mm":40,"cost":50}]}}`

// TestAsFoundHandCalculation: wet insulation (k × 2, the stated planning factor) by hand
// (Fourier, cylinder; ASTM C680 approach):
//
//	R' = ln(0.09715/0.05715)/(2π·0.070) + 1/(2π·0.09715·8) = 1.206342 + 0.204780 = 1.411122 m·K/W
//	q' = 60/1.411122 = 42.5194 W/m; over 100 m: 4251.94 W
//
// and with a tenth of the run missing, 0.9·q'(wet) + 0.1·q'(bare).
func TestAsFoundHandCalculation(t *testing.T) {
	out := mustRun(t, strings.Replace(auditLine, "EXISTING", `{"layers":[{"k_w_mk":0.035,"thickness_mm":40}],"condition":"wet"}`, 1))
	af := out.AsFound
	if af == nil || af.HeatFlowWPerM == nil || af.HeatFlowW == nil {
		t.Fatalf("as_found %+v", af)
	}
	if math.Abs(*af.HeatFlowWPerM-42.5194) > 0.0002 || math.Abs(*af.HeatFlowW-4251.94) > 0.02 || af.KFactor != 2 {
		t.Errorf("as found %.4f W/m, %.2f W, k × %g; hand calculation 42.5194 W/m, 4251.94 W, k × 2", *af.HeatFlowWPerM, *af.HeatFlowW, af.KFactor)
	}
	if !hasAssumption(out, "as found: wet insulation, k × 2 (our planning figure") {
		t.Errorf("the wet factor's basis is not stated: %q", out.Assumptions)
	}
	// The economics table: bare, as found, then the candidates; savings against bare.
	if len(out.Economics) != 3 || out.Economics[0].ThicknessMM != 0 || !out.Economics[1].AsFound || out.Economics[2].ThicknessMM != 40 {
		t.Fatalf("economics rows %+v, want bare, as found, 40 mm", out.Economics)
	}
	found, bare := out.Economics[1], out.Economics[0]
	// Fuel a year as found: 42.5194 W/m × 100 m × 8000 h / 1000 / 0.85 = 40018.23 kWh; × 0.06 = 2401.09 EUR.
	if math.Abs(found.AnnualKWh-40018.23) > 0.02 || math.Round(found.AnnualCost*100)/100 != 2401.09 {
		t.Errorf("as found %.3f kWh, %.3f EUR; hand calculation 40018.23 kWh, 2401.09 EUR", found.AnnualKWh, found.AnnualCost)
	}
	if found.InstalledCost != nil || found.SimplePaybackYears != nil || found.AnnualSavings == nil ||
		math.Abs(found.AnnualSavings.Cost-(bare.AnnualCost-found.AnnualCost)) > 0.002 {
		t.Errorf("as-found row %+v: want no installed cost or payback, savings against bare", found)
	}

	out = mustRun(t, strings.Replace(auditLine, "EXISTING", `{"layers":[{"k_w_mk":0.035,"thickness_mm":40}],"k_factor":2,"missing_fraction":0.1}`, 1))
	want := 0.9*42.519369 + 0.1**out.BareHeatFlow
	if math.Abs(*out.AsFound.HeatFlowWPerM-want) > 0.0002 {
		t.Errorf("a tenth missing: %.4f W/m, want 0.9 × 42.5194 + 0.1 × %.4f = %.4f", *out.AsFound.HeatFlowWPerM, *out.BareHeatFlow, want)
	}
	// Found bare: the as-found heat flow is the bare line's.
	out = mustRun(t, strings.Replace(auditLine, "EXISTING", `{}`, 1))
	if *out.AsFound.HeatFlowWPerM != *out.BareHeatFlow {
		t.Errorf("found bare: %v W/m, bare %v W/m", *out.AsFound.HeatFlowWPerM, *out.BareHeatFlow)
	}
}

// TestAsFoundBareValves: valves found bare add the bare valve's heat to the run as found,
// at the bare pipe's flux over the valve's bare surface, as the fittings model does for a
// line that says its valves are bare.
func TestAsFoundBareValves(t *testing.T) {
	base := `{"geometry":"pipe","pipe_size":"NPS 4","operating_temp_c":150,"ambient_temp_c":20,"length_m":50,
		"layers":[{"material":"mineral_fiber_pipe_c547_t1","thickness_mm":50.8}],"jacket":"aluminium_new",
		"fittings":{"valves":3}FINISH,"existing":{"layers":[{"material":"mineral_fiber_pipe_c547_t1","thickness_mm":50.8}]BARE}}`
	whole := mustRun(t, strings.NewReplacer("FINISH", "", "BARE", "").Replace(base))
	valvesBare := mustRun(t, strings.NewReplacer("FINISH", "", "BARE", `,"bare_fittings":["valves"]`).Replace(base))
	lineSaysBare := mustRun(t, strings.NewReplacer("FINISH", `,"fitting_finish":{"valves":"bare"}`, "BARE", "").Replace(base))
	if *whole.AsFound.HeatFlowW != *whole.HeatFlowW {
		t.Errorf("existing = proposed: as found %v W, proposed %v W", *whole.AsFound.HeatFlowW, *whole.HeatFlowW)
	}
	// The valves found bare lose what the line's own bare valves lose (same model).
	if d := *valvesBare.AsFound.HeatFlowW - *lineSaysBare.HeatFlowW; math.Abs(d) > 0.05 {
		t.Errorf("valves found bare %v W, line with bare valves %v W", *valvesBare.AsFound.HeatFlowW, *lineSaysBare.HeatFlowW)
	}
	if !(*valvesBare.AsFound.HeatFlowW > *whole.AsFound.HeatFlowW) {
		t.Errorf("bare valves add no heat: %v W against %v W", *valvesBare.AsFound.HeatFlowW, *whole.AsFound.HeatFlowW)
	}
}

func TestExistingFieldErrors(t *testing.T) {
	fe := fieldErrors(t, strings.Replace(auditLine, "EXISTING",
		`{"layers":[{"k_w_mk":0.035}],"condition":"soggy","k_factor":0.5,"missing_fraction":1.5,"bare_fittings":["gates"]}`, 1))
	for _, want := range []string{"existing.layers[0].thickness_mm", "existing.condition", "existing.k_factor",
		"existing.missing_fraction", "existing.bare_fittings[0]"} {
		if !slices.ContainsFunc(fe, func(f field.Error) bool { return f.Field == want }) {
			t.Errorf("no error on %s: %v", want, fe)
		}
	}
}
