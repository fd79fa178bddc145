package e2e

import (
	"strings"
	"testing"

	"lagwright/handlers"
)

// TestCompareUseThickness opens the Compare screen of a demo line specified with
// 1/2 in of mineral fiber, presses "Use this thickness" on the 2 in row, and checks
// that the line now carries 2 in: on its form, on the Compare screen (the row marked
// as specified) and in the line list.
func TestCompareUseThickness(t *testing.T) {
	a := startApp(t, handlers.Config{})
	project := a.newDemoProject(t)
	p := openBrowser(t, a)

	p.open(project)
	row := `[data-testid="line-row"][data-tag="STM-207"]`
	if th := p.text(row + ` td:nth-of-type(6)`); th != "1/2" {
		t.Fatalf("STM-207 thickness in the list = %q, want 1/2 (the demo's thin line)", th)
	}
	line := run(p, "read the line's address", attr(row+` th a`, "href"))
	p.open(line + "/compare")
	if n := p.count(`.compare-table tbody tr`); n < 5 {
		t.Fatalf("compare table has %d rows, want a row per available thickness", n)
	}
	if h := p.text(`.compare-table thead`); !strings.Contains(h, "in") || !strings.Contains(h, "°F") {
		t.Errorf("compare headings %q lack the project's units (in, °F)", h)
	}
	current := `.compare-table tr.current`
	if mm := run(p, "read the current row", attr(current, "data-thickness-mm")); mm != "12.7" {
		t.Fatalf("row marked as specified is %q mm, want 12.7", mm)
	}
	two := `.compare-table tr[data-thickness-mm="50.8"]`
	if c := p.text(two + ` td:first-child`); !strings.HasPrefix(c, "2") {
		t.Errorf("the 50.8 mm row reads %q, want 2 (in)", c)
	}
	p.snapshot("before")

	got := p.submit("use 2 in", two+` [data-testid="use-thickness"]`)
	if got != line {
		t.Fatalf("use this thickness went to %s, want the line %s", got, line)
	}
	if v := p.value(`[name="layers[0].thickness_mm"]`); v != "2" {
		t.Errorf("line form thickness = %q, want 2", v)
	}

	p.open(line + "/compare")
	if mm := run(p, "read the current row", attr(current, "data-thickness-mm")); mm != "50.8" {
		t.Errorf("after use, the row marked as specified is %q mm, want 50.8", mm)
	}
	if n := p.count(current + ` [data-testid="use-thickness"]`); n != 0 {
		t.Errorf("the specified row still offers use this thickness")
	}
	p.open(project)
	if th := p.text(row + ` td:nth-of-type(6)`); th != "2" {
		t.Errorf("STM-207 thickness in the list = %q, want 2", th)
	}
}
