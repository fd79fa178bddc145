package catalog

import (
	"errors"
	"math"
	"strings"
	"testing"
)

func near(a, b, tol float64) bool { return math.Abs(a-b) <= tol }

// Steel OD and Schedule 40 wall: ASME B36.10M, as read (docs/references.md "Pipe and tube dimensions").
func TestSteelODAndSch40_ASMEB3610M(t *testing.T) {
	cases := []struct {
		desig string
		od    float64
		sch40 float64 // 0: "–" in the table read
	}{
		{"NPS 1/2", 21.3, 2.77},    // ASME B36.10M
		{"NPS 3/4", 26.7, 2.87},    // ASME B36.10M
		{"NPS 1", 33.4, 3.38},      // ASME B36.10M
		{"NPS 1-1/4", 42.2, 3.56},  // ASME B36.10M
		{"NPS 1-1/2", 48.3, 3.68},  // ASME B36.10M
		{"NPS 2", 60.3, 3.91},      // ASME B36.10M
		{"NPS 2-1/2", 73.0, 5.16},  // ASME B36.10M
		{"NPS 3", 88.9, 5.49},      // ASME B36.10M
		{"NPS 3-1/2", 101.6, 5.74}, // ASME B36.10M
		{"NPS 4", 114.3, 6.02},     // ASME B36.10M
		{"NPS 5", 141.3, 6.55},     // ASME B36.10M
		{"NPS 6", 168.3, 7.11},     // ASME B36.10M
		{"NPS 8", 219.1, 8.18},     // ASME B36.10M
		{"NPS 10", 273.0, 9.27},    // ASME B36.10M
		{"NPS 12", 323.8, 10.31},   // ASME B36.10M
		{"NPS 14", 355.6, 11.13},   // ASME B36.10M
		{"NPS 16", 406.4, 12.7},    // ASME B36.10M
		{"NPS 18", 457, 14.27},     // ASME B36.10M
		{"NPS 20", 508, 15.09},     // ASME B36.10M
		{"NPS 22", 559, 0},         // ASME B36.10M (Sch 40 "–")
		{"NPS 24", 610, 17.48},     // ASME B36.10M
	}
	var steel []PipeSize
	for _, p := range PipeSizes() {
		if p.Kind == Steel {
			steel = append(steel, p)
		}
	}
	if len(steel) != len(cases) {
		t.Fatalf("%d steel sizes, want %d (NPS 1/2–24, ASME B36.10M)", len(steel), len(cases))
	}
	for i, c := range cases {
		p := steel[i]
		if p.Designation != c.desig || p.ODmm != c.od {
			t.Errorf("steel[%d] = %s OD %g, want %s OD %g", i, p.Designation, p.ODmm, c.desig, c.od)
		}
		w, ok := p.WallMM["40"]
		if c.sch40 == 0 {
			if ok {
				t.Errorf("%s: Sch 40 wall %g tabulated, the table read has none", c.desig, w)
			}
			continue
		}
		if !ok || w != c.sch40 {
			t.Errorf("%s: Sch 40 wall %g (%v), want %g", c.desig, w, ok, c.sch40)
		}
		if !strings.Contains(p.Source, "ASME B36.10M") {
			t.Errorf("%s: source %q does not name ASME B36.10M", c.desig, p.Source)
		}
	}
}

// Schedule 80 walls: from memory of ASME B36.10M — verify.
func TestSteelSch80_FromMemory(t *testing.T) {
	cases := []struct {
		desig string
		sch80 float64 // 0 = not tabulated
	}{
		{"NPS 1/2", 3.73}, {"NPS 3/4", 3.91}, {"NPS 1", 4.55}, {"NPS 1-1/4", 4.85},
		{"NPS 1-1/2", 5.08}, {"NPS 2", 5.54}, {"NPS 2-1/2", 7.01}, {"NPS 3", 7.62},
		{"NPS 3-1/2", 8.08}, {"NPS 4", 8.56}, {"NPS 5", 9.53}, {"NPS 6", 10.97},
		{"NPS 8", 12.70}, {"NPS 10", 15.09}, {"NPS 12", 17.48}, {"NPS 14", 19.05},
		{"NPS 16", 21.44}, {"NPS 18", 23.83}, {"NPS 20", 26.19}, {"NPS 22", 0}, {"NPS 24", 30.96},
	}
	for _, c := range cases {
		p, w, err := LookupPipe(c.desig, "80")
		if c.sch80 == 0 {
			if err == nil || !errors.Is(err, ErrUnknownSchedule) {
				t.Errorf("%s Sch 80: err %v, want ErrUnknownSchedule", c.desig, err)
			}
			continue
		}
		if err != nil || w != c.sch80 {
			t.Errorf("%s Sch 80 = %g, %v; want %g", c.desig, w, err, c.sch80)
		}
		if w <= p.WallMM["40"] {
			t.Errorf("%s: Sch 80 wall %g not thicker than Sch 40 %g", c.desig, w, p.WallMM["40"])
		}
		if !strings.Contains(p.Source, "as recalled") {
			t.Errorf("%s: source %q does not mark Sch 80 as from memory", c.desig, p.Source)
		}
	}
}

// DN per ISO 6708 / common practice.
func TestDNToNPS_ISO6708(t *testing.T) {
	cases := []struct {
		dn  int
		nps string
	}{
		{15, "NPS 1/2"}, {20, "NPS 3/4"}, {25, "NPS 1"}, {32, "NPS 1-1/4"}, {40, "NPS 1-1/2"},
		{50, "NPS 2"}, {65, "NPS 2-1/2"}, {80, "NPS 3"}, {90, "NPS 3-1/2"}, {100, "NPS 4"},
		{125, "NPS 5"}, {150, "NPS 6"}, {200, "NPS 8"}, {250, "NPS 10"}, {300, "NPS 12"},
		{350, "NPS 14"}, {400, "NPS 16"}, {450, "NPS 18"}, {500, "NPS 20"}, {550, "NPS 22"},
		{600, "NPS 24"},
	}
	for _, c := range cases {
		byNPS, _, err := LookupPipe(c.nps, "")
		if err != nil && !errors.Is(err, ErrUnknownSchedule) {
			t.Fatalf("%s: %v", c.nps, err)
		}
		if byNPS.DN != c.dn {
			t.Errorf("%s: DN %d, want %d", c.nps, byNPS.DN, c.dn)
		}
		byDN, _, err := LookupPipe("DN"+itoa(c.dn), "")
		if err != nil && !errors.Is(err, ErrUnknownSchedule) {
			t.Fatalf("DN%d: %v", c.dn, err)
		}
		if byDN.Designation != c.nps {
			t.Errorf("DN%d → %s, want %s", c.dn, byDN.Designation, c.nps)
		}
	}
}

func itoa(n int) string { return FormatNominal(float64(n)) }

// Copper tube, ASTM B88: OD = nominal + 1/8 in for every size; Type L walls;
// Types K and M from memory — verify.
func TestCopperTube_ASTMB88(t *testing.T) {
	cases := []struct {
		desig   string
		nominal float64
		k, l, m float64 // in; 0 = not made
	}{
		{"CTS 1/4", 0.25, 0.035, 0.030, 0},
		{"CTS 3/8", 0.375, 0.049, 0.035, 0.025},
		{"CTS 1/2", 0.5, 0.049, 0.040, 0.028},
		{"CTS 5/8", 0.625, 0.049, 0.042, 0},
		{"CTS 3/4", 0.75, 0.065, 0.045, 0.032},
		{"CTS 1", 1, 0.065, 0.050, 0.035},
		{"CTS 1-1/4", 1.25, 0.065, 0.055, 0.042},
		{"CTS 1-1/2", 1.5, 0.072, 0.060, 0.049},
		{"CTS 2", 2, 0.083, 0.070, 0.058},
		{"CTS 2-1/2", 2.5, 0.095, 0.080, 0.065},
		{"CTS 3", 3, 0.109, 0.090, 0.072},
		{"CTS 3-1/2", 3.5, 0.120, 0.100, 0.083},
		{"CTS 4", 4, 0.134, 0.114, 0.095},
	}
	var cu []PipeSize
	for _, p := range PipeSizes() {
		if p.Kind == Copper {
			cu = append(cu, p)
		}
	}
	if len(cu) != len(cases) {
		t.Fatalf("%d copper sizes, want %d (CTS 1/4–4)", len(cu), len(cases))
	}
	for i, c := range cases {
		p := cu[i]
		if p.Designation != c.desig || p.NominalIn != c.nominal || p.DN != 0 {
			t.Errorf("copper[%d] = %s %g DN%d, want %s %g DN0", i, p.Designation, p.NominalIn, p.DN, c.desig, c.nominal)
		}
		if want := (c.nominal + 0.125) * 25.4; !near(p.ODmm, want, 1e-9) {
			t.Errorf("%s OD %g mm, want nominal + 1/8 in = %g mm (ASTM B88)", c.desig, p.ODmm, want)
		}
		for typ, in := range map[string]float64{"K": c.k, "L": c.l, "M": c.m} {
			w, ok := p.WallMM[typ]
			if in == 0 {
				if ok {
					t.Errorf("%s type %s wall %g tabulated; ASTM B88 makes none (from memory)", c.desig, typ, w)
				}
				continue
			}
			if !ok || !near(w, in*25.4, 1e-9) {
				t.Errorf("%s type %s wall %g mm, want %g in = %g mm", c.desig, typ, w, in, in*25.4)
			}
		}
	}
}

func TestPipeSizesOrder(t *testing.T) {
	ps := PipeSizes()
	seenCopper := false
	for i, p := range ps {
		if p.Kind == Copper {
			seenCopper = true
		} else if seenCopper {
			t.Fatalf("steel %s after copper", p.Designation)
		}
		if i > 0 && ps[i-1].Kind == p.Kind && !(p.NominalIn > ps[i-1].NominalIn && p.ODmm > ps[i-1].ODmm) {
			t.Errorf("%s not above %s", p.Designation, ps[i-1].Designation)
		}
		if p.Source == "" {
			t.Errorf("%s has no source", p.Designation)
		}
	}
	// copies: changing a returned map does not change the catalog
	ps[0].WallMM["40"] = 99
	if _, w, _ := LookupPipe("NPS 1/2", "40"); w != 2.77 {
		t.Errorf("catalog changed through a returned copy: %g", w)
	}
}

func TestLookupPipeForms(t *testing.T) {
	cases := []struct {
		in, sch string
		desig   string
		wall    float64
	}{
		{"NPS 4", "", "NPS 4", 6.02},                   // default Sch 40, ASME B36.10M
		{"NPS 1-1/2", "", "NPS 1-1/2", 3.68},           // ASME B36.10M
		{"NPS 1 1/2", "40", "NPS 1-1/2", 3.68},         // ASME B36.10M
		{"NPS 1.5", "Sch 40", "NPS 1-1/2", 3.68},       // ASME B36.10M
		{"nps 1½", "SCH40", "NPS 1-1/2", 3.68},         // ASME B36.10M
		{"NPS 1-1/2\"", "", "NPS 1-1/2", 3.68},         // ASME B36.10M
		{"  NPS   2 ", "80", "NPS 2", 5.54},            // Sch 80 from memory
		{"DN100", "", "NPS 4", 6.02},                   // ISO 6708 / ASME B36.10M
		{"DN 100", "schedule 80", "NPS 4", 8.56},       // Sch 80 from memory
		{"dn40", "", "NPS 1-1/2", 3.68},                // ISO 6708 / ASME B36.10M
		{"NPS 1/2", "", "NPS 1/2", 2.77},               // ASME B36.10M
		{"NPS 3/4", "", "NPS 3/4", 2.87},               // ASME B36.10M
		{"CTS 1", "", "CTS 1", 0.050 * 25.4},           // default type L, ASTM B88
		{"CTS 1-1/4", "L", "CTS 1-1/4", 0.055 * 25.4},  // ASTM B88
		{"CTS 3/4", "type k", "CTS 3/4", 0.065 * 25.4}, // ASTM B88 type K, from memory
		{"cts 2", "M", "CTS 2", 0.058 * 25.4},          // ASTM B88 type M, from memory
	}
	for _, c := range cases {
		p, w, err := LookupPipe(c.in, c.sch)
		if err != nil {
			t.Errorf("LookupPipe(%q, %q): %v", c.in, c.sch, err)
			continue
		}
		if p.Designation != c.desig || !near(w, c.wall, 1e-9) {
			t.Errorf("LookupPipe(%q, %q) = %s %g, want %s %g", c.in, c.sch, p.Designation, w, c.desig, c.wall)
		}
	}
}

func TestLookupPipeErrors(t *testing.T) {
	cases := []struct {
		in, sch  string
		kind     error
		contains string
		keepsOD  bool
	}{
		{"NPS 7", "", ErrUnknownPipeSize, "no steel pipe NPS 7 in ASME B36.10M", false},
		{"NPS 1-3/8", "", ErrUnknownPipeSize, "no steel pipe NPS 1-3/8 in ASME B36.10M", false},
		{"DN175", "", ErrUnknownPipeSize, "no steel pipe DN175 in ASME B36.10M", false},
		{"CTS 5", "", ErrUnknownPipeSize, "no copper tube CTS 5 in ASTM B88", false},
		{"NPS 22", "80", ErrUnknownSchedule, "schedule 80 wall not tabulated for NPS 22", true},
		{"NPS 22", "", ErrUnknownSchedule, "schedule 40 wall not tabulated for NPS 22", true},
		{"NPS 4", "160", ErrUnknownSchedule, `schedule "160" not tabulated for steel pipe`, true},
		{"NPS 4", "L", ErrUnknownSchedule, `schedule "L" not tabulated for steel pipe`, true},
		{"CTS 1", "40", ErrUnknownSchedule, `type "40" not tabulated for copper tube`, true},
		{"CTS 1/4", "M", ErrUnknownSchedule, "type M wall not tabulated for CTS 1/4", true},
		{"CTS 5/8", "M", ErrUnknownSchedule, "type M wall not tabulated for CTS 5/8", true},
		{"4", "", ErrBadDesignation, "start with NPS, DN or CTS", false},
		{"", "", ErrBadDesignation, "start with NPS, DN or CTS", false},
		{"NPS four", "", ErrBadDesignation, `unrecognised pipe size "FOUR"`, false},
		{"NPS -2", "", ErrBadDesignation, "unrecognised pipe size", false},
		{"NPS inf", "", ErrBadDesignation, "unrecognised pipe size", false},
		{"NPS 1-3/2", "", ErrBadDesignation, "unrecognised pipe size", false},
		{"DN 1.5", "", ErrBadDesignation, "write it as DN100", false},
		{"CTS x", "", ErrBadDesignation, "unrecognised tube size", false},
	}
	for _, c := range cases {
		p, w, err := LookupPipe(c.in, c.sch)
		if err == nil {
			t.Errorf("LookupPipe(%q, %q): no error", c.in, c.sch)
			continue
		}
		if !errors.Is(err, c.kind) || !strings.Contains(err.Error(), c.contains) {
			t.Errorf("LookupPipe(%q, %q) error %q (%v), want %v containing %q", c.in, c.sch, err, errors.Unwrap(err), c.kind, c.contains)
		}
		if w != 0 || (p.ODmm > 0) != c.keepsOD {
			t.Errorf("LookupPipe(%q, %q) = OD %g wall %g on error; keepsOD %v", c.in, c.sch, p.ODmm, w, c.keepsOD)
		}
	}
}

// SizeForOD: an outside diameter takes the standard size of its tube family when it
// matches within 0.5 mm (our tolerance). ODs: ASTM B88 (copper tube, nominal + 1/8 in),
// ASME B36.10M (NPS), ISO 4200 series 1 (DN, as recalled, check before use).
func TestSizeForOD(t *testing.T) {
	cases := []struct {
		kind    PipeKind
		od      float64
		want    string
		nominal float64
	}{
		{Copper, 28.58, "CTS 1", 1},      // 1-1/8 in = 28.575 mm, ASTM B88
		{Copper, 53.975, "CTS 2", 2},     // 2-1/8 in
		{Copper, 33.4, "", 0},            // a steel OD is no copper tube
		{Steel, 33.4, "NPS 1", 1},        // 1.315 in, ASME B36.10M
		{Steel, 48.26, "NPS 1-1/2", 1.5}, // 1.900 in, just under the tabulated 48.3
		{Steel, 609.6, "NPS 24", 24},     // 24 in, under the tabulated 610
		{Steel, 76.1, "DN65", 2.5},       // ISO 4200 DN 65 (ASME NPS 2-1/2 is 73.0)
		{Steel, 139.7, "DN125", 5},       // ISO 4200 DN 125 (ASME NPS 5 is 141.3)
		{Steel, 70, "", 0},               // between sizes
		{Steel, math.NaN(), "", 0},
	}
	for _, c := range cases {
		got, nominal, ok := SizeForOD(c.kind, c.od)
		if got != c.want || nominal != c.nominal || ok != (c.want != "") {
			t.Errorf("SizeForOD(%s, %g) = %q, %g, %v; want %q, %g", c.kind, c.od, got, nominal, ok, c.want, c.nominal)
		}
	}
}

func TestFormatNominal(t *testing.T) {
	cases := map[float64]string{0.5: "1/2", 0.375: "3/8", 1.25: "1-1/4", 4: "4", 1.3: "1.3", 3.5: "3-1/2", 0: "0"}
	for in, want := range cases {
		if got := FormatNominal(in); got != want {
			t.Errorf("FormatNominal(%g) = %q, want %q", in, got, want)
		}
	}
}
