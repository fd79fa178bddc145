package handlers

import (
	"context"
	"encoding/json"
	"fmt"
	"net/url"
	"strconv"
	"strings"
	"testing"

	"lagwright/store"
	"lagwright/store/storetest"
)

func TestProjectEconomics(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	h := s.Routes()
	p, _, _ := cmpFixture(t, st, "si")
	in := `{"geometry":"pipe","pipe_size":"NPS 2","operating_temp_c":80,"length_m":60,
		"layers":[{"material":"` + cmpMF + `","thickness_mm":25.4}],"jacket":"all_service_jacket"}`
	if _, err := st.CreateLine(context.Background(), store.Line{ProjectID: p.ID, Tag: "HW-1", Service: "heating hot water",
		Input: json.RawMessage(in)}, []string{cmpMF}); err != nil {
		t.Fatal(err)
	}
	target := fmt.Sprintf("/projects/%d/economics", p.ID)
	rec := do(t, h, "GET", target, nil, nil)
	if rec.Code != 200 {
		t.Fatalf("GET %s = %d\n%s", target, rec.Code, rec.Body)
	}
	body := rec.Body.String()
	for _, want := range []string{`data-scenario="specified"`, `data-scenario="bare"`, `data-scenario="economic"`,
		`data-testid="chart-energy-by-service"`, `data-label="steam"`, `data-label="heating hot water"`, "ST-1", "HW-1",
		`class="tick x-tick"`} {
		if !strings.Contains(body, want) {
			t.Errorf("economics page lacks %q", want)
		}
	}
	if strings.Contains(body, "labelled example") {
		t.Error("real costs reported as the example")
	}
	// Steam loses more than hot water: its bar is drawn first (sorted by energy).
	if strings.Index(body, `data-label="steam"`) > strings.Index(body, `data-label="heating hot water"`) {
		t.Error("bars not sorted by energy")
	}

	// With example costs the page and the compare page say they are not prices.
	got, _ := st.Project(context.Background(), p.ID)
	var raw map[string]json.RawMessage
	_ = json.Unmarshal(got.Settings, &raw)
	delete(raw, "cost_table")
	got.Settings, _ = json.Marshal(raw)
	got, err := st.UpdateProject(context.Background(), got)
	if err != nil {
		t.Fatal(err)
	}
	rec = do(t, h, "POST", fmt.Sprintf("/projects/%d/costs/example", p.ID), strings.NewReader(url.Values{"version": {strconv.Itoa(got.Version)}}.Encode()),
		map[string]string{"Content-Type": "application/x-www-form-urlencoded"})
	if rec.Code != 303 {
		t.Fatalf("example costs = %d", rec.Code)
	}
	rec = do(t, h, "GET", target, nil, nil)
	if !strings.Contains(rec.Body.String(), "Installed costs are the labelled example, not prices") {
		t.Error("economics page does not flag the example costs")
	}
	if rec := do(t, h, "GET", "/projects/999999/economics", nil, nil); rec.Code != 404 {
		t.Errorf("no such project = %d", rec.Code)
	}
}
