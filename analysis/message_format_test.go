package analysis

import "testing"

// Numbers in warnings and assumptions are rounded for people (common practice: kPa and
// °C to 0.1, mm to 0.01), without trailing zeros; words.r writes the same as fmtRound.
func TestFmtRound(t *testing.T) {
	cases := []struct {
		v    float64
		prec int
		want string
	}{
		{689.475729, 1, "689.5"}, {790.800729, 1, "790.8"}, {1101.325, 1, "1101.3"}, {24, 1, "24"},
		{23.8888889, 1, "23.9"}, {-0.04, 1, "0"}, {-17.8, 1, "-17.8"}, {3.9116, 2, "3.91"}, {3, 2, "3"}, {170, 0, "170"},
	}
	for _, c := range cases {
		if got := fmtRound(c.v, c.prec); got != c.want {
			t.Errorf("fmtRound(%v, %d) = %q, want %q", c.v, c.prec, got, c.want)
		}
		if got := (words{}).s("x ").r(c.v, c.prec).String(); got != "x "+c.want {
			t.Errorf("words.r(%v, %d) = %q, want %q", c.v, c.prec, got, "x "+c.want)
		}
	}
}
