package calc

import "testing"

var zzSink float64

func BenchmarkZZM(b *testing.B) {
	s := surface{kind: surfCylH, d: 0.2159, lWind: 0.2159, emit: 0.1}
	air := Air{TempC: 20, SurroundingsC: 20}
	b.Run("exchange", func(b *testing.B) {
		ts := 35.0
		for b.Loop() {
			zzSink += s.exchange(ts, air).slope
			ts += 1e-9
		}
	})
	b.Run("rough", func(b *testing.B) {
		ts := 35.0
		for b.Loop() {
			_, sl := s.roughExchange(ts, air)
			zzSink += sl
			ts += 1e-9
		}
	})
	b.Run("dryAirD", func(b *testing.B) {
		ts := 35.0
		for b.Loop() {
			p, sl := dryAirD(ts)
			zzSink += p.pr + sl.pr
			ts += 1e-9
		}
	})
	b.Run("churchillChu", func(b *testing.B) {
		pr := 0.71
		for b.Loop() {
			t, w := churchillChu(1.2e7, pr, 0.559)
			zzSink += t + w
			pr += 1e-12
		}
	})
	b.Run("march", func(b *testing.B) {
		var p path
		p.build(nps4System())
		for b.Loop() {
			t, _, _, _ := p.march(40, 60, 1)
			zzSink += t
		}
	})
	b.Run("solve", func(b *testing.B) {
		sys := nps4System()
		for b.Loop() {
			Solve(sys, 180, air)
		}
	})
	b.Run("validate", func(b *testing.B) {
		sys := nps4System()
		for b.Loop() {
			sys.Validate()
		}
	})
}
