package handlers

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"net/http"
	"strings"

	"github.com/a-h/templ"
	"github.com/jackc/pgx/v5/pgconn"

	"lagwright/field"
	"lagwright/store"
	"lagwright/web"
)

// Code classifies an error for the client.
type Code string

const (
	CodeNotFound         Code = "not_found"    // 404
	CodeConflict         Code = "conflict"     // 409: duplicate, in use, or changed meanwhile
	CodeInvalid          Code = "invalid"      // 422: bad input, with field errors
	CodeUnavailable      Code = "unavailable"  // 503: the database is down or too slow
	CodeInternal         Code = "internal"     // 500: our fault; logged
	CodeForbidden        Code = "forbidden"    // 403: cross-origin request
	CodeTooLarge         Code = "too_large"    // 413: body over the limit
	CodeMethodNotAllowed Code = "method"       // 405
	CodeUnauthorized     Code = "unauthorized" // 401: not signed in
	CodeTooManyRequests  Code = "too_many"     // 429: sign-in attempts over the limit
	CodeBadRequest       Code = "bad_request"  // 400: the body broke off
	CodeTimeout          Code = "timeout"      // 408: the body came too slowly
)

// Error is the one application error type: a code and a message safe to show.
// Err, when set, is the cause; it is logged (for internal errors), never shown.
type Error struct {
	Code    Code
	Message string
	Fields  []field.Error
	Err     error
}

func (e *Error) Error() string {
	if e.Err != nil {
		return fmt.Sprintf("%s: %s: %v", e.Code, e.Message, e.Err)
	}
	return fmt.Sprintf("%s: %s", e.Code, e.Message)
}

func (e *Error) Unwrap() error { return e.Err }

// NotFound says that the named thing does not exist.
func NotFound(what string) *Error {
	return &Error{Code: CodeNotFound, Message: "No such " + what + "."}
}

// Invalid carries field errors (answered with 422).
func Invalid(fields ...field.Error) *Error {
	return &Error{Code: CodeInvalid, Message: "Please correct the marked fields.", Fields: fields}
}

// classify turns any error into an *Error. Database errors are judged by their
// SQLSTATE code and the store's sentinel errors, never by their text.
func classify(err error) *Error {
	var appErr *Error
	if errors.As(err, &appErr) {
		return appErr
	}
	var fe field.Errors
	if errors.As(err, &fe) {
		return Invalid(fe...)
	}
	var pgErr *pgconn.PgError
	var dupTags *store.DuplicateTagsError
	var bodyErr *bodyReadError
	switch {
	case errors.As(err, &bodyErr) && bodyErr.timeout():
		return &Error{Code: CodeTimeout, Message: "The request body arrived too slowly; send it again.", Err: err}
	case errors.As(err, &bodyErr):
		return &Error{Code: CodeBadRequest, Message: "The request body could not be read (the connection broke off); send it again.", Err: err}
	case errors.As(err, &dupTags):
		return &Error{Code: CodeConflict, Message: "These tags were added to the project meanwhile (by another import or an edit): " +
			strings.Join(dupTags.Tags, ", ") + ".", Err: err}
	case errors.Is(err, store.ErrNotFound):
		return &Error{Code: CodeNotFound, Message: "Not found.", Err: err}
	case errors.Is(err, store.ErrDuplicateTag):
		return &Error{Code: CodeConflict, Message: "That tag is already used in this project.", Err: err}
	case errors.Is(err, store.ErrConflict):
		return &Error{Code: CodeConflict, Message: "Someone else changed this meanwhile; reload and try again.", Err: err}
	case errors.As(err, &pgErr) && pgErr.Code == "23505": // unique_violation
		return &Error{Code: CodeConflict, Message: "That name or tag is already taken.", Err: err}
	case errors.As(err, &pgErr) && pgErr.Code == "23503": // foreign_key_violation
		return &Error{Code: CodeConflict, Message: "It is in use elsewhere, or refers to something missing.", Err: err}
	case errors.As(err, &pgErr) && (pgErr.Code == "57014" || strings.HasPrefix(pgErr.Code, "08") || pgErr.Code == "57P01"):
		// query_canceled (statement_timeout), connection exceptions, admin shutdown
		return &Error{Code: CodeUnavailable, Message: "The database is busy or unavailable; try again shortly.", Err: err}
	case errors.As(err, new(*pgconn.ConnectError)):
		// the server refused or did not answer the connection (it is down or restarting)
		return &Error{Code: CodeUnavailable, Message: "The database is not answering; try again shortly.", Err: err}
	case errors.As(err, &pgErr) && strings.HasPrefix(pgErr.Code, "22"):
		// data_exception: a value the column cannot hold (a NUL in text, an out-of-range number)
		return &Error{Code: CodeInvalid, Message: "The input holds a value the database cannot store.",
			Fields: []field.Error{{Message: "a value is out of range or holds characters that cannot be stored"}}, Err: err}
	case errors.Is(err, context.DeadlineExceeded):
		// the store's statement or acquire deadline passed (store/timeouts.go)
		return &Error{Code: CodeUnavailable, Message: "The database did not answer in time; try again shortly.", Err: err}
	}
	var tooLarge *http.MaxBytesError
	if errors.As(err, &tooLarge) {
		return &Error{Code: CodeTooLarge, Message: fmt.Sprintf("The request is larger than %d bytes.", tooLarge.Limit), Err: err}
	}
	return &Error{Code: CodeInternal, Message: "Something went wrong on our side; it has been logged.", Err: err}
}

func statusOf(c Code) int {
	switch c {
	case CodeNotFound:
		return http.StatusNotFound
	case CodeConflict:
		return http.StatusConflict
	case CodeInvalid:
		return http.StatusUnprocessableEntity
	case CodeUnavailable:
		return http.StatusServiceUnavailable
	case CodeForbidden:
		return http.StatusForbidden
	case CodeTooLarge:
		return http.StatusRequestEntityTooLarge
	case CodeMethodNotAllowed:
		return http.StatusMethodNotAllowed
	case CodeUnauthorized:
		return http.StatusUnauthorized
	case CodeTooManyRequests:
		return http.StatusTooManyRequests
	case CodeBadRequest:
		return http.StatusBadRequest
	case CodeTimeout:
		return http.StatusRequestTimeout
	}
	return http.StatusInternalServerError
}

// fail is the one exit for errors: it maps the error to a status, logs internal
// ones (and database outages), and answers with JSON or an HTML page.
func (s *Server) fail(w http.ResponseWriter, r *http.Request, err error) {
	e := classify(err)
	if e.Code == CodeInternal && s.store != nil && s.dbReady(r.Context()) != nil {
		// A connection dropped mid-query (the server stopped or restarted) is not our
		// bug: the database is away, and the pool reconnects when it is back.
		e = &Error{Code: CodeUnavailable, Message: "The database is not answering; try again shortly.", Err: err}
	}
	status := statusOf(e.Code)
	switch e.Code {
	case CodeInternal:
		s.log.ErrorContext(r.Context(), "internal error", "method", r.Method, "path", r.URL.Path, "err", err)
	case CodeUnavailable:
		if r.Context().Err() != nil {
			// The browser gave up on the request (a newer keystroke replaced a live
			// calculation): the query was cancelled on purpose, the database is fine.
			s.log.DebugContext(r.Context(), "request cancelled by the client", "method", r.Method, "path", r.URL.Path, "err", err)
			break
		}
		s.log.WarnContext(r.Context(), "unavailable", "method", r.Method, "path", r.URL.Path, "err", err)
	}
	if wantsJSON(r) {
		fields := e.Fields
		if len(fields) == 0 {
			fields = []field.Error{{Field: "", Message: e.Message}}
		}
		w.Header().Set("Content-Type", "application/json; charset=utf-8")
		w.Header().Set("Cache-Control", "no-store")
		w.WriteHeader(status)
		_ = json.NewEncoder(w).Encode(struct {
			Errors []field.Error `json:"errors"`
		}{fields})
		return
	}
	w.Header().Set("Cache-Control", "no-store")
	var problems []string
	for _, f := range e.Fields {
		if f.Field == "" {
			problems = append(problems, f.Message)
		} else {
			problems = append(problems, f.Field+": "+f.Message)
		}
	}
	page := web.ErrorPage(web.ErrorView{Assets: s.assets.urls, Status: status, Title: http.StatusText(status), Message: e.Message, Problems: problems})
	// Rendered even when the request's context has ended (a client whose body broke
	// off still gets its answer, if it is listening).
	templ.Handler(page, templ.WithStatus(status)).ServeHTTP(w, r.WithContext(context.WithoutCancel(r.Context())))
}

// wantsJSON: API routes, and clients that ask for JSON.
func wantsJSON(r *http.Request) bool {
	return strings.HasPrefix(r.URL.Path, "/api/") || strings.Contains(r.Header.Get("Accept"), "application/json")
}
