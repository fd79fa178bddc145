package handlers

import (
	"context"
	"encoding/json"
	"fmt"
	"net/http"
	"strconv"
	"time"

	"github.com/go-chi/chi/v5"

	"lagwright/analysis"
	"lagwright/results"
	"lagwright/schedule"
	"lagwright/store"
	"lagwright/units"
)

// pathID reads a positive integer path parameter; anything else is "no such what".
func pathID(r *http.Request, name, what string) (int64, error) {
	id, err := strconv.ParseInt(chi.URLParam(r, name), 10, 64)
	if err != nil || id <= 0 {
		return 0, NotFound(what)
	}
	return id, nil
}

// scheduleInput loads a project and its lines with fresh, whole answers (less the
// economics table) for the calculation sheet (results.ScheduleLines), and the library
// that names their materials and jackets.
func (s *Server) scheduleInput(ctx context.Context, projectID int64) (schedule.Project, []schedule.Line, *store.Library, error) {
	p, set, lib, err := s.scheduleProject(ctx, projectID)
	if err != nil {
		return schedule.Project{}, nil, nil, err
	}
	lines, err := s.results.ScheduleLines(ctx, p, set, lib)
	return scheduleHead(p, set), lines, lib, err
}

// scheduleProject loads the project with its settings and the request's library.
func (s *Server) scheduleProject(ctx context.Context, projectID int64) (store.Project, analysis.ProjectSettings, *store.Library, error) {
	p, err := s.store.Project(ctx, projectID)
	if err != nil {
		return p, analysis.ProjectSettings{}, nil, err
	}
	set, err := results.Settings(p)
	if err != nil {
		return p, set, nil, err
	}
	lib, err := s.library(ctx)
	return p, set, lib, err
}

// scheduleHead is the project as the schedule names it.
func scheduleHead(p store.Project, set analysis.ProjectSettings) schedule.Project {
	return schedule.Project{ID: p.ID, Name: p.Name, Client: p.Client, Site: p.Site, Units: units.System(p.Units), Settings: set}
}

// draftSchedule is the schedule of the current lines, not issued. The lines are
// streamed (results.StreamSchedule): a big project's answers are never held at once.
func (s *Server) draftSchedule(ctx context.Context, projectID int64) (schedule.Schedule, error) {
	p, set, lib, err := s.scheduleProject(ctx, projectID)
	if err != nil {
		return schedule.Schedule{}, err
	}
	b := schedule.NewBuilder(scheduleHead(p, set), lib, 0, time.Now())
	if err := s.results.StreamSchedule(ctx, p.ID, set, lib, b.Add); err != nil {
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
	n, err := strconv.Atoi(v)
	if err != nil || n <= 0 {
		return 0, Invalid(FieldError{Field: "rev", Message: "must be a revision number (1, 2, …)"})
	}
	return n, nil
}

// requestedSchedule is the draft, or the issued revision that ?rev=N names.
func (s *Server) requestedSchedule(r *http.Request) (projectID int64, sc schedule.Schedule, err error) {
	projectID, err = pathID(r, "id", "project")
	if err != nil {
		return 0, sc, err
	}
	rev, err := revParam(r)
	if err != nil {
		return 0, sc, err
	}
	if rev == 0 {
		sc, err = s.draftSchedule(r.Context(), projectID)
		return projectID, sc, err
	}
	if _, err := s.store.Project(r.Context(), projectID); err != nil {
		return 0, sc, err
	}
	stored, err := s.store.Revision(r.Context(), projectID, rev)
	if err != nil {
		return 0, sc, err
	}
	sc, err = revisionSchedule(stored)
	return projectID, sc, err
}
