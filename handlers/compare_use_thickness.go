package handlers

import (
	"encoding/json"
	"net/http"
	"strconv"

	"lagwright/field"
)

// compareUseThickness handles POST /projects/{id}/lines/{line}/thickness: it sets the
// thickness of the line's outermost layer to thickness_mm (SI, from the compare table),
// recomputes the line's answer and saves it if the line is still at `version` (409
// otherwise), then sends the browser to the line page (303).
func (s *Server) compareUseThickness(w http.ResponseWriter, r *http.Request) {
	c, err := loadCompareLine(r)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	if err := r.ParseForm(); err != nil {
		s.fail(w, r, err)
		return
	}
	var problems []field.Error
	t, err := strconv.ParseFloat(r.PostForm.Get("thickness_mm"), 64)
	if err != nil || !(t > 0 && t <= 600) {
		problems = append(problems, field.Error{Field: "thickness_mm", Message: "must be a thickness greater than 0 and at most 600 mm"})
	}
	version, err := parseVersion(r.PostForm.Get("version"))
	if err != nil {
		problems = append(problems, field.Error{Field: "version", Message: "is required (the version of the line you saw)"})
	}
	n := len(c.Own.Layers)
	if n == 0 {
		problems = append(problems, field.Error{Field: "layers", Message: "the line is bare: add an insulation layer first"})
	}
	if len(problems) > 0 {
		s.fail(w, r, Invalid(problems...))
		return
	}
	if version != c.Line.Version {
		s.fail(w, r, &Error{Code: CodeConflict, Message: "The line changed since you opened the comparison; reload and try again."})
		return
	}
	own := c.Own
	own.Layers = append(own.Layers[:0:0], c.Own.Layers...)
	own.Layers[n-1].ThicknessMM = &t
	lib, err := s.library(r.Context())
	if err != nil {
		s.fail(w, r, err)
		return
	}
	st, hash, err := s.results.Compute(lib, c.Set, c.Line, own, c.Fit)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	js, err := json.Marshal(own)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	l := c.Line
	l.Input, l.Result, l.ResultHash, l.Version = js, st.Marshal(), hash, version
	materials, _ := own.Slugs()
	if _, err := s.store.UpdateLine(r.Context(), l, materials); err != nil {
		s.fail(w, r, err) // store.ErrConflict → 409
		return
	}
	http.Redirect(w, r, lineURL(c.Project.ID, c.Line.ID), http.StatusSeeOther)
}
