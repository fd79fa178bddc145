package web

import (
	"bytes"
	"context"
	"math"
	"regexp"
	"strconv"
	"strings"
	"testing"
)

// TestLineChartTrueNumericAxis: 25, 40, 50 and 65 mm sit at distances proportional to
// their values (15 : 10 : 15), not evenly spaced, in the scale and in the drawn SVG.
func TestLineChartTrueNumericAxis(t *testing.T) {
	xs := []float64{25, 40, 50, 65}
	v := LineChartView{ID: "t", Title: "t", XLabel: "thickness, mm", YLabel: "W/m",
		Series:  []ChartSeries{{Name: "a", Points: []ChartPoint{{25, 40}, {40, 30}, {50, 26}, {65, 22}}}},
		Markers: []ChartMarker{{X: 50, Label: "economic", Strong: true}}}
	x := v.XScale()
	for i := 1; i < len(xs)-1; i++ {
		got := (x.Pos(xs[i+1]) - x.Pos(xs[i])) / (x.Pos(xs[i]) - x.Pos(xs[i-1]))
		want := (xs[i+1] - xs[i]) / (xs[i] - xs[i-1])
		if math.Abs(got-want) > 1e-9 {
			t.Errorf("spacing ratio after %g mm = %g, want %g", xs[i], got, want)
		}
	}
	if x.Pos(0) != x.From {
		t.Errorf("0 at %g, want the left of the axis %g", x.Pos(0), x.From)
	}

	var buf bytes.Buffer
	if err := LineChart(v).Render(context.Background(), &buf); err != nil {
		t.Fatal(err)
	}
	svg := buf.String()
	// The drawn points: circles carry their x value.
	re := regexp.MustCompile(`<circle cx="([0-9.]+)" cy="[0-9.]+" r="3.8" data-x="([0-9.]+)"`)
	px := map[float64]float64{}
	for _, m := range re.FindAllStringSubmatch(svg, -1) {
		p, _ := strconv.ParseFloat(m[1], 64)
		val, _ := strconv.ParseFloat(m[2], 64)
		px[val] = p
	}
	if len(px) != 4 {
		t.Fatalf("drew %d points: %v", len(px), px)
	}
	for i := 1; i < len(xs); i++ {
		perUnit := (px[xs[i]] - px[xs[0]]) / (xs[i] - xs[0])
		first := (px[xs[1]] - px[xs[0]]) / (xs[1] - xs[0])
		if math.Abs(perUnit-first) > 0.02 { // SVG coordinates carry 0.1 px
			t.Errorf("%g mm: %.3f px per mm, %.3f for the first interval", xs[i], perUnit, first)
		}
	}
	// Numeric ticks and labelled axes and markers.
	for _, want := range []string{`class="tick x-tick"`, `data-value="0"`, `>thickness, mm</text>`, `>economic</text>`, `<title id="t-title">`} {
		if !strings.Contains(svg, want) {
			t.Errorf("SVG lacks %q", want)
		}
	}
}

func TestNiceScale(t *testing.T) {
	for _, c := range []struct {
		lo, hi   float64
		n        int
		zero     bool
		min, max float64
		ticks    int
	}{
		{25.4, 152.4, 8, true, 0, 160, 9},    // step 20
		{25.4, 152.4, 6, true, 0, 200, 5},    // step 50
		{12, 87, 8, false, 10, 90, 9},        // step 10
		{0.2, 0.9, 6, true, 0, 1, 11},        // step 0.1
		{1000, 1000, 6, false, 900, 1100, 5}, // a flat series gets a range
		{-40, 60, 6, false, -40, 60, 6},      // step 20
	} {
		s := NiceScale(c.lo, c.hi, c.n, c.zero, 0, 100)
		if s.Min > c.lo || s.Max < c.hi || math.Abs(s.Min-c.min) > 1e-9 || math.Abs(s.Max-c.max) > 1e-9 {
			t.Errorf("NiceScale(%g, %g) = %g … %g, want %g … %g", c.lo, c.hi, s.Min, s.Max, c.min, c.max)
		}
		if len(s.Ticks) < 3 || len(s.Ticks) > 12 || s.Ticks[0] != s.Min || s.Ticks[len(s.Ticks)-1] != s.Max {
			t.Errorf("NiceScale(%g, %g) ticks %v", c.lo, c.hi, s.Ticks)
		}
	}
}

func TestBarChartLengthsProportional(t *testing.T) {
	v := BarChartView{ID: "b", Title: "energy", XLabel: "kWh/year",
		Bars: []Bar{{"steam", 30000, "30 000 kWh"}, {"hot water", 10000, "10 000 kWh"}, {"chilled water", 5000, "5 000 kWh"}}}
	var buf bytes.Buffer
	if err := BarChart(v).Render(context.Background(), &buf); err != nil {
		t.Fatal(err)
	}
	re := regexp.MustCompile(`<rect x="[0-9.]+" y="[0-9.]+" width="([0-9.]+)"`)
	var w []float64
	for _, m := range re.FindAllStringSubmatch(buf.String(), -1) {
		f, _ := strconv.ParseFloat(m[1], 64)
		w = append(w, f)
	}
	if len(w) != 3 || math.Abs(w[0]/w[1]-3) > 0.01 || math.Abs(w[0]/w[2]-6) > 0.02 {
		t.Errorf("bar widths %v, want 3 : 1 : 0.5", w)
	}
}
