package handlers

import (
	"encoding/json"
	"fmt"
	"net/http"
	"time"

	"lagwright/analysis"
	"lagwright/field"
	"lagwright/schedule"
	"lagwright/store"
	"lagwright/units"
)

// scheduleHead is the project as the schedule names it.
func scheduleHead(p store.Project, set analysis.ProjectSettings) schedule.Project {
	return schedule.Project{ID: p.ID, Name: p.Name, Client: p.Client, Site: p.Site, Units: units.System(p.Units), Settings: set}
}

// draftSchedule is the schedule of the route's project's current lines, not issued.
// The lines are streamed (results.StreamSchedule): a big project's answers are never
// held at once.
func (s *Server) draftSchedule(r *http.Request) (schedule.Schedule, error) {
	p, set := projectOf(r)
	lib, err := s.library(r.Context())
	if err != nil {
		return schedule.Schedule{}, err
	}
	b := schedule.NewBuilder(scheduleHead(p, set), lib, 0, time.Now())
	if err := s.results.StreamSchedule(r.Context(), p.ID, set, lib, b.Add); err != nil {
		return schedule.Schedule{}, err
	}
	return b.Schedule(), nil
}

// revisionSchedule decodes an issued revision's snapshot.
func revisionSchedule(rev store.ScheduleRevision) (schedule.Schedule, error) {
	var sc schedule.Schedule
	if err := json.Unmarshal(rev.Header, &sc.Header); err != nil {
		return sc, fmt.Errorf("revision %d header: %w", rev.Number, err)
	}
	if err := json.Unmarshal(rev.Rows, &sc.Rows); err != nil {
		return sc, fmt.Errorf("revision %d rows: %w", rev.Number, err)
	}
	if err := json.Unmarshal(rev.Totals, &sc.Totals); err != nil {
		return sc, fmt.Errorf("revision %d totals: %w", rev.Number, err)
	}
	return sc, nil
}

// revParam reads ?rev=N: 0 when absent (the draft).
func revParam(r *http.Request) (int, error) {
	v := r.URL.Query().Get("rev")
	if v == "" {
		return 0, nil
	}
	n, err := parseVersion(v)
	if err != nil {
		return 0, Invalid(field.Error{Field: "rev", Message: "must be a revision number (1, 2, …)"})
	}
	return n, nil
}

// requestedSchedule is the draft, or the issued revision that ?rev=N names, of the
// route's project.
func (s *Server) requestedSchedule(r *http.Request) (projectID int64, sc schedule.Schedule, err error) {
	p, _ := projectOf(r)
	rev, err := revParam(r)
	if err != nil {
		return 0, sc, err
	}
	if rev == 0 {
		sc, err = s.draftSchedule(r)
		return p.ID, sc, err
	}
	stored, err := s.store.Revision(r.Context(), p.ID, rev)
	if err != nil {
		return 0, sc, err
	}
	sc, err = revisionSchedule(stored)
	return p.ID, sc, err
}
