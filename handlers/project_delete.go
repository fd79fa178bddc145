package handlers

import (
	"errors"
	"fmt"
	"net/http"

	"github.com/a-h/templ"

	"lagwright/store"
	"lagwright/web"
)

// projectDeleteConfirm asks before deleting a project (GET changes nothing).
func (s *Server) projectDeleteConfirm(w http.ResponseWriter, r *http.Request) {
	p, _ := projectOf(r)
	lines, err := s.store.Lines(r.Context(), p.ID)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	base := fmt.Sprintf("/projects/%d", p.ID)
	v := web.ProjectDeleteView{Assets: s.assets.urls, Name: p.Name, Lines: len(lines), ProjectURL: base, Action: base + "/delete"}
	templ.Handler(web.ProjectDelete(v)).ServeHTTP(w, r)
}

// projectDelete deletes a project with its lines (POST; viewers are refused by the
// authentication middleware) and returns to the project list.
func (s *Server) projectDelete(w http.ResponseWriter, r *http.Request) {
	p, _ := projectOf(r)
	if err := s.store.DeleteProject(r.Context(), p.ID); err != nil {
		if errors.Is(err, store.ErrNotFound) {
			err = NotFound("project")
		}
		s.fail(w, r, err)
		return
	}
	http.Redirect(w, r, "/projects", http.StatusSeeOther)
}
