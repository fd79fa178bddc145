package handlers

import (
	"fmt"

	"lagwright/store"
	"lagwright/units"
)

// The addresses of the screens, in one place, so a route and its links agree.

func projectURL(id int64) string       { return fmt.Sprintf("/projects/%d", id) }
func lineURL(pid, lid int64) string    { return fmt.Sprintf("/projects/%d/lines/%d", pid, lid) }
func compareURL(pid, lid int64) string { return lineURL(pid, lid) + "/compare" }
func costsURL(pid int64) string        { return projectURL(pid) + "/costs" }
func economicsURL(pid int64) string    { return projectURL(pid) + "/economics" }
func importURL(pid int64) string       { return projectURL(pid) + "/import" }

// importJobURL is the progress page of a background import.
func importJobURL(projectID int64, id string) string {
	return fmt.Sprintf("/projects/%d/import/jobs/%s", projectID, id)
}

// projectSystem is a project's unit system (SI unless it says US).
func projectSystem(p store.Project) units.System {
	if units.System(p.Units) == units.US {
		return units.US
	}
	return units.SI
}
