package calc

import (
	"fmt"
	"testing"
)

func TestZZGuessErr(t *testing.T) {
	for _, c := range sweepCases()[:40] {
		r, _ := Solve(c.sys, c.fluid, c.air)
		var p path
		p.build(c.sys)
		lo, hi := min(c.fluid, c.air.TempC, c.air.SurroundingsC), max(c.fluid, c.air.TempC, c.air.SurroundingsC)
		g := p.guess(c.fluid, c.air, lo, hi)
		fmt.Printf("od %.4f t %.3f fluid %5.0f wind %g eps %.1f: ts %.4f guess err %.2e evals %d\n", c.sys.PipeOD, c.sys.Layers[0].Thickness, c.fluid, c.air.WindMS, c.sys.Emittance, r.SurfaceC, g-r.SurfaceC, r.Evaluations)
	}
}
