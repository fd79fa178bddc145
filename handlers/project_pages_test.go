package handlers

import (
	"context"
	"encoding/json"
	"fmt"
	"net/http"
	"net/http/httptest"
	"net/url"
	"strings"
	"testing"

	"lagwright/analysis"
	"lagwright/results"
	"lagwright/store"
	"lagwright/store/storetest"
)

// postForm posts url-encoded values.
func postPage(t *testing.T, h http.Handler, target string, v url.Values, header map[string]string) *httptest.ResponseRecorder {
	t.Helper()
	hd := map[string]string{"Content-Type": "application/x-www-form-urlencoded"}
	for k, x := range header {
		hd[k] = x
	}
	return do(t, h, "POST", target, strings.NewReader(v.Encode()), hd)
}

// newProject stores a project with the default settings in the given units.
func createTestProject(t *testing.T, st *store.Store, units string) store.Project {
	t.Helper()
	js, _ := json.Marshal(analysis.DefaultSettings())
	p, err := st.CreateProject(context.Background(), store.Project{Name: "Test plant", Units: units, Settings: js})
	if err != nil {
		t.Fatal(err)
	}
	return p
}

// projectForm is a valid project form in US units.
func testProjectForm() url.Values {
	return url.Values{
		"name": {"North cellar"}, "client": {"Test client"}, "site": {"Yard 2"}, "units": {"us"},
		"settings.indoor.ambient_temp_c": {"75"}, "settings.indoor.relative_humidity_pct": {"50"},
		"settings.outdoor.ambient_temp_c": {"90"}, "settings.outdoor.wind_m_s": {"7.5"},
		"settings.outdoor.conditions.freeze.ambient_temp_c": {"0"}, "settings.outdoor.conditions.freeze.initial_temp_c": {"50"},
		"settings.criteria.max_surface_temp_c": {"140"}, "settings.criteria.dew_margin_k": {"1.8"},
		"settings.criteria.energy_code":            {"ashrae-90.1-2016"},
		"settings.economics.heating.price_per_kwh": {"0.04"}, "settings.economics.discount_rate": {"5"},
		"settings.economics.cooling.price_per_kwh": {"0.15"}, "settings.economics.cooling.cop": {"3.2"},
		"settings.economics.currency": {"eur"},
		"settings.fittings.elbow_m":   {"2"}, "settings.fittings.valve_m": {"5"},
	}
}

func TestProjectPagesCreateEdit(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	h := s.Routes()
	ctx := context.Background()

	if rec := do(t, h, "GET", "/projects/new", nil, nil); rec.Code != 200 || !strings.Contains(rec.Body.String(), `name="settings.indoor.conditions.personnel.ambient_temp_c"`) {
		t.Fatalf("GET /projects/new = %d, or lacks the per-criterion condition sets", rec.Code)
	}

	// Invalid: 422, messages beside the fields, the typed input kept.
	bad := testProjectForm()
	bad.Set("name", " ")
	bad.Set("settings.indoor.ambient_temp_c", "seventy")
	bad.Set("settings.outdoor.wind_m_s", "99 mph")
	bad.Set("settings.economics.heating.efficiency", "150")
	bad.Set("settings.economics.currency", "euro")
	rec := postPage(t, h, "/projects", bad, nil)
	body := rec.Body.String()
	if rec.Code != http.StatusUnprocessableEntity {
		t.Fatalf("invalid project form = %d, want 422", rec.Code)
	}
	for _, want := range []string{`data-testid="err-name"`, `data-testid="err-settings.indoor.ambient_temp_c"`,
		`data-testid="err-settings.outdoor.wind_m_s"`, `data-testid="err-settings.economics.heating.efficiency"`,
		`data-testid="err-settings.economics.currency"`,
		`value="seventy"`, `value="99 mph"`, `value="Test client"`} {
		if !strings.Contains(body, want) {
			t.Errorf("invalid project form lacks %s", want)
		}
	}
	if list, _ := st.Projects(ctx); len(list) != 0 {
		t.Fatalf("an invalid project was saved")
	}

	// Valid: 303 to the project, settings stored in SI.
	rec = postPage(t, h, "/projects", testProjectForm(), nil)
	if rec.Code != http.StatusSeeOther {
		t.Fatalf("create project = %d: %s", rec.Code, rec.Body)
	}
	list, _ := st.Projects(ctx)
	if len(list) != 1 || rec.Header().Get("Location") != fmt.Sprintf("/projects/%d", list[0].ID) {
		t.Fatalf("after create: %d projects, Location %q", len(list), rec.Header().Get("Location"))
	}
	p := list[0].Project
	set, _ := results.Settings(p)
	for _, c := range []struct {
		name      string
		got, want float64
	}{
		{"indoor ambient 75 °F", set.Indoor.AmbientTempC, 23.8888888889},                    // exact: (75 − 32)·5/9
		{"outdoor wind 7.5 mph", set.Outdoor.WindMS, 3.35280},                               // exact: 1 mph = 0.44704 m/s
		{"touch limit 140 °F", *set.Criteria.MaxSurfaceTempC, 60},                           // exact
		{"dew margin 1.8 °F", *set.Criteria.DewMarginK, 1},                                  // exact: a difference, no offset
		{"elbow 2 ft", *set.Fittings.ElbowM, 0.6096},                                        // exact: 1 ft = 0.3048 m
		{"discount 5 %", *set.Economics.DiscountRate, 0.05},                                 // percent to fraction
		{"freeze initial 50 °F", *set.Outdoor.Conditions.Freeze.InitialTempC, 10},           // exact
		{"freeze ambient 0 °F", *set.Outdoor.Conditions.Freeze.AmbientTempC, -17.777777778}, // exact
	} {
		if d := c.got - c.want; d > 1e-6 || d < -1e-6 {
			t.Errorf("%s: stored %.9g, want %.9g", c.name, c.got, c.want)
		}
	}
	if e := set.Economics; e == nil || e.Currency != "EUR" || e.Heating == nil || *e.Heating.PricePerKWh != 0.04 ||
		e.Cooling == nil || *e.Cooling.COP != 3.2 || e.Heating.Efficiency != nil {
		t.Errorf("stored economics %+v: want EUR, heating 0.04 (default efficiency), cooling COP 3.2", set.Economics)
	}
	if p.Units != "us" || p.Client != "Test client" || set.Criteria.EnergyCode != "ashrae-90.1-2016" {
		t.Errorf("stored project %+v, energy code %q", p, set.Criteria.EnergyCode)
	}

	// The edit form shows the stored values in the project's units.
	rec = do(t, h, "GET", fmt.Sprintf("/projects/%d/edit", p.ID), nil, nil)
	for _, want := range []string{`value="75"`, `value="7.5"`, `value="140"`, `value="North cellar"`, `value="1"`} {
		if !strings.Contains(rec.Body.String(), want) {
			t.Errorf("edit form lacks %s", want)
		}
	}
	// Edit with the version read: 303; a second save with the same (now stale) version: 409, input kept.
	f := testProjectForm()
	f.Set("name", "North cellar, phase 2")
	f.Set("version", fmt.Sprint(p.Version))
	if rec := postPage(t, h, fmt.Sprintf("/projects/%d/edit", p.ID), f, nil); rec.Code != http.StatusSeeOther {
		t.Fatalf("edit project = %d: %s", rec.Code, rec.Body)
	}
	f.Set("name", "Typed meanwhile")
	rec = postPage(t, h, fmt.Sprintf("/projects/%d/edit", p.ID), f, nil)
	if rec.Code != http.StatusConflict || !strings.Contains(rec.Body.String(), `value="Typed meanwhile"`) ||
		!strings.Contains(rec.Body.String(), `data-testid="conflict"`) {
		t.Errorf("stale project save = %d, want 409 with the typed name kept and a notice", rec.Code)
	}
	got, _ := st.Project(ctx, p.ID)
	if got.Name != "North cellar, phase 2" {
		t.Errorf("name after edits = %q", got.Name)
	}
	// The list shows it.
	if rec := do(t, h, "GET", "/projects", nil, nil); !strings.Contains(rec.Body.String(), "North cellar, phase 2") {
		t.Errorf("projects page lacks the project")
	}
	if rec := do(t, h, "GET", "/projects/999999", nil, nil); rec.Code != 404 {
		t.Errorf("missing project = %d, want 404", rec.Code)
	}
}
