package handlers

import (
	"errors"
	"fmt"
	"net/http"

	"github.com/a-h/templ"

	"lagwright/results"
	"lagwright/store"
	"lagwright/web"
)

// lineDuplicate copies a line (POST) under a new tag and opens the copy.
func (s *Server) lineDuplicate(w http.ResponseWriter, r *http.Request) {
	c, err := s.lineScope(r)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	own, _, err := results.Decode(c.line)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	mats, _ := own.Slugs()
	cp := c.line
	cp.ID, cp.Version = 0, 0
	for i := 1; i <= 50; i++ {
		cp.Tag = c.line.Tag + "-copy"
		if i > 1 {
			cp.Tag = fmt.Sprintf("%s-copy%d", c.line.Tag, i)
		}
		created, err := s.store.CreateLine(r.Context(), cp, mats)
		if errors.Is(err, store.ErrDuplicateTag) {
			continue
		}
		if err != nil {
			s.fail(w, r, err)
			return
		}
		http.Redirect(w, r, fmt.Sprintf("/projects/%d/lines/%d", c.p.ID, created.ID), http.StatusSeeOther)
		return
	}
	s.fail(w, r, &Error{Code: CodeConflict, Message: "Too many copies of this line already; rename some first."})
}

// lineDeleteConfirm asks before deleting (the page for browsers without JavaScript;
// with htmx the list's Delete link posts directly after a confirm dialog).
func (s *Server) lineDeleteConfirm(w http.ResponseWriter, r *http.Request) {
	c, err := s.lineScope(r)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	v := web.LineDeleteView{Assets: s.assets.urls, Tag: c.line.Tag, ProjectName: c.p.Name, ProjectURL: c.projectURL(),
		Action: fmt.Sprintf("/projects/%d/lines/%d/delete", c.p.ID, c.line.ID)}
	templ.Handler(web.LineDelete(v)).ServeHTTP(w, r)
}

// lineDelete deletes a line (POST) and returns to the project.
func (s *Server) lineDelete(w http.ResponseWriter, r *http.Request) {
	p, _ := projectOf(r)
	if err := s.store.DeleteLine(r.Context(), p.ID, lineOf(r).ID); err != nil {
		if errors.Is(err, store.ErrNotFound) {
			err = NotFound("line")
		}
		s.fail(w, r, err)
		return
	}
	to := fmt.Sprintf("/projects/%d", p.ID)
	if r.Header.Get("HX-Request") == "true" {
		w.Header().Set("HX-Redirect", to)
		w.WriteHeader(http.StatusNoContent)
		return
	}
	http.Redirect(w, r, to, http.StatusSeeOther)
}
