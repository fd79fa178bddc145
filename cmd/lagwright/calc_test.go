package main

import (
	"bytes"
	"context"
	"encoding/json"
	"strings"
	"testing"
)

// The command answers the same JSON as the API (checked in handlers), exits 2 with
// the errors document on bad input, and needs no database.
func TestCalcCommand(t *testing.T) {
	in := `{"geometry":"pipe","pipe_size":"NPS 4","operating_temp_c":180,"ambient_temp_c":20,
		"layers":[{"k_w_mk":0.045,"thickness_mm":50}],"surface_emittance":0.1}`
	var stdout, stderr bytes.Buffer
	err := run(context.Background(), []string{"calc"}, env(nil), strings.NewReader(in), &stdout, &stderr)
	if err != nil {
		t.Fatalf("calc: %v (%s)", err, stderr.String())
	}
	var out map[string]any
	if err := json.Unmarshal(stdout.Bytes(), &out); err != nil {
		t.Fatalf("output is not JSON: %v", err)
	}
	if q, _ := out["heat_flow_w_per_m"].(float64); q < 55 || q > 70 {
		t.Errorf("heat_flow_w_per_m = %v", out["heat_flow_w_per_m"])
	}

	stdout.Reset()
	err = run(context.Background(), []string{"calc"}, env(nil), strings.NewReader(`{"geometry":"cone","layers":[{"thickness_mm":-1}]}`), &stdout, &stderr)
	if exitCode(err, &stderr) != 2 {
		t.Fatalf("bad input: exit %d, want 2", exitCode(err, &stderr))
	}
	var doc struct {
		Errors []struct{ Field, Message string } `json:"errors"`
	}
	if err := json.Unmarshal(stdout.Bytes(), &doc); err != nil || len(doc.Errors) < 3 {
		t.Fatalf("errors document: %v %s", err, stdout.String())
	}
}
