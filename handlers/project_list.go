package handlers

import (
	"fmt"
	"net/http"

	"github.com/a-h/templ"

	"lagwright/demo"
	"lagwright/web"
)

// projectList is the projects page.
func (s *Server) projectList(w http.ResponseWriter, r *http.Request) {
	list, err := s.store.Projects(r.Context())
	if err != nil {
		s.fail(w, r, err)
		return
	}
	v := web.ProjectListView{Assets: s.assets.urls, DemoLines: len(demo.Lines())}
	for _, p := range list {
		v.Projects = append(v.Projects, web.ProjectListItem{ID: p.ID, Name: p.Name, Client: p.Client, Site: p.Site,
			Units: map[string]string{"si": "SI", "us": "US"}[p.Units], Lines: p.LineCount, Updated: p.UpdatedAt.Format("2006-01-02 15:04")})
	}
	w.Header().Set("Cache-Control", "no-store")
	templ.Handler(web.ProjectList(v)).ServeHTTP(w, r)
}

// projectDemo creates the demo project (POST) and opens it.
func (s *Server) projectDemo(w http.ResponseWriter, r *http.Request) {
	p, err := demo.Create(r.Context(), s.store)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	http.Redirect(w, r, fmt.Sprintf("/projects/%d", p.ID), http.StatusSeeOther)
}
