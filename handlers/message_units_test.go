package handlers

import (
	"testing"

	"lagwright/units"
)

// US values are from the exact factors of NIST SP 811 Appendix B (°F = °C × 9/5 + 32 for
// temperatures, × 9/5 alone for differences; 1 in = 25.4 mm; 1 ft = 0.3048 m;
// 1 psi = 6.894 757 kPa; 1 Btu/h·ft = 0.961 52 W/m), worked by hand and rounded as shown.
func TestWithUSValues(t *testing.T) {
	cases := []struct {
		name string
		sys  units.System
		in   string
		want string
	}{
		{"temperature with offset, and a range", units.US,
			"Carbon steel at 170 °C lies in the usual range for corrosion under insulation (-4 to 175 °C): coat the pipe",
			"Carbon steel at 170 °C (338 °F) lies in the usual range for corrosion under insulation (-4 to 175 °C (24.8 to 347 °F)): coat the pipe"},
		{"ambient at the end of the text", units.US,
			"surroundings at the ambient temperature 24 °C",
			"surroundings at the ambient temperature 24 °C (75.2 °F)"},
		{"negative temperatures; -0.04 °F shows as 0", units.US,
			"layer 1 (Mineral fiber) reaches -19.4 °C, below its service limit of -17.8 °C",
			"layer 1 (Mineral fiber) reaches -19.4 °C (-2.9 °F), below its service limit of -17.8 °C (0 °F)"},
		{"range with an ellipsis and minus signs", units.US,
			"air properties extrapolated beyond their checked range −50…400 °C (film 25 °C)",
			"air properties extrapolated beyond their checked range −50…400 °C (−58…752 °F) (film 25 °C (77 °F))"},
		{"temperature difference without offset", units.US,
			"no available thickness keeps the temperature change within 5 K; raise the flow",
			"no available thickness keeps the temperature change within 5 K (9 °F); raise the flow"},
		{"wall thickness in mm", units.US,
			"NPS 2, schedule 40 wall (default) 3.91 mm",
			"NPS 2, schedule 40 wall (default) 3.91 mm (0.154 in)"},
		{"pressures, absolute and gauge; the IF97 name is not a number", units.US,
			"saturated steam at 689.5 kPa gauge (790.8 kPa absolute at sea-level atmosphere 101.325 kPa): 170 °C (IAPWS-IF97)",
			"saturated steam at 689.5 kPa (100 psi) gauge (790.8 kPa (114.7 psi) absolute at sea-level atmosphere 101.325 kPa (14.7 psi)): 170 °C (338 °F) (IAPWS-IF97)"},
		{"length in m inside brackets", units.US,
			"temperature change marched in 10 segments over the length plus fittings (12.0 m), at the design conditions",
			"temperature change marched in 10 segments over the length plus fittings (12.0 m (39.4 ft)), at the design conditions"},
		{"heat flow per length", units.US,
			"no available thickness keeps the heat flow at or below 10 W/m.",
			"no available thickness keeps the heat flow at or below 10 W/m (10.4 Btu/h·ft)."},
		{"compound units and names are left alone", units.US,
			"layer 1: constant k 0.04 W/m·K at every temperature; still air (wind 0 m/s); 12 W/m² flux; ASTM C680; row's 0.21–0.27, so",
			"layer 1: constant k 0.04 W/m·K at every temperature; still air (wind 0 m/s); 12 W/m² flux; ASTM C680; row's 0.21–0.27, so"},
		{"US values already given are left alone", units.US,
			"energy code: k 0.280 Btu·in/h·ft²·°F at 75 °F lies outside the row's 0.21–0.27",
			"energy code: k 0.280 Btu·in/h·ft²·°F at 75 °F lies outside the row's 0.21–0.27"},
		{"SI project: unchanged", units.SI,
			"Carbon steel at 170 °C lies in the usual range (-4 to 175 °C)",
			"Carbon steel at 170 °C lies in the usual range (-4 to 175 °C)"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			if got := withUSValues(c.sys, c.in); got != c.want {
				t.Errorf("withUSValues(%s, %q)\n got  %q\n want %q", c.sys, c.in, got, c.want)
			}
		})
	}
}

// TestCodeRowIn: an SI project reads the energy-code row in °C, with the table's °F row
// beside it (ASHRAE 90.1-2016 Table 6.8.3-2 prints its rows in °F; °C = (°F − 32)·5/9).
func TestCodeRowIn(t *testing.T) {
	for _, c := range []struct {
		sys       units.System
		row, want string
	}{
		{units.SI, "cooling 40–60 °F", "cooling 4.4–15.6 °C (table row 40–60 °F)"},
		{units.SI, "cooling <40 °F", "cooling <4.4 °C (table row <40 °F)"},
		{units.SI, "heating >350 °F", "heating >176.7 °C (table row >350 °F)"},
		{units.US, "cooling 40–60 °F", "cooling 40–60 °F"},
	} {
		if got := codeRowIn(c.sys, c.row); got != c.want {
			t.Errorf("codeRowIn(%s, %q) = %q, want %q", c.sys, c.row, got, c.want)
		}
	}
}
