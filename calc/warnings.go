package calc

import (
	"fmt"
	"math"
	"strconv"
)

// warnings lists the notes on a solved path: conductivity extended beyond its data, faces
// outside service limits, correlations or air properties used beyond their range. face
// names the duct face ("" otherwise); messages then start "<face> face: ".
func (p *path) warnings(sys System, pr pathResult, air Air, face string) []string {
	var w []string
	prefix := ""
	if face != "" && p.anyWarning(sys, pr, air) {
		prefix = face + " face: "
	}
	for i, st := range pr.layers {
		l := sys.Layers[i]
		if !st.Beyond && (!l.HasLimits || (math.Max(st.InnerC, st.OuterC) <= l.MaxC && math.Min(st.InnerC, st.OuterC) >= l.MinC)) {
			continue // nothing to say: skip naming the layer
		}
		name := layerName(i, l)
		if st.Beyond {
			w = append(w, fmt.Sprintf("%sk of %s extrapolated beyond its data (mean %s °C)", prefix, name, fmtC(st.MeanC)))
		}
		if !l.HasLimits {
			continue
		}
		if hot := math.Max(st.InnerC, st.OuterC); hot > l.MaxC {
			w = append(w, fmt.Sprintf("%s%s reaches %s °C, above its service limit of %s °C", prefix, name, fmtC(hot), fmtC(l.MaxC)))
		}
		if cold := math.Min(st.InnerC, st.OuterC); cold < l.MinC {
			w = append(w, fmt.Sprintf("%s%s reaches %s °C, below its service limit of %s °C", prefix, name, fmtC(cold), fmtC(l.MinC)))
		}
	}
	if pr.jump {
		w = append(w, prefix+"the heat balance sits on a step (a convection correlation changes range at this surface temperature, or a k curve is extended far beyond its data): the surface coefficient is taken between its two values")
	}
	if p.surf.fixed == 0 {
		if pr.sf.note != "" {
			w = append(w, prefix+pr.sf.note)
		}
		if film := (pr.ts + air.TempC) / 2; film < airMinC || film > airMaxC {
			w = append(w, fmt.Sprintf("%sair properties extrapolated beyond their checked range −50…400 °C (film %s °C)", prefix, fmtC(film)))
		}
	}
	return w
}

// anyWarning reports whether warnings has anything to say (it mirrors its tests).
func (p *path) anyWarning(sys System, pr pathResult, air Air) bool {
	for i, st := range pr.layers {
		l := sys.Layers[i]
		if st.Beyond || (l.HasLimits && (math.Max(st.InnerC, st.OuterC) > l.MaxC || math.Min(st.InnerC, st.OuterC) < l.MinC)) {
			return true
		}
	}
	if pr.jump {
		return true
	}
	film := (pr.ts + air.TempC) / 2
	return p.surf.fixed == 0 && (pr.sf.note != "" || film < airMinC || film > airMaxC)
}

// criticalRadius warns when an insulated pipe's outer radius r (m) is below the critical
// radius r_cr = k/h of its outer layer (k at its solved mean, h = h_conv + h_rad): there,
// added insulation increases the heat flow.
func criticalRadius(r float64, pr pathResult) string {
	if len(pr.layers) == 0 {
		return ""
	}
	h := pr.sf.hConv + pr.sf.hRad
	if !(h > 0) {
		return ""
	}
	rcr := pr.layers[len(pr.layers)-1].K / h
	if r >= rcr {
		return ""
	}
	return fmt.Sprintf("insulated outer radius %s mm is below the critical radius r_cr = k/h ≈ %s mm: at this radius added insulation increases the heat flow",
		fmtMM(r), fmtMM(rcr))
}

// fmtC rounds a temperature to 0.1 °C for messages.
func fmtC(c float64) string {
	v := math.Round(c*10) / 10
	if v == 0 {
		v = 0 // no "-0"
	}
	return strconv.FormatFloat(v, 'f', -1, 64)
}

// fmtMM formats a length in m as mm with three significant figures (at least whole mm
// above 100 mm).
func fmtMM(m float64) string {
	mm := m * 1000
	if mm >= 100 {
		return strconv.FormatFloat(math.Round(mm), 'f', -1, 64)
	}
	return strconv.FormatFloat(mm, 'g', 3, 64)
}
