package calc

import (
	"math"
	"slices"
)

// solveDuct solves a rectangular duct by the ISO 12241 approach: the four faces are
// parallel heat paths, each conducting through every layer with its mean width (inner
// face width + outer face width)/2, the face growing by 2t per layer, so that the faces
// together follow the mean-perimeter rule (mean perimeter P_i + 4t per layer). Each face
// has its own surface coefficient, radiates to the surroundings with view factor 1, and is
// solved separately; the two sides are identical and solved once.
//
// Surfaces: the sides are vertical plates of the outer height (Churchill–Chu), the top a
// horizontal plate facing up and the bottom one facing down (McAdams), L = outer width/2
// (area/perimeter of a long strip). Wind: our simplification takes the flat-plate average
// along each face with L = the face's outer width (outer height for the sides), as if the
// flow ran across that face alone.
func solveDuct(sys System, fluidC float64, air Air) (Result, error) {
	total := 0.0
	for _, l := range sys.Layers {
		total += l.Thickness
	}
	wo, ho := sys.DuctWidth+2*total, sys.DuctHeight+2*total
	faces := []struct {
		name  string
		inner float64
		kind  surfKind
		count float64
	}{
		{"top", sys.DuctWidth, surfPlateUp, 1},
		{"bottom", sys.DuctWidth, surfPlateDown, 1},
		{"side", sys.DuctHeight, surfPlateV, 2},
	}
	res := Result{OuterAreaPerM: 2 * (wo + ho), Faces: make([]Face, 0, len(faces))}
	worst := -1.0
	var p path
	for _, f := range faces {
		p.buildFace(sys, f.inner, f.kind, wo, ho)
		pr, err := p.solve(fluidC, air)
		if err != nil {
			return Result{}, err
		}
		res.Evaluations += pr.evals
		res.HeatFlowPerM += f.count * pr.q
		res.Faces = append(res.Faces, Face{
			Name: f.name, SurfaceC: pr.ts, HeatFlowPerM: pr.q, HeatFlux: pr.q / p.area,
			HConv: pr.sf.hConv, HRad: pr.sf.hRad, Layers: pr.layers,
		})
		res.Warnings = append(res.Warnings, p.warnings(sys, pr, air, f.name)...)
		if d := math.Abs(pr.ts - air.TempC); d > worst {
			worst = d
			res.SurfaceC, res.PipeSurfaceC, res.Layers = pr.ts, pr.under, slices.Clone(pr.layers)
			res.HConv, res.HRad = pr.sf.hConv, pr.sf.hRad
		}
	}
	res.HeatFlux = res.HeatFlowPerM / res.OuterAreaPerM
	return res, nil
}

// buildFace lays out one duct face of inner width w0 (per metre of duct).
func (p *path) buildFace(sys System, w0 float64, kind surfKind, wo, ho float64) {
	p.init(len(sys.Layers))
	if sys.InnerCoeff > 0 {
		p.addG(sys.InnerCoeff * w0)
	}
	w := w0
	for _, l := range sys.Layers {
		p.addLayer(pathLayer{s: (w + l.Thickness) / l.Thickness, curve: l.K})
		w += 2 * l.Thickness
	}
	p.area = w
	p.surf = surface{kind: kind, emit: sys.Emittance, fixed: sys.FixedCoeff, lWind: w,
		solar: sys.SolarAbsorptance * solarShare(kind)}
	if kind == surfPlateV {
		p.surf.l = ho
	} else {
		p.surf.l = wo / 2
	}
}
