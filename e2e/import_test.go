package e2e

import (
	"fmt"
	"net/http"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"lagwright/handlers"
)

var oneLineRead = regexp.MustCompile(`\b1 lines? read, no problems`)

// TestImportCSV uploads the line-list template (US units) with its example line
// renamed, previews it, imports it, and finds the line in the project's list.
func TestImportCSV(t *testing.T) {
	a := startApp(t, handlers.Config{})
	id := a.newUSProject(t, "Boiler room")
	p := openBrowser(t, a)

	p.open(fmt.Sprintf("/projects/%d/import", id))
	href := run(p, "read the template link", attr(`[data-testid="template-link"]`, "href"))
	resp, body := a.get(t, href)
	if resp.StatusCode != http.StatusOK || !strings.HasPrefix(resp.Header.Get("Content-Type"), "text/csv") {
		t.Fatalf("GET %s = %d %s", href, resp.StatusCode, resp.Header.Get("Content-Type"))
	}
	tmpl := string(body)
	if !strings.Contains(tmpl, "HW-101") || !strings.Contains(tmpl, "°F") {
		t.Fatalf("US template lacks its example line or °F headers:\n%s", tmpl)
	}
	csvPath := filepath.Join(t.TempDir(), "line-list.csv")
	if err := os.WriteFile(csvPath, []byte(strings.Replace(tmpl, "HW-101", "HW-777", 1)), 0o644); err != nil {
		t.Fatal(err)
	}
	p.do("choose the file", chromedpUpload(`#import-file`, csvPath))

	p.submit("preview", `[data-testid="import-form"] button[type="submit"]`)
	summary := p.text(`[data-testid="import-summary"]`)
	if !oneLineRead.MatchString(summary) {
		t.Fatalf("preview summary = %q (problems: %q)", summary, p.textIfAny(`[data-testid="import-problems"]`))
	}
	prow := p.text(`[data-testid="import-rows"] tbody tr:first-child`)
	for _, want := range []string{"HW-777", "NPS 2", "180", "ready"} {
		if !strings.Contains(prow, want) {
			t.Errorf("preview row %q lacks %q", prow, want)
		}
	}
	if h := p.text(`[data-testid="import-rows"] tbody tr:first-child td:nth-child(10)`); !strings.Contains(h, "°F") {
		t.Errorf("preview surface temperature %q lacks °F", h)
	}
	p.snapshot("preview")

	got := p.submit("import", `[data-testid="import-commit"] button[type="submit"]`)
	if got != fmt.Sprintf("/projects/%d", id) {
		t.Fatalf("import went to %s, want the project", got)
	}
	row := `[data-testid="line-row"][data-tag="HW-777"]`
	if n := p.count(row); n != 1 {
		t.Fatalf("line list has %d rows HW-777, want 1", n)
	}
	if cells := p.text(row); !strings.Contains(cells, "Mineral fiber") || !strings.Contains(cells, "1-1/2") {
		t.Errorf("imported row %q, want mineral fiber 1-1/2", cells)
	}
}
