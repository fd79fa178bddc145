package catalog

import "math"

// KPoint is an apparent thermal conductivity K (W/(m·K)) at a mean temperature MeanC (°C), as
// the ASTM material specifications and makers' data sheets publish it.
type KPoint struct{ MeanC, K float64 }

// Material is a generic insulation material class.
type Material struct {
	Slug, Name, Category, Spec string    // Spec: "ASTM C547 Type I"
	Form                       string    // "pipe section", "tubing and sheet", "block and board", "blanket"
	KPoints                    []KPoint  // strictly increasing MeanC, at least 2 points
	MinC, MaxC                 float64   // service limits, °C
	ThicknessesMM              []float64 // inch series, in mm (NPS and CTS lines)
	ThicknessesMetricMM        []float64 // metric series, whole mm (DN lines, metric projects)
	MaxLayerMM                 float64   // largest single layer made
	Compressible               bool      // blanket that compresses when installed (duct wrap)
	CompressionPct             float64   // default installed compression for blankets, else 0
	Source                     string
}

// ip converts a published inch-pound point: mean temperature in °F and apparent conductivity
// in Btu·in/(h·ft²·°F).
func ip(meanF, kBtuIn float64) KPoint { return KPoint{MeanC: FToC(meanF), K: kBtuIn * BtuInToWmK} }

// inches converts a list of thicknesses in inches to mm, rounded to 0.01 mm so that
// 1½ in reads 38.1 and not 38.099999999999994.
func inches(in ...float64) []float64 {
	out := make([]float64, len(in))
	for i, v := range in {
		out[i] = math.Round(in2mm(v)*100) / 100
	}
	return out
}

// Thickness series, common practice.
var (
	seriesPipeSection = inches(0.5, 1, 1.5, 2, 2.5, 3, 3.5, 4, 4.5, 5, 6)
	seriesRigidPipe   = inches(1, 1.5, 2, 2.5, 3, 3.5, 4, 4.5, 5, 6)
	seriesBoard       = inches(1, 1.5, 2, 2.5, 3, 3.5, 4)
	seriesFoam        = inches(0.5, 1, 1.5, 2, 2.5, 3, 3.5, 4)
	seriesElastomeric = inches(0.375, 0.5, 0.75, 1, 1.5, 2)
	seriesDuctWrap    = inches(1, 1.5, 2, 3)
	seriesAerogel     = []float64{10, 20, 30, 40, 50, 60, 70, 80} // 10 mm blankets in layers

	// Metric series, whole millimetres in 5 or 10 mm steps where the trade makes them so
	// (common practice, as recalled from makers' metric ranges, check before use).
	metricPipeSection = []float64{20, 25, 30, 40, 50, 60, 70, 80, 90, 100, 120, 140, 150}
	metricRigidPipe   = []float64{25, 30, 40, 50, 60, 70, 80, 90, 100, 120, 140, 150}
	metricBoard       = []float64{25, 30, 40, 50, 60, 70, 80, 90, 100}
	metricFoam        = []float64{20, 25, 30, 40, 50, 60, 70, 80, 90, 100}
	metricElastomeric = []float64{10, 13, 19, 25, 32, 40, 50} // sheet and tube walls as made
	metricDuctWrap    = []float64{25, 40, 50, 75}
)

const srcSeries = "thickness series and largest single layer: " + labelCommon + ", " + labelMemory + " with the maker"

var materials = []Material{
	{
		Slug: "mineral_fiber_pipe_c547_t1", Name: "Mineral fiber pipe insulation, Type I",
		Category: "mineral fiber", Spec: "ASTM C547 Type I", Form: "pipe section",
		KPoints: []KPoint{
			ip(100, 0.25), // 100 °F, 0.25 Btu·in/(h·ft²·°F)
			ip(200, 0.28), // 200 °F, 0.28
			ip(300, 0.34), // 300 °F, 0.34
			ip(400, 0.40), // 400 °F, 0.40
		},
		MinC: FToC(0), MaxC: FToC(850), // 0 to 850 °F
		ThicknessesMM: seriesPipeSection, ThicknessesMetricMM: metricPipeSection, MaxLayerMM: in2mm(6),
		Source: "service limits 0–850 °F: ASTM C547; maximum apparent k: ASTM C547 Type I, " +
			labelMemory + "; " + srcSeries,
	},
	{
		Slug: "mineral_fiber_pipe_c547_t2", Name: "Mineral fiber pipe insulation, Type II",
		Category: "mineral fiber", Spec: "ASTM C547 Type II", Form: "pipe section",
		KPoints: []KPoint{
			ip(100, 0.25), // 100 °F, 0.25 Btu·in/(h·ft²·°F)
			ip(200, 0.29), // 200 °F, 0.29
			ip(300, 0.35), // 300 °F, 0.35
			ip(400, 0.42), // 400 °F, 0.42
			ip(500, 0.50), // 500 °F, 0.50
			ip(600, 0.60), // 600 °F, 0.60
			ip(700, 0.71), // 700 °F, 0.71
		},
		MinC: FToC(0), MaxC: FToC(1200), // 0 to 1200 °F
		ThicknessesMM: seriesPipeSection, ThicknessesMetricMM: metricPipeSection, MaxLayerMM: in2mm(6),
		Source: "service limits 0–1200 °F: ASTM C547 Types II/III; maximum apparent k: " +
			"ASTM C547 Type II, " + labelMemory + "; " + srcSeries,
	},
	{
		Slug: "mineral_fiber_board_c612", Name: "Mineral fiber block and board, Type IA/IB",
		Category: "mineral fiber", Spec: "ASTM C612 Type IA/IB", Form: "block and board",
		KPoints: []KPoint{
			ip(75, 0.26),  // 75 °F, 0.26 Btu·in/(h·ft²·°F)
			ip(100, 0.27), // 100 °F, 0.27
			ip(200, 0.34), // 200 °F, 0.34
		},
		MinC: FToC(0), MaxC: FToC(450), // 0 to 450 °F
		ThicknessesMM: seriesBoard, ThicknessesMetricMM: metricBoard, MaxLayerMM: in2mm(4),
		Source: "ASTM C612 Type IA/IB: service limits and maximum apparent k " + labelMemory + "; " + srcSeries,
	},
	{
		Slug: "calcium_silicate_c533_t1", Name: "Calcium silicate, Type I",
		Category: "calcium silicate", Spec: "ASTM C533 Type I", Form: "pipe section and block",
		KPoints: []KPoint{
			ip(100, 0.41), // 100 °F, 0.41 Btu·in/(h·ft²·°F) — ASTM C533 Type I
			ip(200, 0.44), // 200 °F, 0.44 — from memory
			ip(400, 0.50), // 400 °F, 0.50 — from memory
			ip(600, 0.57), // 600 °F, 0.57 — from memory
			ip(800, 0.66), // 800 °F, 0.66 — from memory
		},
		MinC: FToC(80), MaxC: FToC(1200), // 80 to 1200 °F
		ThicknessesMM: seriesRigidPipe, ThicknessesMetricMM: metricRigidPipe, MaxLayerMM: in2mm(4),
		Source: "ASTM C533 Type I: service limits 80–1200 °F and maximum apparent k 0.41 Btu·in/(h·ft²·°F) at " +
			"100 °F; k at 200–800 °F " + labelMemory + "; " + srcSeries,
	},
	{
		Slug: "cellular_glass_c552_t1", Name: "Cellular glass, Type I (block)",
		Category: "cellular glass", Spec: "ASTM C552 Type I", Form: "block",
		KPoints: []KPoint{
			ip(0, 0.27),   // 0 °F, 0.27 Btu·in/(h·ft²·°F)
			ip(75, 0.31),  // 75 °F, 0.31
			ip(200, 0.40), // 200 °F, 0.40
			ip(400, 0.58), // 400 °F, 0.58
		},
		MinC: FToC(-450), MaxC: FToC(800), // −450 to 800 °F
		ThicknessesMM: seriesRigidPipe, ThicknessesMetricMM: metricRigidPipe, MaxLayerMM: in2mm(4),
		Source: "ASTM C552 Type I, maximum apparent k and service limits −450 to 800 °F; " +
			"type names (block / pipe and tubing) " + labelMemory + "; " + srcSeries,
	},
	{
		Slug: "cellular_glass_c552_t2", Name: "Cellular glass, Type II (pipe and tubing)",
		Category: "cellular glass", Spec: "ASTM C552 Type II", Form: "pipe section",
		KPoints: []KPoint{
			ip(0, 0.29),   // 0 °F, 0.29 Btu·in/(h·ft²·°F)
			ip(75, 0.34),  // 75 °F, 0.34
			ip(200, 0.43), // 200 °F, 0.43
			ip(400, 0.63), // 400 °F, 0.63
		},
		MinC: FToC(-450), MaxC: FToC(800), // −450 to 800 °F
		ThicknessesMM: seriesRigidPipe, ThicknessesMetricMM: metricRigidPipe, MaxLayerMM: in2mm(4),
		Source: "ASTM C552 Type II, maximum apparent k and service limits −450 to 800 °F; " +
			"type names (block / pipe and tubing) " + labelMemory + "; " + srcSeries,
	},
	{
		Slug: "elastomeric_c534_gr1", Name: "Flexible elastomeric, Grade 1",
		Category: "flexible elastomeric", Spec: "ASTM C534 Type I Grade 1", Form: "tubing and sheet",
		KPoints: []KPoint{
			ip(0, 0.26),  // 0 °F, 0.26 Btu·in/(h·ft²·°F)
			ip(75, 0.28), // 75 °F, 0.28
		},
		MinC: FToC(-297), MaxC: FToC(220), // −297 to 220 °F
		ThicknessesMM: seriesElastomeric, ThicknessesMetricMM: metricElastomeric, MaxLayerMM: in2mm(2),
		Source: "ASTM C534 Grade 1, maximum apparent k and service limits −297 to 220 °F; " +
			"Type I = tubular " + labelMemory + "; " + srcSeries,
	},
	{
		Slug: "elastomeric_c534_gr2", Name: "Flexible elastomeric, Grade 2 (high temperature)",
		Category: "flexible elastomeric", Spec: "ASTM C534 Type I Grade 2", Form: "tubing and sheet",
		KPoints: []KPoint{
			ip(0, 0.26),   // 0 °F, 0.26 Btu·in/(h·ft²·°F)
			ip(75, 0.30),  // 75 °F, 0.30
			ip(200, 0.38), // 200 °F, 0.38
		},
		MinC: FToC(-297), MaxC: FToC(350), // −297 to 350 °F
		ThicknessesMM: seriesElastomeric, ThicknessesMetricMM: metricElastomeric, MaxLayerMM: in2mm(1),
		Source: "ASTM C534 Grade 2, maximum apparent k and upper service limit 350 °F; " +
			"lower limit −297 °F taken as Grade 1's, " + labelMemory + "; " + srcSeries,
	},
	{
		Slug: "polyiso_c591", Name: "Polyisocyanurate foam",
		Category: "polyisocyanurate", Spec: "ASTM C591", Form: "pipe section and board",
		KPoints: []KPoint{
			ip(0, 0.22),   // 0 °F, 0.22 Btu·in/(h·ft²·°F) (tabulated range 0.19–0.22: upper end)
			ip(75, 0.22),  // 75 °F, 0.22 (range 0.19–0.22: upper end)
			ip(200, 0.30), // 200 °F, 0.30 (range 0.26–0.30: upper end)
		},
		MinC: FToC(-297), MaxC: FToC(300), // −297 to 300 °F
		ThicknessesMM: seriesFoam, ThicknessesMetricMM: metricFoam, MaxLayerMM: in2mm(4),
		Source: "ASTM C591, maximum apparent k (upper end of the range tabulated across types and grades) and " +
			"service limits −297 to 300 °F; ASHRAE Fundamentals 2013 gives 0.0235 W/(m·K) " +
			"aged at room temperature as a design value (ch. 26); " + srcSeries,
	},
	{
		Slug: "phenolic_c1126", Name: "Phenolic foam, Type III",
		Category: "phenolic foam", Spec: "ASTM C1126 Type III", Form: "pipe section and board",
		KPoints: []KPoint{
			ip(0, 0.13),   // 0 °F, 0.13 Btu·in/(h·ft²·°F)
			ip(75, 0.14),  // 75 °F, 0.14
			ip(150, 0.16), // 150 °F, 0.16
		},
		MinC: FToC(-290), MaxC: FToC(257), // −290 to 257 °F
		ThicknessesMM: seriesFoam, ThicknessesMetricMM: metricFoam, MaxLayerMM: in2mm(4),
		Source: "ASTM C1126 Type III: service limits −290 to 257 °F; maximum apparent k " +
			labelMemory + "; " + srcSeries,
	},
	{
		Slug: "glass_blanket_c553", Name: "Fibrous glass blanket / duct wrap",
		Category: "fibrous glass", Spec: "ASTM C553 Type I / ASTM C1290", Form: "blanket (duct wrap)",
		KPoints: []KPoint{
			ip(75, 0.30),  // 75 °F, 0.30 Btu·in/(h·ft²·°F)
			ip(100, 0.32), // 100 °F, 0.32
			ip(200, 0.44), // 200 °F, 0.44
		},
		MinC: FToC(40), MaxC: FToC(250), // 40 to 250 °F, faced duct wrap
		ThicknessesMM: seriesDuctWrap, ThicknessesMetricMM: metricDuctWrap, MaxLayerMM: in2mm(3),
		Compressible: true, CompressionPct: 25,
		Source: "ASTM C553 / C1290: maximum apparent k at nominal (uncompressed) density and service limits of " +
			"faced duct wrap " + labelMemory + " (C553 types run to 450–1200 °F, e.g. Incropera, Fundamentals of Heat and Mass Transfer, 6th ed., Table A.11); " +
			"25 % installed compression and nominal thicknesses: " + labelCommon,
	},
	{
		Slug: "aerogel_c1728", Name: "Flexible aerogel blanket",
		Category: "aerogel", Spec: "ASTM C1728 (high-temperature type)", Form: "blanket",
		KPoints: []KPoint{
			ip(100, 0.17), // 100 °F, 0.17 Btu·in/(h·ft²·°F)
			ip(200, 0.19), // 200 °F, 0.19
			ip(400, 0.25), // 400 °F, 0.25
			ip(600, 0.32), // 600 °F, 0.32
		},
		MinC: FToC(-40), MaxC: FToC(1200), // −40 to 1200 °F
		ThicknessesMM: seriesAerogel, ThicknessesMetricMM: seriesAerogel, MaxLayerMM: 10,
		Source: "ASTM C1728: type, service limits and maximum apparent k " + labelMemory +
			"; 10 mm blankets applied in layers: " + labelCommon,
	},
	{
		Slug: "perlite_c610", Name: "Expanded perlite",
		Category: "expanded perlite", Spec: "ASTM C610", Form: "pipe section and block",
		KPoints: []KPoint{
			ip(100, 0.48), // 100 °F, 0.48 Btu·in/(h·ft²·°F)
			ip(200, 0.52), // 200 °F, 0.52
			ip(400, 0.60), // 400 °F, 0.60
			ip(600, 0.70), // 600 °F, 0.70
		},
		MinC: FToC(80), MaxC: FToC(1200), // 80 to 1200 °F
		ThicknessesMM: seriesRigidPipe, ThicknessesMetricMM: metricRigidPipe, MaxLayerMM: in2mm(4),
		Source: "ASTM C610: service limits 80–1200 °F; maximum apparent k " + labelMemory +
			"; " + srcSeries,
	},
}

func (m Material) clone() Material {
	m.KPoints = append([]KPoint(nil), m.KPoints...)
	m.ThicknessesMM = append([]float64(nil), m.ThicknessesMM...)
	m.ThicknessesMetricMM = append([]float64(nil), m.ThicknessesMetricMM...)
	return m
}

// Materials returns every generic insulation material class.
func Materials() []Material {
	out := make([]Material, len(materials))
	for i, m := range materials {
		out[i] = m.clone()
	}
	return out
}

// MaterialBySlug finds an insulation material class by its slug.
func MaterialBySlug(slug string) (Material, bool) {
	for _, m := range materials {
		if m.Slug == slug {
			return m.clone(), true
		}
	}
	return Material{}, false
}

// ThicknessSeriesInch returns the inch series of pipe sections, ½ to 6 in, in mm
// (common practice).
func ThicknessSeriesInch() []float64 { return append([]float64(nil), seriesPipeSection...) }

// ThicknessSeriesMetric returns the metric series of pipe sections, mm (common practice).
func ThicknessSeriesMetric() []float64 {
	return []float64{13, 20, 25, 30, 40, 50, 60, 70, 80, 90, 100, 120, 140, 160}
}

// MetricFromInch gives a metric series for a material that has only an inch one: each
// thickness to the nearest 5 mm (our rule; whole millimetres as metric ranges are made).
func MetricFromInch(inchMM []float64) []float64 {
	out := make([]float64, 0, len(inchMM))
	for _, t := range inchMM {
		v := math.Max(5, math.Round(t/5)*5)
		if len(out) == 0 || v > out[len(out)-1] {
			out = append(out, v)
		}
	}
	return out
}
