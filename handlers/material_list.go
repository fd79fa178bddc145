package handlers

import (
	"net/http"

	"github.com/a-h/templ"

	"lagwright/web"
)

// materialList shows GET /materials: every material by category, with the pipe materials.
func (s *Server) materialList(w http.ResponseWriter, r *http.Request) {
	list, err := s.store.Materials(r.Context())
	if err != nil {
		s.fail(w, r, err)
		return
	}
	notice := ""
	if d := r.URL.Query().Get("deleted"); d != "" {
		notice = "Deleted the custom material " + d + "."
	}
	w.Header().Set("Cache-Control", "no-store")
	templ.Handler(web.MaterialsPage(s.materialsView(list, notice))).ServeHTTP(w, r)
}
