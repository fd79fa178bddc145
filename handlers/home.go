package handlers

import (
	"net/http"

	"github.com/a-h/templ"

	"lagwright/demo"
	"lagwright/web"
)

func (s *Server) home(w http.ResponseWriter, r *http.Request) {
	v := web.HomeView{Assets: s.assets.urls, Version: s.cfg.Version, DBReady: s.dbReady(r.Context()) == nil, DemoLines: len(demo.Lines())}
	w.Header().Set("Cache-Control", "no-store")
	templ.Handler(web.Home(v)).ServeHTTP(w, r)
}
