package handlers

import (
	"context"
	"encoding/json"
	"fmt"

	"lagwright/analysis"
	"lagwright/store"
)

// LineView is a stored line with its effective calculation input and its answer.
type LineView struct {
	Line      store.Line
	Own       analysis.Input    // the line's own input, as stored
	Fittings  analysis.Fittings // its fitting counts
	Effective analysis.Input    // with the project's conditions and defaults filled in
	Result    analysis.Stored   // the analysis, or the field errors that stopped it
}

// ProjectSettings decodes a project's settings over the defaults.
func ProjectSettings(p store.Project) (analysis.ProjectSettings, error) {
	set := analysis.DefaultSettings()
	if len(p.Settings) > 0 {
		if err := json.Unmarshal(p.Settings, &set); err != nil {
			return set, fmt.Errorf("project %d settings: %w", p.ID, err)
		}
	}
	return set, nil
}

// versions lists the versions of the materials and jacket an input names.
func versions(lib *store.Library, in analysis.Input) analysis.Versions {
	mats, jacket := in.Slugs()
	v := analysis.Versions{}
	for _, m := range mats {
		v["material:"+m] = lib.Version("material:" + m)
	}
	if jacket != "" {
		v["jacket:"+jacket] = lib.Version("jacket:" + jacket)
	}
	return v
}

// decodeLine reads a stored line's own input and fittings.
func decodeLine(l store.Line) (analysis.Input, analysis.Fittings, error) {
	var in analysis.Input
	var fit analysis.Fittings
	if err := json.Unmarshal(l.Input, &in); err != nil {
		return in, fit, fmt.Errorf("line %d input: %w", l.ID, err)
	}
	if len(l.Fittings) > 0 {
		if err := json.Unmarshal(l.Fittings, &fit); err != nil {
			return in, fit, fmt.Errorf("line %d fittings: %w", l.ID, err)
		}
	}
	return in, fit, nil
}

// projectLines loads a project's lines with fresh answers. A line whose stored answer
// was computed from the same effective input, material versions and method version
// is read back as stored; the stale ones are analysed on every core and saved, so a
// page view of fresh lines does no physics.
func (s *Server) projectLines(ctx context.Context, p store.Project) (analysis.ProjectSettings, []LineView, error) {
	set, err := ProjectSettings(p)
	if err != nil {
		return set, nil, err
	}
	lines, err := s.store.Lines(ctx, p.ID)
	if err != nil {
		return set, nil, err
	}
	lib, err := s.store.Library(ctx)
	if err != nil {
		return set, nil, err
	}
	views := make([]LineView, len(lines))
	hashes := make([]string, len(lines))
	var stale []int
	for i, l := range lines {
		own, fit, err := decodeLine(l)
		if err != nil {
			return set, nil, err
		}
		eff := set.Effective(l.Location, own, fit)
		views[i] = LineView{Line: l, Own: own, Fittings: fit, Effective: eff}
		hashes[i] = analysis.ResultHash(eff, versions(lib, eff))
		if hashes[i] != l.ResultHash || len(l.Result) == 0 || json.Unmarshal(l.Result, &views[i].Result) != nil {
			stale = append(stale, i)
		}
	}
	if len(stale) == 0 {
		return set, views, nil
	}
	inputs := make([]analysis.Input, len(stale))
	for j, i := range stale {
		inputs[j] = views[i].Effective
	}
	results, err := analysis.AnalyseMany(inputs, lib)
	if err != nil {
		return set, nil, err
	}
	updates := make([]store.ResultUpdate, len(stale))
	for j, i := range stale {
		views[i].Result = results[j]
		updates[j] = store.ResultUpdate{LineID: views[i].Line.ID, Result: results[j].Marshal(), Hash: hashes[i]}
		views[i].Line.Result, views[i].Line.ResultHash = updates[j].Result, hashes[i]
	}
	if err := s.store.SaveResults(ctx, updates); err != nil {
		return set, nil, err
	}
	return set, views, nil
}

// analyseLine computes one line's answer for saving with it (the line form and the
// API), returning the stored answer and its hash.
func (s *Server) analyseLine(ctx context.Context, set analysis.ProjectSettings, l store.Line, own analysis.Input,
	fit analysis.Fittings) (analysis.Stored, string, error) {
	lib, err := s.store.Library(ctx)
	if err != nil {
		return analysis.Stored{}, "", err
	}
	eff := set.Effective(l.Location, own, fit)
	out, err := analysis.Analyse(eff, lib)
	var st analysis.Stored
	if fe, ok := err.(analysis.FieldErrors); ok {
		st.Errors = fe
	} else if err != nil {
		return st, "", err
	} else {
		st.Output = out
	}
	return st, analysis.ResultHash(eff, versions(lib, eff)), nil
}
