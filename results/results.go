// Package results owns every line's stored answer: when it is fresh, recomputing the
// stale ones on every core, saving them and reading them back. Every page, the API,
// the importer and the exports read answers through it, so no view runs the analysis
// for a line whose stored answer still holds, and how answers are stored stays here.
//
// An answer is fresh while its hash (analysis.ResultHash of the line's effective
// input with the versions of the materials and jacket it names, and the method
// version) matches the one saved beside it.
package results

import (
	"encoding/json"
	"fmt"

	"lagwright/analysis"
	"lagwright/store"
)

// Engine computes answers for inputs on every core. Results calls it only for lines
// whose stored answer is stale (or for input that is about to be saved).
type Engine func(inputs []analysis.Input, lib analysis.Resolver) ([]analysis.Stored, error)

// Results reads, checks, recomputes and saves stored answers. Build it with New.
type Results struct {
	store  *store.Store
	engine Engine
}

// New builds a Results over the store, computing with analysis.AnalyseMany.
func New(st *store.Store) *Results {
	return &Results{store: st, engine: analysis.AnalyseMany}
}

// WithEngine returns a copy that computes with e: tests count or forbid calls with it.
func (r *Results) WithEngine(e Engine) *Results {
	c := *r
	c.engine = e
	return &c
}

// Line is a stored line with its effective calculation input and its answer.
type Line struct {
	Line      store.Line
	Own       analysis.Input    // the line's own input, as stored
	Fittings  analysis.Fittings // its fitting counts
	Effective analysis.Input    // with the project's conditions and defaults filled in
	Result    analysis.Stored   // the analysis, or the field errors that stopped it
}

// Settings decodes a project's settings over the defaults.
func Settings(p store.Project) (analysis.ProjectSettings, error) {
	set := analysis.DefaultSettings()
	if len(p.Settings) > 0 {
		if err := json.Unmarshal(p.Settings, &set); err != nil {
			return set, fmt.Errorf("project %d settings: %w", p.ID, err)
		}
	}
	return set, nil
}

// Decode reads a stored line's own input and fittings.
func Decode(l store.Line) (analysis.Input, analysis.Fittings, error) {
	return decode(l.ID, l.Input, l.Fittings)
}

func decode(id int64, input, fittings []byte) (analysis.Input, analysis.Fittings, error) {
	var in analysis.Input
	var fit analysis.Fittings
	if err := json.Unmarshal(input, &in); err != nil {
		return in, fit, fmt.Errorf("line %d input: %w", id, err)
	}
	if len(fittings) > 0 {
		if err := json.Unmarshal(fittings, &fit); err != nil {
			return in, fit, fmt.Errorf("line %d fittings: %w", id, err)
		}
	}
	return in, fit, nil
}

// Hash is the freshness hash of an effective input: it changes when the input, a
// material or jacket it names, or the method changes.
func Hash(lib *store.Library, eff analysis.Input) string {
	return analysis.ResultHash(eff, versions(lib, eff))
}

// versions lists the versions of the materials, jacket and energy-code table an input names.
func versions(lib *store.Library, in analysis.Input) analysis.Versions {
	mats, jacket := in.Slugs()
	v := analysis.Versions{}
	for _, m := range mats {
		v["material:"+m] = lib.Version("material:" + m)
	}
	if jacket != "" {
		v["jacket:"+jacket] = lib.Version("jacket:" + jacket)
	}
	if in.Criteria != nil && in.Criteria.EnergyCode != "" { // an edited table makes its lines stale
		id := "code_table:" + in.Criteria.EnergyCode
		v[id] = lib.Version(id)
	}
	return v
}

// Compute analyses a line as it is about to be saved (the line form, the API, the
// compare screen's action) and returns its answer with the hash to save beside it.
func (r *Results) Compute(lib *store.Library, set analysis.ProjectSettings, l store.Line, own analysis.Input,
	fit analysis.Fittings) (analysis.Stored, string, error) {
	eff := set.Effective(l.Location, own, fit)
	out, err := r.engine([]analysis.Input{eff}, lib)
	if err != nil {
		return analysis.Stored{}, "", err
	}
	return out[0], Hash(lib, eff), nil
}

// ComputeMany analyses the effective inputs of lines about to be saved (an import)
// on every core; save each answer with its Hash.
func (r *Results) ComputeMany(lib *store.Library, effective []analysis.Input) ([]analysis.Stored, error) {
	return r.engine(effective, lib)
}
