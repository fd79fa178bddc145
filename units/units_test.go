package units

import (
	"math"
	"strings"
	"testing"
)

func near(got, want, rel float64) bool {
	return math.Abs(got-want) <= rel*math.Max(math.Abs(want), 1e-300)
}

func TestExactFactors(t *testing.T) {
	// NIST Special Publication 811 (2008), Appendix B.8/B.9 conversion factors; the
	// published factors are rounded, so each is compared to its own published digits.
	cases := []struct {
		name      string
		got, want float64
		rel       float64
	}{
		{"inch → mm (exact)", ToSI(Length, US, 1), 25.4, 0},
		{"foot → m (exact)", ToSI(LongLength, US, 1), 0.3048, 0},
		{"Btu(IT)/h → W: 2.930 711 E-01", ToSI(HeatFlow, US, 1), 0.29307107, 1e-8},
		{"Btu(IT)·in/(h·ft²·°F) → W/(m·K): 1.442 279 E-01", ToSI(Conductivity, US, 1), 0.144227888, 1e-8},
		{"Btu(IT)/(h·ft) → W/m: 0.96152 (derived)", ToSI(HeatFlowPerLength, US, 1), 0.96152, 1e-5},
		{"Btu(IT)/(h·ft²) → W/m²: 3.154 591", ToSI(HeatFlux, US, 1), 3.154591, 1e-6},
		{"Btu(IT)/(h·ft²·°F) → W/(m²·K): 5.678 263", ToSI(SurfaceCoeff, US, 1), 5.678263, 1e-6},
		{"h·ft²·°F/Btu(IT) → m²·K/W: 1.761 102 E-01", ToSI(RValue, US, 1), 0.1761102, 1e-6},
		{"therm (100 000 Btu(IT)) → MJ: 105.5056", Therm / 1e6, 105.5056, 1e-6},
		{"MMBtu → kWh: 293.071 07", ToSI(Energy, US, 1), 293.07107, 1e-8},
		{"perm (0 °C) → kg/(Pa·s·m²): 5.721 35 E-11", Perm, 5.72135e-11, 1e-6},
		{"psi → kPa: 6.894 757", ToSI(Pressure, US, 1), 6.894757, 1e-7},
		{"mph → m/s: 0.447 04 (exact)", ToSI(Speed, US, 1), 0.44704, 1e-15},
		{"lb/h → kg/s: 1.259 979 E-04", ToSI(MassFlow, US, 1), 1.259979e-4, 1e-6},
		{"ft² → m²: 9.290 304 E-02 (exact)", ToSI(Area, US, 1), 0.09290304, 1e-15},
		{"ft³ → m³: 2.831 685 E-02", ToSI(Volume, US, 1), 0.02831685, 2e-7},
		{"°F difference → K: 5/9", ToSI(TempDiff, US, 9), 5, 1e-15},
	}
	for _, c := range cases {
		if !near(c.got, c.want, c.rel) {
			t.Errorf("%s: %.12g, want %.12g", c.name, c.got, c.want)
		}
	}
}

func TestTemperatureOffsets(t *testing.T) {
	cases := []struct {
		q        Quantity
		us, want float64
		note     string
	}{
		{Temp, 32, 0, "freezing point (exact)"},
		{Temp, 212, 100, "boiling point (exact)"},
		{Temp, -40, -40, "−40 °F = −40 °C (exact)"},
		{Temp, 140, 60, "personnel protection limit, common practice"},
		{TempDiff, 18, 10, "a difference has no offset"},
		{TempDiff, -9, -5, "negative difference"},
	}
	for _, c := range cases {
		if got := ToSI(c.q, US, c.us); !near(got, c.want, 1e-12) && math.Abs(got-c.want) > 1e-12 {
			t.Errorf("%s: ToSI(%v, US, %g) = %g, want %g", c.note, c.q, c.us, got, c.want)
		}
	}
}

func TestRoundTrips(t *testing.T) {
	for q := range quantities {
		for _, x := range []float64{-40, -1.5, 0, 0.035, 1, 25.4, 100, 12345.678, 1e9} {
			for _, sys := range []System{SI, US} {
				if got := FromSI(q, sys, ToSI(q, sys, x)); math.Abs(got-x) > 1e-12*math.Max(1, math.Abs(x)) {
					t.Errorf("%v %s: FromSI(ToSI(%g)) = %.15g", q, sys, x, got)
				}
			}
		}
		if Label(q, SI) == "" || Label(q, US) == "" || q.String() == "unknown quantity" {
			t.Errorf("quantity %d lacks labels", int(q))
		}
	}
	if got := FromSI(Length, SI, 38); got != 38 {
		t.Errorf("SI is the identity: %g", got)
	}
	if got := FromSI(Quantity(999), US, 3); got != 3 || Label(Quantity(999), US) != "" {
		t.Errorf("unknown quantity: %g %q", got, Label(Quantity(999), US))
	}
}

func TestLabels(t *testing.T) {
	cases := []struct {
		q      Quantity
		si, us string
	}{
		{Length, "mm", "in"}, {LongLength, "m", "ft"}, {Temp, "°C", "°F"}, {TempDiff, "K", "°F"},
		{HeatFlowPerLength, "W/m", "Btu/h·ft"}, {HeatFlux, "W/m²", "Btu/h·ft²"}, {HeatFlow, "W", "Btu/h"},
		{Conductivity, "W/m·K", "Btu·in/h·ft²·°F"}, {Area, "m²", "ft²"}, {Energy, "kWh", "MMBtu"},
		{Speed, "m/s", "mph"}, {SurfaceCoeff, "W/m²·K", "Btu/h·ft²·°F"}, {Pressure, "kPa", "psi"},
		{MassFlow, "kg/s", "lb/h"}, {Volume, "m³", "ft³"}, {RValue, "m²·K/W", "h·ft²·°F/Btu"},
		{Permeance, "ng/Pa·s·m²", "perm"},
	}
	for _, c := range cases {
		if Label(c.q, SI) != c.si || Label(c.q, US) != c.us {
			t.Errorf("%v: %q / %q, want %q / %q", c.q, Label(c.q, SI), Label(c.q, US), c.si, c.us)
		}
		// Every label parses back as its own unit, with a value in it.
		for _, sys := range []System{SI, US} {
			other := US
			if sys == US {
				other = SI
			}
			got, err := Parse(c.q, other, "2 "+Label(c.q, sys))
			if err != nil {
				t.Errorf("Parse(%v, %q): %v", c.q, "2 "+Label(c.q, sys), err)
			} else if want := ToSI(c.q, sys, 2); math.Abs(got-want) > 1e-12*math.Abs(want) {
				t.Errorf("Parse(%v, 2 %s) = %g, want %g", c.q, Label(c.q, sys), got, want)
			}
		}
	}
}

func TestFormat(t *testing.T) {
	cases := []struct {
		q    Quantity
		sys  System
		si   float64
		want string
	}{
		{Length, US, 38.1, "1-1/2"},
		{Length, US, 19.05, "3/4"},
		{Length, US, 50.8, "2"},
		{Length, US, 3.175, "1/8"},
		{Length, US, 28.575, "1-1/8"},
		{Length, US, 0, "0"},
		{Length, US, 60.3, "2.37"},
		{Length, US, -38.1, "-1-1/2"},
		{Length, SI, 25, "25"},
		{Length, SI, 25.04, "25"},
		{Length, SI, 12.7, "12.7"},
		{Length, SI, 60.33, "60.3"},
		{Temp, SI, 20, "20.0"},
		{Temp, US, 60, "140.0"},
		{Temp, SI, -0.01, "0.0"},
		{TempDiff, US, 10, "18.0"},
		{LongLength, US, 30.48, "100.0"},
		{HeatFlowPerLength, SI, 45.26, "45.3"},
		{HeatFlowPerLength, SI, 1234.4, "1234"},
		{HeatFlowPerLength, SI, 9.996, "10.0"},
		{HeatFlowPerLength, US, 0.96152, "1.00"},
		{Conductivity, SI, 0.035, "0.0350"},
		{Conductivity, US, 0.144227888 * 0.25, "0.250"},
		{Energy, SI, 219000, "219000"},
		{Pressure, US, 6.894757 * 150, "150.0"},
		{HeatFlux, SI, 0, "0"},
		{HeatFlux, SI, math.NaN(), ""},
		{Temp, SI, math.Inf(1), ""},
	}
	for _, c := range cases {
		if got := Format(c.q, c.sys, c.si); got != c.want {
			t.Errorf("Format(%v, %s, %g) = %q, want %q", c.q, c.sys, c.si, got, c.want)
		}
	}
	if got := FormatUnit(Length, US, 38.1); got != "1-1/2 in" {
		t.Errorf("FormatUnit = %q", got)
	}
	if got := FormatUnit(Temp, SI, 20); got != "20.0 °C" {
		t.Errorf("FormatUnit = %q", got)
	}
	// Inch fractions round-trip through Parse.
	for eighths := range 41 {
		si := float64(eighths) / 8 * 25.4
		s := Format(Length, US, si)
		back, err := Parse(Length, US, s)
		if err != nil || math.Abs(back-si) > 1e-9 {
			t.Errorf("%d/8 in: %q → %g, %v", eighths, s, back, err)
		}
	}
}

func TestParse(t *testing.T) {
	cases := []struct {
		q    Quantity
		sys  System
		in   string
		want float64 // SI
	}{
		{Length, US, "1-1/2", 38.1},
		{Length, US, "1 1/2", 38.1},
		{Length, US, "3/4", 19.05},
		{Length, US, `3/4"`, 19.05},
		{Length, US, `1-1/2 in`, 38.1},
		{Length, US, `2"`, 50.8},
		{Length, US, "1½", 38.1},
		{Length, US, "½", 12.7},
		{Length, US, "0.75", 19.05},
		{Length, US, ".5", 12.7},
		{Length, US, "25 mm", 25}, // explicit unit overrides the project's system
		{Length, US, "38mm", 38},
		{Length, SI, "38", 38},
		{Length, SI, "2 in", 50.8},
		{Length, SI, "  40  ", 40},
		{Length, SI, "+40", 40},
		{Length, SI, "0.05 m", 50},
		{Length, SI, "1e2", 100},
		{LongLength, US, "100", 30.48},
		{LongLength, SI, "100 ft", 30.48},
		{LongLength, US, "12 m", 12},
		{Temp, US, "100 °F", (100 - 32) / 1.8},
		{Temp, US, "-40F", -40},
		{Temp, US, "−40 °F", -40},
		{Temp, US, "212", 100},
		{Temp, US, "20 °C", 20},
		{Temp, US, "20C", 20},
		{Temp, SI, "20", 20},
		{Temp, SI, "300 K", 26.85},
		{Temp, SI, "68 degF", 20},
		{TempDiff, SI, "18 °F", 10},
		{TempDiff, US, "18", 10},
		{TempDiff, US, "5 K", 5},
		{HeatFlowPerLength, US, "10 Btu/h·ft", 9.6151971},
		{HeatFlowPerLength, US, "10 Btu/(hr·ft)", 9.6151971},
		{HeatFlowPerLength, US, "50 W/m", 50},
		{Conductivity, US, "0.25", 0.25 * 0.144227888},
		{Conductivity, SI, "0.25 Btu·in/h·ft²·°F", 0.25 * 0.144227888},
		{Conductivity, SI, "35 mW/m·K", 0.035},
		{Conductivity, SI, "0.035 W/mK", 0.035},
		{HeatFlow, US, "12 MBH", 12000 * 0.29307107},
		{Energy, SI, "1 MMBtu", 293.07107},
		{Energy, SI, "10 therms", 293.07107},
		{Pressure, US, "150", 150 * 6.894757293168},
		{Pressure, SI, "1 bar", 100},
		{Speed, US, "10 mph", 4.4704},
		{Area, SI, "100 sq ft", 9.290304},
		{Permeance, US, "1", 57.2135},
		{RValue, SI, "6 h·ft²·°F/Btu", 6 * 0.1761102},
		{RValue, US, "1 m²·K/W", 1},
	}
	for _, c := range cases {
		got, err := Parse(c.q, c.sys, c.in)
		if err != nil {
			t.Errorf("Parse(%v, %s, %q): %v", c.q, c.sys, c.in, err)
			continue
		}
		if math.Abs(got-c.want) > 1e-6*math.Max(1, math.Abs(c.want)) {
			t.Errorf("Parse(%v, %s, %q) = %.9g, want %.9g", c.q, c.sys, c.in, got, c.want)
		}
	}
}

func TestParseErrors(t *testing.T) {
	cases := []struct {
		q       Quantity
		sys     System
		in      string
		message string
	}{
		{Length, SI, "", "empty"},
		{Length, SI, "   ", "empty"},
		{Length, SI, "abc", "not a number"},
		{Length, SI, "NaN", "not a number"},
		{Length, SI, "Inf", "not a number"},
		{Length, SI, "1,5", "use a dot"},
		{Length, SI, "1e400", "out of range"},
		{Length, SI, "1e13", "out of range"},
		{Length, SI, "25 furlongs", "unknown unit"},
		{Length, SI, "25 W/m", "not a length unit"},
		{Temp, US, "20 mm", "not a temperature unit"},
		{Temp, SI, "-300", "absolute zero"},
		{Temp, US, "-500 F", "absolute zero"},
		{Temp, SI, "1e6", "out of range"},
		{Length, US, "1/0", "division by zero"},
		{Length, US, "1-3/2", "less than 1"},
		{Length, US, "3-4", "unknown unit"},
		{Pressure, US, "150 psig", "unknown unit"},
		{Length, System("metric"), "25", "unknown unit system"},
		{Quantity(0), SI, "25", "unknown quantity"},
	}
	for _, c := range cases {
		_, err := Parse(c.q, c.sys, c.in)
		if err == nil || !strings.Contains(err.Error(), c.message) {
			t.Errorf("Parse(%v, %s, %q): error %v, want one containing %q", c.q, c.sys, c.in, err, c.message)
		}
	}
}

func TestParseFraction(t *testing.T) {
	for _, c := range []struct {
		in   string
		want float64
	}{
		{"1-1/2", 1.5}, {"1 1/2", 1.5}, {"3/4", 0.75}, {"2", 2}, {"2.5", 2.5}, {`3/4"`, 0.75}, {"1¼", 1.25}, {"1/8", 0.125},
	} {
		if got, err := ParseFraction(c.in); err != nil || got != c.want {
			t.Errorf("ParseFraction(%q) = %g, %v; want %g", c.in, got, err, c.want)
		}
	}
	for _, bad := range []string{"", "x", "1-1/2 mm", "3/0", "1/2/3"} {
		if _, err := ParseFraction(bad); err == nil {
			t.Errorf("ParseFraction(%q): want error", bad)
		}
	}
}

func FuzzParse(f *testing.F) {
	for _, s := range []string{"1-1/2", `3/4"`, "25 mm", "-40F", "20 °C", "1e308", "½", "0.25 Btu·in/h·ft²·°F", "1 1/2 in", ""} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		for q := range quantities {
			for _, sys := range []System{SI, US} {
				v, err := Parse(q, sys, s)
				if err == nil && (math.IsNaN(v) || math.IsInf(v, 0) || math.Abs(v) > maxMagnitude) {
					t.Fatalf("Parse(%v, %s, %q) = %g", q, sys, s, v)
				}
			}
		}
		if v, err := ParseFraction(s); err == nil && (math.IsNaN(v) || math.IsInf(v, 0)) {
			t.Fatalf("ParseFraction(%q) = %g", s, v)
		}
	})
}

// TestFormatOD: outside diameters as the dimension tables print them. Source: ASME
// B36.10M, Table 1 (NPS 2 = 2.375 in, NPS 6 = 6.625 in, NPS 1-1/2 = 1.900 in, NPS 4 =
// 4.500 in; DN 50 = 60.3 mm); ASTM B88 (CTS 1 = 1.125 in).
func TestFormatOD(t *testing.T) {
	for _, c := range []struct {
		sys  System
		mm   float64
		want string
	}{
		{US, 2.375 * 25.4, "2.375 in"},
		{US, 6.625 * 25.4, "6.625 in"},
		{US, 1.9 * 25.4, "1.900 in"},
		{US, 4.5 * 25.4, "4.500 in"},
		{US, 1.125 * 25.4, "1.125 in"},
		{SI, 2.375 * 25.4, "60.3 mm"},
	} {
		if got := FormatOD(c.sys, c.mm); got != c.want {
			t.Errorf("FormatOD(%s, %g) = %q, want %q", c.sys, c.mm, got, c.want)
		}
	}
}

// TestFormatDisplay: converted defaults read as a person writes them. 3.4 m/s =
// 7.6056 mph and 0.6 m = 1.9685 ft (exact factors, NIST SP 811); 24 °C = 75.2 °F.
func TestFormatDisplay(t *testing.T) {
	for _, c := range []struct {
		q    Quantity
		sys  System
		v    float64
		want string
	}{
		{Speed, US, 3.4, "7.61"},
		{LongLength, US, 0.6, "1.97"},
		{LongLength, US, 0.3048 * 2, "2"},
		{Temp, US, 24, "75.2"},
		{Temp, US, 0, "32"},
		{Temp, SI, -0.01, "0"},
		{Speed, SI, 3.4, "3.4"},
		{HeatFlowPerLength, SI, 1234.6, "1235"},
	} {
		if got := FormatDisplay(c.q, c.sys, c.v); got != c.want {
			t.Errorf("FormatDisplay(%v, %s, %g) = %q, want %q", c.q, c.sys, c.v, got, c.want)
		}
	}
}
