package results

import (
	"context"
	"encoding/json"

	"lagwright/analysis"
	"lagwright/store"
)

// Project loads a project's lines with fresh, whole answers. A line whose stored
// answer still holds is read back as stored; the stale ones are analysed on every
// core and saved.
func (r *Results) Project(ctx context.Context, p store.Project, set analysis.ProjectSettings, lib *store.Library) ([]Line, error) {
	lines, err := r.store.Lines(ctx, p.ID)
	if err != nil {
		return nil, err
	}
	views := make([]Line, len(lines))
	hashes := make([]string, len(lines))
	var stale []int
	for i, l := range lines {
		own, fit, err := Decode(l)
		if err != nil {
			return nil, err
		}
		eff := set.Effective(l.Location, own, fit)
		views[i] = Line{Line: l, Own: own, Fittings: fit, Effective: eff}
		hashes[i] = Hash(lib, eff)
		if hashes[i] != l.ResultHash || len(l.Result) == 0 || json.Unmarshal(l.Result, &views[i].Result) != nil {
			views[i].Result = analysis.Stored{}
			stale = append(stale, i)
		}
	}
	if err := r.recompute(ctx, lib, views, stale, hashes); err != nil {
		return nil, err
	}
	return views, nil
}

// One gives one stored line with a fresh answer (recomputed and saved only if stale).
func (r *Results) One(ctx context.Context, set analysis.ProjectSettings, lib *store.Library, l store.Line) (Line, error) {
	own, fit, err := Decode(l)
	if err != nil {
		return Line{}, err
	}
	lv := Line{Line: l, Own: own, Fittings: fit, Effective: set.Effective(l.Location, own, fit)}
	hash := Hash(lib, lv.Effective)
	if hash == l.ResultHash && len(l.Result) > 0 && json.Unmarshal(l.Result, &lv.Result) == nil {
		return lv, nil
	}
	lv.Result = analysis.Stored{}
	views := []Line{lv}
	if err := r.recompute(ctx, lib, views, []int{0}, []string{hash}); err != nil {
		return Line{}, err
	}
	return views[0], nil
}

// recompute analyses views[i] for each i in stale, on every core, and saves the
// answers with their hashes (hashes[i]).
func (r *Results) recompute(ctx context.Context, lib *store.Library, views []Line, stale []int, hashes []string) error {
	if len(stale) == 0 {
		return nil
	}
	inputs := make([]analysis.Input, len(stale))
	for j, i := range stale {
		inputs[j] = views[i].Effective
	}
	results, err := r.engine(inputs, lib)
	if err != nil {
		return err
	}
	updates := make([]store.ResultUpdate, len(stale))
	for j, i := range stale {
		views[i].Result = results[j]
		updates[j] = store.ResultUpdate{LineID: views[i].Line.ID, Result: results[j].Marshal(), Hash: hashes[i]}
		views[i].Line.Result, views[i].Line.ResultHash = updates[j].Result, hashes[i]
	}
	return r.store.SaveResults(ctx, updates)
}
