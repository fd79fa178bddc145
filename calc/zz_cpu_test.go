package calc

import (
	"syscall"
	"testing"
)

func zzCPU() int64 {
	var ru syscall.Rusage
	syscall.Getrusage(syscall.RUSAGE_SELF, &ru)
	return ru.Utime.Nano() + ru.Stime.Nano()
}

func BenchmarkZZCPUSolve(b *testing.B) {
	sys := nps4System()
	air := Air{TempC: 20, SurroundingsC: 20}
	t0 := zzCPU()
	n := 0
	for b.Loop() {
		Solve(sys, 180, air)
		n++
	}
	b.ReportMetric(float64(zzCPU()-t0)/float64(n), "cpu-ns/op")
}

func BenchmarkZZCPUDuct(b *testing.B) {
	sys := System{Shape: Duct, DuctWidth: 0.6, DuctHeight: 0.4, Emittance: 0.05,
		Layers: []Layer{{Thickness: 0.05, K: KCurve{{10, 0.033}, {24, 0.035}, {50, 0.039}}}}}
	air := Air{TempC: 32, SurroundingsC: 32}
	t0 := zzCPU()
	n := 0
	for b.Loop() {
		Solve(sys, 12, air)
		n++
	}
	b.ReportMetric(float64(zzCPU()-t0)/float64(n), "cpu-ns/op")
}

func BenchmarkZZCPUSweep(b *testing.B) {
	cases := sweepCases()
	t0 := zzCPU()
	n := 0
	ev := 0
	for b.Loop() {
		for _, c := range cases {
			r, _ := Solve(c.sys, c.fluid, c.air)
			ev += r.Evaluations
		}
		n++
	}
	b.ReportMetric(float64(zzCPU()-t0)/float64(n*len(cases)), "cpu-ns/solve")
	b.ReportMetric(float64(ev)/float64(n*len(cases)), "evals/solve")
}
