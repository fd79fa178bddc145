package handlers

import (
	"net/http"
	"net/url"
	"strconv"

	"github.com/a-h/templ"

	"lagwright/units"
	"lagwright/web"
)

// jacketList shows GET /jackets: every jacket and coating with emittance, vapour
// retarder, permeance, use and source.
func (s *Server) jacketList(w http.ResponseWriter, r *http.Request) {
	list, err := s.store.Jackets(r.Context())
	if err != nil {
		s.fail(w, r, err)
		return
	}
	v := web.JacketsView{Assets: s.assets.urls}
	q := r.URL.Query()
	switch {
	case q.Get("deleted") != "":
		v.Notice = "Deleted the custom jacket " + q.Get("deleted") + "."
	case q.Get("saved") != "":
		v.Notice = "Saved the custom jacket " + q.Get("saved") + "."
	}
	for _, j := range list {
		perm := "unknown"
		if j.PermeancePerm > 0 {
			si := units.ToSI(units.Permeance, units.US, j.PermeancePerm)
			perm = strconv.FormatFloat(j.PermeancePerm, 'f', -1, 64) + " perm (" +
				units.FormatUnit(units.Permeance, units.SI, si) + ")"
		}
		base := "/jackets/" + url.PathEscape(j.Slug)
		v.Rows = append(v.Rows, web.JacketRow{
			Slug: j.Slug, Name: j.Name, Emittance: strconv.FormatFloat(j.Emittance, 'f', -1, 64), Permeance: perm,
			Use: j.Use, Source: j.Source, VapourRetarder: j.VapourRetarder, Builtin: j.Builtin,
			EditHref: templ.SafeURL(base + "/edit"), DeleteHref: templ.SafeURL(base + "/delete"),
		})
	}
	w.Header().Set("Cache-Control", "no-store")
	templ.Handler(web.JacketsPage(v)).ServeHTTP(w, r)
}
