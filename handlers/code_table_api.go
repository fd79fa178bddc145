package handlers

import (
	"net/http"
	"net/url"

	"github.com/go-chi/chi/v5"

	"lagwright/field"
	"lagwright/store"
)

// codeTableAPI mounts the energy-code tables' JSON API (docs/library-api.md).
func (s *Server) codeTableAPI(r chi.Router) {
	r.Get("/code-tables", s.apiCodeTableList)
	r.Post("/code-tables", s.apiCodeTableCreate)
	r.Get("/code-tables/{table}", s.apiCodeTableGet)
	r.Put("/code-tables/{table}", s.apiCodeTablePut)
	r.Delete("/code-tables/{table}", s.apiCodeTableDelete)
}

const codeTableWhat = "energy-code table"

// codeTableJSON is a table in answers: never a null list.
func codeTableJSON(t store.CodeTable) store.CodeTable {
	if t.Systems == nil {
		t.Systems = []string{}
	}
	if t.Footnotes == nil {
		t.Footnotes = []store.CodeFootnote{}
	}
	return t
}

// apiCodeTableList answers GET /api/v1/code-tables: every table, built-in first.
func (s *Server) apiCodeTableList(w http.ResponseWriter, r *http.Request) {
	list, err := s.store.CodeTables(r.Context())
	if err != nil {
		s.fail(w, r, err)
		return
	}
	for i := range list {
		list[i] = codeTableJSON(list[i])
	}
	writeJSON(w, http.StatusOK, list)
}

// apiCodeTableGet answers GET /api/v1/code-tables/{table}.
func (s *Server) apiCodeTableGet(w http.ResponseWriter, r *http.Request) {
	t, err := s.store.CodeTable(r.Context(), chi.URLParam(r, "table"))
	if err != nil {
		s.fail(w, r, libraryError(codeTableWhat, err))
		return
	}
	writeJSON(w, http.StatusOK, codeTableJSON(t))
}

// apiCodeTableCreate answers POST /api/v1/code-tables: 201 with the table, 422 naming
// every bad cell, 409 for a taken id.
func (s *Server) apiCodeTableCreate(w http.ResponseWriter, r *http.Request) {
	var t store.CodeTable
	if err := libDecode(r, &t); err != nil {
		s.fail(w, r, err)
		return
	}
	if t.Builtin {
		s.fail(w, r, Invalid(field.Error{Field: "builtin", Message: "only custom tables can be created or changed"}))
		return
	}
	saved, err := s.store.CreateCodeTable(r.Context(), t)
	if err != nil {
		s.fail(w, r, libraryError(codeTableWhat, err))
		return
	}
	w.Header().Set("Location", "/api/v1/code-tables/"+url.PathEscape(saved.ID))
	writeJSON(w, http.StatusCreated, codeTableJSON(saved))
}

// apiCodeTablePut answers PUT /api/v1/code-tables/{table}: the whole table with the
// version it was read at (409 when stale or built-in).
func (s *Server) apiCodeTablePut(w http.ResponseWriter, r *http.Request) {
	id := chi.URLParam(r, "table")
	var t struct {
		store.CodeTable
		Version *int `json:"version"`
	}
	if err := libDecode(r, &t); err != nil {
		s.fail(w, r, err)
		return
	}
	var fe field.Errors
	if msg := versionProblem(t.Version); msg != "" {
		fe.Add("version", "%s", msg)
	} else {
		t.CodeTable.Version = *t.Version
	}
	if t.ID != "" && t.ID != id {
		fe.Add("id", "cannot be changed")
	}
	if t.Builtin {
		fe.Add("builtin", "only custom tables can be created or changed")
	}
	if len(fe) > 0 {
		s.fail(w, r, Invalid(fe...))
		return
	}
	t.ID = id
	saved, err := s.store.UpdateCodeTable(r.Context(), t.CodeTable)
	if err != nil {
		s.fail(w, r, libraryError(codeTableWhat, err))
		return
	}
	writeJSON(w, http.StatusOK, codeTableJSON(saved))
}

// apiCodeTableDelete answers DELETE /api/v1/code-tables/{table}: 204, or 409 when a
// line or a project names it or it is built-in.
func (s *Server) apiCodeTableDelete(w http.ResponseWriter, r *http.Request) {
	if err := s.store.DeleteCodeTable(r.Context(), chi.URLParam(r, "table")); err != nil {
		s.fail(w, r, libraryError(codeTableWhat, err))
		return
	}
	w.WriteHeader(http.StatusNoContent)
}
