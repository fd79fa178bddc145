package handlers

import (
	"regexp"
	"strconv"
	"strings"

	"lagwright/units"
)

// The analysis writes its warnings and assumptions in SI ("Carbon steel at 170 °C lies
// in the usual range for corrosion under insulation (-4 to 175 °C)"). A US project's
// pages show them with the US value added in brackets after each quantity they
// recognise: "170 °C (338 °F)", "(-4 to 175 °C (24.8 to 347 °F))", "3.91 mm (0.154 in)".
// Temperatures convert with the offset; temperature differences (K) without.

// messageQuantity finds "<number> <unit>" and "<number> to <number> <unit>" (also with
// "–" or "…" between) for the SI units the analysis writes. The number must not follow
// a letter, digit, point or slash (so "IF97" or "C680" are not read), and the unit must
// end at a space, punctuation or the end of the text (so "W/m·K", "m/s" and "m²" are
// not read as W/m or m).
var messageQuantity = regexp.MustCompile(
	`(^|[^\w.·/])([-−]?\d+(?:\.\d+)?)(?:(\s+to\s+|\s*[–…]\s*)([-−]?\d+(?:\.\d+)?))?\s(°C|K|mm|m|kPa|W/m)($|[\s,;:.)\]])`)

// messageUnits maps the SI unit written in a message to its quantity and the decimals
// of the US value.
var messageUnits = map[string]struct {
	q        units.Quantity
	decimals int
}{
	"°C":  {units.Temp, 1},
	"K":   {units.TempDiff, 1},
	"mm":  {units.Length, 3},
	"m":   {units.LongLength, 1},
	"kPa": {units.Pressure, 1},
	"W/m": {units.HeatFlowPerLength, 1},
}

// withUSValues adds the US value after each SI quantity of msg for a US project; any
// other system returns msg unchanged.
func withUSValues(sys units.System, msg string) string {
	if sys != units.US {
		return msg
	}
	return messageQuantity.ReplaceAllStringFunc(msg, func(m string) string {
		p := messageQuantity.FindStringSubmatch(m)
		lead, a, sep, b, unit, tail := p[1], p[2], p[3], p[4], p[5], p[6]
		u := messageUnits[unit]
		conv := func(s string) (string, bool) {
			v, err := strconv.ParseFloat(strings.Replace(s, "−", "-", 1), 64)
			if err != nil {
				return "", false
			}
			out := roundTrim(units.FromSI(u.q, units.US, v), u.decimals)
			if strings.HasPrefix(s, "−") {
				out = strings.Replace(out, "-", "−", 1)
			}
			return out, true
		}
		us, ok := conv(a)
		if !ok {
			return m
		}
		if b != "" {
			ub, ok := conv(b)
			if !ok {
				return m
			}
			us += sep + ub
		}
		return lead + m[len(lead):len(m)-len(tail)] + " (" + us + " " + units.Label(u.q, units.US) + ")" + tail
	})
}

// withUSValuesAll is withUSValues over a list, in a new slice.
func withUSValuesAll(sys units.System, msgs []string) []string {
	if sys != units.US || msgs == nil {
		return msgs
	}
	out := make([]string, len(msgs))
	for i, m := range msgs {
		out[i] = withUSValues(sys, m)
	}
	return out
}

// roundTrim writes v with at most decimals decimals, without trailing zeros and
// without a negative zero.
func roundTrim(v float64, decimals int) string {
	s := strconv.FormatFloat(v, 'f', decimals, 64)
	if strings.Contains(s, ".") {
		s = strings.TrimSuffix(strings.TrimRight(s, "0"), ".")
	}
	if s == "-0" {
		return "0"
	}
	return s
}

// codeRowF finds the °F temperatures of an energy-code row label ("cooling 40–60 °F",
// "heating >350 °F", "cooling <40 °F").
var codeRowF = regexp.MustCompile(`([<>≤≥]?)(-?\d+(?:\.\d+)?)(?:–(-?\d+(?:\.\d+)?))? °F`)

// codeRowIn writes an energy-code row (the tables are in °F) in the project's units: an SI
// project reads "cooling 4.4–15.6 °C (table row 40–60 °F)"; a US one reads it as printed.
func codeRowIn(sys units.System, row string) string {
	if sys == units.US {
		return row
	}
	m := codeRowF.FindStringSubmatchIndex(row)
	if m == nil {
		return row
	}
	c := func(f string) string {
		v, _ := strconv.ParseFloat(f, 64)
		return units.Format(units.Temp, units.SI, (v-32)*5/9)
	}
	si := row[m[2]:m[3]] + c(row[m[4]:m[5]])
	if m[6] >= 0 {
		si += "–" + c(row[m[6]:m[7]])
	}
	return row[:m[0]] + si + " °C (table row " + row[m[0]:m[1]] + ")" + row[m[1]:]
}
