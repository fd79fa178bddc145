package catalog

import (
	"math"
	"slices"
)

// FittingKinds are the fitting kinds a line counts, in the order every table and
// answer lists them; each is also the key of its count in the calculation JSON.
var FittingKinds = []string{"elbows", "tees", "valves", "flange_pairs", "caps", "strainers", "reducers"}

// FittingKindName writes a fitting kind for people ("flange pair").
func FittingKindName(kind string) string {
	switch kind {
	case "elbows":
		return "elbow"
	case "tees":
		return "tee"
	case "valves":
		return "valve"
	case "flange_pairs":
		return "flange pair"
	case "caps":
		return "cap"
	case "strainers":
		return "strainer"
	case "reducers":
		return "reducer"
	}
	return kind
}

// FittingLengthBasis names where the built-in equivalent lengths come from.
const FittingLengthBasis = "built-in fitting allowances by size: " + labelCommon +
	" (our estimate — a fixed allowance for the cover's ends plus a multiple of the nominal size for the fitting's extra surface; " +
	"a valve or strainer includes its two end joints); edit them per project"

// fittingRule is the built-in allowance of one kind: Fixed metres plus PerSize times the
// nominal size in metres.
type fittingRule struct{ Fixed, PerSize float64 }

var fittingRules = map[string]fittingRule{
	"elbows":       {0.30, 3},
	"tees":         {0.45, 4},
	"valves":       {0.90, 8},
	"flange_pairs": {0.30, 2},
	"caps":         {0.15, 1},
	"strainers":    {0.90, 8}, // as a valve of the same size (common practice)
	"reducers":     {0.30, 2},
}

// FittingTableSizes are the nominal sizes (in) the built-in tables list.
var FittingTableSizes = []float64{0.5, 0.75, 1, 1.25, 1.5, 2, 2.5, 3, 4, 5, 6, 8, 10, 12, 14, 16, 18, 20, 24}

// FittingEquivLengthM is the built-in equivalent insulated length of one fitting of kind
// at a nominal size (in), metres of run, rounded to 0.05 m; sizes outside ½–24 take the
// nearest end. ok is false for an unknown kind.
func FittingEquivLengthM(kind string, nominalIn float64) (float64, bool) {
	r, ok := fittingRules[kind]
	if !ok {
		return 0, false
	}
	n := math.Min(math.Max(nominalIn, 0.5), 24)
	return math.Round((r.Fixed+r.PerSize*n*MMPerInch/1000)*20) / 20, true
}

// FlangeDims are the class 150 flange dimensions of one nominal size: outside diameter
// and thickness, mm, with the face-to-face length of a class 150 flanged gate valve.
type FlangeDims struct {
	NominalIn           float64
	FlangeODmm, ThickMM float64
	ValveFaceToFaceMM   float64
	Source              string
}

// FlangeDimsSource is the basis of the flange and valve dimensions.
const FlangeDimsSource = "ASME B16.5 class 150 flange OD and thickness, ASME B16.10 class 150 gate-valve face-to-face: " + labelMemory

// flangeRows: NPS, flange OD (in), flange thickness (in), valve face-to-face (in).
var flangeRows = [][4]float64{
	{0.5, 3.5, 0.44, 4.25}, {0.75, 3.88, 0.50, 4.62}, {1, 4.25, 0.56, 5}, {1.25, 4.62, 0.62, 5.5},
	{1.5, 5, 0.69, 6.5}, {2, 6, 0.75, 7}, {2.5, 7, 0.88, 7.5}, {3, 7.5, 0.94, 8}, {4, 9, 0.94, 9},
	{5, 10, 0.94, 10}, {6, 11, 1, 10.5}, {8, 13.5, 1.12, 11.5}, {10, 16, 1.19, 13}, {12, 19, 1.25, 14},
	{14, 21, 1.38, 15}, {16, 23.5, 1.44, 16}, {18, 25, 1.56, 17}, {20, 27.5, 1.69, 18}, {24, 32, 1.88, 20},
}

// FlangeAt gives the flange and valve dimensions of the tabulated size at or above
// nominalIn (the larger fitting: the conservative side), the largest above 24.
func FlangeAt(nominalIn float64) FlangeDims {
	row := flangeRows[len(flangeRows)-1]
	for _, r := range flangeRows {
		if r[0] >= nominalIn-1e-9 {
			row = r
			break
		}
	}
	return FlangeDims{NominalIn: row[0], FlangeODmm: in2mm(row[1]), ThickMM: in2mm(row[2]),
		ValveFaceToFaceMM: in2mm(row[3]), Source: FlangeDimsSource}
}

// Where the built-in support spacing comes from, for steel pipe and copper tube.
const (
	SupportSpacingSteel  = "ASME B31.1 suggested maximum span, water service, " + labelMemory
	SupportSpacingCopper = labelCommon + " plumbing-code spans for copper tube, " + labelMemory
)

// steelSpans: NPS, span (ft), ASME B31.1 suggested maximum span, water service.
var steelSpans = [][2]float64{{1, 7}, {2, 10}, {3, 12}, {4, 14}, {6, 17}, {8, 19}, {12, 23}, {16, 27}, {20, 30}, {24, 32}}

// copperSpans: nominal tube size, span (ft).
var copperSpans = [][2]float64{{0.5, 5}, {0.75, 5}, {1, 6}, {1.25, 7}, {1.5, 8}, {2, 8}, {2.5, 9}, {3, 10}, {4, 12}}

// SupportSpacingM is the built-in support spacing at a nominal size (in), m: linear
// between tabulated sizes, the end value beyond them. copper selects the tube table.
func SupportSpacingM(nominalIn float64, copper bool) float64 {
	t := steelSpans
	if copper {
		t = copperSpans
	}
	ft := interpolate(t, nominalIn)
	return math.Round(ft*0.3048*100) / 100
}

func interpolate(t [][2]float64, x float64) float64 {
	if x <= t[0][0] {
		return t[0][1]
	}
	i := slices.IndexFunc(t, func(r [2]float64) bool { return r[0] >= x })
	if i < 0 {
		return t[len(t)-1][1]
	}
	a, b := t[i-1], t[i]
	return a[1] + (b[1]-a[1])*(x-a[0])/(b[0]-a[0])
}

// SupportRodDiameterMM is the hanger rod at a nominal size (in), for the heat through a
// bare clamp: MSS SP-58 rod sizes, from memory — verify.
func SupportRodDiameterMM(nominalIn float64) float64 {
	switch {
	case nominalIn <= 2:
		return in2mm(0.375)
	case nominalIn <= 3.5:
		return in2mm(0.5)
	case nominalIn <= 5:
		return in2mm(0.625)
	case nominalIn <= 6:
		return in2mm(0.75)
	case nominalIn <= 12:
		return in2mm(0.875)
	case nominalIn <= 18:
		return in2mm(1)
	}
	return in2mm(1.25)
}

// SupportInsertLengthM is the length of a load-bearing insert and its shield at a
// nominal size (in): 12 in to NPS 3-1/2, 18 in to NPS 12, 24 in above (MSS SP-58
// shield lengths, from memory — verify).
func SupportInsertLengthM(nominalIn float64) float64 {
	switch {
	case nominalIn <= 3.5:
		return 0.3048
	case nominalIn <= 12:
		return 0.4572
	}
	return 0.6096
}

// InsertKWmK is the conductivity of a load-bearing support insert: high-density
// polyisocyanurate, about 0.045 W/m·K near 24 °C mean (from memory — verify with the
// insert's maker).
const InsertKWmK = 0.045

// SupportRodKWmK is the conductivity of a carbon-steel hanger rod (about 50 W/m·K near
// room temperature, common practice).
const SupportRodKWmK = 50.0
