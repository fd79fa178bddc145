package catalog

import (
	"math"
	"strings"
	"testing"
)

func fToCTest(f float64) float64 { return (f - 32) * 5 / 9 }

// ASHRAE 90.1-2016 Tables 6.8.3-1/-2 as reproduced in docs/references.md (secondary source — verify
// against the adopted code). Columns: <1, 1–<1½, 1½–<4, 4–<8, ≥8 in nominal size.
func TestASHRAE9012016Lookup(t *testing.T) {
	tab, ok := CodeTableByID("ashrae-90.1-2016")
	if !ok {
		t.Fatal("table ashrae-90.1-2016 missing")
	}
	cases := []struct {
		name     string
		fluidF   float64
		nominal  float64
		required bool
		label    string
		col      int
		thickIn  float64
	}{
		{"NPS 2 at 180 °F: 141–200 row, 1½–<4 column", 180, 2, true, "141–200", 2, 2},
		{"50 °F chilled water NPS 2", 50, 2, true, "40–60", 2, 1},
		{"80 °F: no requirement between the ranges", 80, 2, false, "", -1, 0},
		{"60.5 °F: just above the cooling range", 60.5, 2, false, "", -1, 0},
		{"104.9 °F: just below the heating range", 104.9, 2, false, "", -1, 0},
		{"140.5 °F: 141–200 row by the contiguity rule", 140.5, 2, true, "141–200", 2, 2},
		{"140 °F: upper edge of 105–140", 140, 2, true, "105–140", 2, 1.5},
		{"105 °F: lower edge of 105–140", 105, 0.75, true, "105–140", 0, 1},
		{"200 °F edge stays in 141–200", 200, 1, true, "141–200", 1, 1.5},
		{"200.5 °F: 201–250 row", 200.5, 1, true, "201–250", 1, 2.5},
		{"250 °F, NPS 4: 201–250 row", 250, 4, true, "201–250", 3, 3},
		{"300 °F, NPS 1-1/2: 251–350 row", 300, 1.5, true, "251–350", 2, 4.5},
		{"350 °F edge stays in 251–350", 350, 0.5, true, "251–350", 0, 3},
		{"351 °F: >350 open end", 351, 0.5, true, ">350", 0, 4.5},
		{"1000 °F: >350 open end, NPS 10", 1000, 10, true, ">350", 4, 5},
		{"60 °F edge of 40–60", 60, 8, true, "40–60", 4, 1},
		{"40 °F edge of 40–60", 40, 8, true, "40–60", 4, 1},
		{"39.9 °F: <40 row", 39.9, 8, true, "<40", 4, 1.5},
		{"−40 °F brine, NPS 1: <40 open end", -40, 1, true, "<40", 1, 1},
		{"NPS 1-1/4 in the 1–<1½ column", 180, 1.25, true, "141–200", 1, 1.5},
		{"NPS 3-1/2 in the 1½–<4 column", 180, 3.5, true, "141–200", 2, 2},
		{"NPS 8 in the ≥8 column", 180, 8, true, "141–200", 4, 2},
	}
	for _, c := range cases {
		row, idx, col, req := tab.Lookup(fToCTest(c.fluidF), c.nominal)
		if req != c.required {
			t.Errorf("%s: required %v, want %v", c.name, req, c.required)
			continue
		}
		if !req {
			if row != nil || idx != -1 || col != -1 {
				t.Errorf("%s: row %v idx %d col %d with no requirement", c.name, row, idx, col)
			}
			continue
		}
		if row == nil || row.Label != c.label || col != c.col || idx < 0 || tab.Rows[idx].Label != c.label {
			t.Errorf("%s: row %+v idx %d col %d, want %s col %d", c.name, row, idx, col, c.label, c.col)
			continue
		}
		if row.ThicknessIn[col] != c.thickIn {
			t.Errorf("%s: %g in, want %g in", c.name, row.ThicknessIn[col], c.thickIn)
		}
	}
	if _, _, col, req := tab.Lookup(fToCTest(180), math.NaN()); !req || col != -1 {
		t.Errorf("NaN nominal: col %d req %v, want -1 true", col, req)
	}
	if _, _, _, req := tab.Lookup(math.NaN(), 2); req {
		t.Error("NaN temperature: required")
	}
}

// Every row and its values, as reproduced in docs/references.md (secondary source — verify).
func TestASHRAE9012016Rows(t *testing.T) {
	tab, _ := CodeTableByID("ashrae-90.1-2016")
	want := []struct {
		label      string
		service    string
		kmin, kmax float64
		mean       float64
		th         [5]float64
	}{
		{">350", "heating", 0.32, 0.34, 250, [5]float64{4.5, 5, 5, 5, 5}},
		{"251–350", "heating", 0.29, 0.31, 200, [5]float64{3, 4, 4.5, 4.5, 4.5}},
		{"201–250", "heating", 0.27, 0.30, 150, [5]float64{2.5, 2.5, 2.5, 3, 3}},
		{"141–200", "heating", 0.25, 0.29, 125, [5]float64{1.5, 1.5, 2, 2, 2}},
		{"105–140", "heating", 0.22, 0.28, 100, [5]float64{1, 1, 1.5, 1.5, 1.5}},
		{"40–60", "cooling", 0.21, 0.27, 75, [5]float64{0.5, 0.5, 1, 1, 1}},
		{"<40", "cooling", 0.20, 0.26, 50, [5]float64{0.5, 1, 1, 1, 1.5}},
	}
	if len(tab.Rows) != len(want) {
		t.Fatalf("%d rows, want %d", len(tab.Rows), len(want))
	}
	for i, w := range want {
		r := tab.Rows[i]
		if r.Label != w.label || r.Service != w.service || r.KMin != w.kmin || r.KMax != w.kmax ||
			r.MeanRatingF != w.mean || r.ThicknessIn != w.th {
			t.Errorf("row %d = %+v, want %+v", i, r, w)
		}
	}
	if tab.RefEnd != "upper" || tab.RefK(tab.Rows[3]) != 0.29 {
		t.Errorf("RefEnd %q, RefK(141–200) %g; want upper, 0.29 (90.1, from memory)", tab.RefEnd, tab.RefK(tab.Rows[3]))
	}
	lower := tab
	lower.RefEnd = "lower"
	if lower.RefK(tab.Rows[3]) != 0.25 {
		t.Errorf("RefK lower = %g, want 0.25", lower.RefK(tab.Rows[3]))
	}
	if !strings.Contains(tab.Source, "verify") || !strings.Contains(tab.Source, "251–350") {
		t.Errorf("source %q should ask to verify and note the 251–350 row", tab.Source)
	}
	// columns are contiguous and cover every size
	for j := 1; j < len(tab.Columns); j++ {
		if tab.Columns[j].MinNominalIn != tab.Columns[j-1].MaxNominalIn {
			t.Errorf("columns %d and %d not contiguous", j-1, j)
		}
	}
	if !math.IsInf(tab.Columns[4].MaxNominalIn, 1) {
		t.Error("last column not open-ended")
	}
	// rows of a service do not overlap: sweep in 0.01 °F steps
	for f := -100.0; f <= 1000; f += 0.01 {
		n := 0
		for _, r := range tab.Rows {
			if r.Contains(f) {
				n++
			}
		}
		inGap := f > 60 && f < 105
		if (inGap && n != 0) || (!inGap && n != 1) {
			t.Fatalf("%g °F lies in %d rows", f, n)
		}
	}
	if _, ok := CodeTableByID("iecc-2099"); ok {
		t.Error("found an unknown table")
	}
	// copies
	tabs := CodeTables()
	tabs[0].Rows[0].KMax = 9
	if again, _ := CodeTableByID("ashrae-90.1-2016"); again.Rows[0].KMax != 0.34 {
		t.Error("catalog changed through a returned copy")
	}
}
