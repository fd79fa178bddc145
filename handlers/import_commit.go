package handlers

import (
	"net/http"
	"strings"

	"github.com/a-h/templ"

	"lagwright/web"
)

// importCommit saves a previewed line list: POST /projects/{id}/import/commit with
// the original text re-posted (field "text"), so nothing is kept on the server between
// preview and commit. The list is checked and analysed again; all lines are saved in
// one transaction or none. Large lists run in the background and the browser is sent
// to the progress page; small ones are saved at once and the browser is sent to the
// project (303).
func (s *Server) importCommit(w http.ResponseWriter, r *http.Request) {
	p, _ := projectOf(r)
	text, err := importFormText(r, "text")
	if err != nil {
		s.fail(w, r, err)
		return
	}
	if strings.TrimSpace(text) == "" {
		http.Redirect(w, r, importURL(p.ID), http.StatusSeeOther)
		return
	}
	if strings.Count(text, "\n") > importJobRows {
		id, err := s.startImportJob(r.Context(), p, []byte(text))
		if err != nil {
			s.fail(w, r, err)
			return
		}
		http.Redirect(w, r, importJobURL(p.ID, id), http.StatusSeeOther)
		return
	}
	plan, err := s.planImport(r.Context(), p, []byte(text), nil)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	if !plan.OK() { // changed since the preview (a tag taken meanwhile, a material deleted)
		w.Header().Set("Cache-Control", "no-store")
		templ.Handler(web.ImportPage(s.importView(p, text, plan)), templ.WithStatus(http.StatusUnprocessableEntity)).ServeHTTP(w, r)
		return
	}
	if _, err := s.store.CreateLines(r.Context(), p.ID, plan.Lines, plan.Materials); err != nil {
		s.fail(w, r, err)
		return
	}
	http.Redirect(w, r, projectURL(p.ID), http.StatusSeeOther)
}
