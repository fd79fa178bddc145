package e2e

import (
	"fmt"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/chromedp/chromedp"

	"lagwright/handlers"
)

// The live results of the line form: htmx posts the form on input (300 ms debounce)
// and swaps #results.
const (
	resultsSurface = `[data-testid="results"] [data-testid="r-surface-temp"] td`
	// quiet is true when no request of the line form is in flight.
	quiet = `!document.querySelector("form.line-form").classList.contains("htmx-request")`
)

var fahrenheit = regexp.MustCompile(`^(-?[0-9]+(?:\.[0-9]+)?) °F$`)

// degF reads a temperature shown as "72.3 °F"; the unit must be there.
func degF(t *testing.T, what, s string) float64 {
	t.Helper()
	m := fahrenheit.FindStringSubmatch(s)
	if m == nil {
		t.Fatalf("%s = %q, want a temperature in °F", what, s)
	}
	v, _ := strconv.ParseFloat(m[1], 64)
	return v
}

// settle waits until the line form has no request in flight and the results have
// not been swapped for longer than htmx's debounce, so a read sees the answer to
// the last input.
func (p *page) settle() {
	p.t.Helper()
	p.waitFor("the live results settle", `(() => {
		const now = Date.now();
		if (!window.__e2eSwaps) {
			window.__e2eSwaps = {n: 0, at: now};
			document.body.addEventListener("htmx:afterSettle", () => { window.__e2eSwaps.n++; window.__e2eSwaps.at = Date.now(); });
			document.body.addEventListener("htmx:beforeRequest", () => { window.__e2eSwaps.at = Date.now(); });
			document.body.addEventListener("input", () => { window.__e2eSwaps.at = Date.now(); });
			return false;
		}
		return `+quiet+` && now - window.__e2eSwaps.at > 700;
	})()`)
}

// TestLineLiveResults adds a line through the line form (NPS 2 chilled water at
// 44 °F, 1-1/2" flexible elastomeric, PVC jacket) in a US project, watches the live
// results follow a change of thickness without a page load, saves, and finds the
// line in the project's line list.
func TestLineLiveResults(t *testing.T) {
	a := startApp(t, handlers.Config{})
	id := a.newUSProject(t, "Cooling plant")
	p := openBrowser(t, a)

	p.open(fmt.Sprintf("/projects/%d", id))
	if got := p.submit("click Add a line", `[data-testid="add-line"]`); got != fmt.Sprintf("/projects/%d/lines/new", id) {
		t.Fatalf("Add a line went to %s", got)
	}
	p.settle() // installs the swap counter before any input
	p.typeInto(`#tag`, "CHW-101")
	p.typeInto(`#service`, "Chilled water supply")
	p.choose(`#pipe_size`, "NPS 2")
	p.choose(`#fluid`, "water")
	p.typeInto(`#operating_temp_c`, "44")
	p.typeInto(`#length_m`, "120")
	p.choose(`[name="layers[0].material"]`, "elastomeric_c534_gr1")
	p.typeInto(`[name="layers[0].thickness_mm"]`, "1-1/2")
	p.choose(`#jacket`, "pvc_jacket")
	if u := p.text(`label[for="operating_temp_c"] + .with-unit .unit`); u != "°F" {
		t.Errorf("operating temperature unit = %q, want °F", u)
	}

	p.waitFor("the results are computed", `document.querySelector(`+jsString(resultsSurface)+`) !== null`)
	p.settle()
	before := p.text(resultsSurface)
	tBefore := degF(t, "surface temperature at 1-1/2 in", before)
	if th := p.text(`[data-testid="results"] .results-table caption + thead + tbody td:nth-child(2)`); th != "1-1/2 in" {
		t.Errorf("layer thickness in the results = %q, want 1-1/2 in", th)
	}

	// Mark the panel, type a thinner insulation, and wait for htmx to replace it.
	run(p, "mark the results", chromedp.Evaluate[chromedp.Void](`document.querySelector('[data-testid="results"] h2').dataset.e2eOld = "1"`))
	p.typeInto(`[name="layers[0].thickness_mm"]`, "1/2")
	p.waitFor("htmx swaps the results", `!document.querySelector('[data-testid="results"] [data-e2e-old]')`)
	p.settle()
	after := p.text(resultsSurface)
	tAfter := degF(t, "surface temperature at 1/2 in", after)
	if after == before {
		t.Fatalf("surface temperature stayed %q after the thickness changed", after)
	}
	// A cold line: thinner insulation leaves its surface colder, between the fluid and
	// the air (common practice: the surface lies between the two).
	if !(tAfter < tBefore) || tAfter <= 44 || tBefore >= 75.2 {
		t.Errorf("surface temperature %v °F at 1/2 in, %v °F at 1-1/2 in: want 44 < 1/2 in < 1-1/2 in < ambient", tAfter, tBefore)
	}
	p.snapshot("form")
	if p.path() != fmt.Sprintf("/projects/%d/lines/new", id) {
		t.Errorf("the live update navigated to %s", p.path())
	}

	got := p.submit("save the line", `[data-testid="save-line"]`)
	if got != fmt.Sprintf("/projects/%d", id) {
		t.Fatalf("Save went to %s (form errors: %q)", got, p.textIfAny(`[data-testid="form-errors"]`))
	}
	row := `[data-testid="line-row"][data-tag="CHW-101"]`
	if n := p.count(row); n != 1 {
		t.Fatalf("line list has %d rows CHW-101, want 1", n)
	}
	cells := p.text(row)
	for _, want := range []string{"NPS 2", "44.0", "Flexible elastomeric", "1/2", "PVC jacket"} {
		if !strings.Contains(cells, want) {
			t.Errorf("line row %q lacks %q", cells, want)
		}
	}
	// The list shows the saved answer: the same surface temperature as the live one.
	if s := p.text(row + ` [data-testid="surface"]`); s+" °F" != after {
		t.Errorf("listed surface temperature %q, live result %q", s, after)
	}
	if h := p.text(`.line-list thead`); !strings.Contains(h, "°F") {
		t.Errorf("line list headings %q carry no °F", h)
	}
}
