package analysis

import (
	"encoding/json"
	"flag"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

var update = flag.Bool("update", false, "rewrite the golden answers in testdata/golden")

// TestGolden guards the whole answer of a set of representative lines against
// unintended change. The golden files are regression guards, not references: they were
// produced by this code. What they cover is checked against outside sources elsewhere —
// the heat balance against the ht library's two-layer pipe and Incropera's correlation
// examples (calc/solve_test.go, calc/convection_test.go), steam against IAPWS-IF97
// (calc/steam_test.go), dew points against ASHRAE and PsychroLib (calc/psychro_test.go),
// freeze times against the ASHRAE ch. 23 example (calc/freeze_test.go), code minimums
// against ASHRAE 90.1 (calc/energycode_test.go); see docs/references.md. Rewrite them with
// -update only when a method change is intended (and then bump calc.MethodVersion).
func TestGolden(t *testing.T) {
	inputs, _ := filepath.Glob("testdata/golden/*.input.json")
	if len(inputs) == 0 {
		t.Fatal("no golden inputs")
	}
	for _, in := range inputs {
		name := strings.TrimSuffix(filepath.Base(in), ".input.json")
		t.Run(name, func(t *testing.T) {
			data, err := os.ReadFile(in)
			if err != nil {
				t.Fatal(err)
			}
			out, err := Run(data, CatalogResolver{})
			if err != nil {
				t.Fatal(err)
			}
			got, _ := json.MarshalIndent(out, "", "  ")
			goldenPath := strings.TrimSuffix(in, ".input.json") + ".output.json"
			if *update {
				if err := os.WriteFile(goldenPath, append(got, '\n'), 0o644); err != nil {
					t.Fatal(err)
				}
				return
			}
			want, err := os.ReadFile(goldenPath)
			if err != nil {
				t.Fatalf("%v (run go test ./analysis -run TestGolden -update)", err)
			}
			var g, w any
			_ = json.Unmarshal(got, &g)
			if err := json.Unmarshal(want, &w); err != nil {
				t.Fatal(err)
			}
			if diffs := compareJSON("", g, w, nil); len(diffs) > 0 {
				t.Errorf("answer differs from %s:\n%s", goldenPath, strings.Join(diffs, "\n"))
			}
		})
	}
}

// compareJSON lists differences; numbers agree within 1e-6 relative (or 1e-6 absolute),
// so the comparison survives a change of solver path that moves only the last digits.
func compareJSON(path string, got, want any, diffs []string) []string {
	switch w := want.(type) {
	case float64:
		g, ok := got.(float64)
		if !ok || math.Abs(g-w) > 1e-6*math.Max(1, math.Abs(w)) {
			diffs = append(diffs, fmt.Sprintf("%s: got %v, want %v", path, got, w))
		}
	case map[string]any:
		g, ok := got.(map[string]any)
		if !ok {
			return append(diffs, fmt.Sprintf("%s: got %T, want an object", path, got))
		}
		for k := range w {
			diffs = compareJSON(path+"."+k, g[k], w[k], diffs)
		}
		for k := range g {
			if _, ok := w[k]; !ok {
				diffs = append(diffs, fmt.Sprintf("%s.%s: unexpected key", path, k))
			}
		}
	case []any:
		g, ok := got.([]any)
		if !ok || len(g) != len(w) {
			return append(diffs, fmt.Sprintf("%s: got %v, want %v", path, got, want))
		}
		for i := range w {
			diffs = compareJSON(fmt.Sprintf("%s[%d]", path, i), g[i], w[i], diffs)
		}
	default:
		if fmt.Sprint(got) != fmt.Sprint(want) {
			diffs = append(diffs, fmt.Sprintf("%s: got %v, want %v", path, got, want))
		}
	}
	return diffs
}
