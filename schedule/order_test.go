package schedule

import (
	"math"
	"slices"
	"testing"

	"lagwright/units"
)

// Sizes order by kind (NPS, DN, CTS, OD, ducts, flat) and numerically within a kind
// (common practice for take-off lists: smallest first).
func TestSizeOrder(t *testing.T) {
	want := []string{"NPS 1/2", "NPS 3/4", "NPS 1", "NPS 1-1/2", "NPS 2", "NPS 2-1/2", "NPS 10", "DN 15", "DN 50", "DN 100",
		"CTS 3/4", "CTS 1", "CTS 1-1/2", "OD 2-3/8 in", "OD 60.3 mm", "24 × 12 in", "30 × 16 in", "30 × 20 in", "48 × 24 in",
		"flat surface", "tank"}
	got := slices.Clone(want)
	slices.Reverse(got)
	slices.SortFunc(got, func(a, b string) int { return compareSizes(sizeKey(a), sizeKey(b)) })
	if !slices.Equal(got, want) {
		t.Errorf("sorted sizes\n got  %q\n want %q", got, want)
	}
}

// The material totals list material, then size, then thickness, each ascending.
func TestMaterialTotalsOrder(t *testing.T) {
	for _, sys := range []units.System{units.SI, units.US} {
		v := NewView(fixtureSchedule(t, sys))
		for i := 1; i < len(v.ByMaterial.Rows); i++ {
			a, b := v.ByMaterial.Rows[i-1], v.ByMaterial.Rows[i]
			if compareGroups(a[0].Text, sizeKey(a[2].Text), a[3].Num, b[0].Text, sizeKey(b[2].Text), b[3].Num) > 0 {
				t.Errorf("%s: %q %q %v listed before %q %q %v", sys, a[0].Text, a[2].Text, a[3].Num, b[0].Text, b[2].Text, b[3].Num)
			}
		}
		sc := fixtureSchedule(t, sys)
		for i := 1; i < len(sc.Totals.ByMaterial); i++ {
			a, b := sc.Totals.ByMaterial[i-1], sc.Totals.ByMaterial[i]
			if compareGroups(a.Material, sizeKey(a.Size), a.ThicknessMM, b.Material, sizeKey(b.Size), b.ThicknessMM) > 0 {
				t.Errorf("%s: SI totals list %q %q before %q %q", sys, a.Material, a.Size, b.Material, b.Size)
			}
		}
	}
}

func TestGroupThousands(t *testing.T) {
	const s = ThousandsSep
	cases := []struct{ in, want string }{
		{"0.00", "0.00"}, {"999", "999"}, {"2204", "2" + s + "204"}, {"16079.03", "16" + s + "079.03"},
		{"-28120", "-28" + s + "120"}, {"1234567.5", "1" + s + "234" + s + "567.5"}, {"NPS 2", "NPS 2"}, {"", ""},
	}
	for _, c := range cases {
		if got := GroupThousands(c.in); got != c.want {
			t.Errorf("GroupThousands(%q) = %q, want %q", c.in, got, c.want)
		}
	}
	if got := (Cell{IsNum: true, Num: 33782}).Display(0); got != "33"+s+"782" {
		t.Errorf("Display of 33782 = %q", got)
	}
	if got := (Cell{Text: "1234"}).Display(0); got != "1234" {
		t.Errorf("a text cell is grouped: %q", got)
	}
}

// The surface under the insulation: π·D·L for a pipe, perimeter × L for a duct, the
// given area for a flat surface (geometry, worked by hand).
func TestSurfaceArea(t *testing.T) {
	f := func(v float64) *float64 { return &v }
	cases := []struct {
		name string
		r    Row
		want *float64
	}{
		{"pipe NPS 4, 53.4 m", Row{Geometry: "pipe", PipeODmm: f(114.3), InsulatedM: f(53.4)}, f(math.Pi * 0.1143 * 53.4)},
		{"duct 800 × 400 mm, 25 m", Row{Geometry: "duct", DuctWmm: f(800), DuctHmm: f(400), InsulatedM: f(25)}, f(60)},
		{"flat 6 m²", Row{Geometry: "flat", AreaM2: f(6)}, f(6)},
		{"pipe not computed (no OD)", Row{Geometry: "pipe", InsulatedM: f(10)}, nil},
		{"pipe without a length", Row{Geometry: "pipe", PipeODmm: f(60.3)}, nil},
	}
	for _, c := range cases {
		got := c.r.SurfaceAreaM2()
		switch {
		case got == nil && c.want == nil:
		case got == nil || c.want == nil || math.Abs(*got-*c.want) > 1e-9:
			t.Errorf("%s: surface area %v, want %v", c.name, got, c.want)
		}
	}
}

// Hot lines' loss and cold lines' gain are totalled apart, in SI and as shown, and the
// shown surface-area total is the sum of the shown rows.
func TestGrandLossAndGain(t *testing.T) {
	for _, sys := range []units.System{units.SI, units.US} {
		sc := fixtureSchedule(t, sys)
		var loss, gain float64
		for _, r := range sc.Rows {
			if r.HeatFlowW != nil && *r.HeatFlowW >= 0 {
				loss += *r.HeatFlowW
			} else if r.HeatFlowW != nil {
				gain -= *r.HeatFlowW
			}
		}
		g := sc.Totals.Grand
		if loss == 0 || gain == 0 || math.Abs(g.HeatLossW-loss) > 1e-9 || math.Abs(g.HeatGainW-gain) > 1e-9 {
			t.Errorf("%s: SI loss %g gain %g, rows give %g and %g", sys, g.HeatLossW, g.HeatGainW, loss, gain)
		}
		v := NewView(sc)
		iHF, iArea := ColumnIndex("heat_flow"), ColumnIndex("area")
		var sLoss, sGain, sArea float64
		for _, row := range v.Rows.Rows {
			if !row[iHF].Blank {
				if q := row[iHF].Num; q >= 0 {
					sLoss += q
				} else {
					sGain -= q
				}
			}
			if !row[iArea].Blank {
				sArea += row[iArea].Num
			}
		}
		gr := v.Grand.Rows[0]
		if gr[6].Num != sLoss || gr[7].Num != sGain {
			t.Errorf("%s: shown loss %v gain %v, rows give %v and %v", sys, gr[6].Num, gr[7].Num, sLoss, sGain)
		}
		if sArea == 0 || gr[3].Num != round(sArea, v.Grand.Columns[3].Decimals) {
			t.Errorf("%s: shown surface area %v, rows give %v", sys, gr[3].Num, sArea)
		}
	}
}
