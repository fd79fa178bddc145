package handlers

import (
	"context"
	"net/http"

	"lagwright/catalog"
)

// codeTables finds energy-code tables by id in the request's library (built-in and
// custom); when the library cannot be read, the built-in tables still answer.
func (s *Server) codeTables(r *http.Request) func(id string) (catalog.CodeTable, bool) {
	lib, err := s.library(r.Context())
	if err != nil {
		return catalog.CodeTableByID
	}
	return lib.CodeTable
}

// codeTableList lists the tables for a picker (built-in first).
func (s *Server) codeTableList(ctx context.Context) []catalog.CodeTable {
	lib, err := s.library(ctx)
	if err != nil {
		return catalog.CodeTables()
	}
	return lib.CodeTableList()
}
