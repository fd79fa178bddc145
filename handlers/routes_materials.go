package handlers

import "github.com/go-chi/chi/v5"

// materialPages mounts the materials routes.
func (s *Server) materialPages(r chi.Router) {}

// materialAPI mounts the materials routes.
func (s *Server) materialAPI(r chi.Router) {}
