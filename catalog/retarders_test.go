package catalog

import "testing"

func TestRetarderLimit(t *testing.T) {
	// Common practice: ≤ 0.02 perm for chilled service, lower (≈ 0.01) below 0 °C.
	for _, c := range []struct{ opC, want float64 }{{7, 0.02}, {0, 0.02}, {-10, 0.01}, {-40, 0.01}} {
		if got, basis := RetarderLimit(c.opC); got != c.want || basis == "" {
			t.Errorf("RetarderLimit(%g) = %g %q, want %g", c.opC, got, basis, c.want)
		}
	}
	// Every closed-cell entry names a built-in material, and open-cell fibres are not in it
	// (mineral fiber passes vapour freely: a fact of the trade).
	for slug := range closedCell {
		if _, ok := MaterialBySlug(slug); !ok {
			t.Errorf("closed-cell entry %q is not a built-in material", slug)
		}
	}
	if _, ok := ClosedCellBySlug("mineral_fiber_pipe_c547_t1"); ok {
		t.Error("mineral fiber is not its own vapour retarder")
	}
}
