package main

import (
	"encoding/json"
	"errors"
	"fmt"
	"io"

	"lagwright/analysis"
	"lagwright/field"
)

// calcCmd reads one line's JSON on stdin and writes the analysis on stdout, with the
// compiled-in catalog (no database). Bad input writes the errors document on stdout
// and exits with status 2 — the same JSON that POST /api/v1/calc answers with 422.
func calcCmd(args []string, stdin io.Reader, stdout io.Writer) error {
	if len(args) > 0 {
		return usageError{fmt.Sprintf("calc takes no arguments (JSON on standard input), got %q", args)}
	}
	data, err := io.ReadAll(io.LimitReader(stdin, analysis.MaxInputBytes+1))
	if err != nil {
		return fmt.Errorf("calc: read input: %w", err)
	}
	out, err := analysis.Run(data, analysis.CatalogResolver{})
	var fe field.Errors
	if errors.As(err, &fe) {
		writeIndented(stdout, struct {
			Errors field.Errors `json:"errors"`
		}{fe})
		return exitStatus{code: 2}
	}
	if err != nil {
		return fmt.Errorf("calc: %w", err)
	}
	writeIndented(stdout, out)
	return nil
}

func writeIndented(w io.Writer, v any) {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	_ = enc.Encode(v)
}

// exitStatus ends the program with a status and nothing more said (the output already
// says what went wrong).
type exitStatus struct{ code int }

func (e exitStatus) Error() string { return fmt.Sprintf("exit status %d", e.code) }
