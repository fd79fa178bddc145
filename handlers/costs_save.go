package handlers

import (
	"net/http"
	"slices"

	"github.com/a-h/templ"

	"lagwright/analysis"
	"lagwright/store"
	"lagwright/web"
)

// costsSave handles POST /projects/{id}/costs: the grid and the pasted rows become the
// project's cost table, all or nothing. Problems re-render the form with the input and
// a message beside each bad row or pasted line (422); a stale project version is 409.
func (s *Server) costsSave(w http.ResponseWriter, r *http.Request) {
	p, _ := projectOf(r)
	lib, err := s.library(r.Context())
	if err != nil {
		s.fail(w, r, err)
		return
	}
	f, err := parseCostsForm(r, projectSystem(p), lib)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	if !f.ok() {
		rows := slices.DeleteFunc(f.rows, func(r web.CostRowView) bool {
			return r.Delete || (r.Material == "" && r.Size == "" && r.Thickness == "" && r.Cost == "")
		})
		v := s.costsView(p, lib, rows)
		v.Version = f.version
		v.Paste, v.PasteErrors, v.Errors = f.paste, f.pasteErrors, append(f.formErrors, "Nothing was saved: correct the marked rows.")
		w.Header().Set("Cache-Control", "no-store")
		templ.Handler(web.Costs(v), templ.WithStatus(http.StatusUnprocessableEntity)).ServeHTTP(w, r)
		return
	}
	if err := s.saveCostTable(r, p, f.version, f.table); err != nil {
		s.fail(w, r, err)
		return
	}
	http.Redirect(w, r, costsURL(p.ID)+"?saved=1", http.StatusSeeOther)
}

// saveCostTable stores a cost table in the project's settings at the version the user saw.
func (s *Server) saveCostTable(r *http.Request, p store.Project, version int, t analysis.CostTable) error {
	js, err := withCostTable(p.Settings, t)
	if err != nil {
		return err
	}
	p.Settings, p.Version = js, version
	_, err = s.store.UpdateProject(r.Context(), p)
	return err // store.ErrConflict → 409
}
