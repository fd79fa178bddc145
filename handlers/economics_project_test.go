package handlers

import (
	"context"
	"encoding/json"
	"fmt"
	"net/url"
	"regexp"
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
	p, _, _ := compareFixture(t, st, "si")
	in := `{"geometry":"pipe","pipe_size":"NPS 2","operating_temp_c":80,"length_m":60,
		"layers":[{"material":"` + compareMaterial + `","thickness_mm":25.4}],"jacket":"all_service_jacket"}`
	if _, err := st.CreateLine(context.Background(), store.Line{ProjectID: p.ID, Tag: "HW-1", Service: "heating hot water",
		Input: json.RawMessage(in)}, []string{compareMaterial}); err != nil {
		t.Fatal(err)
	}
	target := fmt.Sprintf("/projects/%d/economics", p.ID)
	rec := do(t, h, "GET", target, nil, nil)
	if rec.Code != 200 {
		t.Fatalf("GET %s = %d\n%s", target, rec.Code, rec.Body)
	}
	body := rec.Body.String()
	for _, want := range []string{`data-scenario="specified" data-basis="heating"`, `data-scenario="bare"`, `data-scenario="economic"`,
		`data-testid="economics-totals-heating"`, "Energy cost/year, USD",
		`data-testid="chart-energy-by-service"`, `data-label="steam"`, `data-label="heating hot water"`, "ST-1", "HW-1",
		`class="tick x-tick"`} {
		if !strings.Contains(body, want) {
			t.Errorf("economics page lacks %q", want)
		}
	}
	if strings.Contains(body, "labelled example") {
		t.Error("real costs reported as the example")
	}
	// The project has no cooling price: a chilled-water line is left out, never priced
	// on the heating basis.
	cold := `{"geometry":"pipe","pipe_size":"NPS 2","operating_temp_c":6,"length_m":60,
		"layers":[{"material":"` + compareMaterial + `","thickness_mm":25.4}],"jacket":"all_service_jacket"}`
	if _, err := st.CreateLine(context.Background(), store.Line{ProjectID: p.ID, Tag: "CHW-1", Service: "chilled water",
		Input: json.RawMessage(cold)}, []string{compareMaterial}); err != nil {
		t.Fatal(err)
	}
	body = do(t, h, "GET", target, nil, nil).Body.String()
	if strings.Contains(body, `data-testid="economics-totals-cooling"`) || !strings.Contains(body, "1 line(s) have no energy price for their basis") {
		t.Error("a cold line without a cooling price was priced, or not reported")
	}
	// With a cooling price the cold line is totalled apart from the hot ones.
	pr, _ := st.Project(context.Background(), p.ID)
	var withCooling map[string]any
	_ = json.Unmarshal(pr.Settings, &withCooling)
	withCooling["economics"].(map[string]any)["cooling"] = map[string]any{"price_per_kwh": 0.15}
	pr.Settings, _ = json.Marshal(withCooling)
	if _, err := st.UpdateProject(context.Background(), pr); err != nil {
		t.Fatal(err)
	}
	body = do(t, h, "GET", target, nil, nil).Body.String()
	for _, want := range []string{`data-scenario="specified" data-basis="cooling"`, `data-testid="economics-totals-cooling"`,
		"Cooling (cold lines: electricity bought): project totals of 1 line(s)", "Heating (hot lines: fuel or heat bought): project totals of 2 line(s)"} {
		if !strings.Contains(body, want) {
			t.Errorf("economics page with both bases lacks %q", want)
		}
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
	// Without installed costs there is no investment and no payback: "—", never "0.0".
	body = do(t, h, "GET", target, nil, nil).Body.String()
	row := regexp.MustCompile(`(?s)<tr data-scenario="specified" data-basis="heating">.*?</tr>`).FindString(body)
	cells := regexp.MustCompile(`<td class="num">([^<]*)</td>`).FindAllStringSubmatch(row, -1)
	if n := len(cells); n < 2 || cells[n-2][1] != "—" || cells[n-1][1] != "—" || !strings.Contains(row, "no installed costs") {
		t.Errorf("as specified without costs: %q, want investment and payback —", row)
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
