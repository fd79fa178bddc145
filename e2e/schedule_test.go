package e2e

import (
	"archive/zip"
	"bytes"
	"net/http"
	"strings"
	"testing"

	"lagwright/handlers"
)

// TestScheduleExport opens the demo project's insulation schedule, checks that its
// table has rows, and fetches its CSV and XLSX exports from the page (the browser's
// own session) and with net/http: status 200, content types, and files that open.
func TestScheduleExport(t *testing.T) {
	a := startApp(t, handlers.Config{})
	project := a.newDemoProject(t)
	p := openBrowser(t, a)

	p.open(project + "/schedule")
	if n := p.count(`[data-testid="schedule-rows"] tbody tr`); n < 10 {
		t.Fatalf("schedule table has %d rows, want the demo's lines", n)
	}
	if h := p.text(`[data-testid="schedule-rows"] thead`); !strings.Contains(h, "in") {
		t.Errorf("schedule headings %q lack the inch unit", h)
	}
	if n := p.count(`[data-testid="totals-grand"] tbody tr, [data-testid="totals-grand"] tfoot tr`); n == 0 {
		t.Error("grand totals table is empty")
	}

	for _, tc := range []struct {
		ext, ctype string
		magic      string // how the body starts
	}{
		{"csv", "text/csv", ""},
		{"xlsx", "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet", "PK"},
	} {
		t.Run(tc.ext, func(t *testing.T) {
			path := project + "/schedule." + tc.ext
			// The page's own links, fetched in the browser.
			link := run(p, "find the "+tc.ext+" link", attr(`.schedule-actions a[href$="schedule.`+tc.ext+`"]`, "href"))
			if link != path {
				t.Errorf("%s link = %q, want %q", tc.ext, link, path)
			}
			got := run(p, "fetch "+path, fetchHead(path))
			if got.Status != http.StatusOK || !strings.HasPrefix(got.Type, tc.ctype) || got.Size == 0 {
				t.Errorf("browser fetch %s = %d %q, %d bytes", path, got.Status, got.Type, got.Size)
			}
			if !strings.Contains(got.Disposition, "attachment") {
				t.Errorf("%s Content-Disposition = %q, want an attachment", path, got.Disposition)
			}

			resp, body := a.get(t, path)
			if resp.StatusCode != http.StatusOK || !strings.HasPrefix(resp.Header.Get("Content-Type"), tc.ctype) {
				t.Fatalf("GET %s = %d %q", path, resp.StatusCode, resp.Header.Get("Content-Type"))
			}
			if !bytes.HasPrefix(body, []byte(tc.magic)) {
				t.Errorf("%s starts %q, want %q", path, body[:min(len(body), 8)], tc.magic)
			}
			switch tc.ext {
			case "csv":
				if !strings.Contains(string(body), "STM-207") {
					t.Errorf("CSV lacks the demo line STM-207")
				}
			case "xlsx":
				if _, err := zip.NewReader(bytes.NewReader(body), int64(len(body))); err != nil {
					t.Errorf("XLSX is not a zip package: %v", err)
				}
			}
		})
	}
}
