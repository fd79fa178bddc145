package handlers

import (
	"io"
	"net/http"

	"lagwright/linelist"
	"lagwright/units"
)

// importTemplate sends the line-list template: GET /api/v1/import/template.csv, in SI
// units, or US customary with ?units=us.
func (s *Server) importTemplate(w http.ResponseWriter, r *http.Request) {
	sys, name := units.SI, "lagwright-line-list-si.csv"
	if r.URL.Query().Get("units") == string(units.US) {
		sys, name = units.US, "lagwright-line-list-us.csv"
	}
	w.Header().Set("Content-Type", "text/csv; charset=utf-8")
	w.Header().Set("Content-Disposition", `attachment; filename="`+name+`"`)
	w.Header().Set("Cache-Control", "no-cache")
	_, _ = w.Write(linelist.Template(sys))
}

// apiImport imports a line list into a project for scripts: POST
// /api/v1/projects/{id}/import with the CSV (or tab-separated text) as the body.
// 200 {"created": N}; 422 {"errors": [{"row", "field", "message"}]} with nothing
// saved; 404 for an unknown project.
func (s *Server) apiImport(w http.ResponseWriter, r *http.Request) {
	p, _ := projectOf(r)
	body, err := io.ReadAll(r.Body) // bounded by the server's body limit
	if err != nil {
		s.fail(w, r, err)
		return
	}
	plan, err := s.planImport(r.Context(), p, body, nil)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	if !plan.OK() {
		writeJSON(w, http.StatusUnprocessableEntity, struct {
			Errors []linelist.RowError `json:"errors"`
		}{plan.Problems})
		return
	}
	n, err := s.store.CreateLines(r.Context(), p.ID, plan.Lines, plan.Materials)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	writeJSON(w, http.StatusOK, struct {
		Created int `json:"created"`
	}{n})
}
