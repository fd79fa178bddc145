package units

import (
	"math"
	"strconv"
	"strings"
)

// Format returns v (in SI) converted to sys and written with sensible precision for q,
// without the unit (see Label and FormatUnit):
//
//   - Length: mm as an integer, or with 1 decimal where it has one ("25", "12.7"); inches as
//     a fraction to 1/8 where exact ("1-1/2", "3/4", "2"), otherwise 2 decimals ("2.38");
//   - Temp, TempDiff, LongLength, Speed, Pressure: 1 decimal;
//   - everything else: 3 significant digits, never in exponent form ("45.3", "0.0350", "1230").
//
// A value that is not finite formats as "".
func Format(q Quantity, sys System, v float64) string {
	if !finite(v) {
		return ""
	}
	x := FromSI(q, sys, v)
	var s string
	switch q {
	case Length:
		if sys == US {
			s = formatInches(x)
		} else {
			s = fixed(x, 1)
			s = strings.TrimSuffix(s, ".0")
		}
	case Temp, TempDiff, LongLength, Speed, Pressure:
		s = fixed(x, 1)
	default:
		s = significant(x, 3)
	}
	return noNegativeZero(s)
}

// FormatUnit is Format followed by a space and the unit ("1-1/2 in", "20.0 °C").
func FormatUnit(q Quantity, sys System, v float64) string {
	s := Format(q, sys, v)
	if s == "" {
		return ""
	}
	return s + " " + Label(q, sys)
}

func fixed(x float64, decimals int) string { return strconv.FormatFloat(x, 'f', decimals, 64) }

// significant writes x with n significant digits but never drops integer digits.
func significant(x float64, n int) string {
	if x == 0 {
		return "0"
	}
	decimals := func(x float64) int {
		d := n - 1 - int(math.Floor(math.Log10(math.Abs(x))))
		return max(0, min(d, 12))
	}
	d := decimals(x)
	r, _ := strconv.ParseFloat(fixed(x, d), 64) // 9.996 → 10.00: recount the digits
	if r != 0 {
		d = decimals(r)
	}
	return fixed(x, d)
}

// formatInches writes inches as a whole number and a fraction in eighths where the value
// is a multiple of 1/8 (within 1e-6 in), otherwise with two decimals.
func formatInches(x float64) string {
	eighths := math.Round(x * 8)
	if math.Abs(x*8-eighths) > 8e-6 || math.Abs(eighths) > 1e12 {
		return fixed(x, 2)
	}
	sign := ""
	if eighths < 0 {
		sign, eighths = "-", -eighths
	}
	whole, num := int64(eighths)/8, int64(eighths)%8
	if num == 0 {
		return sign + strconv.FormatInt(whole, 10)
	}
	den := int64(8)
	for num%2 == 0 {
		num, den = num/2, den/2
	}
	frac := strconv.FormatInt(num, 10) + "/" + strconv.FormatInt(den, 10)
	if whole == 0 {
		return sign + frac
	}
	return sign + strconv.FormatInt(whole, 10) + "-" + frac
}

func noNegativeZero(s string) string {
	if strings.HasPrefix(s, "-") && strings.Trim(s[1:], "0.") == "" {
		return s[1:]
	}
	return s
}

// FormatOD writes a pipe or tube outside diameter with its unit as the dimension tables
// print it: inches to three decimals ("2.375 in", "1.900 in", ASME B36.10 and ASTM B88
// style), millimetres to one ("60.3 mm", ISO 4200 / EN 10220 style).
func FormatOD(sys System, mm float64) string {
	if !finite(mm) {
		return ""
	}
	if sys == US {
		return fixed(mm/25.4, 3) + " " + Label(Length, sys)
	}
	return fixed(mm, 1) + " " + Label(Length, sys)
}

// FormatDisplay writes v (in SI) in sys for a person to read back and edit: 1 decimal
// for temperatures and temperature differences, 3 significant digits otherwise, with
// trailing zeros dropped ("75.2", "7.61", "1.97", "2"). Forms that must store exactly
// what was saved pair it with the exact value (see handlers).
func FormatDisplay(q Quantity, sys System, v float64) string {
	if !finite(v) {
		return ""
	}
	x := FromSI(q, sys, v)
	var s string
	switch q {
	case Temp, TempDiff:
		s = fixed(x, 1)
	default:
		s = significant(x, 3)
	}
	if strings.Contains(s, ".") {
		s = strings.TrimRight(strings.TrimRight(s, "0"), ".")
	}
	return noNegativeZero(s)
}
