package handlers

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"math"
	"slices"
	"strings"

	"lagwright/analysis"
	"lagwright/catalog"
	"lagwright/linelist"
	"lagwright/results"
	"lagwright/store"
	"lagwright/units"
)

// importPlan is a line list checked against a project: every row parsed, its material
// and jacket resolved through the library, its tag checked, and its analysis run with
// the project's settings. When Problems is empty, Lines is ready for store.CreateLines
// with the results stored beside each line (so the project page computes nothing).
type importPlan struct {
	Project   store.Project
	Sys       units.System // the project's display units
	Rows      []linelist.Row
	Results   []analysis.Stored // per row, nil Output where the row had a problem
	Problems  []linelist.RowError
	Lines     []store.Line
	Materials store.LineMaterials
	lib       *store.Library
}

// OK reports whether the import can be saved.
func (p *importPlan) OK() bool { return len(p.Problems) == 0 && len(p.Lines) > 0 }

// importChunk is how many rows are analysed between progress reports (each chunk on
// every core).
const importChunk = 250

// planImport checks a line list against project p. progress, when given, is told how
// many rows have been analysed so far. The returned error is for internal failures
// only; problems with the file are in plan.Problems.
func (s *Server) planImport(ctx context.Context, p store.Project, text []byte, progress func(done, total int)) (*importPlan, error) {
	plan := &importPlan{Project: p, Sys: projectSystem(p)}
	rows, problems := linelist.Parse(bytes.NewReader(text))
	plan.Rows, plan.Problems = rows, problems
	for _, e := range problems {
		if e.Row <= 1 { // the header or the file as a whole: nothing more to check
			plan.Rows = nil
			return plan, nil
		}
	}
	set, err := results.Settings(p)
	if err != nil {
		return nil, err
	}
	lib, err := s.library(ctx)
	if err != nil {
		return nil, err
	}
	plan.lib = lib
	existing, err := s.store.Lines(ctx, p.ID)
	if err != nil {
		return nil, err
	}
	taken := make(map[string]int, len(existing)+len(rows)) // tag → row (0: an existing line)
	for _, l := range existing {
		taken[l.Tag] = 0
	}

	bad := make([]bool, len(rows))
	add := func(i int, field, format string, args ...any) {
		bad[i] = true
		plan.Problems = append(plan.Problems, linelist.RowError{Row: rows[i].Row, Field: field, Message: fmt.Sprintf(format, args...)})
	}
	for i := range rows {
		r := &rows[i]
		if prev, dup := taken[r.Tag]; dup {
			if prev == 0 {
				add(i, r.Column("tag"), "tag %q is already used in this project", r.Tag)
			} else {
				add(i, r.Column("tag"), "tag %q is already used on row %d", r.Tag, prev)
			}
		} else {
			taken[r.Tag] = r.Row
		}
		for j := range r.Input.Layers {
			slug, ok := materialSlug(lib, r.Input.Layers[j].Material)
			if !ok {
				add(i, r.Column(fmt.Sprintf("layers[%d].material", j)),
					"unknown material %q: give its slug or name from the Materials page (e.g. mineral_fiber_pipe_c547_t1)", r.Input.Layers[j].Material)
				continue
			}
			r.Input.Layers[j].Material = slug
		}
		if r.Input.Jacket != "" {
			slug, ok := jacketSlug(lib, r.Input.Jacket)
			if !ok {
				add(i, r.Column("jacket"), "unknown jacket %q: give its slug or name (e.g. all_service_jacket, aluminium_weathered, pvc_jacket)", r.Input.Jacket)
			} else {
				r.Input.Jacket = slug
			}
		}
	}

	// Analyse every row that is still good, with the project's settings, in chunks so
	// that progress can be shown; each chunk runs on every core.
	effective := make([]analysis.Input, len(rows))
	var todo []int
	for i, r := range rows {
		effective[i] = set.Effective(r.Location, r.Input, r.Fittings)
		if !bad[i] {
			todo = append(todo, i)
		}
	}
	plan.Results = make([]analysis.Stored, len(rows))
	for start := 0; start < len(todo); start += importChunk {
		if err := ctx.Err(); err != nil {
			return nil, err
		}
		idx := todo[start:min(start+importChunk, len(todo))]
		in := make([]analysis.Input, len(idx))
		for k, i := range idx {
			in[k] = effective[i]
		}
		out, err := s.results.ComputeMany(lib, in)
		if err != nil {
			return nil, err
		}
		for k, i := range idx {
			plan.Results[i] = out[k]
		}
		if progress != nil {
			progress(start+len(idx), len(todo))
		}
	}
	for _, i := range todo {
		r, st := rows[i], plan.Results[i]
		for _, fe := range st.Errors {
			field := r.Column(fe.Field)
			msg := fe.Message
			if field == "" {
				field = fe.Field
				msg += " (from the project's settings)"
			}
			add(i, field, "%s", msg)
		}
		if st.Output != nil {
			serviceLimits(plan, lib, i, add)
		}
	}
	slices.SortStableFunc(plan.Problems, func(a, b linelist.RowError) int { return a.Row - b.Row })
	if len(plan.Problems) > 0 {
		return plan, nil
	}

	plan.Lines = make([]store.Line, len(rows))
	plan.Materials = make(store.LineMaterials, len(rows))
	for i, r := range rows {
		own, err := json.Marshal(r.Input)
		if err != nil {
			return nil, fmt.Errorf("import row %d: %w", r.Row, err)
		}
		fit, err := json.Marshal(r.Fittings)
		if err != nil {
			return nil, fmt.Errorf("import row %d: %w", r.Row, err)
		}
		plan.Lines[i] = store.Line{
			ProjectID: p.ID, Tag: r.Tag, Service: r.Service, Location: r.Location, Exposure: r.Exposure, Notes: r.Notes,
			Input: own, Fittings: fit, Result: plan.Results[i].Marshal(),
			ResultHash: results.Hash(lib, effective[i]),
		}
		plan.Materials[i], _ = r.Input.Slugs()
	}
	return plan, nil
}

// serviceLimits refuses a row whose layers would run outside their material's
// service temperatures (the solved faces of each layer against the material's limits).
func serviceLimits(plan *importPlan, lib *store.Library, i int, add func(int, string, string, ...any)) {
	r, out := plan.Rows[i], plan.Results[i].Output
	sys := r.System()
	for j, l := range r.Input.Layers {
		m, ok := lib.Material(l.Material)
		if !ok || j >= len(out.Layers) {
			continue
		}
		lo := math.Min(out.Layers[j].InnerTempC, out.Layers[j].OuterTempC)
		hi := math.Max(out.Layers[j].InnerTempC, out.Layers[j].OuterTempC)
		col := r.Column(fmt.Sprintf("layers[%d].material", j))
		switch {
		case hi > m.MaxC:
			add(i, col, "%s would reach %s, above its service limit of %s: choose a material rated for this temperature",
				m.Name, units.FormatUnit(units.Temp, sys, hi), units.FormatUnit(units.Temp, sys, m.MaxC))
		case lo < m.MinC:
			add(i, col, "%s would reach %s, below its service limit of %s: choose a material rated for this temperature",
				m.Name, units.FormatUnit(units.Temp, sys, lo), units.FormatUnit(units.Temp, sys, m.MinC))
		}
	}
}

// slugOf folds a name typed in a spreadsheet towards a slug: "Mineral Fiber-Pipe" →
// "mineral_fiber_pipe".
func slugOf(s string) string {
	s = strings.ToLower(strings.TrimSpace(s))
	return strings.Join(strings.FieldsFunc(s, func(r rune) bool { return r == ' ' || r == '-' || r == '_' }), "_")
}

// materialSlug resolves a material given by slug (any case and spacing) or by the
// name of a built-in material.
func materialSlug(lib *store.Library, s string) (string, bool) {
	for _, cand := range []string{s, slugOf(s)} {
		if _, ok := lib.Material(cand); ok {
			return cand, true
		}
	}
	for _, m := range catalog.Materials() {
		if strings.EqualFold(m.Name, strings.TrimSpace(s)) {
			if _, ok := lib.Material(m.Slug); ok {
				return m.Slug, true
			}
		}
	}
	return "", false
}

// jacketSlug resolves a jacket by slug or built-in name.
func jacketSlug(lib *store.Library, s string) (string, bool) {
	for _, cand := range []string{s, slugOf(s)} {
		if _, ok := lib.Jacket(cand); ok {
			return cand, true
		}
	}
	for _, j := range catalog.Jackets() {
		if strings.EqualFold(j.Name, strings.TrimSpace(s)) {
			if _, ok := lib.Jacket(j.Slug); ok {
				return j.Slug, true
			}
		}
	}
	return "", false
}
