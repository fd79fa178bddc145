package catalog

import (
	"math"
	"testing"
)

// Each allowance grows with size (common practice: a bigger fitting has more surface
// to cover), and an elbow's is at least the centreline arc of a long-radius elbow
// (ASME B16.9: centre-to-end 1.5 × NPS, so the arc is π/2 · 1.5 · NPS).
func TestFittingEquivLengthBySize(t *testing.T) {
	for _, kind := range FittingKinds {
		prev := 0.0
		for _, n := range FittingTableSizes {
			v, ok := FittingEquivLengthM(kind, n)
			if !ok || v <= 0 || v < prev {
				t.Errorf("%s at NPS %g: %g m (ok %v), previous size %g m", kind, n, v, ok, prev)
			}
			prev = v
		}
	}
	for _, n := range FittingTableSizes {
		e, _ := FittingEquivLengthM("elbows", n)
		if arc := math.Pi / 2 * 1.5 * n * MMPerInch / 1000; e < arc {
			t.Errorf("elbow NPS %g: %g m, below the long-radius arc %g m", n, e, arc)
		}
		// A valve's allowance covers at least its own face-to-face length (ASME B16.10).
		v, _ := FittingEquivLengthM("valves", n)
		if ff := FlangeAt(n).ValveFaceToFaceMM / 1000; v < ff {
			t.Errorf("valve NPS %g: %g m, below its face-to-face %g m", n, v, ff)
		}
	}
	e34, _ := FittingEquivLengthM("elbows", 0.75)
	e6, _ := FittingEquivLengthM("elbows", 6)
	if e6 < 2*e34 {
		t.Errorf("an NPS 6 elbow (%g m) should count far more than a 3/4 one (%g m)", e6, e34)
	}
	if _, ok := FittingEquivLengthM("bends", 4); ok {
		t.Error("an unknown kind must not be found")
	}
}

// ASME B31.1 suggested maximum spans for water service (from memory — verify): NPS 1,
// 7 ft; NPS 4, 14 ft; NPS 12, 23 ft. Copper tube is supported closer than steel pipe
// of the same size (common practice).
func TestSupportSpacing(t *testing.T) {
	for _, c := range []struct{ nps, ft float64 }{{1, 7}, {4, 14}, {12, 23}, {24, 32}, {30, 32}} {
		if got, want := SupportSpacingM(c.nps, false), c.ft*0.3048; math.Abs(got-want) > 0.006 {
			t.Errorf("NPS %g: %g m, want %g m (%g ft)", c.nps, got, want, c.ft)
		}
	}
	if a, b := SupportSpacingM(5, false), (SupportSpacingM(4, false)+SupportSpacingM(6, false))/2; math.Abs(a-b) > 0.01 {
		t.Errorf("NPS 5 spacing %g m, want the interpolation %g m", a, b)
	}
	for _, n := range []float64{1, 2, 4} {
		if SupportSpacingM(n, true) >= SupportSpacingM(n, false) {
			t.Errorf("copper %g in spaced %g m, not closer than steel %g m", n, SupportSpacingM(n, true), SupportSpacingM(n, false))
		}
	}
}

// ASME B16.5 class 150 flange OD (from memory — verify): NPS 4 is 9 in, NPS 12 is 19 in.
func TestFlangeAt(t *testing.T) {
	if got := FlangeAt(4).FlangeODmm; math.Abs(got-228.6) > 0.01 {
		t.Errorf("NPS 4 flange OD %g mm, want 228.6", got)
	}
	if got := FlangeAt(11).NominalIn; got != 12 {
		t.Errorf("NPS 11 takes the size above, got NPS %g", got)
	}
}
