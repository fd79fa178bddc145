package handlers

import "github.com/go-chi/chi/v5"

// importPages mounts the import routes.
func (s *Server) importPages(r chi.Router) {}

// importAPI mounts the import routes.
func (s *Server) importAPI(r chi.Router) {}
