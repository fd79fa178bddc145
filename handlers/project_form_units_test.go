package handlers

import (
	"net/http"
	"strings"
	"testing"

	"lagwright/store/storetest"
	"lagwright/units"
)

// TestProjectFormUnits: the form is in one system at a time. In US units the defaults
// are converted (24 °C indoor design air = 75.2 °F; 60 °C touch limit = 140 °F, common
// practice), the units are a hidden field beside a link that reloads the form in the
// other system, and a range message speaks °F.
func TestProjectFormUnits(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	h := s.Routes()
	for _, c := range []struct {
		target string
		want   []string
	}{
		{"/projects/new", []string{`name="units" value="si"`, `name="settings.criteria.max_surface_temp_c" value="60"`, `href="/projects/new?units=us"`}},
		{"/projects/new?units=us", []string{`name="units" value="us"`, `name="settings.criteria.max_surface_temp_c" value="140"`,
			`name="settings.indoor.ambient_temp_c" value="75.2"`, `href="/projects/new?units=si"`, "°F"}},
	} {
		rec := do(t, h, "GET", c.target, nil, nil)
		body := rec.Body.String()
		for _, w := range c.want {
			if rec.Code != 200 || !strings.Contains(body, w) {
				t.Errorf("GET %s = %d, lacks %s", c.target, rec.Code, w)
			}
		}
		if strings.Contains(body, `<select id="units"`) {
			t.Errorf("GET %s: a units select that would not convert the values", c.target)
		}
	}
	f := testProjectForm() // US units
	f.Set("settings.criteria.max_surface_temp_c", "60")
	rec := postPage(t, h, "/projects", f, nil)
	body := rec.Body.String()
	if rec.Code != http.StatusUnprocessableEntity || !strings.Contains(body, "°F") || strings.Contains(body, "°C</span>") {
		t.Fatalf("touch limit 60 °F = %d; want 422 with the range in °F", rec.Code)
	}
	i := strings.Index(body, `data-testid="err-settings.criteria.max_surface_temp_c"`)
	if i < 0 || !strings.Contains(body[i:i+200], "°F") {
		t.Errorf("the touch limit's message is not in °F: %q", body[max(i, 0):max(i, 0)+200])
	}
}

// TestLocaliseRange: SI range messages in the form's units.
func TestLocaliseRange(t *testing.T) {
	temp := numField{Key: "t", Q: 0}
	for _, f := range projectNumFields() {
		if f.Key == "settings.criteria.max_surface_temp_c" {
			temp = f
		}
	}
	pct := numField{Key: "p", Scale: 0.01}
	for _, c := range []struct {
		f        numField
		sys, msg string
		want     string
	}{
		{temp, "us", "must be between 30 and 100 °C", "must be between 86 and 212 °F"}, // exact °C→°F
		{temp, "si", "must be between 30 and 100 °C", "must be between 30 and 100 °C"},
		{temp, "us", "must be between -70 and 80", "must be between -94 and 176 °F"},
		{pct, "us", "must be between 0.01 and 1", "must be between 1 and 100 %"},
		{temp, "us", "is required", "is required"},
	} {
		if got := localiseRange(c.f, units.System(c.sys), c.msg); got != c.want {
			t.Errorf("%s %q = %q, want %q", c.sys, c.msg, got, c.want)
		}
	}
}
