package calc

import (
	"math"
	"math/rand/v2"
	"testing"
)

func TestTmpDiscontinuity(t *testing.T) {
	maxE, worstR := 0, 0.0
	for fl := 20.5; fl < 400; fl += 0.37 {
		sys := System{Shape: FlatUp, PlateLength: 1.2, PlateWidth: 1.2, Emittance: 0.9,
			Layers: []Layer{{Thickness: 0.001, K: constK(0.04)}}}
		r, err := Solve(sys, fl, Air{TempC: 20, SurroundingsC: 20})
		if err != nil {
			t.Fatal(err)
		}
		if r.Evaluations > maxE {
			maxE = r.Evaluations
		}
		worstR = math.Max(worstR, math.Abs(r.Layers[0].InnerC-fl))
	}
	t.Logf("max evals %d, worst inner mismatch %g", maxE, worstR)
}

func TestTmpRandom(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	hist := map[int]int{}
	n, nerr := 0, 0
	for range 200000 {
		shape := Shape(rng.IntN(6))
		size := math.Exp(rng.Float64()*8 - 6)
		sys := System{Shape: shape, PipeOD: size, DuctWidth: size, DuctHeight: size * rng.Float64() * 2,
			Height: rng.Float64() * 20, Width: rng.Float64() * 20, PlateLength: rng.Float64() * 5, PlateWidth: rng.Float64() * 5,
			Emittance: rng.Float64(), InnerCoeff: []float64{0, 10, 1e4}[rng.IntN(3)]}
		if rng.IntN(2) == 0 {
			sys.PipeWall, sys.WallK = size*0.05, 45
		}
		for range rng.IntN(4) {
			k1, k2 := 0.01+rng.Float64()*0.2, 0.01+rng.Float64()*0.2
			if k2 < k1 {
				k1, k2 = k2, k1
			}
			sys.Layers = append(sys.Layers, Layer{Thickness: math.Exp(rng.Float64()*7 - 7), K: KCurve{{0, k1}, {100, k2}}})
		}
		air := Air{TempC: rng.Float64()*150 - 70, SurroundingsC: rng.Float64()*400 - 100, WindMS: rng.Float64() * rng.Float64() * 40}
		fluid := rng.Float64()*1200 - 200
		r, err := Solve(sys, fluid, air)
		if err != nil {
			nerr++
			continue
		}
		n++
		if !resultFinite(r) {
			t.Fatalf("non-finite %+v", r)
		}
		per := r.Evaluations
		if shape == Duct {
			per = (per + 2) / 3
		}
		hist[per]++
		if per > 25 && rng.IntN(300) == 0 {
			t.Logf("%d evals: %+v fluid %g air %+v", r.Evaluations, sys, fluid, air)
		}
	}
	t.Logf("ok %d err %d hist %v", n, nerr, hist)
}
