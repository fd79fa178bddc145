package handlers

import (
	"errors"
	"strings"

	"lagwright/field"
	"lagwright/store"
)

// libraryError turns the store's library errors into application errors with a
// message for people: field errors (422), a built-in or taken slug (409, on the
// slug field), in use or read-only (409), missing (404). what is "material" or
// "jacket". Other errors pass through to classify.
func libraryError(what string, err error) error {
	var fe field.Errors
	var inUse *store.InUseError
	switch {
	case err == nil:
		return nil
	case errors.As(err, &fe):
		return Invalid(fe...)
	case errors.As(err, &inUse):
		msg := inUse.Error()
		return &Error{Code: CodeConflict, Message: strings.ToUpper(msg[:1]) + msg[1:] +
			"; change those lines to another " + what + " first.", Err: err}
	case errors.Is(err, store.ErrBuiltinSlug):
		return &Error{Code: CodeConflict, Message: "That slug belongs to a built-in " + what + ".", Err: err,
			Fields: []field.Error{{Field: "slug", Message: "is a built-in " + what + "'s slug; choose another"}}}
	case errors.Is(err, store.ErrSlugTaken):
		return &Error{Code: CodeConflict, Message: "A custom " + what + " already has that slug.", Err: err,
			Fields: []field.Error{{Field: "slug", Message: "is already taken by a custom " + what}}}
	case errors.Is(err, store.ErrBuiltin):
		return &Error{Code: CodeConflict, Message: "Built-in " + what + "s are read-only; copy one to a custom " +
			what + " to change it.", Err: err}
	case errors.Is(err, store.ErrNotFound):
		return NotFound(what)
	}
	return err
}
