package schedule

import (
	"strings"
	"testing"
	"time"

	"lagwright/analysis"
	"lagwright/units"
)

// The calculation sheet shows each fitting kind with its finish and heat, and the
// supports; the line's heat per run is the straight run plus every kind and the
// supports (the answer's own balance, as the sheet prints it).
func TestSheetFittingsAndSupports(t *testing.T) {
	p, lines := fixture(t, units.SI)
	var stm Line
	for _, l := range lines {
		if l.Tag == "STM-301" {
			stm = l
		}
	}
	sh := BuildSheet(p, stm, analysis.CatalogResolver{}, time.Date(2026, 3, 14, 0, 0, 0, 0, time.UTC))
	var sec *Section
	for i := range sh.Sections {
		if sh.Sections[i].Title == "Fittings and supports" {
			sec = &sh.Sections[i]
		}
	}
	if sec == nil {
		t.Fatal("no fittings section on the sheet")
	}
	var text []string
	for _, r := range sec.Rows {
		text = append(text, r[0]+": "+r[1])
	}
	all := strings.Join(text, "\n")
	for _, want := range []string{"Straight run: ", "2 × valve, bare: ", "bare surface ", "2 × flange pair, removable cover: ", "Supports: 10 × clamp"} {
		if !strings.Contains(all, want) {
			t.Errorf("sheet lacks %q:\n%s", want, all)
		}
	}
	o := stm.Output
	sum := *o.StraightRunHeatW
	for _, w := range o.FittingsHeatW {
		sum += w
	}
	if d := sum - *o.HeatFlowW; d > 0.05 || d < -0.05 {
		t.Errorf("straight run + fittings = %.2f W, heat per run %.2f W", sum, *o.HeatFlowW)
	}
}
