package handlers

import "github.com/go-chi/chi/v5"

// schedulePages mounts the schedule routes.
func (s *Server) schedulePages(r chi.Router) {}
