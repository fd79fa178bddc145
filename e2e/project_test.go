package e2e

import (
	"regexp"
	"strings"
	"testing"

	"lagwright/handlers"
)

var projectPath = regexp.MustCompile(`^/projects/[0-9]+$`)

// TestCreateProject creates a project in US units through the form: the list's "New
// project" button, the form switched to US units (design conditions typed in °F,
// since the form reads every value in the units it is shown in), Save, the project page, and the project in the
// list.
func TestCreateProject(t *testing.T) {
	a := startApp(t, handlers.Config{})
	p := openBrowser(t, a)

	p.open("/projects")
	p.waitFor("the empty list notice", `document.querySelector("main .notice") !== null`)
	if got := p.submit("click New project", `[data-testid="new-project"]`); got != "/projects/new" {
		t.Fatalf("New project went to %s", got)
	}
	// The form is in SI; its link reloads it in US units, the defaults converted.
	p.submit("switch the form to US units", `[data-testid="switch-units"]`)
	if v := p.value(`#settings\.criteria\.max_surface_temp_c`); v != "140" {
		t.Errorf("touch limit default in US units = %q, want 140 (°F)", v)
	}
	p.typeInto(`#name`, "Chiller plant retrofit")
	p.typeInto(`#client`, "Eastbank Hospital")
	p.typeInto(`#site`, "Building C")
	p.typeInto(`[name="settings.indoor.ambient_temp_c"]`, "75")
	p.typeInto(`[name="settings.indoor.relative_humidity_pct"]`, "55")
	p.typeInto(`[name="settings.outdoor.ambient_temp_c"]`, "95")
	p.typeInto(`[name="settings.outdoor.wind_m_s"]`, "7")
	p.typeInto(`#settings\.criteria\.max_surface_temp_c`, "140")
	p.typeInto(`#settings\.criteria\.dew_margin_k`, "2")

	got := p.submit("save the project", `[data-testid="save-project"]`)
	if !projectPath.MatchString(got) {
		t.Fatalf("Save went to %s, want /projects/{id} (form errors: %q)", got,
			p.textIfAny(`[data-testid="form-errors"]`))
	}
	if name := p.text(`[data-testid="project-name"]`); name != "Chiller plant retrofit" {
		t.Errorf("project page heading = %q", name)
	}
	if meta := p.text(`.page-head .muted`); !strings.Contains(meta, "Eastbank Hospital") || !strings.Contains(meta, "US") {
		t.Errorf("project page line = %q, want the client and US units", meta)
	}

	// The conditions were stored as typed, in °F: the edit form shows them back.
	p.open(got + "/edit")
	if v := p.value(`[name="settings.indoor.ambient_temp_c"]`); !strings.HasPrefix(v, "75") {
		t.Errorf("indoor ambient on the edit form = %q, want 75 (°F)", v)
	}
	if u := p.text(`table.conditions thead th:nth-child(2)`); !strings.Contains(u, "°F") {
		t.Errorf("conditions heading = %q, want °F", u)
	}

	p.open("/projects")
	if n := p.count(`[data-testid="project-row"]`); n != 1 {
		t.Fatalf("project list has %d rows, want 1", n)
	}
	row := p.text(`[data-testid="project-row"]`)
	for _, want := range []string{"Chiller plant retrofit", "Eastbank Hospital", "Building C"} {
		if !strings.Contains(row, want) {
			t.Errorf("project row %q lacks %q", row, want)
		}
	}
}
