package results

import (
	"context"
	"encoding/json"
	"runtime"
	"sync"
	"sync/atomic"

	"lagwright/analysis"
	"lagwright/schedule"
	"lagwright/store"
)

// ScheduleLines loads a project's lines with fresh, whole answers (less the
// economics table) as the plain data package schedule takes: for the calculation
// sheet, which shows the assumptions and warnings too. The schedule and its exports
// stream instead (StreamSchedule).
//
// It reads the lines raw and decodes them on every core; when any line's stored
// answer is stale, it falls back to Project, which recomputes and saves the stale ones.
func (r *Results) ScheduleLines(ctx context.Context, p store.Project, set analysis.ProjectSettings, lib *store.Library) ([]schedule.Line, error) {
	raw, err := r.store.ScheduleLines(ctx, p.ID)
	if err != nil {
		return nil, err
	}
	lines, fresh, err := decodeScheduleLines(set, raw, lib)
	if err != nil || fresh {
		return lines, err
	}
	views, err := r.Project(ctx, p, set, lib)
	if err != nil {
		return nil, err
	}
	lines = make([]schedule.Line, len(views))
	for i, v := range views {
		lines[i] = ScheduleLine(v)
	}
	return lines, nil
}

// ScheduleLine is a line as the schedule takes it.
func ScheduleLine(v Line) schedule.Line {
	l := schedule.Line{
		ID: v.Line.ID, Tag: v.Line.Tag, Service: v.Line.Service, Location: v.Line.Location, Exposure: v.Line.Exposure,
		Notes: v.Line.Notes, Input: v.Effective, Fittings: v.Fittings, Output: v.Result.Output,
	}
	for _, e := range v.Result.Errors {
		l.Errors = append(l.Errors, e.Field+": "+e.Message)
	}
	return l
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
				rl := raw[i]
				own, fit, err := decode(rl.ID, rl.Input, rl.Fittings)
				if err != nil {
					errs[w] = err
					return
				}
				eff := set.Effective(rl.Location, own, fit)
				var res slimStored
				if len(rl.Result) == 0 || Hash(lib, eff) != rl.ResultHash || json.Unmarshal(rl.Result, &res) != nil {
					stale.Store(true)
					return
				}
				l := schedule.Line{ID: rl.ID, Tag: rl.Tag, Service: rl.Service, Location: rl.Location, Exposure: rl.Exposure,
					Notes: rl.Notes, Input: eff, Fittings: fit}
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

// scheduleBatch is how many lines travel together through StreamSchedule.
const scheduleBatch = 256

// lineBatch is one batch of lines on its way from the database to the schedule.
type lineBatch struct {
	raw     []store.StreamedLine
	lines   []schedule.Line
	updates []store.ResultUpdate
	err     error
	done    chan struct{} // closed when lines, updates and err are set
}

// StreamSchedule hands add a project's lines in order, each with a fresh answer
// holding what the schedule reads; the stale ones are analysed and saved, so a fresh
// project does no physics and a big project's answers are never held at once.
//
// It is a pipeline: one goroutine reads the lines in batches (the stored answers cut
// down in the database to the parts the schedule reads, schedule.ResultPaths), one
// decoder per core decodes and checks the batches (recomputing the stale lines), and
// the caller's goroutine adds them in order. At most a few batches are in flight.
func (r *Results) StreamSchedule(ctx context.Context, projectID int64, set analysis.ProjectSettings, lib *store.Library,
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
				b.lines, b.updates, b.err = r.decodeStreamed(set, lib, b.raw)
				b.raw = nil
				close(b.done)
			}
		})
	}
	readErr := make(chan error, 1)
	go func() {
		defer close(ordered)
		defer close(work)
		readErr <- r.store.EachScheduleLines(ctx, projectID, schedule.ResultPaths(), scheduleBatch, func(raw []store.StreamedLine) error {
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
	return r.store.SaveResults(ctx, updates)
}

// decodeStreamed decodes a batch of streamed lines and recomputes the stale ones,
// returning the answers to save for those.
func (r *Results) decodeStreamed(set analysis.ProjectSettings, lib *store.Library, raw []store.StreamedLine) ([]schedule.Line, []store.ResultUpdate, error) {
	lines := make([]schedule.Line, len(raw))
	var stale []int
	var staleInputs []analysis.Input
	var staleHashes []string
	for i, rl := range raw {
		own, fit, err := decode(rl.ID, rl.Input, rl.Fittings)
		if err != nil {
			return nil, nil, err
		}
		eff := set.Effective(rl.Location, own, fit)
		hash := Hash(lib, eff)
		lines[i] = schedule.Line{ID: rl.ID, Tag: rl.Tag, Service: rl.Service, Location: rl.Location, Exposure: rl.Exposure,
			Notes: rl.Notes, Input: eff, Fittings: fit}
		if rl.HasResult && rl.ResultHash == hash {
			if st, err := schedule.StoredFromParts(rl.ResultParts); err == nil {
				setAnswer(&lines[i], st)
				continue
			}
		}
		stale, staleInputs, staleHashes = append(stale, i), append(staleInputs, eff), append(staleHashes, hash)
	}
	if len(stale) == 0 {
		return lines, nil, nil
	}
	out, err := r.engine(staleInputs, lib)
	if err != nil {
		return nil, nil, err
	}
	updates := make([]store.ResultUpdate, len(stale))
	for j, i := range stale {
		setAnswer(&lines[i], out[j])
		updates[j] = store.ResultUpdate{LineID: raw[i].ID, Result: out[j].Marshal(), Hash: staleHashes[j]}
	}
	return lines, updates, nil
}

// setAnswer puts a stored answer on a schedule line.
func setAnswer(l *schedule.Line, st analysis.Stored) {
	l.Output = st.Output
	for _, e := range st.Errors {
		l.Errors = append(l.Errors, e.Field+": "+e.Message)
	}
}
