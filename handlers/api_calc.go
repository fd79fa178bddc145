package handlers

import (
	"encoding/json"
	"io"
	"net/http"

	"lagwright/analysis"
)

// apiCalc answers POST /api/v1/calc: one line's JSON in, the analysis out (the same
// JSON as `lagwright calc`), with materials and jackets from the library in the
// database (built-in and custom).
func (s *Server) apiCalc(w http.ResponseWriter, r *http.Request) {
	body, err := io.ReadAll(io.LimitReader(r.Body, analysis.MaxInputBytes+1))
	if err != nil {
		s.fail(w, r, err)
		return
	}
	lib, err := s.library(r.Context())
	if err != nil {
		s.fail(w, r, err)
		return
	}
	out, err := analysis.Run(body, lib)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	writeJSON(w, http.StatusOK, out)
}

// writeJSON answers with one JSON document.
func writeJSON(w http.ResponseWriter, status int, v any) {
	w.Header().Set("Content-Type", "application/json; charset=utf-8")
	w.Header().Set("Cache-Control", "no-store")
	w.WriteHeader(status)
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	_ = enc.Encode(v)
}
