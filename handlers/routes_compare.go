package handlers

import "github.com/go-chi/chi/v5"

// comparePages mounts the compare routes.
func (s *Server) comparePages(r chi.Router) {}
