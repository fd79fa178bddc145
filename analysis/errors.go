package analysis

import (
	"fmt"

	"lagwright/field"
)

// errs collects field errors while validating; its err is the one field-error type
// (field.Errors), sorted by field.
type errs struct{ list field.Errors }

func (c *errs) add(name, format string, args ...any) {
	c.list = append(c.list, field.Error{Field: name, Message: fmt.Sprintf(format, args...)})
}

// has reports whether a field (or anything under it) already has an error, so that
// later checks do not pile a second message on the same field.
func (c *errs) has(name string) bool { return c.list.Has(name) }

func (c *errs) err() error {
	if len(c.list) == 0 {
		return nil
	}
	return c.list.Sorted()
}
