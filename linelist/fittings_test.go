package linelist

import (
	"math"
	"strings"
	"testing"

	"lagwright/analysis"
	"lagwright/units"
)

// Finishes, covers and supports come in by column; the old name "flanges" still reads
// as flange pairs; the heat value converts exactly (1 Btu/h·°F = 0.5275279 W/K: Btu(IT)
// 1055.05585 J per NIST SP 811, 1 °F = 5/9 K).
func TestFittingColumns(t *testing.T) {
	rows := mustParse(t, "tag,length [ft],flanges,valves,valves_finish,flange_pairs_finish,cover_thickness [in],cover_jacket,support_spacing [ft],support_kind,support_heat_value [Btu/h·°F]\n"+
		"CHW-1,100,2,3,Bare,cover,2,pvc_jacket,8,Insert,1\n")
	in := rows[0].Input
	if rows[0].Fittings != (analysis.Fittings{FlangePairs: 2, Valves: 3}) || in.FittingFinish == nil || in.FittingFinish.Valves != "bare" ||
		in.FittingFinish.FlangePairs != "cover" || in.FittingCover == nil || *in.FittingCover.ThicknessMM != 50.8 || in.FittingCover.Jacket != "pvc_jacket" ||
		in.Supports == nil || in.Supports.Kind != "insert" || math.Abs(*in.Supports.SpacingM-2.4384) > 1e-9 || math.Abs(*in.Supports.WPerK-0.5275279) > 1e-6 {
		t.Fatalf("row: %+v, input finish %+v cover %+v supports %+v", rows[0], in.FittingFinish, in.FittingCover, in.Supports)
	}
	// The template shows the new columns with an example.
	tpl := string(Template(units.SI))
	for _, h := range []string{"flange_pairs", "strainers", "reducers", "valves_finish", "cover_thickness [mm]", "support_kind", "support_spacing [m]", "support_heat_value [W/K]"} {
		if !strings.Contains(tpl, h) {
			t.Errorf("template lacks %s", h)
		}
	}
	// Written back and read again, the row is the same.
	again := mustParse(t, strings.Join(Header(units.SI), ",")+"\n"+strings.Join(Record(Header(units.SI), rows[0]), ",")+"\n")
	if *again[0].Input.FittingFinish != *in.FittingFinish || *again[0].Input.Supports.SpacingM != *in.Supports.SpacingM {
		t.Errorf("round trip: %+v", again[0].Input)
	}
}
