package handlers

import (
	"math"
	"net/url"
	"strconv"
	"strings"

	"github.com/a-h/templ"

	"lagwright/calc"
	"lagwright/catalog"
	"lagwright/store"
	"lagwright/units"
	"lagwright/web"
)

// kRefC is the mean temperature at which the list compares materials: 75 °F
// (23.9 °C), the rating temperature of the ASTM tables.
var kRefC = catalog.FToC(75)

// unicodeMinus writes a number with a typographic minus sign.
func unicodeMinus(s string) string {
	if strings.HasPrefix(s, "-") {
		return "−" + s[1:]
	}
	return s
}

// roundTo writes v with the given decimals and a typographic minus.
func roundTo(v float64, decimals int) string {
	s := strconv.FormatFloat(v, 'f', decimals, 64)
	if strings.Trim(s, "-0.") == "" {
		s = strings.TrimPrefix(s, "-")
	}
	return unicodeMinus(s)
}

// serviceRange gives a service range in °C and in °F, to whole degrees.
func serviceRange(minC, maxC float64) (c, f string) {
	c = roundTo(minC, 0) + " to " + roundTo(maxC, 0) + " °C"
	f = roundTo(catalog.CToF(minC), 0) + " to " + roundTo(catalog.CToF(maxC), 0) + " °F"
	return c, f
}

// kCurveView is a material's k points as the calculation's curve.
func kCurveView(m catalog.Material) calc.KCurve {
	c := make(calc.KCurve, len(m.KPoints))
	for i, p := range m.KPoints {
		c[i] = calc.KPoint{MeanC: p.MeanC, K: p.K}
	}
	return c
}

func materialHref(slug string, suffix string) templ.SafeURL {
	return templ.SafeURL("/materials/" + url.PathEscape(slug) + suffix)
}

// thicknessValue writes a thickness in mm with its inch equivalent.
// A thickness within 0.01 mm of a whole eighth of an inch (the catalog rounds 3/8 in
// to 9.53 mm) is written as that fraction.
func thicknessValue(mm float64) string {
	in := mm
	if eighth := math.Round(mm/25.4*8) / 8 * 25.4; math.Abs(eighth-mm) <= 0.01 {
		in = eighth
	}
	return units.FormatUnit(units.Length, units.SI, mm) + " (" + units.FormatUnit(units.Length, units.US, in) + ")"
}

// materialsView builds the Materials screen: groups in category order, built-in
// rows before custom ones within a category.
func (s *Server) materialsView(list []store.Material, notice string) web.MaterialsView {
	v := web.MaterialsView{Assets: s.assets.urls, Notice: notice}
	index := map[string]int{}
	for _, m := range list {
		i, ok := index[m.Category]
		if !ok {
			i = len(v.Groups)
			index[m.Category] = i
			v.Groups = append(v.Groups, web.MaterialGroup{Category: m.Category, ID: "cat-" + materialAnchor(m.Category)})
		}
		k, beyond := kCurveView(m.Material).At(kRefC)
		row := web.MaterialRow{
			Slug: m.Slug, Name: m.Name, Spec: m.Spec, Href: materialHref(m.Slug, ""),
			KSI: units.Format(units.Conductivity, units.SI, k), KUS: units.Format(units.Conductivity, units.US, k),
			KExtended: beyond, Builtin: m.Builtin,
		}
		row.ServiceC, row.ServiceF = serviceRange(m.MinC, m.MaxC)
		v.Groups[i].Rows = append(v.Groups[i].Rows, row)
	}
	for _, g := range v.Groups {
		rows := g.Rows
		// stable: built-in first, keeping the store's order by name
		out := make([]web.MaterialRow, 0, len(rows))
		for _, want := range []bool{true, false} {
			for _, r := range rows {
				if r.Builtin == want {
					out = append(out, r)
				}
			}
		}
		copy(rows, out)
	}
	for _, p := range catalog.PipeMaterials() {
		v.PipeMaterials = append(v.PipeMaterials, web.PipeMaterialRow{
			Name: p.Name, WallK: units.Format(units.Conductivity, units.SI, p.WallK),
			BareEmittance: strconv.FormatFloat(p.BareEmittance, 'f', -1, 64), Source: p.Source, Cautions: p.Cautions,
		})
	}
	return v
}

// materialAnchor makes an id from a category name.
func materialAnchor(s string) string {
	var b strings.Builder
	for _, r := range strings.ToLower(s) {
		switch {
		case r >= 'a' && r <= 'z', r >= '0' && r <= '9':
			b.WriteRune(r)
		default:
			b.WriteByte('-')
		}
	}
	return b.String()
}

// materialPageView builds one material's page, the chart in sys.
func (s *Server) materialPageView(m store.Material, sys units.System, notice string) web.MaterialPageView {
	v := web.MaterialPageView{
		Assets: s.assets.urls, Slug: m.Slug, Name: m.Name, Category: m.Category, Spec: m.Spec, Form: m.Form,
		Source: m.Source, Builtin: m.Builtin, Version: m.Version, Notice: notice,
		MaxLayer: thicknessValue(m.MaxLayerMM), Chart: kChart(m.Material, sys),
		EditHref: materialHref(m.Slug, "/edit"), DeleteHref: materialHref(m.Slug, "/delete"),
		CopyHref: templ.SafeURL("/materials/new?from=" + url.QueryEscape(m.Slug)),
	}
	v.ServiceC, v.ServiceF = serviceRange(m.MinC, m.MaxC)
	for _, p := range m.KPoints {
		v.KRows = append(v.KRows, web.MaterialKRow{
			MeanC: roundTo(p.MeanC, 1), MeanF: roundTo(catalog.CToF(p.MeanC), 1),
			KSI: units.Format(units.Conductivity, units.SI, p.K), KUS: units.Format(units.Conductivity, units.US, p.K),
		})
	}
	for _, t := range m.ThicknessesMM {
		v.Thicknesses = append(v.Thicknesses, thicknessValue(t))
	}
	if m.Compressible {
		v.Compression = "yes: counted at " + strconv.FormatFloat(100-m.CompressionPct, 'f', -1, 64) +
			" % of its nominal thickness (" + strconv.FormatFloat(m.CompressionPct, 'f', -1, 64) + " % installed compression)"
	}
	if sys == units.US {
		v.UnitsHref, v.UnitsLabel = materialHref(m.Slug, ""), "Chart in °C and W/m·K"
	} else {
		v.UnitsHref, v.UnitsLabel = materialHref(m.Slug, "?units=us"), "Chart in °F and Btu·in/h·ft²·°F"
	}
	return v
}

// Chart layout, SVG user units.
const (
	kcW, kcH                     = 640.0, 380.0
	kcLeft, kcRight, kcTop, kcBt = 76.0, 620.0, 14.0, 326.0
)

// kTicks spans lo…hi with about n ticks at 1, 2, 2.5 or 5 × 10^k, widened to whole
// ticks, and returns the range, the tick values and the decimals their labels need.
func kTicks(lo, hi float64, n int) (min, max float64, ticks []float64, decimals int) {
	if !(hi > lo) {
		lo, hi = lo-1, hi+1
	}
	raw := (hi - lo) / float64(n)
	mag := math.Pow(10, math.Floor(math.Log10(raw)))
	step := 10 * mag
	for _, f := range []float64{1, 2, 2.5, 5, 10} {
		if f*mag >= raw*0.999 {
			step = f * mag
			break
		}
	}
	min, max = math.Floor(lo/step+1e-9)*step, math.Ceil(hi/step-1e-9)*step
	for i := 0; ; i++ {
		t := min + float64(i)*step
		if t > max+step*1e-6 {
			break
		}
		ticks = append(ticks, t)
	}
	decimals = int(math.Max(0, -math.Floor(math.Log10(step)+1e-9)))
	if s := step / math.Pow(10, math.Floor(math.Log10(step)+1e-9)); math.Abs(s-2.5) < 1e-6 {
		decimals++
	}
	return min, max, ticks, decimals
}

// kChart lays out the k-versus-mean-temperature chart of m in sys: the published
// points, the end segments extended over the rest of the service range (by the
// calculation's own rule, calc.KCurve.At), and the service range shaded.
func kChart(m catalog.Material, sys units.System) web.KChartView {
	curve := kCurveView(m)
	tx := func(c float64) float64 { return units.FromSI(units.Temp, sys, c) }
	ky := func(k float64) float64 { return units.FromSI(units.Conductivity, sys, k) }
	first, last := m.KPoints[0].MeanC, m.KPoints[len(m.KPoints)-1].MeanC
	loC, hiC := math.Min(first, m.MinC), math.Max(last, m.MaxC)

	type pt struct{ x, y float64 }
	sample := func(a, b float64) []pt {
		const n = 24
		out := make([]pt, 0, n+1)
		for i := 0; i <= n; i++ {
			c := a + (b-a)*float64(i)/n
			k, _ := curve.At(c)
			out = append(out, pt{tx(c), ky(k)})
		}
		return out
	}
	var extLow, extHigh []pt
	if m.MinC < first {
		extLow = sample(m.MinC, first)
	}
	if m.MaxC > last {
		extHigh = sample(last, m.MaxC)
	}
	kMax := 0.0
	for _, p := range m.KPoints {
		kMax = math.Max(kMax, ky(p.K))
	}
	for _, p := range append(append([]pt(nil), extLow...), extHigh...) {
		kMax = math.Max(kMax, p.y)
	}

	xMin, xMax, xTicks, xDec := kTicks(tx(loC), tx(hiC), 7)
	yMin, yMax, yTicks, yDec := kTicks(0, kMax, 6)
	px := func(x float64) float64 { return kcLeft + (x-xMin)/(xMax-xMin)*(kcRight-kcLeft) }
	py := func(y float64) float64 { return kcBt - (y-yMin)/(yMax-yMin)*(kcBt-kcTop) }
	poly := func(pts []pt) string {
		parts := make([]string, len(pts))
		for i, p := range pts {
			parts[i] = strconv.FormatFloat(px(p.x), 'f', 1, 64) + "," + strconv.FormatFloat(py(p.y), 'f', 1, 64)
		}
		return strings.Join(parts, " ")
	}

	tempUnit, kUnit := units.Label(units.Temp, sys), units.Label(units.Conductivity, sys)
	c := web.KChartView{
		Title:  m.Name + ": apparent conductivity against mean temperature",
		XLabel: "mean temperature, " + tempUnit, YLabel: "k, " + kUnit,
		W: kcW, H: kcH, Left: kcLeft, Right: kcRight, Top: kcTop, Bottom: kcBt,
		HasService: m.MaxC > m.MinC,
		ServiceX0:  px(tx(m.MinC)), ServiceX1: px(tx(m.MaxC)),
		ServiceLabel: "service range " + roundTo(tx(m.MinC), 0) + " to " + roundTo(tx(m.MaxC), 0) + " " + tempUnit,
	}
	for _, t := range xTicks {
		c.XTicks = append(c.XTicks, web.KChartTick{Pos: px(t), Label: roundTo(t, xDec)})
	}
	for _, t := range yTicks {
		c.YTicks = append(c.YTicks, web.KChartTick{Pos: py(t), Label: roundTo(t, yDec)})
	}
	var line []pt
	for _, p := range m.KPoints {
		q := pt{tx(p.MeanC), ky(p.K)}
		line = append(line, q)
		c.Dots = append(c.Dots, web.KChartDot{X: px(q.x), Y: py(q.y),
			Label: roundTo(q.x, 1) + " " + tempUnit + ": " + units.Format(units.Conductivity, sys, p.K) + " " + kUnit})
	}
	c.Line = poly(line)
	if len(extLow) > 0 {
		c.ExtLow = poly(extLow)
	}
	if len(extHigh) > 0 {
		c.ExtHigh = poly(extHigh)
	}
	return c
}
