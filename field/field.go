// Package field is the one way Lagwright says what is wrong with an input: a list of
// problems, each naming its field. The analysis, the store and the handlers all
// return field.Errors for bad input; handlers find it with errors.As and answer 422
// with every message beside its field, so nothing the user typed is lost.
package field

import (
	"fmt"
	"sort"
	"strings"
)

// Error is one problem with one input field. Field is the JSON path
// ("layers[0].thickness_mm"; "" for the input as a whole); Message is for people.
type Error struct {
	Field   string `json:"field"`
	Message string `json:"message"`
}

// Errors is every problem found in an input; nothing was computed or saved.
type Errors []Error

func (e Errors) Error() string {
	parts := make([]string, len(e))
	for i, fe := range e {
		parts[i] = fe.Field + ": " + fe.Message
	}
	return "invalid input: " + strings.Join(parts, "; ")
}

// Add appends a problem with a formatted message.
func (e *Errors) Add(name, format string, args ...any) {
	*e = append(*e, Error{Field: name, Message: fmt.Sprintf(format, args...)})
}

// Has reports whether a field (or anything under it) already has a problem, so that
// later checks do not pile a second message on the same field.
func (e Errors) Has(name string) bool {
	for _, fe := range e {
		if Under(fe.Field, name) {
			return true
		}
	}
	return false
}

// Under reports whether path is name or lies below it ("layers[0].k" is under "layers").
func Under(path, name string) bool {
	return path == name || strings.HasPrefix(path, name+".") || strings.HasPrefix(path, name+"[")
}

// Err is nil when there is no problem, else the problems, so that
// `return v.Validate().Err()` is safe.
func (e Errors) Err() error {
	if len(e) == 0 {
		return nil
	}
	return e
}

// Sorted is a copy sorted by field (a stable sort: the order found is kept within a
// field).
func (e Errors) Sorted() Errors {
	out := append(Errors(nil), e...)
	sort.SliceStable(out, func(i, j int) bool { return out[i].Field < out[j].Field })
	return out
}
