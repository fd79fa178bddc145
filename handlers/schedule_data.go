package handlers

import (
	"context"
	"encoding/json"
	"fmt"
	"net/http"
	"runtime"
	"strconv"
	"sync"
	"sync/atomic"
	"time"

	"github.com/go-chi/chi/v5"

	"lagwright/analysis"
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
// economics table), as the plain data package schedule takes, and the library that
// names their materials and jackets: for the calculation sheet, which shows the
// assumptions and warnings too. The schedule and its exports stream instead
// (draftSchedule).
//
// It reads the lines raw and decodes them on every core; when any line's stored
// answer is stale, it falls back to projectLines, which recomputes and saves the stale
// ones, so the freshness rule is the one every page uses.
func (s *Server) scheduleInput(ctx context.Context, projectID int64) (schedule.Project, []schedule.Line, *store.Library, error) {
	p, err := s.store.Project(ctx, projectID)
	if err != nil {
		return schedule.Project{}, nil, nil, err
	}
	set, err := ProjectSettings(p)
	if err != nil {
		return schedule.Project{}, nil, nil, err
	}
	sp := schedule.Project{ID: p.ID, Name: p.Name, Client: p.Client, Site: p.Site, Units: units.System(p.Units), Settings: set}
	lib, err := s.store.Library(ctx)
	if err != nil {
		return sp, nil, nil, err
	}
	raw, err := s.store.ScheduleLines(ctx, projectID)
	if err != nil {
		return sp, nil, nil, err
	}
	lines, fresh, err := decodeScheduleLines(set, raw, lib)
	if err != nil {
		return sp, nil, nil, err
	}
	if fresh {
		return sp, lines, lib, nil
	}
	_, views, err := s.projectLines(ctx, p)
	if err != nil {
		return sp, nil, nil, err
	}
	lines = make([]schedule.Line, len(views))
	for i, v := range views {
		lines[i] = scheduleLine(v)
	}
	return sp, lines, lib, nil
}

// decodeScheduleLines decodes raw lines on every core. fresh is false as soon as one
// line's stored answer does not match its effective input (then lines is incomplete).
func decodeScheduleLines(set analysis.ProjectSettings, raw []store.ScheduleLine, lib *store.Library) ([]schedule.Line, bool, error) {
	lines := make([]schedule.Line, len(raw))
	workers := max(1, min(runtime.GOMAXPROCS(0), len(raw)/256))
	var stale atomic.Bool
	errs := make([]error, workers)
	var wg sync.WaitGroup
	for w := range workers {
		wg.Go(func() {
			for i := w; i < len(raw) && !stale.Load(); i += workers {
				r := raw[i]
				var own analysis.Input
				var fit analysis.Fittings
				if err := json.Unmarshal(r.Input, &own); err != nil {
					errs[w] = fmt.Errorf("line %d input: %w", r.ID, err)
					return
				}
				if len(r.Fittings) > 0 {
					if err := json.Unmarshal(r.Fittings, &fit); err != nil {
						errs[w] = fmt.Errorf("line %d fittings: %w", r.ID, err)
						return
					}
				}
				eff := set.Effective(r.Location, own, fit)
				var res slimStored
				if len(r.Result) == 0 || analysis.ResultHash(eff, versions(lib, eff)) != r.ResultHash ||
					json.Unmarshal(r.Result, &res) != nil {
					stale.Store(true)
					return
				}
				l := schedule.Line{ID: r.ID, Tag: r.Tag, Service: r.Service, Location: r.Location, Exposure: r.Exposure,
					Notes: r.Notes, Input: eff, Fittings: fit}
				if res.Output != nil {
					l.Output = res.Output.Output
				}
				for _, e := range res.Errors {
					l.Errors = append(l.Errors, e.Field+": "+e.Message)
				}
				lines[i] = l
			}
		})
	}
	wg.Wait()
	for _, err := range errs {
		if err != nil {
			return nil, false, err
		}
	}
	return lines, !stale.Load(), nil
}

func scheduleLine(v LineView) schedule.Line {
	l := schedule.Line{
		ID: v.Line.ID, Tag: v.Line.Tag, Service: v.Line.Service, Location: v.Line.Location, Exposure: v.Line.Exposure,
		Notes: v.Line.Notes, Input: v.Effective, Fittings: v.Fittings, Output: v.Result.Output,
	}
	for _, e := range v.Result.Errors {
		l.Errors = append(l.Errors, e.Field+": "+e.Message)
	}
	return l
}

// draftSchedule is the schedule of the current lines, not issued. The lines are
// streamed (freshScheduleLines): a big project's answers are never held at once.
func (s *Server) draftSchedule(ctx context.Context, projectID int64) (schedule.Schedule, error) {
	p, err := s.store.Project(ctx, projectID)
	if err != nil {
		return schedule.Schedule{}, err
	}
	set, err := ProjectSettings(p)
	if err != nil {
		return schedule.Schedule{}, err
	}
	lib, err := s.store.Library(ctx)
	if err != nil {
		return schedule.Schedule{}, err
	}
	sp := schedule.Project{ID: p.ID, Name: p.Name, Client: p.Client, Site: p.Site, Units: units.System(p.Units), Settings: set}
	b := schedule.NewBuilder(sp, lib, 0, time.Now())
	if err := s.freshScheduleLines(ctx, p.ID, set, lib, b.Add); err != nil {
		return schedule.Schedule{}, err
	}
	return b.Schedule(), nil
}

// scheduleBatch is how many lines travel together through freshScheduleLines.
const scheduleBatch = 256

// lineBatch is one batch of lines on its way from the database to the schedule.
type lineBatch struct {
	raw     []store.StreamedLine
	lines   []schedule.Line
	updates []store.ResultUpdate
	err     error
	done    chan struct{} // closed when lines, updates and err are set
}

// freshScheduleLines hands add a project's lines in order, each with a fresh answer
// holding what the schedule reads, with the freshness rule of projectLines: a line
// whose stored answer was computed from the same effective input, material versions
// and method version is read back as stored, the stale ones are analysed and saved,
// so a fresh project does no physics.
//
// It is a pipeline: one goroutine reads the lines in batches (the stored answers cut
// down in the database to the parts the schedule reads, schedule.ResultPaths), one
// decoder per core decodes and checks the batches (recomputing the stale lines), and
// the caller's goroutine adds them in order. At most a few batches are in flight.
func (s *Server) freshScheduleLines(ctx context.Context, projectID int64, set analysis.ProjectSettings, lib *store.Library,
	add func(schedule.Line)) error {
	ctx, cancel := context.WithCancel(ctx)
	defer cancel()
	workers := max(1, runtime.GOMAXPROCS(0))
	work := make(chan *lineBatch)
	ordered := make(chan *lineBatch, 2*workers)
	var wg sync.WaitGroup
	for range workers {
		wg.Go(func() {
			for b := range work {
				b.lines, b.updates, b.err = decodeStreamedLines(set, lib, b.raw)
				b.raw = nil
				close(b.done)
			}
		})
	}
	readErr := make(chan error, 1)
	go func() {
		defer close(ordered)
		defer close(work)
		readErr <- s.store.EachScheduleLines(ctx, projectID, schedule.ResultPaths(), scheduleBatch, func(raw []store.StreamedLine) error {
			b := &lineBatch{raw: raw, done: make(chan struct{})}
			// To a decoder first, then in line: a batch in the queue is always being decoded.
			select {
			case work <- b:
			case <-ctx.Done():
				return ctx.Err()
			}
			select {
			case ordered <- b:
			case <-ctx.Done():
				return ctx.Err()
			}
			return nil
		})
	}()
	var err error
	var updates []store.ResultUpdate
	for b := range ordered {
		if err != nil {
			continue // drain until the reader stops
		}
		<-b.done
		if b.err != nil {
			err = b.err
			cancel()
			continue
		}
		for _, l := range b.lines {
			add(l)
		}
		updates = append(updates, b.updates...)
	}
	wg.Wait()
	if rerr := <-readErr; err == nil {
		err = rerr
	}
	if err != nil {
		return err
	}
	// Saved after the read, so the export never needs a second connection while the
	// first is streaming.
	return s.store.SaveResults(ctx, updates)
}

// decodeStreamedLines decodes a batch of streamed lines and recomputes the stale ones,
// returning the results to save for those.
func decodeStreamedLines(set analysis.ProjectSettings, lib *store.Library, raw []store.StreamedLine) ([]schedule.Line, []store.ResultUpdate, error) {
	lines := make([]schedule.Line, len(raw))
	var updates []store.ResultUpdate
	for i, r := range raw {
		var own analysis.Input
		var fit analysis.Fittings
		if err := json.Unmarshal(r.Input, &own); err != nil {
			return nil, nil, fmt.Errorf("line %d input: %w", r.ID, err)
		}
		if len(r.Fittings) > 0 {
			if err := json.Unmarshal(r.Fittings, &fit); err != nil {
				return nil, nil, fmt.Errorf("line %d fittings: %w", r.ID, err)
			}
		}
		eff := set.Effective(r.Location, own, fit)
		hash := analysis.ResultHash(eff, versions(lib, eff))
		var st analysis.Stored
		fresh := r.HasResult && r.ResultHash == hash
		if fresh {
			var err error
			st, err = schedule.StoredFromParts(r.ResultParts)
			fresh = err == nil
		}
		if !fresh {
			out, err := analysis.Analyse(eff, lib)
			if fe, ok := err.(analysis.FieldErrors); ok {
				st = analysis.Stored{Errors: fe}
			} else if err != nil {
				return nil, nil, fmt.Errorf("line %d: %w", r.ID, err)
			} else {
				st = analysis.Stored{Output: out}
			}
			updates = append(updates, store.ResultUpdate{LineID: r.ID, Result: st.Marshal(), Hash: hash})
		}
		l := schedule.Line{ID: r.ID, Tag: r.Tag, Service: r.Service, Location: r.Location, Exposure: r.Exposure,
			Notes: r.Notes, Input: eff, Fittings: fit, Output: st.Output}
		for _, e := range st.Errors {
			l.Errors = append(l.Errors, e.Field+": "+e.Message)
		}
		lines[i] = l
	}
	return lines, updates, nil
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

// slimStored decodes a stored answer without its economics table, which neither the
// schedule nor the calculation sheet shows: less to allocate on big projects.
type slimStored struct {
	Output *slimOutput          `json:"output"`
	Errors analysis.FieldErrors `json:"errors"`
}

type slimOutput struct {
	*analysis.Output
	Economics skipJSON `json:"economics"` // shadows Output.Economics
}

// skipJSON accepts any JSON value and keeps nothing.
type skipJSON struct{}

func (*skipJSON) UnmarshalJSON([]byte) error { return nil }
