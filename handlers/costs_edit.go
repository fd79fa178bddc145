package handlers

import (
	"net/http"
	"slices"

	"github.com/a-h/templ"

	"lagwright/results"
	"lagwright/store"
	"lagwright/units"
	"lagwright/web"
)

// currencyOf is the ISO 4217 code of a project's money figures.
func currencyOf(p store.Project) string {
	set, _ := results.Settings(p) // unreadable settings: the default currency
	return set.Economics.CurrencyCode()
}

// costsView builds the cost-table screen around rows as they are (stored or typed).
func (s *Server) costsView(p store.Project, lib *store.Library, rows []web.CostRowView) web.CostsView {
	sys := projectSystem(p)
	v := web.CostsView{
		Assets:        s.assets.urls,
		Title:         "Installed costs: " + p.Name,
		ProjectURL:    projectURL(p.ID),
		Action:        costsURL(p.ID),
		ExampleAction: costsURL(p.ID) + "/example",
		Version:       p.Version,
		ThicknessUnit: units.Label(units.Length, sys),
		CostUnit:      costUnit(sys),
		FlatCostUnit:  flatCostUnit(sys),
		Currency:      currencyOf(p),
		Rows:          rows,
	}
	for range blankCostRows {
		v.Rows = append(v.Rows, web.CostRowView{})
	}
	for _, m := range lib.MaterialChoices() {
		v.Materials = append(v.Materials, web.CompareOption{Value: m.Slug, Label: m.Name})
	}
	v.HasExample = slices.ContainsFunc(rows, func(r web.CostRowView) bool { return r.Example })
	return v
}

// costsEdit shows GET /projects/{id}/costs.
func (s *Server) costsEdit(w http.ResponseWriter, r *http.Request) {
	p, set := projectOf(r)
	lib, err := s.library(r.Context())
	if err != nil {
		s.fail(w, r, err)
		return
	}
	v := s.costsView(p, lib, costRowsView(set.CostTable, projectSystem(p)))
	v.Saved = r.URL.Query().Get("saved") == "1"
	w.Header().Set("Cache-Control", "no-store")
	templ.Handler(web.Costs(v)).ServeHTTP(w, r)
}
