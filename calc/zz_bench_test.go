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

func BenchmarkZZDenPow(b *testing.B) {
	pr := 0.71
	for b.Loop() {
		zzSink += math.Pow(1+math.Pow(0.559/pr, 9.0/16), 8.0/27)
		pr += 1e-12
	}
}
func BenchmarkZZDenSqrtExpLog(b *testing.B) {
	pr := 0.71
	for b.Loop() {
		x := 0.559 / pr
		s := math.Sqrt(x)
		u := s * math.Sqrt(math.Sqrt(math.Sqrt(s)))
		zzSink += math.Exp(8.0 / 27 * math.Log(1+u))
		pr += 1e-12
	}
}
func BenchmarkZZDenExpLog(b *testing.B) {
	pr := 0.71
	for b.Loop() {
		u := math.Exp(9.0 / 16 * math.Log(0.559/pr))
		zzSink += math.Exp(8.0 / 27 * math.Log(1+u))
		pr += 1e-12
	}
}
func BenchmarkZZDenCbrt(b *testing.B) {
	pr := 0.71
	for b.Loop() {
		x := 0.559 / pr
		s := math.Sqrt(x)
		u := s * math.Sqrt(math.Sqrt(math.Sqrt(s)))
		c := math.Cbrt(math.Cbrt(math.Cbrt(1 + u)))
		c2 := c * c
		c4 := c2 * c2
		zzSink += c4 * c4
		pr += 1e-12
	}
}
func BenchmarkZZRa6(b *testing.B) {
	x := 1.2345e7
	for b.Loop() {
		zzSink += math.Sqrt(math.Cbrt(x))
		x += 1e-3
	}
}
