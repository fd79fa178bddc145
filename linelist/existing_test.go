package linelist

import (
	"math"
	"strings"
	"testing"
)

// TestExistingColumns: the as-found survey columns fill existing, in the header's units
// (2 in = 50.8 mm exactly, 1 in = 25.4 mm, NIST SP 811; 25 % = 0.25), a row found bare
// has no existing layer, and bad cells are named.
func TestExistingColumns(t *testing.T) {
	rows := mustParse(t, "tag,pipe_size,length [ft],operating_temp [°F],layer1_material,layer1_thickness [in],"+
		"existing_material,existing_thickness [in],existing_condition,existing_k_factor,existing_missing [%],existing_bare_fittings\n"+
		"HW-1,4,100,180,mineral_fiber_pipe_c547_t1,2,mineral_fiber_pipe_c547_t1,1,Wet,,25,valves; flange_pairs\n"+
		"HW-2,4,100,180,mineral_fiber_pipe_c547_t1,2,,,bare,,,\n"+
		"HW-3,4,100,180,mineral_fiber_pipe_c547_t1,2,,,,1.7,,\n")
	e := rows[0].Input.Existing
	if e == nil || len(e.Layers) != 1 || math.Abs(*e.Layers[0].ThicknessMM-25.4) > 1e-9 || e.Condition != "wet" ||
		e.MissingFraction == nil || math.Abs(*e.MissingFraction-0.25) > 1e-12 || strings.Join(e.BareFittings, ",") != "valves,flange_pairs" {
		t.Errorf("HW-1 existing %+v", e)
	}
	if e := rows[1].Input.Existing; e == nil || len(e.Layers) != 0 || e.Condition != "" {
		t.Errorf("HW-2 (found bare) existing %+v", e)
	}
	if e := rows[2].Input.Existing; e == nil || e.KFactor == nil || *e.KFactor != 1.7 {
		t.Errorf("HW-3 existing %+v", e)
	}
	_, errs := Parse(strings.NewReader("tag,existing_material,existing_k_factor\nHW-9,mineral_fiber_pipe_c547_t1,lots\n"))
	var fields []string
	for _, e := range errs {
		fields = append(fields, e.Field)
	}
	if got := strings.Join(fields, ","); !strings.Contains(got, "existing_thickness") || !strings.Contains(got, "existing_k_factor") {
		t.Errorf("errors name %q, want existing_thickness and existing_k_factor", got)
	}
}
