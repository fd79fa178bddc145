package handlers

import (
	"context"
	"encoding/json"
	"fmt"
	"net/http"
	"net/url"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"lagwright/analysis"
	"lagwright/store"
	"lagwright/store/storetest"
)

const compareMaterial = "mineral_fiber_pipe_c547_t1"

// compareFixture makes a project (with an energy price and a cost table for mineral fibre)
// and one steam line on a fresh database.
func compareFixture(t *testing.T, st *store.Store, sys string) (store.Project, store.Line, analysis.ProjectSettings) {
	t.Helper()
	ctx := context.Background()
	f := func(v float64) *float64 { return &v }
	set := analysis.DefaultSettings()
	set.Economics = &analysis.Economics{Heating: &analysis.HeatingBasis{PricePerKWh: f(0.06), Efficiency: f(0.85), HoursPerYear: f(8000)}}
	for _, tmm := range []float64{25.4, 38.1, 50.8, 63.5, 76.2, 101.6} {
		set.CostTable = append(set.CostTable, analysis.CostRow{Material: compareMaterial, NominalSize: "any", ThicknessMM: tmm,
			CostPerM: 20 + 0.6*tmm + 0.004*tmm*tmm})
	}
	js, _ := json.Marshal(set)
	p, err := st.CreateProject(ctx, store.Project{Name: "Boiler house", Units: sys, Settings: js})
	if err != nil {
		t.Fatal(err)
	}
	in := `{"geometry":"pipe","pipe_size":"NPS 4","steam_gauge_pressure_kpa":700,"length_m":100,
		"layers":[{"material":"` + compareMaterial + `","thickness_mm":25.4}],"jacket":"aluminium_new"}`
	l, err := st.CreateLine(ctx, store.Line{ProjectID: p.ID, Tag: "ST-1", Service: "steam", Input: json.RawMessage(in)}, []string{compareMaterial})
	if err != nil {
		t.Fatal(err)
	}
	return p, l, set
}

func TestComparePage(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	h := s.Routes()
	p, l, set := compareFixture(t, st, "si")

	// The economic thickness the analysis finds for this line with the project's costs.
	lib, err := st.Library(context.Background())
	if err != nil {
		t.Fatal(err)
	}
	var own analysis.Input
	_ = json.Unmarshal(l.Input, &own)
	want, err := analysis.Analyse(set.Effective(l.Location, own, analysis.Fittings{}), lib)
	if err != nil || want.Sizing.EconomicMM == nil || *want.Sizing.EconomicMM <= 25.4 {
		t.Fatalf("fixture: economic thickness %v, %v (want one above 25.4 mm)", want.Sizing.EconomicMM, err)
	}
	eco := strconv.FormatFloat(*want.Sizing.EconomicMM, 'f', -1, 64)

	for _, tc := range []struct {
		name, target string
		status       int
		wants        []string
	}{
		{"own material", fmt.Sprintf("/projects/%d/lines/%d/compare", p.ID, l.ID), 200, []string{
			`<tr class="economic" data-thickness-mm="` + eco + `">`, `data-testid="mark-economic"`,
			`<svg viewBox=`, `data-testid="chart-lcc"`, `data-testid="chart-heat"`, `data-testid="chart-surface"`,
			`class="tick x-tick"`, `>economic</text>`, "Thickness, mm", "Heat flow, W/m", "min. personnel protection",
			`name="version" value="` + strconv.Itoa(l.Version) + `"`}},
		{"second material", fmt.Sprintf("/projects/%d/lines/%d/compare?alt=cellular_glass_c552_t2", p.ID, l.ID), 200, []string{
			`data-testid="compare-cellular_glass_c552_t2"`, "(dashed)", "no installed costs match this material and size"}},
		{"unknown material", fmt.Sprintf("/projects/%d/lines/%d/compare?alt=unobtainium", p.ID, l.ID), 422, nil},
		{"no such line", fmt.Sprintf("/projects/%d/lines/%d/compare", p.ID, l.ID+99), 404, nil},
		{"no such project", "/projects/999999/lines/1/compare", 404, nil},
	} {
		t.Run(tc.name, func(t *testing.T) {
			rec := do(t, h, "GET", tc.target, nil, nil)
			if rec.Code != tc.status {
				t.Fatalf("GET %s = %d, want %d\n%s", tc.target, rec.Code, tc.status, rec.Body)
			}
			body := rec.Body.String()
			for _, w := range tc.wants {
				if !strings.Contains(body, w) {
					t.Errorf("page lacks %q", w)
				}
			}
			if tc.status == 200 {
				if n := strings.Count(body, `data-testid="mark-economic"`); n < 1 || n > 2 {
					t.Errorf("%d economic marks, want one per material", n)
				}
				// Numeric ticks: the x ticks are numbers, evenly stepped.
				re := regexp.MustCompile(`class="tick x-tick" x="([0-9.]+)" y="[0-9.]+" text-anchor="middle" data-value="([0-9.]+)"`)
				ticks := re.FindAllStringSubmatch(body, -1)
				if len(ticks) < 4 {
					t.Fatalf("%d numeric x ticks", len(ticks))
				}
				x0, _ := strconv.ParseFloat(ticks[0][1], 64)
				x1, _ := strconv.ParseFloat(ticks[1][1], 64)
				v0, _ := strconv.ParseFloat(ticks[0][2], 64)
				v1, _ := strconv.ParseFloat(ticks[1][2], 64)
				x2, _ := strconv.ParseFloat(ticks[2][1], 64)
				v2, _ := strconv.ParseFloat(ticks[2][2], 64)
				if r := (x2 - x1) / (x1 - x0) * (v1 - v0) / (v2 - v1); r < 0.99 || r > 1.01 {
					t.Errorf("tick positions %v not proportional to values", ticks[:3])
				}
			}
		})
	}
}

func TestComparePageUSUnits(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	p, l, _ := compareFixture(t, st, "us")
	rec := do(t, s.Routes(), "GET", fmt.Sprintf("/projects/%d/lines/%d/compare", p.ID, l.ID), nil, nil)
	if rec.Code != 200 {
		t.Fatalf("status %d", rec.Code)
	}
	for _, w := range []string{"Thickness, in", "Heat flow, Btu/h·ft", "Surface, °F", "Energy, MMBtu/year", "thickness of the sized layer, in", ">1-1/2<"} {
		if !strings.Contains(rec.Body.String(), w) {
			t.Errorf("US page lacks %q", w)
		}
	}
}

func TestUseThickness(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	h := s.Routes()
	p, l, _ := compareFixture(t, st, "si")
	target := fmt.Sprintf("/projects/%d/lines/%d/thickness", p.ID, l.ID)
	post := func(thick string, version int) int {
		form := url.Values{"thickness_mm": {thick}, "version": {strconv.Itoa(version)}}
		rec := do(t, h, "POST", target, strings.NewReader(form.Encode()), map[string]string{"Content-Type": "application/x-www-form-urlencoded"})
		if rec.Code == http.StatusSeeOther && rec.Header().Get("Location") != fmt.Sprintf("/projects/%d/lines/%d", p.ID, l.ID) {
			t.Errorf("redirect to %q", rec.Header().Get("Location"))
		}
		return rec.Code
	}
	if code := post("63.5", l.Version); code != http.StatusSeeOther {
		t.Fatalf("use 63.5 mm = %d, want 303", code)
	}
	got, err := st.Line(context.Background(), p.ID, l.ID)
	if err != nil {
		t.Fatal(err)
	}
	var in analysis.Input
	_ = json.Unmarshal(got.Input, &in)
	var res analysis.Stored
	_ = json.Unmarshal(got.Result, &res)
	if *in.Layers[0].ThicknessMM != 63.5 || got.Version != l.Version+1 || res.Output == nil || res.Output.InsulationMM != 63.5 || got.ResultHash == "" {
		t.Errorf("after use: thickness %v, version %d, result %v", *in.Layers[0].ThicknessMM, got.Version, res.Output)
	}
	if code := post("76.2", l.Version); code != http.StatusConflict {
		t.Errorf("stale version = %d, want 409", code)
	}
	if code := post("-3", got.Version); code != http.StatusUnprocessableEntity {
		t.Errorf("negative thickness = %d, want 422", code)
	}
	again, _ := st.Line(context.Background(), p.ID, l.ID)
	if again.Version != got.Version {
		t.Errorf("a refused post changed the line (version %d → %d)", got.Version, again.Version)
	}
}
