package e2e

import (
	"strconv"
	"strings"
	"testing"

	"lagwright/handlers"
)

// TestDemoProjectFlagsTooHot presses "Create the demo project" on the projects page
// and checks the line list it lands on: about forty lines, at least one flagged "Too
// hot to touch" in the bad style, and the status summary counting the same lines.
func TestDemoProjectFlagsTooHot(t *testing.T) {
	a := startApp(t, handlers.Config{})
	p := openBrowser(t, a)

	p.open("/projects")
	got := p.submit("click Create the demo project", `[data-testid="demo-project"]`)
	if !projectPath.MatchString(got) {
		t.Fatalf("the demo button went to %s, want /projects/{id}", got)
	}
	if n := p.count(`[data-testid="line-row"]`); n < 30 {
		t.Fatalf("the demo project lists %d lines, want about forty", n)
	}
	tooHot := `[data-testid="line-row"] [data-testid="status"] [data-status="too_hot"]`
	n := p.count(tooHot)
	if n == 0 {
		t.Fatal(`no line is flagged "too hot to touch"`)
	}
	if label := p.text(tooHot); label != "Too hot to touch" {
		t.Errorf("too-hot badge reads %q", label)
	}
	if cls := run(p, "read the badge class", attr(tooHot, "class")); !strings.Contains(cls, "bad") {
		t.Errorf("too-hot badge class = %q, want the bad style", cls)
	}
	summary := p.text(`[data-testid="status-summary"]`)
	if !strings.Contains(summary, "Too hot to touch "+strconv.Itoa(n)) {
		t.Errorf("status summary %q does not count %d too-hot lines", summary, n)
	}

}
