package calc

import (
	"slices"
	"testing"
)

// nps4System is a typical insulated NPS 4 steel pipe: 114.3 mm OD (ASME B36.10M), Schedule
// 40 wall 6.02 mm, 50 mm of mineral fiber with a 3-point k curve (C547 Type I-like values,
// from memory), aluminium jacket ε 0.1.
func nps4System() System {
	return System{
		Shape: PipeHorizontal, PipeOD: 0.1143, PipeWall: 0.00602, WallK: 50, Emittance: 0.1,
		Layers: []Layer{{Name: "mineral fiber", Thickness: 0.05,
			K: KCurve{{38, 0.036}, {93, 0.040}, {204, 0.049}}}},
	}
}

func BenchmarkSolve(b *testing.B) {
	sys := nps4System()
	air := Air{TempC: 20, SurroundingsC: 20}
	evals := 0
	for b.Loop() {
		r, err := Solve(sys, 180, air)
		if err != nil {
			b.Fatal(err)
		}
		evals += r.Evaluations
	}
	b.ReportMetric(float64(evals)/float64(b.N), "evals/op")
}

// BenchmarkSolveSweep solves a spread of common pipe and flat cases (sizes, thicknesses,
// hot and cold, still air and wind, bright and painted jackets) and reports the
// distribution of residual evaluations per solve.
func BenchmarkSolveSweep(b *testing.B) {
	cases := sweepCases()
	var counts []int
	for b.Loop() {
		counts = counts[:0]
		for _, c := range cases {
			r, err := Solve(c.sys, c.fluid, c.air)
			if err != nil {
				b.Fatal(err)
			}
			counts = append(counts, r.Evaluations)
		}
	}
	mean, p95, max := evalStats(counts)
	b.ReportMetric(float64(len(cases)), "solves/op")
	b.ReportMetric(mean, "evals/solve")
	b.ReportMetric(p95, "p95-evals")
	b.ReportMetric(max, "max-evals")
}

func BenchmarkSolveDuct(b *testing.B) {
	sys := System{Shape: Duct, DuctWidth: 0.6, DuctHeight: 0.4, Emittance: 0.05,
		Layers: []Layer{{Thickness: 0.05, K: KCurve{{10, 0.033}, {24, 0.035}, {50, 0.039}}}}}
	air := Air{TempC: 32, SurroundingsC: 32}
	evals := 0
	for b.Loop() {
		r, err := Solve(sys, 12, air)
		if err != nil {
			b.Fatal(err)
		}
		evals += r.Evaluations
	}
	b.ReportMetric(float64(evals)/float64(b.N), "evals/op")
}

type sweepCase struct {
	sys   System
	fluid float64
	air   Air
}

func sweepCases() []sweepCase {
	var cases []sweepCase
	curve := KCurve{{-20, 0.031}, {38, 0.036}, {93, 0.040}, {204, 0.049}}
	for _, od := range []float64{0.0213, 0.0603, 0.1143, 0.2191, 0.6096} {
		for _, t := range []float64{0.013, 0.025, 0.05, 0.1} {
			for _, fluid := range []float64{-30, 5, 60, 180, 400} {
				for _, eps := range []float64{0.1, 0.9} {
					for _, wind := range []float64{0, 5} {
						for _, shape := range []Shape{PipeHorizontal, PipeVertical} {
							sys := System{Shape: shape, PipeOD: od, PipeWall: od * 0.05, WallK: 50, Height: 3,
								Emittance: eps, Layers: []Layer{{Thickness: t, K: curve}}}
							cases = append(cases, sweepCase{sys, fluid, Air{TempC: 20, SurroundingsC: 20, WindMS: wind}})
						}
					}
				}
			}
		}
	}
	for _, shape := range []Shape{FlatVertical, FlatUp, FlatDown} {
		for _, fluid := range []float64{-30, 5, 60, 180, 400} {
			sys := System{Shape: shape, Height: 3, Width: 3, PlateLength: 2, PlateWidth: 1, Emittance: 0.9,
				InnerCoeff: 50, Layers: []Layer{{Thickness: 0.05, K: curve}, {Thickness: 0.025, K: curve}}}
			cases = append(cases, sweepCase{sys, fluid, Air{TempC: 20, SurroundingsC: 10}})
		}
	}
	return cases
}

// evalStats returns the mean, 95th percentile and maximum of the evaluation counts.
func evalStats(counts []int) (mean, p95, max float64) {
	s := slices.Clone(counts)
	slices.Sort(s)
	sum := 0
	for _, c := range s {
		sum += c
	}
	return float64(sum) / float64(len(s)), float64(s[len(s)*95/100]), float64(s[len(s)-1])
}
