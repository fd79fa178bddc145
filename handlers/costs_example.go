package handlers

import (
	"net/http"
	"slices"

	"lagwright/analysis"
	"lagwright/catalog"
	"lagwright/field"
	"lagwright/results"
)

// costsExample handles POST /projects/{id}/costs/example: it adds the labelled example
// cost rows (analysis.ExampleCostRows) for the outer materials of the project's lines,
// or a mineral-fibre pipe section when there are no lines, replacing earlier example
// rows and keeping the user's own (an example row never shadows a user row).
func (s *Server) costsExample(w http.ResponseWriter, r *http.Request) {
	p, set := projectOf(r)
	if err := r.ParseForm(); err != nil {
		s.fail(w, r, err)
		return
	}
	version, err := parseVersion(r.PostForm.Get("version"))
	if err != nil {
		s.fail(w, r, Invalid(field.Error{Field: "version", Message: "is required (the version of the project you saw)"}))
		return
	}
	lib, err := s.library(r.Context())
	if err != nil {
		s.fail(w, r, err)
		return
	}
	lines, err := s.store.Lines(r.Context(), p.ID)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	var mats []string
	for _, l := range lines {
		own, _, err := results.Decode(l)
		if err != nil {
			continue
		}
		if m := outerMaterial(own); m != "" && !slices.Contains(mats, m) {
			if _, ok := lib.Material(m); ok {
				mats = append(mats, m)
			}
		}
	}
	if len(mats) == 0 {
		mats = []string{"mineral_fiber_pipe_c547_t1"}
	}
	series := func(slug string) []float64 {
		if m, ok := lib.Material(slug); ok && len(m.ThicknessesMM) > 0 {
			return m.ThicknessesMM
		}
		return catalog.ThicknessSeriesInch()
	}
	table := slices.DeleteFunc(slices.Clone(set.CostTable), func(c analysis.CostRow) bool { return c.Example })
	for _, ex := range analysis.ExampleCostRows(mats, series) {
		if !slices.ContainsFunc(table, func(c analysis.CostRow) bool {
			return c.Material == ex.Material && analysis.NormalSize(c.NominalSize) == analysis.AnySize && c.ThicknessMM == ex.ThicknessMM
		}) {
			table = append(table, ex)
		}
	}
	if err := s.saveCostTable(r, p, version, table); err != nil {
		s.fail(w, r, err)
		return
	}
	http.Redirect(w, r, costsURL(p.ID)+"?saved=1", http.StatusSeeOther)
}
