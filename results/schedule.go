package results

import (
	"context"
	"runtime"
	"sync"

	"lagwright/analysis"
	"lagwright/schedule"
	"lagwright/store"
)

// ScheduleLine is a line as the schedule takes it.
func ScheduleLine(v Line) schedule.Line {
	l := schedule.Line{
		ID: v.Line.ID, Tag: v.Line.Tag, Service: v.Line.Service, Location: v.Line.Location, Exposure: v.Line.Exposure,
		Notes: v.Line.Notes, Input: v.Effective, Fittings: v.Fittings,
	}
	setAnswer(&l, v.Result)
	return l
}

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
