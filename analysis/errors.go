package analysis

import (
	"fmt"
	"sort"
	"strings"
)

// FieldError is one problem with one input field. Field is the JSON path
// ("layers[0].thickness_mm"); Message is for people.
type FieldError struct {
	Field   string `json:"field"`
	Message string `json:"message"`
}

// FieldErrors is every problem found in an input; nothing was computed.
type FieldErrors []FieldError

func (e FieldErrors) Error() string {
	parts := make([]string, len(e))
	for i, fe := range e {
		parts[i] = fe.Field + ": " + fe.Message
	}
	return "invalid input: " + strings.Join(parts, "; ")
}

// errs collects field errors while validating.
type errs struct{ list FieldErrors }

func (c *errs) add(field, format string, args ...any) {
	c.list = append(c.list, FieldError{Field: field, Message: fmt.Sprintf(format, args...)})
}

// has reports whether a field (or anything under it) already has an error, so that
// later checks do not pile a second message on the same field.
func (c *errs) has(field string) bool {
	for _, fe := range c.list {
		if fe.Field == field || strings.HasPrefix(fe.Field, field+".") || strings.HasPrefix(fe.Field, field+"[") {
			return true
		}
	}
	return false
}

func (c *errs) err() error {
	if len(c.list) == 0 {
		return nil
	}
	out := append(FieldErrors(nil), c.list...)
	sort.SliceStable(out, func(i, j int) bool { return out[i].Field < out[j].Field })
	return out
}
