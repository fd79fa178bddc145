package handlers

import (
	"context"
	"fmt"
	"net/http"
	"strings"
	"testing"

	"lagwright/results"
	"lagwright/store/storetest"
)

// TestProjectFormTouchExposure: the project form offers the touch-limit presets and
// states the hot-day personnel defaults (32 °C / 90 °F still air, 1000 W/m² of sun
// outdoors: common practice); a "public" exposure is kept with the user's own limit.
func TestProjectFormTouchExposure(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	h := s.Routes()
	body := do(t, h, "GET", "/projects/new", nil, nil).Body.String()
	for _, want := range []string{`name="settings.criteria.touch_exposure"`, `value="public"`, "ASTM C1055", "32 °C / 90 °F", "1000 W/m²"} {
		if !strings.Contains(body, want) {
			t.Errorf("new project form lacks %q", want)
		}
	}
	f := testProjectForm()
	f.Set("settings.criteria.touch_exposure", "public")
	f.Set("settings.criteria.max_surface_temp_c", "113") // 45 °C
	if rec := postPage(t, h, "/projects", f, nil); rec.Code != http.StatusSeeOther {
		t.Fatalf("create = %d: %s", rec.Code, rec.Body)
	}
	list, _ := st.Projects(context.Background())
	p := list[0].Project
	set, err := results.Settings(p)
	if err != nil {
		t.Fatal(err)
	}
	if set.Criteria.TouchExposure != "public" || set.Criteria.MaxSurfaceTempC == nil || *set.Criteria.MaxSurfaceTempC != 45 {
		t.Errorf("stored criteria %+v", set.Criteria)
	}
	edit := do(t, h, "GET", fmt.Sprintf("/projects/%d/edit", p.ID), nil, nil).Body.String()
	if !strings.Contains(edit, `value="public" selected`) {
		t.Error("edit form does not show the public exposure selected")
	}
	f.Set("settings.criteria.touch_exposure", "kiosk")
	if rec := postPage(t, h, "/projects", f, nil); rec.Code != http.StatusUnprocessableEntity || !strings.Contains(rec.Body.String(), `err-settings.criteria.touch_exposure`) {
		t.Errorf("unknown exposure = %d, want 422 beside the field", rec.Code)
	}
}
