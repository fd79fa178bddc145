package handlers

import (
	"net/http"
	"strconv"

	"github.com/a-h/templ"
	"github.com/go-chi/chi/v5"

	"lagwright/units"
	"lagwright/web"
)

// materialShow shows GET /materials/{slug}: k points, chart, service range, sizes and
// source. ?units=us draws the chart in °F and Btu·in/h·ft²·°F.
func (s *Server) materialShow(w http.ResponseWriter, r *http.Request) {
	m, err := s.store.Material(r.Context(), chi.URLParam(r, "slug"))
	if err != nil {
		s.fail(w, r, libraryError("material", err))
		return
	}
	sys := units.SI
	if r.URL.Query().Get("units") == "us" {
		sys = units.US
	}
	notice := ""
	switch {
	case r.URL.Query().Has("created"):
		notice = "Added the custom material."
	case r.URL.Query().Has("saved"):
		notice = "Saved: version " + strconv.Itoa(m.Version) + ". Lines that use it are recalculated when next shown."
	}
	w.Header().Set("Cache-Control", "no-store")
	templ.Handler(web.MaterialPage(s.materialPageView(m, sys, notice))).ServeHTTP(w, r)
}
