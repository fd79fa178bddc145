package analysis

import (
	"math"
	"slices"
	"strconv"
	"strings"
	"testing"

	"lagwright/field"
)

func checkOf(o *Output, criterion string) *Check {
	for i := range o.Checks {
		if o.Checks[i].Criterion == criterion {
			return &o.Checks[i]
		}
	}
	return nil
}

// A 25 mm layer (a metric thickness, not in the inch series) whose surface is about
// 54 °C passes the 60 °C touch limit (limit: common practice, ASTM C1055 basis), though
// the thinnest inch-series candidate for personnel protection is 25.4 mm: checks judge
// the build as specified, never "thinner than the series".
func TestChecksJudgeTheBuildAsSpecified(t *testing.T) {
	o := mustRun(t, `{"geometry":"pipe","pipe_size":"NPS 2","operating_temp_c":182,"ambient_temp_c":25,
		"conditions":{"personnel":{"ambient_temp_c":25}},
		"layers":[{"material":"mineral_fiber_pipe_c547_t1","thickness_mm":25}],"jacket":"aluminium_weathered"}`)
	c := checkOf(o, "personnel_protection")
	if c == nil {
		t.Fatalf("no personnel check: %+v", o.Checks)
	}
	if math.Abs(c.Value-o.SurfaceTempC) > 1e-3 || c.Value < 50 || c.Value > 58 {
		t.Fatalf("personnel check value %v °C, want the surface %v °C (about 54)", c.Value, o.SurfaceTempC)
	}
	if !c.Pass || c.Limit != 60 || c.Unit != "°C" || c.Sense != "max" {
		t.Errorf("check %+v: a %v °C surface under a 60 °C limit must pass", c, c.Value)
	}
	if p := o.Sizing.PersonnelProtectionMM; p == nil || *p <= 25 {
		t.Errorf("the inch-series candidate should be above the 25 mm specified (so the old rule flagged it): %v", p)
	}
}

// The same line made hotter fails, and a cold line's dew margin is judged on the
// coldest surface against dew point + margin (Magnus-type dew point of 24 °C at 55 %:
// about 14.4 °C, psychrometric charts, common practice).
func TestChecksFailAndCondensation(t *testing.T) {
	o := mustRun(t, `{"geometry":"pipe","pipe_size":"NPS 2","operating_temp_c":260,"ambient_temp_c":25,
		"layers":[{"material":"mineral_fiber_pipe_c547_t1","thickness_mm":25}],"jacket":"aluminium_weathered"}`)
	if c := checkOf(o, "personnel_protection"); c == nil || c.Pass || c.Value <= 60 {
		t.Errorf("hot line: personnel check %+v, want a failure above 60 °C", c)
	}
	o = mustRun(t, `{"geometry":"pipe","pipe_size":"NPS 2","operating_temp_c":7,"ambient_temp_c":24,"relative_humidity_pct":55,
		"layers":[{"material":"elastomeric_c534_gr1","thickness_mm":25.4}],"jacket":"pvc_jacket"}`)
	c := checkOf(o, "condensation")
	if c == nil {
		t.Fatalf("no condensation check: %+v", o.Checks)
	}
	if math.Abs(c.Limit-15.4) > 0.3 || c.Sense != "min" || c.Unit != "°C" {
		t.Errorf("condensation check %+v: limit want dew point ≈ 14.4 °C + 1 K margin", c)
	}
	if c.Pass != (c.Value >= c.Limit) || !c.Pass {
		t.Errorf("condensation check %+v: 25 mm elastomeric keeps a 7 °C pipe dry at 55 %%", c)
	}
	if o.CondensationMarginK == nil || math.Abs(*o.CondensationMarginK-(c.Value-c.Limit+1)) > 2e-3 {
		t.Errorf("check value %v and limit %v disagree with the margin %v", c.Value, c.Limit, o.CondensationMarginK)
	}
}

// NPS 1/2 hot water at 204.4 °C (400 °F) in calcium silicate against ASHRAE 90.1-2016
// Table 6.8.3-1 (row >350 °F: 4.5 in for sizes <1 in, k range 0.32–0.34 Btu·in/h·ft²·°F at
// 250 °F mean): the footnote correction T = r[(1 + t/r)^(K/k) − 1] with K the material's k
// at 250 °F needs about 277 mm, far beyond one 4 in layer (the largest block made, common
// practice). The answer must govern with a layered build at least that thick, never with
// the personnel-protection thickness.
func TestUnmetSingleLayerGivesLayeredBuild(t *testing.T) {
	o := mustRun(t, `{"geometry":"pipe","pipe_size":"NPS 1/2","operating_temp_c":204.4,"ambient_temp_c":24,
		"layers":[{"material":"calcium_silicate_c533_t1","thickness_mm":25.4}],"jacket":"aluminium_new",
		"criteria":{"energy_code":"ashrae-90.1-2016"}}`)
	// By hand: r = 0.840 in / 2 (ASME B36.10M), t = 4.5 in, K = 0.455 (C533 Type I between
	// 0.44 at 200 °F and 0.50 at 400 °F, the catalog's data), k = 0.34.
	r := 0.840 / 2 * 25.4
	want := r * (math.Pow(1+4.5*25.4/r, 0.455/0.34) - 1)
	if want < 270 || want > 285 {
		t.Fatalf("hand value %v mm", want)
	}
	s := o.Sizing
	if s.Governing == nil || *s.Governing != "energy_code" {
		t.Fatalf("governing %v, want energy_code", s.Governing)
	}
	if s.GoverningThicknessMM == nil || *s.GoverningThicknessMM < want-0.5 {
		t.Fatalf("governing thickness %v below the corrected requirement %.1f mm", s.GoverningThicknessMM, want)
	}
	sum := 0.0
	series := []float64{25.4, 38.1, 50.8, 63.5, 76.2, 88.9, 101.6, 114.3, 127, 152.4}
	for _, lp := range s.LayersProposed {
		sum += lp.ThicknessMM
		if lp.ThicknessMM > 101.6+1e-6 || !slices.Contains(series, lp.ThicknessMM) || lp.Material != "calcium_silicate_c533_t1" {
			t.Errorf("proposed layer %+v: each layer from the series and at most 4 in", lp)
		}
	}
	if n := len(s.LayersProposed); n < 2 || n > 4 || math.Abs(sum-*s.GoverningThicknessMM) > 0.01 {
		t.Errorf("layers %+v (sum %v) do not make the governing %v mm in 2–4 layers", s.LayersProposed, sum, *s.GoverningThicknessMM)
	}
	if len(s.Unmet) != 0 {
		t.Errorf("unmet %v, want none: the layered build meets the code", s.Unmet)
	}
	if c := checkOf(o, "energy_code"); c == nil || c.Pass {
		t.Errorf("the 25.4 mm build as specified must fail the code check: %+v", c)
	}
}

// When even a layered build cannot meet a criterion, it governs with no thickness, it is
// listed as unmet and a warning says what would help. Personnel air at 62 °C over a
// 60 °C limit: the ambient itself is over the limit (physics: a surface cannot be cooler
// than the air and surroundings it gains heat from).
func TestUnmetGovernsWithNullThickness(t *testing.T) {
	o := mustRun(t, `{"geometry":"pipe","pipe_size":"NPS 2","operating_temp_c":180,"ambient_temp_c":24,
		"conditions":{"personnel":{"ambient_temp_c":62}},
		"layers":[{"material":"mineral_fiber_pipe_c547_t1","thickness_mm":25.4}],"jacket":"aluminium_new"}`)
	s := o.Sizing
	if s.Governing == nil || *s.Governing != "personnel_protection" || s.GoverningThicknessMM != nil {
		t.Fatalf("governing %v at %v, want personnel_protection with null thickness", s.Governing, s.GoverningThicknessMM)
	}
	if !slices.Contains(s.Unmet, "personnel_protection") || len(s.LayersProposed) != 0 {
		t.Errorf("unmet %v, layers %v", s.Unmet, s.LayersProposed)
	}
	if !slices.ContainsFunc(o.Warnings, func(w string) bool { return strings.Contains(w, "itself at or above the 60 °C") }) {
		t.Errorf("no warning that the ambient is over the limit: %q", o.Warnings)
	}
}

// A copper tube given as CTS 1 and the same tube by its outside diameter, 1-1/8 in =
// 28.58 mm (ASTM B88: OD = nominal + 1/8 in), read the same ASHRAE 90.1-2016 column
// ("1 to <1-1/2", Table 6.8.3-1), and the answer names the size it used.
func TestTubeByODTakesItsNominalColumn(t *testing.T) {
	run := func(pipe string) *EnergyCodeRow {
		o := mustRun(t, `{"geometry":"pipe",`+pipe+`,"operating_temp_c":60,"ambient_temp_c":24,
			"layers":[{"material":"mineral_fiber_pipe_c547_t1","thickness_mm":25.4}],"jacket":"all_service_jacket",
			"criteria":{"energy_code":"ashrae-90.1-2016"}}`)
		if o.EnergyCode == nil {
			t.Fatalf("%s: no energy-code row", pipe)
		}
		return o.EnergyCode
	}
	bySize := run(`"pipe_size":"CTS 1"`)
	byOD := run(`"pipe_od_mm":28.58,"pipe_material":"copper"`)
	if bySize.Column != "1 to <1-1/2" || byOD.Column != bySize.Column {
		t.Errorf("columns: CTS 1 %q, OD 28.58 mm %q; want both \"1 to <1-1/2\"", bySize.Column, byOD.Column)
	}
	if byOD.SizeUsed != "CTS 1" || byOD.SizeBasis != "matched_od" || bySize.SizeBasis != "pipe_size" {
		t.Errorf("size used: %q (%s), %q (%s)", byOD.SizeUsed, byOD.SizeBasis, bySize.SizeUsed, bySize.SizeBasis)
	}
	if ec := run(`"pipe_od_mm":70`); ec.SizeBasis != "od" || ec.Column != "1-1/2 to <4" {
		t.Errorf("a 70 mm OD (no standard size) reads %q by %s; want the OD itself, 2.76 in, in \"1-1/2 to <4\"", ec.Column, ec.SizeBasis)
	}
}

// A DN 100 line proposes whole-millimetre thicknesses from the material's metric series
// (common practice: metric ranges in whole mm); thickness_series overrides either way.
func TestMetricSeriesForDNLines(t *testing.T) {
	line := func(size, series string) *Output {
		extra := ""
		if series != "" {
			extra = `,"thickness_series":"` + series + `"`
		}
		return mustRun(t, `{"geometry":"pipe","pipe_size":"`+size+`","operating_temp_c":180,"ambient_temp_c":24,
			"layers":[{"material":"mineral_fiber_pipe_c547_t1","thickness_mm":30}],"jacket":"aluminium_new",
			"criteria":{"energy_code":"ashrae-90.1-2016"}`+extra+`}`)
	}
	whole := func(v []float64) bool {
		return len(v) > 0 && !slices.ContainsFunc(v, func(x float64) bool { return x != math.Round(x) })
	}
	o := line("DN100", "")
	if !whole(o.Sizing.Candidates) {
		t.Errorf("DN100 candidates %v, want whole millimetres", o.Sizing.Candidates)
	}
	for _, p := range []*float64{o.Sizing.PersonnelProtectionMM, o.Sizing.EnergyCodeMM, o.Sizing.GoverningThicknessMM} {
		if p == nil || *p != math.Round(*p) {
			t.Errorf("DN100 proposes %v, want whole millimetres", p)
		}
	}
	if o := line("NPS 4", ""); whole(o.Sizing.Candidates) {
		t.Errorf("NPS 4 candidates %v, want the inch series", o.Sizing.Candidates)
	}
	if o := line("NPS 4", "metric"); !whole(o.Sizing.Candidates) {
		t.Errorf("NPS 4 with thickness_series metric: %v", o.Sizing.Candidates)
	}
	if o := line("DN100", "inch"); whole(o.Sizing.Candidates) {
		t.Errorf("DN100 with thickness_series inch: %v", o.Sizing.Candidates)
	}
	if fe := fieldErrors(t, `{"geometry":"pipe","pipe_size":"DN100","operating_temp_c":80,"ambient_temp_c":24,"thickness_series":"imperial"}`); !slices.ContainsFunc(fe, func(e field.Error) bool { return e.Field == "thickness_series" }) {
		t.Errorf("thickness_series imperial accepted: %v", fe)
	}
	set := DefaultSettings()
	set.ThicknessSeries = "metric"
	if eff := set.Effective("indoor", Input{Geometry: "pipe"}, Fittings{}); eff.ThicknessSeries != "metric" {
		t.Errorf("the project's thickness_series does not reach the line: %q", eff.ThicknessSeries)
	}
}

// A material outside its service range is never proposed: ASTM C547 Type I mineral
// fiber is made for 0 to 850 °F (−17.8 to 454 °C, ASTM C547), so a −40 °C line in it gets
// no thickness, only an unmet criterion, and its build fails the service check.
func TestServiceLimitsExcludeCandidates(t *testing.T) {
	o := mustRun(t, `{"geometry":"pipe","pipe_size":"NPS 2","operating_temp_c":-40,"ambient_temp_c":24,"relative_humidity_pct":60,
		"layers":[{"material":"mineral_fiber_pipe_c547_t1","thickness_mm":50.8}],"jacket":"pvc_jacket"}`)
	if o.Sizing.CondensationMM != nil || o.Sizing.GoverningThicknessMM != nil || !slices.Contains(o.Sizing.Unmet, "condensation") {
		t.Errorf("C547 Type I proposed at −40 °C: %+v", o.Sizing)
	}
	c := checkOf(o, CheckServiceTemp)
	if c == nil || c.Pass || math.Abs(c.Limit-(0-32)*5.0/9) > 1e-3 || c.Sense != "min" {
		t.Errorf("service check %+v, want a failure against −17.8 °C", c)
	}
	// The same line in cellular glass (−450 to 800 °F, ASTM C552) is proposed.
	o = mustRun(t, `{"geometry":"pipe","pipe_size":"NPS 2","operating_temp_c":-40,"ambient_temp_c":24,"relative_humidity_pct":60,
		"layers":[{"material":"cellular_glass_c552_t2","thickness_mm":50.8}],"jacket":"pvc_jacket"}`)
	if o.Sizing.CondensationMM == nil || o.Sizing.GoverningThicknessMM == nil {
		t.Errorf("cellular glass not proposed at −40 °C: %+v", o.Sizing)
	}
	if c := checkOf(o, CheckServiceTemp); c == nil || !c.Pass {
		t.Errorf("cellular glass service check %+v", c)
	}
}

// A PVC jacket is made for surfaces up to about 65 °C (common practice): a thin build
// whose jacket runs hotter fails the jacket check, and sizing proposes a build that keeps
// the jacket within it, judged at the hottest of the design and personnel conditions.
func TestJacketLimit(t *testing.T) {
	o := mustRun(t, `{"geometry":"pipe","pipe_size":"NPS 4","operating_temp_c":230,"ambient_temp_c":25,
		"criteria":{"personnel_protection":false},
		"layers":[{"material":"mineral_fiber_pipe_c547_t1","thickness_mm":12.7}],"jacket":"pvc_jacket"}`)
	c := checkOf(o, CheckJacketMaxTemp)
	if c == nil || c.Pass || c.Limit != 65 || c.Value <= 65 {
		t.Fatalf("jacket check %+v, want a failure above 65 °C", c)
	}
	tj := o.Sizing.JacketMaxTempMM
	if tj == nil || o.Sizing.Governing == nil || *o.Sizing.Governing != CheckJacketMaxTemp {
		t.Fatalf("jacket limit not sized or not governing: %+v", o.Sizing)
	}
	again := mustRun(t, `{"geometry":"pipe","pipe_size":"NPS 4","operating_temp_c":230,"ambient_temp_c":25,
		"criteria":{"personnel_protection":false},
		"layers":[{"material":"mineral_fiber_pipe_c547_t1","thickness_mm":`+strconv.FormatFloat(*tj, 'f', -1, 64)+`}],"jacket":"pvc_jacket"}`)
	if c := checkOf(again, CheckJacketMaxTemp); c == nil || !c.Pass {
		t.Errorf("the proposed %v mm does not pass its own jacket check: %+v", *tj, c)
	}
}

// Personnel protection without a personnel set: judged at the warmer of the design
// ambient and a 32 °C (90 °F) hot day, in still air (common practice), echoed in
// conditions_used.personnel; outdoors with 1000 W/m² of sunlight on the projected area
// (common practice) absorbed at the jacket's solar absorptance.
func TestPersonnelHotDayDefaults(t *testing.T) {
	base := `{"geometry":"pipe","pipe_size":"NPS 2","operating_temp_c":150,"ambient_temp_c":20,"wind_m_s":3,
		"layers":[{"material":"mineral_fiber_pipe_c547_t1","thickness_mm":25.4}],"jacket":"aluminium_weathered"`
	in := mustRun(t, base+`}`)
	p := in.ConditionsUsed.Personnel
	if p.AmbientTempC != 32 || p.SurroundingsTempC != 32 || p.WindMS != 0 || p.SolarFluxWm2 == nil || *p.SolarFluxWm2 != 0 {
		t.Errorf("indoor personnel conditions %+v, want 32 °C, still air, no sun", p)
	}
	out := mustRun(t, base+`,"location":"outdoor"}`)
	p = out.ConditionsUsed.Personnel
	if p.AmbientTempC != 32 || p.SolarFluxWm2 == nil || *p.SolarFluxWm2 != 1000 || p.SolarAbsorptance == nil || *p.SolarAbsorptance != 0.35 {
		t.Errorf("outdoor personnel conditions %+v, want 32 °C and 1000 W/m² at the weathered aluminium's 0.35", p)
	}
	ci, co := checkOf(in, "personnel_protection"), checkOf(out, "personnel_protection")
	if ci == nil || co == nil || co.Value <= ci.Value {
		t.Errorf("sunlit surface %+v not above the shaded one %+v", co, ci)
	}
	hot := mustRun(t, strings.Replace(base, `"ambient_temp_c":20`, `"ambient_temp_c":38`, 1)+`}`)
	if hot.ConditionsUsed.Personnel.AmbientTempC != 38 {
		t.Errorf("design ambient 38 °C: personnel judged at %v °C, want the warmer 38", hot.ConditionsUsed.Personnel.AmbientTempC)
	}
	// Areas used by the public or patients: the user gives the lower limit, with a caution.
	if fe := fieldErrors(t, base+`,"criteria":{"touch_exposure":"public"}}`); !slices.ContainsFunc(fe, func(e field.Error) bool { return e.Field == "criteria.max_surface_temp_c" }) {
		t.Errorf("public exposure without a limit accepted: %v", fe)
	}
	pub := mustRun(t, base+`,"criteria":{"touch_exposure":"public","max_surface_temp_c":43}}`)
	if c := checkOf(pub, "personnel_protection"); c == nil || c.Limit != 43 ||
		!slices.ContainsFunc(pub.Cautions, func(s string) bool { return strings.Contains(s, "public or patients") }) {
		t.Errorf("public exposure: check %+v, cautions %q", c, pub.Cautions)
	}
}

// Small cases: a bare line with a fixed surface coefficient is refused with both fields
// named (its bare comparison would come from the correlations and disagree); the heat-flow
// limit of a flat surface reads W/m² in its messages (per m², docs/calc-json.md).
func TestSmallCasesConsistent(t *testing.T) {
	fe := fieldErrors(t, `{"geometry":"pipe","pipe_size":"NPS 2","operating_temp_c":80,"ambient_temp_c":20,"surface_coeff_w_m2k":10}`)
	for _, want := range []string{"surface_coeff_w_m2k", "layers"} {
		if !slices.ContainsFunc(fe, func(e field.Error) bool { return e.Field == want }) {
			t.Errorf("bare line with surface_coeff_w_m2k: %v, want %s named", fe, want)
		}
	}
	fe = fieldErrors(t, `{"geometry":"flat","operating_temp_c":80,"ambient_temp_c":20,"criteria":{"max_heat_flow_w_per_m":2000000}}`)
	if !slices.ContainsFunc(fe, func(e field.Error) bool { return strings.Contains(e.Message, "W/m²") }) {
		t.Errorf("flat heat-flow limit message %v, want W/m²", fe)
	}
	o := mustRun(t, `{"geometry":"flat","operating_temp_c":300,"ambient_temp_c":20,"layers":[{"material":"mineral_fiber_board_c612","thickness_mm":25.4}],
		"jacket":"aluminium_new","thicknesses_mm":[25.4],"criteria":{"max_heat_flow_w_per_m":1}}`)
	if c := checkOf(o, "max_heat_flow"); c == nil || c.Unit != "W/m²" {
		t.Errorf("flat heat-flow check %+v, want W/m²", c)
	}
	if !slices.ContainsFunc(o.Warnings, func(w string) bool { return strings.Contains(w, "at or below 1 W/m²") }) {
		t.Errorf("flat heat-flow warning %q, want W/m²", o.Warnings)
	}
}

// 50.8 mm calcium silicate under 76.2 mm mineral fiber on NPS 4 at 204.4 °C against
// ASHRAE 90.1-2016 Table 6.8.3-1 (>350 °F, 4 to <8 in: 5 in at k 0.32–0.34 Btu·in/h·ft²·°F,
// 250 °F mean): the total, 127 mm, is above the footnote correction with the outer layer's k
// (0.31 at 250 °F: about 109 mm), but the build's resistance per metre, each layer at its own
// k at 250 °F (C533: 0.455, C547 Type I: 0.31, the catalog's data), is about 9 % short of
// 5 in at k 0.34: it fails.
func TestMultiLayerCodeByResistance(t *testing.T) {
	o := mustRun(t, `{"geometry":"pipe","pipe_size":"NPS 4","operating_temp_c":204.4,"ambient_temp_c":24,
		"layers":[{"material":"calcium_silicate_c533_t1","thickness_mm":50.8},{"material":"mineral_fiber_pipe_c547_t1","thickness_mm":76.2}],
		"jacket":"aluminium_new","criteria":{"energy_code":"ashrae-90.1-2016"}}`)
	r0, r1, r2 := 114.3/2, 114.3/2+50.8, 114.3/2+127
	build := math.Log(r1/r0)/0.455 + math.Log(r2/r1)/0.31
	need := math.Log((r0+127)/r0) / 0.34
	if oldRule := r0 * (math.Pow(1+127/r0, 0.31/0.34) - 1); oldRule >= 127 || build >= need {
		t.Fatalf("hand case: old rule %v mm, resistance ratio %v", oldRule, build/need)
	}
	c := checkOf(o, "energy_code")
	if c == nil || c.Pass || o.EnergyCode == nil || o.EnergyCode.Pass || c.Unit != "m·K/W" {
		t.Fatalf("energy-code check %+v (row pass %v): the two-layer build must fail by resistance", c, o.EnergyCode != nil && o.EnergyCode.Pass)
	}
	if got := c.Value / c.Limit; math.Abs(got-build/need) > 2e-3 {
		t.Errorf("resistance ratio %v, by hand %v", got, build/need)
	}
	// The proposed outer layer on the same calcium silicate brings it to the requirement.
	tOut := o.Sizing.EnergyCodeMM
	if tOut == nil || *tOut <= 76.2 {
		t.Fatalf("energy_code_mm %v, want more than the 76.2 mm given", tOut)
	}
	rOut := r1 + *tOut
	if math.Log(r1/r0)/0.455+math.Log(rOut/r1)/0.31 < need*(1-1e-3) {
		t.Errorf("the proposed %v mm outer layer is still short of the resistance", *tOut)
	}
}
