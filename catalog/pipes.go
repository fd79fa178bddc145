package catalog

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"
)

// PipeKind is the kind of pipe or tube: "steel" (ASME B36.10M) or "copper" (ASTM B88).
type PipeKind string

// Pipe kinds.
const (
	Steel  PipeKind = "steel"
	Copper PipeKind = "copper"
)

// PipeSize is one steel pipe size (ASME B36.10M) or copper tube size (ASTM B88).
type PipeSize struct {
	Kind        PipeKind
	Designation string             // canonical: "NPS 1-1/2", "CTS 3/4"
	NominalIn   float64            // nominal pipe or tube size, inches (energy-code columns)
	DN          int                // metric designation of steel pipe (DN40); 0 for copper
	ODmm        float64            // outside diameter, mm
	WallMM      map[string]float64 // steel "40", "80"; copper "K", "L", "M"; absent = not tabulated
	Source      string
}

// Sentinel errors of LookupPipe; test with errors.Is. The error's text is the full message.
var (
	ErrBadDesignation  = errors.New("unrecognised pipe designation")
	ErrUnknownPipeSize = errors.New("pipe size not in the catalog")
	ErrUnknownSchedule = errors.New("schedule or type not tabulated")
)

type lookupError struct {
	msg  string
	kind error
}

func (e *lookupError) Error() string { return e.msg }
func (e *lookupError) Unwrap() error { return e.kind }

func lookupErr(kind error, format string, args ...any) error {
	return &lookupError{msg: fmt.Sprintf(format, args...), kind: kind}
}

const (
	srcSteel = "ASME B36.10M: OD and Schedule 40 wall; Schedule 80 wall " + labelMemory +
		" against ASME B36.10M; DN per ISO 6708 (" + labelCommon + ")"
	srcSteel22 = "ASME B36.10M: OD (no Schedule 40 in the table read; Schedule 80 not tabulated here, " +
		labelMemory + "); DN per ISO 6708 (" + labelCommon + ")"
	srcCopper = "ASTM B88: OD = nominal + 1/8 in and Type L wall; Types K and M walls " + labelMemory +
		" against ASTM B88"
)

// steelRow: nominal size (in), DN, OD (mm) and walls (mm); 0 = not tabulated.
type steelRow struct {
	nps   float64
	dn    int
	od    float64 // ASME B36.10M
	sch40 float64 // ASME B36.10M
	sch80 float64 // from memory — verify
}

var steelRows = []steelRow{
	{0.5, 15, 21.3, 2.77, 3.73},    // OD 0.840 in
	{0.75, 20, 26.7, 2.87, 3.91},   // OD 1.050 in
	{1, 25, 33.4, 3.38, 4.55},      // OD 1.315 in
	{1.25, 32, 42.2, 3.56, 4.85},   // OD 1.660 in
	{1.5, 40, 48.3, 3.68, 5.08},    // OD 1.900 in
	{2, 50, 60.3, 3.91, 5.54},      // OD 2.375 in
	{2.5, 65, 73.0, 5.16, 7.01},    // OD 2.875 in
	{3, 80, 88.9, 5.49, 7.62},      // OD 3.500 in
	{3.5, 90, 101.6, 5.74, 8.08},   // OD 4.000 in
	{4, 100, 114.3, 6.02, 8.56},    // OD 4.500 in
	{5, 125, 141.3, 6.55, 9.53},    // OD 5.563 in
	{6, 150, 168.3, 7.11, 10.97},   // OD 6.625 in
	{8, 200, 219.1, 8.18, 12.70},   // OD 8.625 in
	{10, 250, 273.0, 9.27, 15.09},  // OD 10.75 in
	{12, 300, 323.8, 10.31, 17.48}, // OD 12.75 in
	{14, 350, 355.6, 11.13, 19.05}, // OD 14 in
	{16, 400, 406.4, 12.70, 21.44}, // OD 16 in
	{18, 450, 457, 14.27, 23.83},   // OD 18 in
	{20, 500, 508, 15.09, 26.19},   // OD 20 in
	{22, 550, 559, 0, 0},           // OD 22 in; Sch 40 "–" in the table read; Sch 80 not tabulated here
	{24, 600, 610, 17.48, 30.96},   // OD 24 in
}

// copperRow: nominal tube size (in) and walls (in); 0 = not made in that type.
type copperRow struct {
	nominal float64
	k       float64 // ASTM B88 Type K, from memory — verify
	l       float64 // ASTM B88 Type L
	m       float64 // ASTM B88 Type M, from memory — verify
}

var copperRows = []copperRow{
	{0.25, 0.035, 0.030, 0},
	{0.375, 0.049, 0.035, 0.025},
	{0.5, 0.049, 0.040, 0.028},
	{0.625, 0.049, 0.042, 0},
	{0.75, 0.065, 0.045, 0.032},
	{1, 0.065, 0.050, 0.035},
	{1.25, 0.065, 0.055, 0.042},
	{1.5, 0.072, 0.060, 0.049},
	{2, 0.083, 0.070, 0.058},
	{2.5, 0.095, 0.080, 0.065},
	{3, 0.109, 0.090, 0.072},
	{3.5, 0.120, 0.100, 0.083},
	{4, 0.134, 0.114, 0.095},
}

var pipeSizes = buildPipeSizes()

func buildPipeSizes() []PipeSize {
	out := make([]PipeSize, 0, len(steelRows)+len(copperRows))
	for _, r := range steelRows {
		w := map[string]float64{}
		if r.sch40 > 0 {
			w["40"] = r.sch40
		}
		if r.sch80 > 0 {
			w["80"] = r.sch80
		}
		src := srcSteel
		if r.nps == 22 {
			src = srcSteel22
		}
		out = append(out, PipeSize{
			Kind: Steel, Designation: "NPS " + FormatNominal(r.nps), NominalIn: r.nps,
			DN: r.dn, ODmm: r.od, WallMM: w, Source: src,
		})
	}
	for _, r := range copperRows {
		w := map[string]float64{}
		for typ, in := range map[string]float64{"K": r.k, "L": r.l, "M": r.m} {
			if in > 0 {
				w[typ] = in2mm(in)
			}
		}
		out = append(out, PipeSize{
			Kind: Copper, Designation: "CTS " + FormatNominal(r.nominal), NominalIn: r.nominal,
			ODmm: in2mm(r.nominal + 0.125), WallMM: w, Source: srcCopper,
		})
	}
	return out
}

func (p PipeSize) clone() PipeSize {
	w := make(map[string]float64, len(p.WallMM))
	for k, v := range p.WallMM {
		w[k] = v
	}
	p.WallMM = w
	return p
}

// PipeSizes returns every size: steel NPS 1/2–24 ascending, then copper CTS 1/4–4 ascending.
func PipeSizes() []PipeSize {
	out := make([]PipeSize, len(pipeSizes))
	for i, p := range pipeSizes {
		out[i] = p.clone()
	}
	return out
}

// FormatNominal writes a nominal size in inches the way designations spell it: 1.5 → "1-1/2",
// 0.375 → "3/8", 4 → "4". Sizes that are not a multiple of 1/8 in are written as decimals.
func FormatNominal(x float64) string {
	if math.IsNaN(x) || math.IsInf(x, 0) || x < 0 {
		return strconv.FormatFloat(x, 'g', -1, 64)
	}
	eighths := x * 8
	if eighths != math.Trunc(eighths) || eighths > 1e6 {
		return strconv.FormatFloat(x, 'g', -1, 64)
	}
	n := int(eighths)
	whole, num, den := n/8, n%8, 8
	for num > 0 && num%2 == 0 {
		num, den = num/2, den/2
	}
	switch {
	case num == 0:
		return strconv.Itoa(whole)
	case whole == 0:
		return fmt.Sprintf("%d/%d", num, den)
	default:
		return fmt.Sprintf("%d-%d/%d", whole, num, den)
	}
}

var unicodeFractions = strings.NewReplacer(
	"½", " 1/2", "¼", " 1/4", "¾", " 3/4", "⅛", " 1/8", "⅜", " 3/8", "⅝", " 5/8", "⅞", " 7/8",
	"\u2044", "/", // fraction slash
)

// parseNominal reads "4", "1-1/2", "1 1/2", "1.5", "1/2" as inches.
func parseNominal(s string) (float64, bool) {
	s = strings.TrimSpace(unicodeFractions.Replace(s))
	s = strings.TrimSuffix(s, "\"")
	s = strings.TrimSuffix(s, "IN")
	s = strings.TrimSpace(s)
	// a hyphen between a whole number and a fraction is a separator
	if i := strings.Index(s, "-"); i > 0 {
		s = s[:i] + " " + s[i+1:]
	}
	f := strings.Fields(s)
	switch len(f) {
	case 1:
		return parsePart(f[0])
	case 2:
		w, ok1 := parsePart(f[0])
		fr, ok2 := parsePart(f[1])
		if !ok1 || !ok2 || w != math.Trunc(w) || !strings.Contains(f[1], "/") || fr >= 1 {
			return 0, false
		}
		return w + fr, true
	}
	return 0, false
}

func parsePart(s string) (float64, bool) {
	if a, b, ok := strings.Cut(s, "/"); ok {
		n, err1 := strconv.Atoi(a)
		d, err2 := strconv.Atoi(b)
		if err1 != nil || err2 != nil || n < 0 || d <= 0 {
			return 0, false
		}
		return float64(n) / float64(d), true
	}
	for _, r := range s {
		if (r < '0' || r > '9') && r != '.' {
			return 0, false // rejects signs, exponents, "inf", "nan"
		}
	}
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		return 0, false
	}
	return v, true
}

// normaliseSchedule maps "", "40", "Sch 40", "SCH40", "schedule 80" to "40"/"80" and
// "L", "type l" to "L".
func normaliseSchedule(s string) string {
	s = strings.ToUpper(strings.TrimSpace(s))
	for _, p := range []string{"SCHEDULE", "SCH.", "SCH", "TYPE"} {
		if strings.HasPrefix(s, p) {
			s = strings.TrimSpace(s[len(p):])
			break
		}
	}
	return s
}

// LookupPipe finds a size by designation and returns it with the wall thickness (mm) of the
// schedule (steel, "40" or "80") or type (copper, "K", "L" or "M").
//
// Designations: "NPS 4", "NPS 1-1/2", "NPS 1 1/2", "NPS 1.5", "NPS 1½", "DN100", "DN 100",
// "CTS 1", "CTS 1-1/4" (case and spacing ignored; a trailing `"` or "in" is allowed).
// Schedule "" takes the default: "40" for steel, "L" for copper; "Sch 40" and "Type L" are
// accepted too.
//
// Errors name what was wrong and wrap ErrBadDesignation, ErrUnknownPipeSize or
// ErrUnknownSchedule. When only the wall is missing (ErrUnknownSchedule: e.g. NPS 22, whose
// Schedule 40 wall is not tabulated), size is still returned, with wallMM 0, so that a caller
// may go on with the outside diameter alone.
func LookupPipe(designation, schedule string) (size PipeSize, wallMM float64, err error) {
	d := strings.ToUpper(strings.TrimSpace(designation))
	var kind PipeKind
	var found *PipeSize
	switch {
	case strings.HasPrefix(d, "NPS"):
		kind = Steel
		rest := strings.TrimSpace(d[3:])
		n, ok := parseNominal(rest)
		if !ok {
			return PipeSize{}, 0, lookupErr(ErrBadDesignation,
				"unrecognised pipe size %q in %q: write it as NPS 4, NPS 1-1/2, NPS 1 1/2 or NPS 1.5", rest, designation)
		}
		found = findSize(func(p PipeSize) bool { return p.Kind == Steel && p.NominalIn == n })
		if found == nil {
			return PipeSize{}, 0, lookupErr(ErrUnknownPipeSize,
				"no steel pipe NPS %s in ASME B36.10M (the catalog holds NPS 1/2 to 24)", FormatNominal(n))
		}
	case strings.HasPrefix(d, "DN"):
		kind = Steel
		rest := strings.TrimSpace(d[2:])
		dn, err := strconv.Atoi(rest)
		if err != nil || dn <= 0 {
			return PipeSize{}, 0, lookupErr(ErrBadDesignation,
				"unrecognised pipe size %q in %q: write it as DN100 or DN 100", rest, designation)
		}
		found = findSize(func(p PipeSize) bool { return p.Kind == Steel && p.DN == dn })
		if found == nil {
			return PipeSize{}, 0, lookupErr(ErrUnknownPipeSize,
				"no steel pipe DN%d in ASME B36.10M (the catalog holds DN15 to DN600)", dn)
		}
	case strings.HasPrefix(d, "CTS"):
		kind = Copper
		rest := strings.TrimSpace(d[3:])
		n, ok := parseNominal(rest)
		if !ok {
			return PipeSize{}, 0, lookupErr(ErrBadDesignation,
				"unrecognised tube size %q in %q: write it as CTS 1, CTS 3/4 or CTS 1-1/4", rest, designation)
		}
		found = findSize(func(p PipeSize) bool { return p.Kind == Copper && p.NominalIn == n })
		if found == nil {
			return PipeSize{}, 0, lookupErr(ErrUnknownPipeSize,
				"no copper tube CTS %s in ASTM B88 (the catalog holds CTS 1/4 to 4)", FormatNominal(n))
		}
	default:
		return PipeSize{}, 0, lookupErr(ErrBadDesignation,
			"unrecognised pipe designation %q: start with NPS, DN or CTS (NPS 1-1/2, DN40, CTS 3/4)", designation)
	}
	size = found.clone()

	sch := normaliseSchedule(schedule)
	switch kind {
	case Steel:
		if sch == "" {
			sch = "40"
		}
		if sch != "40" && sch != "80" {
			return size, 0, lookupErr(ErrUnknownSchedule,
				"schedule %q not tabulated for steel pipe: the catalog has schedules 40 and 80 (ASME B36.10M)", schedule)
		}
		w, ok := size.WallMM[sch]
		if !ok {
			return size, 0, lookupErr(ErrUnknownSchedule,
				"schedule %s wall not tabulated for %s", sch, size.Designation)
		}
		return size, w, nil
	default:
		if sch == "" {
			sch = "L"
		}
		if sch != "K" && sch != "L" && sch != "M" {
			return size, 0, lookupErr(ErrUnknownSchedule,
				"type %q not tabulated for copper tube: ASTM B88 types are K, L and M", schedule)
		}
		w, ok := size.WallMM[sch]
		if !ok {
			return size, 0, lookupErr(ErrUnknownSchedule,
				"type %s wall not tabulated for %s (ASTM B88)", sch, size.Designation)
		}
		return size, w, nil
	}
}

func findSize(match func(PipeSize) bool) *PipeSize {
	for i := range pipeSizes {
		if match(pipeSizes[i]) {
			return &pipeSizes[i]
		}
	}
	return nil
}

// odToleranceMM lets a plain OD converted from inches take its own size although ASME
// B36.10M rounds metric ODs (24 in = 609.6 mm against the tabulated 610; 1.900 in =
// 48.26 mm against 48.3). Adjacent steel ODs differ by at least 5.4 mm.
const odToleranceMM = 0.5

// isoODs are the outside diameters of steel pipe by DN, ISO 4200 / EN 10220 series 1 (mm),
// where they differ from ASME B36.10M's (DN 20 26.9 against 26.7 …): values as recalled
// from ISO 4200, check before use. The DN's nominal size in inches is ISO 6708's pairing.
var isoODs = []struct {
	dn int
	od float64
}{
	{15, 21.3}, {20, 26.9}, {25, 33.7}, {32, 42.4}, {40, 48.3}, {50, 60.3}, {65, 76.1}, {80, 88.9},
	{100, 114.3}, {125, 139.7}, {150, 168.3}, {200, 219.1}, {250, 273.0}, {300, 323.9}, {350, 355.6},
	{400, 406.4}, {450, 457}, {500, 508}, {600, 610},
}

// SizeForOD names the standard size whose outside diameter matches odMM within 0.5 mm
// (odToleranceMM) in the tube family: copper tube by CTS (ASTM B88, OD = nominal + 1/8 in),
// any other pipe by NPS (ASME B36.10M ODs) and then by DN (ISO 4200 / EN 10220 ODs).
// It returns the designation ("NPS 1", "CTS 1", "DN65") and its nominal size in inches
// for the energy-code columns; ok is false when no standard OD matches.
func SizeForOD(kind PipeKind, odMM float64) (designation string, nominalIn float64, ok bool) {
	if math.IsNaN(odMM) || odMM <= 0 {
		return "", 0, false
	}
	best := odToleranceMM + 1e-9
	for _, p := range pipeSizes {
		if d := math.Abs(p.ODmm - odMM); p.Kind == kind && d <= best {
			designation, nominalIn, ok, best = p.Designation, p.NominalIn, true, d
		}
	}
	if ok || kind == Copper {
		return designation, nominalIn, ok
	}
	for _, r := range isoODs {
		if d := math.Abs(r.od - odMM); d <= best {
			designation, ok, best = "DN"+strconv.Itoa(r.dn), true, d
			for _, s := range steelRows {
				if s.dn == r.dn {
					nominalIn = s.nps
				}
			}
		}
	}
	return designation, nominalIn, ok
}
