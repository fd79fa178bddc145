package demo

import (
	"testing"

	"lagwright/analysis"
)

// TestDemoLinesAnalyse: every demo line analyses without field errors at the demo
// project's conditions, the list has 30–60 lines with unique tags, and the two lines
// that are wrong on purpose show it.
func TestDemoLinesAnalyse(t *testing.T) {
	set := Settings()
	if err := set.Validate(); err != nil {
		t.Fatalf("demo settings: %v", err)
	}
	lines := Lines()
	if n := len(lines); n < 30 || n > 60 {
		t.Fatalf("demo has %d lines, want 30–60", n)
	}
	seen := map[string]bool{}
	services := map[string]bool{}
	for _, l := range lines {
		if seen[l.Tag] {
			t.Errorf("tag %s used twice", l.Tag)
		}
		seen[l.Tag] = true
		services[l.Tag[:2]] = true
		eff := set.Effective(l.Location, l.Input, l.Fittings)
		out, err := analysis.Analyse(eff, analysis.CatalogResolver{})
		if err != nil {
			t.Errorf("%s: %v", l.Tag, err)
			continue
		}
		switch l.Tag {
		case "STM-207": // too hot to touch: the 60 °C limit (common practice) is exceeded
			if out.SurfaceTempC <= 60 {
				t.Errorf("STM-207 surface %.1f °C, want above the 60 °C touch limit", out.SurfaceTempC)
			}
		case "CHW-309": // condenses: margin below the 1 K default
			if out.CondensationMarginK == nil || *out.CondensationMarginK >= 1 {
				t.Errorf("CHW-309 condensation margin %v, want below 1 K", out.CondensationMarginK)
			}
		case "HHW-101", "CHW-301":
			if out.SurfaceTempC > 60 || (out.CondensationMarginK != nil && *out.CondensationMarginK < 1) {
				t.Errorf("%s should be well insulated: surface %.1f °C, margin %v", l.Tag, out.SurfaceTempC, out.CondensationMarginK)
			}
		}
	}
	for _, want := range []string{"HH", "ST", "CR", "CH", "GL", "DH", "DC", "RS", "SA"} {
		if !services[want] {
			t.Errorf("no %s… line in the demo", want)
		}
	}
	rows, mats := StoreLines(7)
	if len(rows) != len(lines) || len(mats) != len(lines) || rows[0].ProjectID != 7 || len(mats[0]) == 0 {
		t.Errorf("StoreLines: %d rows, %d material lists", len(rows), len(mats))
	}
}
