package handlers

import (
	"bytes"
	"context"
	"strings"
	"testing"

	"lagwright/units"
	"lagwright/web"
)

// TestLineThicknessText: the catalog's inch series, stored in mm rounded to 0.01 mm,
// read as the eighths they stand for in US units (common practice: 3/8, 1/2, 3/4 in
// elastomeric; 1-1/2 in pipe section); other values are shown as they are.
func TestLineThicknessText(t *testing.T) {
	for _, c := range []struct {
		sys  units.System
		mm   float64
		want string
	}{
		{units.US, 9.52, "3/8"}, // 3/8 in = 9.525 mm, stored as 9.52
		{units.US, 9.53, "3/8"},
		{units.US, 19.05, "3/4"},
		{units.US, 38.1, "1-1/2"},
		{units.US, 10, "0.39"}, // a 10 mm blanket is not an inch size
		{units.US, 9.4, "0.37"},
		{units.SI, 9.52, "9.5"},
	} {
		if got := units.Format(units.Length, c.sys, thicknessMM(c.sys, c.mm)); got != c.want {
			t.Errorf("%s %g mm = %q, want %q", c.sys, c.mm, got, c.want)
		}
	}
}

// TestLineSortByStatus: sorting by status orders lines by their worst flag, the most
// severe first (input problem, too hot, condensation, below code, unmet, fails a check, ok).
func TestLineSortByStatus(t *testing.T) {
	rows := []listRow{}
	for _, keys := range [][]string{{StatusOK}, {StatusFails}, {StatusBelowCode, StatusFails}, {StatusInputIssue}, {StatusOK, StatusTooHot}, {StatusCondenses}} {
		rank := float64(worstRank(keys))
		rows = append(rows, listRow{view: web.LineRow{Tag: keys[len(keys)-1]}, num: map[string]*float64{"status": &rank}, str: map[string]string{}})
	}
	for _, c := range []struct{ key, want string }{
		{"status", "input too_hot condenses fails fails ok"},
		{"-status", "ok fails fails condenses too_hot input"},
	} {
		sortLineRows(rows, c.key)
		var got []string
		for _, r := range rows {
			got = append(got, r.view.Tag)
		}
		if strings.Join(got, " ") != c.want {
			t.Errorf("sort=%s: %v, want %s", c.key, got, c.want)
		}
	}
}

// TestProjectPageLineCount: "1 line", "2 lines" in the heading and the totals.
func TestProjectPageLineCount(t *testing.T) {
	for _, c := range []struct {
		n    int
		want string
	}{{1, "1 line"}, {2, "2 lines"}} {
		v := web.ProjectPageView{Name: "P", UnitsName: "SI", LineCount: c.n}
		for range c.n {
			v.Rows = append(v.Rows, web.LineRow{Tag: "T"})
		}
		var b bytes.Buffer
		if err := web.ProjectPage(v).Render(context.Background(), &b); err != nil {
			t.Fatal(err)
		}
		html := b.String()
		if !strings.Contains(html, "· "+c.want+"<") || !strings.Contains(html, "Totals ("+c.want+")") || strings.Contains(html, "1 lines") {
			t.Errorf("%d lines: heading or totals lack %q", c.n, c.want)
		}
	}
}
