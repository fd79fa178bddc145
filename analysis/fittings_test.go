package analysis

import (
	"math"
	"slices"
	"strings"
	"testing"

	"lagwright/field"
)

const steamMain = `{"geometry":"pipe","pipe_size":"NPS 4","steam_gauge_pressure_kpa":700,"ambient_temp_c":20,
	"layers":[{"material":"mineral_fiber_pipe_c547_t1","thickness_mm":50}],"jacket":"aluminium_weathered","length_m":60`

// The fitting allowance follows the line's size: an elbow on NPS 6 counts for more
// run than one on a 3/4 in tube (the complaint about one size-blind length).
func TestFittingLengthFollowsSize(t *testing.T) {
	small := mustRun(t, `{"geometry":"pipe","pipe_size":"CTS 3/4","operating_temp_c":60,"ambient_temp_c":20,
		"layers":[{"k_w_mk":0.04,"thickness_mm":25}],"jacket":"pvc_jacket","length_m":10,"fittings":{"elbows":4}}`)
	big := mustRun(t, `{"geometry":"pipe","pipe_size":"NPS 6","operating_temp_c":60,"ambient_temp_c":20,
		"layers":[{"k_w_mk":0.04,"thickness_mm":25}],"jacket":"pvc_jacket","length_m":10,"fittings":{"elbows":4}}`)
	es, eb := *small.EquivalentLengthM-10, *big.EquivalentLengthM-10
	if eb < 2*es || es <= 0 {
		t.Errorf("4 elbows: %.2f m on CTS 3/4, %.2f m on NPS 6", es, eb)
	}
	// The override stays: it replaces the table's length of the insulated fittings.
	over := mustRun(t, `{"geometry":"pipe","pipe_size":"NPS 6","operating_temp_c":60,"ambient_temp_c":20,
		"layers":[{"k_w_mk":0.04,"thickness_mm":25}],"jacket":"pvc_jacket","length_m":10,"fittings":{"elbows":4},"fittings_equiv_length_m":1}`)
	if *over.EquivalentLengthM != 11 {
		t.Errorf("override: equivalent length %v, want 11", *over.EquivalentLengthM)
	}
	// The run's heat is the straight run plus every kind (energy balance of the answer).
	sum := *big.StraightRunHeatW
	for _, w := range big.FittingsHeatW {
		sum += w
	}
	near(t, "straight + fittings", sum, *big.HeatFlowW, 1e-4)
}

// Six bare valves on a steam main show their share of the loss: each as its bare
// surface at the bare pipe's flux (ASTM C1129 approach), far above the same valves
// insulated, and a removable cover in between.
func TestBareValvesOnSteamMain(t *testing.T) {
	ins := mustRun(t, steamMain+`,"fittings":{"valves":6}}`)
	bare := mustRun(t, steamMain+`,"fittings":{"valves":6},"fitting_finish":{"valves":"bare"}}`)
	cover := mustRun(t, steamMain+`,"fittings":{"valves":6},"fitting_finish":{"valves":"cover"},"fitting_cover":{"thickness_mm":25}}`)
	wi, wb, wc := ins.FittingsHeatW["valves"], bare.FittingsHeatW["valves"], cover.FittingsHeatW["valves"]
	if !(wb > 5*wi && wc > wi && wc < wb) {
		t.Errorf("six valves: insulated %.0f W, 25 mm covers %.0f W, bare %.0f W", wi, wc, wb)
	}
	d := bare.Fittings[0]
	if d.BareAreaM2 == nil {
		t.Fatal("a bare valve must state its bare area")
	}
	near(t, "bare valves = 6 × area × bare flux", wb, 6**d.BareAreaM2*bare.BareHeatFluxWm2, 1e-3)
	// Bare valves are not in the insulated length, but in the run's heat and condensate.
	if *bare.EquivalentLengthM != 60 || *bare.HeatFlowW <= *ins.HeatFlowW || *bare.CondensateKgPerH <= *ins.CondensateKgPerH {
		t.Errorf("bare: equivalent length %v, heat %v W (insulated %v W), condensate %v (insulated %v)",
			*bare.EquivalentLengthM, *bare.HeatFlowW, *ins.HeatFlowW, *bare.CondensateKgPerH, *ins.CondensateKgPerH)
	}
	// A warm line counts its supports for the bid: NPS 4 at 14 ft (4.27 m) over 60 m.
	if s := bare.Supports; s == nil || s.Count != 15 || s.HeatW != nil {
		t.Errorf("supports on a steam main: %+v, want 15 counted, heat not modelled", s)
	}
}

// A chilled-water line: supports gain heat; a bare clamp at the pipe temperature sits
// below the dew point (30 °C, 70 % RH: about 23.9 °C, Hyland–Wexler), so it is warned of.
func TestSupportsOnColdLine(t *testing.T) {
	base := `{"geometry":"pipe","pipe_size":"NPS 4","operating_temp_c":6,"ambient_temp_c":30,"relative_humidity_pct":70,
		"layers":[{"material":"elastomeric_c534_gr1","thickness_mm":40}],"jacket":"pvc_jacket","length_m":43`
	ins := mustRun(t, base+`}`)
	clamp := mustRun(t, base+`,"supports":{"kind":"clamp"}}`)
	si, sc := ins.Supports, clamp.Supports
	if si == nil || sc == nil || si.Kind != "insert" || si.Count != 11 || si.HeatW == nil || sc.HeatW == nil {
		t.Fatalf("supports: insert %+v, clamp %+v", si, sc)
	}
	if !(*si.HeatW < 0 && *sc.HeatW < *si.HeatW) {
		t.Errorf("heat through supports: inserts %v W, bare clamps %v W (both gains, clamps larger)", *si.HeatW, *sc.HeatW)
	}
	if sc.ClampCondensationMarginK == nil || *sc.ClampCondensationMarginK > -17 {
		t.Errorf("clamp margin %v K, want about 6 − 23.9", sc.ClampCondensationMarginK)
	}
	if !slices.ContainsFunc(clamp.Warnings, func(w string) bool { return strings.Contains(w, "bare support clamps") }) {
		t.Errorf("no clamp warning: %q", clamp.Warnings)
	}
	if slices.ContainsFunc(ins.Warnings, func(w string) bool { return strings.Contains(w, "bare support clamps") }) {
		t.Error("inserts warned of as bare clamps")
	}
	given := mustRun(t, base+`,"supports":{"kind":"insert","w_per_k":0.05,"spacing_m":3}}`)
	if s := given.Supports; s.Count != 15 || math.Abs(*s.HeatEachW-0.05*(6-30)) > 1e-9 {
		t.Errorf("given w_per_k and spacing: %+v", s)
	}
	near(t, "run heat with supports", *given.HeatFlowW, *given.StraightRunHeatW+*given.Supports.HeatW, 1e-4)
}

func TestFittingInputErrors(t *testing.T) {
	fe := fieldErrors(t, steamMain+`,"fittings":{"valves":-1},"fitting_finish":{"valves":"painted"},
		"supports":{"kind":"hanger","spacing_m":0.1},"fitting_cover":{"jacket":"gold"}}`)
	for _, f := range []string{"fittings.valves", "fitting_finish.valves", "supports.kind", "supports.spacing_m", "fitting_cover.jacket"} {
		if !slices.ContainsFunc(fe, func(e field.Error) bool { return e.Field == f }) {
			t.Errorf("no error for %s: %v", f, fe)
		}
	}
	fe = fieldErrors(t, `{"geometry":"flat","operating_temp_c":80,"ambient_temp_c":20,"area_m2":4,"surface_emittance":0.9,
		"fittings":{"valves":1},"supports":{"kind":"clamp"}}`)
	if !slices.ContainsFunc(fe, func(e field.Error) bool { return e.Field == "fittings" }) ||
		!slices.ContainsFunc(fe, func(e field.Error) bool { return e.Field == "supports" }) {
		t.Errorf("flat surface with fittings and supports: %v", fe)
	}
}

// A project's fitting table fills the line's per-fitting lengths: the row of the
// line's size wins over the "any" row; the all-size allowance wins over both.
func TestProjectFittingTable(t *testing.T) {
	set := DefaultSettings()
	set.FittingTable = []FittingRow{{Kind: "elbows", NominalSize: "any", EquivLengthM: 1}, {Kind: "elbows", NominalSize: "NPS 4", EquivLengthM: 2}}
	set.SupportTable = []SupportRow{{NominalSize: "4", SpacingM: 3}}
	in := Input{Geometry: "pipe", PipeSize: "NPS 4", LengthM: ptr(10.0)}
	eff := set.Effective("indoor", in, Fittings{Elbows: 3})
	if eff.Fittings == nil || eff.Fittings.Elbows != 3 || eff.FittingLengthsM == nil || *eff.FittingLengthsM.Elbows != 2 {
		t.Fatalf("effective fittings %+v lengths %+v", eff.Fittings, eff.FittingLengthsM)
	}
	if eff.Supports == nil || *eff.Supports.SpacingM != 3 {
		t.Errorf("support spacing from the project: %+v", eff.Supports)
	}
	in.PipeSize = "NPS 2"
	if eff := set.Effective("indoor", in, Fittings{Elbows: 3}); *eff.FittingLengthsM.Elbows != 1 || eff.Supports != nil {
		t.Errorf("NPS 2 takes the any row and the built-in spacing: %+v %+v", eff.FittingLengthsM, eff.Supports)
	}
	set.Fittings.ElbowM = ptr(0.7)
	if eff := set.Effective("indoor", in, Fittings{Elbows: 3}); *eff.FittingLengthsM.Elbows != 0.7 {
		t.Errorf("all-size allowance: %v", *eff.FittingLengthsM.Elbows)
	}
	set.FittingTable = append(set.FittingTable, FittingRow{Kind: "bends", NominalSize: "", EquivLengthM: 60})
	err := set.Validate()
	for _, f := range []string{"settings.fitting_table[2].kind", "settings.fitting_table[2].nominal_size", "settings.fitting_table[2].equiv_length_m"} {
		if err == nil || !strings.Contains(err.Error(), f) {
			t.Errorf("no error for %s: %v", f, err)
		}
	}
}
