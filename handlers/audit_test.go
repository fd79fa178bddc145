package handlers

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"

	"lagwright/store"
	"lagwright/store/storetest"
)

// TestAudit: the audit lists the surveyed lines best first with their savings, leaves
// out (and says so) lines without a survey, and gives the same figures as PDF and XLSX.
func TestAudit(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	h := s.Routes()
	p, _, _ := compareFixture(t, st, "si") // ST-1: steam, no survey
	ctx := context.Background()
	line := func(tag, existing string) int64 {
		in := `{"geometry":"pipe","pipe_size":"NPS 4","steam_gauge_pressure_kpa":700,"length_m":100,
			"layers":[{"material":"` + compareMaterial + `","thickness_mm":50.8}],"jacket":"aluminium_new","existing":` + existing + `}`
		l, err := st.CreateLine(ctx, store.Line{ProjectID: p.ID, Tag: tag, Service: "steam", Input: json.RawMessage(in)}, []string{compareMaterial})
		if err != nil {
			t.Fatal(err)
		}
		return l.ID
	}
	line("ST-BARE", `{}`)                                                                                          // found bare: the best payback
	wet := line("ST-WET", `{"layers":[{"material":"`+compareMaterial+`","thickness_mm":25.4}],"condition":"wet"}`) // found wet and thin
	// The Compare screen: a bare row and an as-found row, savings against each.
	compareBody := do(t, h, "GET", fmt.Sprintf("/projects/%d/lines/%d/compare", p.ID, wet), nil, nil).Body.String()
	for _, want := range []string{`data-testid="mark-as-found"`, `class="bare"`, "Saving/year against as found, USD", "Saving/year against bare, USD"} {
		if !strings.Contains(compareBody, want) {
			t.Errorf("compare page of a surveyed line lacks %q", want)
		}
	}
	target := fmt.Sprintf("/projects/%d/audit", p.ID)
	rec := do(t, h, "GET", target, nil, nil)
	if rec.Code != 200 {
		t.Fatalf("GET %s = %d\n%s", target, rec.Code, rec.Body)
	}
	body := rec.Body.String()
	for _, want := range []string{`data-testid="audit-lines"`, `data-testid="audit-totals"`, "Saved a year (USD)", "Installed cost (USD)",
		"1 line(s) have no as-found survey", "Heating (fuel or heat bought)", `href="` + target + `.pdf"`} {
		if !strings.Contains(body, want) {
			t.Errorf("audit page lacks %q", want)
		}
	}
	if i, j := strings.Index(body, "ST-BARE"), strings.Index(body, "ST-WET"); i < 0 || j < 0 || i > j {
		t.Errorf("the bare line (shorter payback) is not listed before the wet one")
	}
	if strings.Contains(body, ">ST-1<") {
		t.Error("a line without a survey is in the audit")
	}

	rec = do(t, h, "GET", target+".pdf", nil, nil)
	if rec.Code != 200 || !bytes.HasPrefix(rec.Body.Bytes(), []byte("%PDF")) || rec.Header().Get("Content-Type") != "application/pdf" {
		t.Errorf("audit PDF = %d %q", rec.Code, rec.Header().Get("Content-Type"))
	}
	rec = do(t, h, "GET", target+".xlsx", nil, nil)
	if rec.Code != 200 {
		t.Fatalf("audit XLSX = %d", rec.Code)
	}
	f, err := excelize.OpenReader(bytes.NewReader(rec.Body.Bytes()))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := f.GetRows("Audit")
	if err != nil || len(rows) != 3 || rows[1][0] != "ST-BARE" || rows[2][0] != "ST-WET" {
		t.Fatalf("Audit sheet rows %v, %v", rows, err)
	}
	if !strings.Contains(strings.Join(rows[0], "|"), "Saved a year (USD)") {
		t.Errorf("Audit sheet heading %v lacks the currency", rows[0])
	}
	basis, _ := f.GetRows("Basis")
	if len(basis) < 3 || basis[2][1] != "USD (ISO 4217)" {
		t.Errorf("Basis sheet %v", basis)
	}
}
