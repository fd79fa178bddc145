package handlers

import (
	"encoding/json"
	"fmt"
	"net/http"
	"strings"
	"time"
	"unicode/utf8"

	"lagwright/field"
)

// maxRevisionNote bounds a revision note, in characters.
const maxRevisionNote = 500

// scheduleIssue issues the next revision of a project's schedule: it builds the
// schedule of the current lines and stores its rows, totals and header as a snapshot,
// then sends the browser to the issued revision (303; JSON clients get 201 with it).
func (s *Server) scheduleIssue(w http.ResponseWriter, r *http.Request) {
	p, _ := projectOf(r)
	id := p.ID
	if err := r.ParseForm(); err != nil {
		s.fail(w, r, Invalid(field.Error{Field: "", Message: "the form could not be read"}))
		return
	}
	note := strings.TrimSpace(r.PostForm.Get("note"))
	if utf8.RuneCountInString(note) > maxRevisionNote {
		s.fail(w, r, Invalid(field.Error{Field: "note", Message: fmt.Sprintf("at most %d characters", maxRevisionNote)}))
		return
	}
	sc, err := s.draftSchedule(r)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	rev, err := s.store.IssueRevision(r.Context(), id, note, func(number int, at time.Time) (rows, totals, header json.RawMessage, err error) {
		sc.Header.Revision, sc.Header.Date, sc.Header.Note = number, at.UTC(), note
		if rows, err = json.Marshal(sc.Rows); err != nil {
			return
		}
		if totals, err = json.Marshal(sc.Totals); err != nil {
			return
		}
		header, err = json.Marshal(sc.Header)
		return
	})
	if err != nil {
		s.fail(w, r, err)
		return
	}
	if wantsJSON(r) {
		writeJSON(w, http.StatusCreated, map[string]any{"number": rev.Number, "issued_at": rev.IssuedAt, "note": rev.Note,
			"url": fmt.Sprintf("/projects/%d/schedule?rev=%d", id, rev.Number)})
		return
	}
	http.Redirect(w, r, fmt.Sprintf("/projects/%d/schedule?rev=%d", id, rev.Number), http.StatusSeeOther)
}
