package calc

import (
	"math"
	"testing"
)

var zzSink float64

func BenchmarkZZHConv(b *testing.B) {
	s := surface{kind: surfCylH, d: 0.2159, lWind: 0.2159, emit: 0.1}
	air := Air{TempC: 20, SurroundingsC: 20}
	ts := 35.0
	for b.Loop() {
		h, _ := s.hConv(ts, air)
		zzSink += h
		ts += 1e-9
	}
}
func BenchmarkZZDryAir(b *testing.B) {
	ts := 35.0
	for b.Loop() {
		zzSink += dryAir(ts).pr
		ts += 1e-9
	}
}
func BenchmarkZZPow(b *testing.B) {
	x := 1.2345
	for b.Loop() {
		zzSink += math.Pow(x, 8.0/27)
		x += 1e-9
	}
}
func BenchmarkZZCbrt(b *testing.B) {
	x := 1.2345
	for b.Loop() {
		zzSink += math.Cbrt(x)
		x += 1e-9
	}
}
func BenchmarkZZExp(b *testing.B) {
	x := 1.2345
	for b.Loop() {
		zzSink += math.Exp(x)
		x += 1e-9
	}
}
func BenchmarkZZLog(b *testing.B) {
	x := 1.2345
	for b.Loop() {
		zzSink += math.Log(x)
		x += 1e-9
	}
}
func BenchmarkZZSqrt(b *testing.B) {
	x := 1.2345
	for b.Loop() {
		zzSink += math.Sqrt(x)
		x += 1e-9
	}
}
