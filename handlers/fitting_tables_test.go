package handlers

import (
	"fmt"
	"net/http"
	"net/url"
	"strings"
	"testing"

	"lagwright/results"
	"lagwright/store/storetest"
)

// The fitting and support tables are edited per project: rows typed in the project's
// units are stored in SI (1 ft = 0.3048 m exactly, NIST SP 811); a bad line comes back
// named with 422 and nothing is saved.
func TestFittingTablesPage(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	h := s.Routes()
	p := createTestProject(t, st, "us")
	base := fmt.Sprintf("/projects/%d/fittings", p.ID)
	rec := do(t, h, "GET", base, nil, nil)
	if rec.Code != 200 || !strings.Contains(rec.Body.String(), `data-testid="builtin-fittings"`) {
		t.Fatalf("GET = %d", rec.Code)
	}
	bad := url.Values{"version": {"1"}, "fitting_table": {"valve, NPS 4, 7\nbend, NPS 2, 1"}, "support_spacing": {"NPS 4"}}
	rec = postPage(t, h, base, bad, nil)
	body := rec.Body.String()
	if rec.Code != http.StatusUnprocessableEntity || !strings.Contains(body, "Support spacing, line 1") || !strings.Contains(body, "bend, NPS 2, 1") {
		t.Fatalf("bad rows = %d: %s", rec.Code, body)
	}
	bad.Set("support_spacing", "NPS 4, 12")
	rec = postPage(t, h, base, bad, nil)
	if rec.Code != http.StatusUnprocessableEntity || !strings.Contains(rec.Body.String(), "Fitting table, line 2: kind") {
		t.Fatalf("unknown kind = %d", rec.Code)
	}
	good := url.Values{"version": {"1"}, "fitting_table": {"Valve, NPS 4, 7\nelbow, any, 2"}, "support_spacing": {"NPS 4, 12"}}
	if rec = postPage(t, h, base, good, nil); rec.Code != http.StatusSeeOther {
		t.Fatalf("save = %d: %s", rec.Code, rec.Body)
	}
	got, err := st.Project(t.Context(), p.ID)
	if err != nil {
		t.Fatal(err)
	}
	set, _ := results.Settings(got)
	if len(set.FittingTable) != 2 || set.FittingTable[0].Kind != "valves" || !nearValue(set.FittingTable[0].EquivLengthM, 2.1336, 1e-9) ||
		len(set.SupportTable) != 1 || !nearValue(set.SupportTable[0].SpacingM, 3.6576, 1e-9) {
		t.Errorf("stored tables %+v %+v", set.FittingTable, set.SupportTable)
	}
}
