package analysis

import (
	"fmt"
	"testing"

	"lagwright/catalog"
)

func BenchmarkZZCat(b *testing.B) {
	b.Run("LookupPipe", func(b *testing.B) {
		for b.Loop() {
			catalog.LookupPipe("NPS 4", "")
		}
	})
	b.Run("Material", func(b *testing.B) {
		for b.Loop() {
			catalog.MaterialBySlug("mineral_fiber_pipe_c547_t1")
		}
	})
	b.Run("Jacket", func(b *testing.B) {
		for b.Loop() {
			catalog.JacketBySlug("aluminium_new")
		}
	})
	b.Run("Code", func(b *testing.B) {
		for b.Loop() {
			catalog.CodeTableByID("ashrae-90.1-2016")
		}
	})
	b.Run("PipeMat", func(b *testing.B) {
		for b.Loop() {
			catalog.PipeMaterialBySlug("carbon_steel")
		}
	})
	b.Run("Sprintf", func(b *testing.B) {
		for b.Loop() {
			_ = fmt.Sprintf("surroundings at the ambient temperature %s °C", fmtNum(20))
		}
	})
}
