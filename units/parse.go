package units

import (
	"fmt"
	"math"
	"regexp"
	"strconv"
	"strings"
)

// unitDef converts a value in some unit to the SI unit of a quantity: SI = v·factor + offset.
type unitDef struct{ factor, offset float64 }

// accepted lists, per quantity, the unit spellings Parse accepts, normalised by normUnit
// (lower case; no spaces, degree signs, dots, dashes, parentheses; "hr" → "h"; ² → 2).
var accepted = map[Quantity]map[string]unitDef{
	Length: {
		"mm": {1, 0}, "cm": {10, 0}, "m": {1000, 0},
		"in": {lengthF, 0}, "inch": {lengthF, 0}, "inches": {lengthF, 0}, `"`: {lengthF, 0},
		"ft": {Foot * 1000, 0}, "foot": {Foot * 1000, 0}, "feet": {Foot * 1000, 0}, "'": {Foot * 1000, 0},
	},
	LongLength: {
		"m": {1, 0}, "mm": {1e-3, 0}, "cm": {1e-2, 0}, "km": {1e3, 0},
		"ft": {Foot, 0}, "foot": {Foot, 0}, "feet": {Foot, 0}, "'": {Foot, 0}, "yd": {3 * Foot, 0},
		"in": {Inch, 0}, "inch": {Inch, 0}, "inches": {Inch, 0}, `"`: {Inch, 0},
	},
	Temp: {
		"c": {1, 0}, "celsius": {1, 0},
		"f": {FahrenheitK, -32 * FahrenheitK}, "fahrenheit": {FahrenheitK, -32 * FahrenheitK},
		"k": {1, -273.15}, "kelvin": {1, -273.15},
	},
	TempDiff: {
		"k": {1, 0}, "kelvin": {1, 0}, "c": {1, 0}, "celsius": {1, 0},
		"f": {tempDiffF, 0}, "fahrenheit": {tempDiffF, 0},
	},
	HeatFlowPerLength: {
		"w/m": {1, 0}, "btu/hft": {heatFlowPerLengthF, 0}, "btuh/ft": {heatFlowPerLengthF, 0},
	},
	HeatFlux: {
		"w/m2": {1, 0}, "btu/hft2": {heatFluxF, 0}, "btuh/ft2": {heatFluxF, 0}, "btu/hsqft": {heatFluxF, 0},
	},
	HeatFlow: {
		"w": {1, 0}, "kw": {1000, 0}, "btu/h": {heatFlowF, 0}, "btuh": {heatFlowF, 0}, "mbh": {1000 * heatFlowF, 0},
	},
	Conductivity: {
		"w/mk": {1, 0}, "mw/mk": {1e-3, 0},
		"btuin/hft2f": {conductivityF, 0}, "btuin/hsqftf": {conductivityF, 0},
		"btu/hftf": {12 * conductivityF, 0},
	},
	Area: {"m2": {1, 0}, "ft2": {areaF, 0}, "sqft": {areaF, 0}, "sf": {areaF, 0}},
	Energy: {
		"kwh": {1, 0}, "mwh": {1e3, 0}, "wh": {1e-3, 0}, "mj": {1 / 3.6, 0}, "gj": {1e3 / 3.6, 0},
		"btu": {BtuIT / 3.6e6, 0}, "mmbtu": {energyF, 0}, "therm": {ThermKWh, 0}, "therms": {ThermKWh, 0},
	},
	Speed: {
		"m/s": {1, 0}, "km/h": {1 / 3.6, 0}, "kph": {1 / 3.6, 0}, "mph": {speedF, 0},
		"ft/min": {Foot / 60, 0}, "fpm": {Foot / 60, 0}, "ft/s": {Foot, 0},
	},
	SurfaceCoeff: {"w/m2k": {1, 0}, "btu/hft2f": {surfaceCoeffF, 0}, "btu/hsqftf": {surfaceCoeffF, 0}},
	Pressure: {
		"kpa": {1, 0}, "pa": {1e-3, 0}, "mpa": {1e3, 0}, "bar": {100, 0}, "psi": {pressureF, 0},
	},
	MassFlow: {
		"kg/s": {1, 0}, "kg/h": {1.0 / 3600, 0}, "lb/h": {massFlowF, 0}, "lbm/h": {massFlowF, 0},
		"lb/s": {Pound, 0}, "lbm/s": {Pound, 0},
	},
	Volume: {
		"m3": {1, 0}, "l": {1e-3, 0}, "litre": {1e-3, 0}, "liter": {1e-3, 0}, "ft3": {volumeF, 0},
		"gal": {3.785411784e-3, 0}, // US gallon, 231 in³ (NIST SP 811)
	},
	RValue:    {"m2k/w": {1, 0}, "hft2f/btu": {rValueF, 0}},
	Permeance: {"ng/pasm2": {1, 0}, "ng/m2spa": {1, 0}, "perm": {permeanceF, 0}, "perms": {permeanceF, 0}},
}

var unitReplacer = strings.NewReplacer(
	"°", "", "º", "", "˚", "", "²", "2", "³", "3", "″", `"`, "”", `"`, "“", `"`, "′", "'", "’", "'",
	" ", "", "\t", "", "·", "", "⋅", "", "•", "", "*", "", "(", "", ")", "", "-", "", ".", "",
	"hrs", "h", "hr", "h", "deg", "",
)

func normUnit(s string) string { return unitReplacer.Replace(strings.ToLower(strings.TrimSpace(s))) }

var fractionReplacer = strings.NewReplacer(
	"½", " 1/2", "¼", " 1/4", "¾", " 3/4", "⅛", " 1/8", "⅜", " 3/8", "⅝", " 5/8", "⅞", " 7/8", "⁄", "/",
	"−", "-", "–", "-",
)

// numberRE matches a leading number: a mixed number (1-1/2, 1 1/2), a fraction (3/4) or a
// decimal with a dot and an optional exponent (2, 0.75, .5, 1e3).
var numberRE = regexp.MustCompile(`^([+-]?)\s*(?:(\d+)\s*(?:-|\s)\s*(\d+)\s*/\s*(\d+)|(\d+)\s*/\s*(\d+)|((?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?))`)

// maxMagnitude bounds any parsed SI value; temperatures have tighter limits.
const maxMagnitude = 1e12

// parseNumber reads the leading number of s and returns it with the rest of s.
func parseNumber(s string) (float64, string, error) {
	orig := s
	s = strings.TrimSpace(fractionReplacer.Replace(s))
	if s == "" {
		return 0, "", fmt.Errorf("empty value")
	}
	m := numberRE.FindStringSubmatch(s)
	if m == nil {
		return 0, "", fmt.Errorf("not a number: %q", orig)
	}
	rest := s[len(m[0]):]
	num := func(d string) float64 { v, _ := strconv.ParseFloat(d, 64); return v } // digits only: cannot fail
	var v float64
	switch {
	case m[2] != "": // mixed number
		n, d := num(m[3]), num(m[4])
		if d == 0 {
			return 0, "", fmt.Errorf("not a number: %q (division by zero)", orig)
		}
		if n >= d {
			return 0, "", fmt.Errorf("not a number: %q (the fraction of a mixed number must be less than 1)", orig)
		}
		v = num(m[2]) + n/d
	case m[5] != "": // fraction
		d := num(m[6])
		if d == 0 {
			return 0, "", fmt.Errorf("not a number: %q (division by zero)", orig)
		}
		v = num(m[5]) / d
	default:
		var err error
		if v, err = strconv.ParseFloat(m[7], 64); err != nil && !strings.Contains(err.Error(), "range") {
			return 0, "", fmt.Errorf("not a number: %q", orig)
		}
	}
	if m[1] == "-" {
		v = -v
	}
	if strings.HasPrefix(rest, ",") {
		return 0, "", fmt.Errorf("not a number: %q (use a dot for decimals and no thousands separators)", orig)
	}
	if !finite(v) || math.Abs(v) > maxMagnitude {
		return 0, "", fmt.Errorf("number out of range: %q", orig)
	}
	return v, strings.TrimSpace(rest), nil
}

// Parse reads a value of quantity q typed in a project whose system is sys and returns it
// in SI (the unit Label(q, SI) gives).
//
// It accepts plain numbers, decimals with a dot, fractions and mixed numbers ("3/4",
// "1-1/2", "1 1/2", "1½"), optionally followed by a unit ("3/4\"", "1-1/2 in", "25 mm",
// "38mm", "100 °F", "-40F", "20 °C", "20C", "150 W/m", "0.25 Btu·in/h·ft²·°F"). A unit that
// fits q overrides the project's system ("25 mm" in a US project is 25 mm); a bare number
// is in the project's unit. Unknown or incompatible units, empty strings, NaN, infinities,
// temperatures below absolute zero and absurd magnitudes are errors.
func Parse(q Quantity, sys System, s string) (float64, error) {
	qi, ok := quantities[q]
	if !ok {
		return 0, fmt.Errorf("unknown quantity %d", int(q))
	}
	if !sys.Valid() {
		return 0, fmt.Errorf("unknown unit system %q", string(sys))
	}
	v, rest, err := parseNumber(s)
	if err != nil {
		return 0, err
	}
	var si float64
	if rest == "" {
		si = ToSI(q, sys, v)
	} else {
		u, ok := accepted[q][normUnit(rest)]
		if !ok {
			for other, units := range accepted {
				if _, known := units[normUnit(rest)]; known && other != q {
					return 0, fmt.Errorf("unit %q is not a %s unit (use %s or %s)", rest, qi.name, qi.siUnit, qi.usUnit)
				}
			}
			return 0, fmt.Errorf("unknown unit %q for %s (use %s or %s)", rest, qi.name, qi.siUnit, qi.usUnit)
		}
		si = v*u.factor + u.offset
	}
	switch {
	case !finite(si) || math.Abs(si) > maxMagnitude:
		return 0, fmt.Errorf("%s out of range: %q", qi.name, s)
	case q == Temp && si < -273.15:
		return 0, fmt.Errorf("temperature below absolute zero: %q", s)
	case (q == Temp || q == TempDiff) && math.Abs(si) > 1e4:
		return 0, fmt.Errorf("%s out of range: %q", qi.name, s)
	}
	return si, nil
}

// ParseFraction reads a plain number such as a nominal size: "2", "1.5", "3/4", "1-1/2",
// "1 1/2", "1½", optionally with a trailing inch mark ("3/4\""). Any other text is an error.
func ParseFraction(s string) (float64, error) {
	v, rest, err := parseNumber(s)
	if err != nil {
		return 0, err
	}
	if rest != "" && rest != `"` && rest != "″" {
		return 0, fmt.Errorf("not a number: %q (unexpected %q)", s, rest)
	}
	return v, nil
}
