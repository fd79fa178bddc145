package handlers

import "github.com/go-chi/chi/v5"

// projectPages mounts the projects routes.
func (s *Server) projectPages(r chi.Router) {}

// projectAPI mounts the projects routes.
func (s *Server) projectAPI(r chi.Router) {}
