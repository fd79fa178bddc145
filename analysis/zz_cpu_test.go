package analysis

import (
	"syscall"
	"testing"
)

func zzCPU() int64 {
	var ru syscall.Rusage
	syscall.Getrusage(syscall.RUSAGE_SELF, &ru)
	return ru.Utime.Nano() + ru.Stime.Nano()
}

func BenchmarkZZCPUAnalyse(b *testing.B) {
	var in Input
	if err := DecodeStrict(benchLine, &in); err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	t0 := zzCPU()
	n := 0
	for b.Loop() {
		if _, err := Analyse(in, CatalogResolver{}); err != nil {
			b.Fatal(err)
		}
		n++
	}
	b.ReportMetric(float64(zzCPU()-t0)/float64(n), "cpu-ns/op")
}

func BenchmarkZZCPUResolve(b *testing.B) {
	var in Input
	if err := DecodeStrict(benchLine, &in); err != nil {
		b.Fatal(err)
	}
	t0 := zzCPU()
	n := 0
	for b.Loop() {
		resolve(in, CatalogResolver{})
		n++
	}
	b.ReportMetric(float64(zzCPU()-t0)/float64(n), "cpu-ns/op")
}
