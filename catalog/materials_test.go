package catalog

import (
	"math"
	"slices"
	"strings"
	"testing"
)

// Independent of the package's constants: 1 Btu·in/(h·ft²·°F) = 0.144227888 W/(m·K).
func wmk(btuIn float64) float64 { return btuIn * 0.144227888 }
func degC(f float64) float64    { return (f - 32) / 1.8 }

func TestMaterialsWellFormed(t *testing.T) {
	want := []string{
		"mineral_fiber_pipe_c547_t1", "mineral_fiber_pipe_c547_t2", "mineral_fiber_board_c612",
		"calcium_silicate_c533_t1", "cellular_glass_c552_t1", "cellular_glass_c552_t2",
		"elastomeric_c534_gr1", "elastomeric_c534_gr2", "polyiso_c591", "phenolic_c1126",
		"glass_blanket_c553", "aerogel_c1728", "perlite_c610",
	}
	ms := Materials()
	if len(ms) != len(want) {
		t.Errorf("%d materials, want %d", len(ms), len(want))
	}
	seen := map[string]bool{}
	for _, m := range ms {
		if seen[m.Slug] {
			t.Errorf("duplicate slug %q", m.Slug)
		}
		seen[m.Slug] = true
		if m.Name == "" || m.Category == "" || m.Form == "" || !strings.HasPrefix(m.Spec, "ASTM C") {
			t.Errorf("%s: name %q category %q form %q spec %q", m.Slug, m.Name, m.Category, m.Form, m.Spec)
		}
		if !strings.Contains(m.Source, "ASTM C") || strings.Contains(m.Source, "[read]") {
			t.Errorf("%s: source %q does not cite its ASTM specification as a reader would", m.Slug, m.Source)
		}
		if !(m.MinC < m.MaxC) || m.MinC < -273.15 || m.MaxC > 1000 {
			t.Errorf("%s: service limits %g..%g °C", m.Slug, m.MinC, m.MaxC)
		}
		if len(m.KPoints) < 2 {
			t.Errorf("%s: %d k points", m.Slug, len(m.KPoints))
		}
		for i, p := range m.KPoints {
			if !(p.K > 0 && p.K < 0.2) { // every class here: below 0.2 W/(m·K)
				t.Errorf("%s: k %g at %g °C", m.Slug, p.K, p.MeanC)
			}
			if p.MeanC < m.MinC || p.MeanC > m.MaxC {
				t.Errorf("%s: k point at %g °C outside service limits %g..%g", m.Slug, p.MeanC, m.MinC, m.MaxC)
			}
			if i > 0 && !(p.MeanC > m.KPoints[i-1].MeanC) {
				t.Errorf("%s: mean temperatures not strictly increasing at %d", m.Slug, i)
			}
			if i > 0 && p.K < m.KPoints[i-1].K {
				t.Errorf("%s: k falls with temperature at %d", m.Slug, i)
			}
		}
		th := m.ThicknessesMM
		if len(th) == 0 || th[0] <= 0 || th[len(th)-1] > 160 {
			t.Errorf("%s: thickness series %v", m.Slug, th)
		}
		for i := 1; i < len(th); i++ {
			if !(th[i] > th[i-1]) {
				t.Errorf("%s: thickness series not ascending: %v", m.Slug, th)
			}
		}
		if len(th) > 0 && (m.MaxLayerMM < th[0] || m.MaxLayerMM > th[len(th)-1]) {
			t.Errorf("%s: max layer %g outside series %v", m.Slug, m.MaxLayerMM, th)
		}
		if m.Compressible != (m.CompressionPct > 0) || m.CompressionPct < 0 || m.CompressionPct >= 50 {
			t.Errorf("%s: compressible %v with %g %%", m.Slug, m.Compressible, m.CompressionPct)
		}
		got, ok := MaterialBySlug(m.Slug)
		if !ok || got.Slug != m.Slug {
			t.Errorf("MaterialBySlug(%q) = %v", m.Slug, ok)
		}
	}
	for _, s := range want {
		if !seen[s] {
			t.Errorf("missing material %q", s)
		}
	}
	if _, ok := MaterialBySlug("nonesuch"); ok {
		t.Error("MaterialBySlug found an unknown slug")
	}
	// copies
	ms[0].KPoints[0].K = 99
	if m, _ := MaterialBySlug(ms[0].Slug); m.KPoints[0].K == 99 {
		t.Error("catalog changed through a returned copy")
	}
}

// Maximum apparent k reproduces docs/references.md's table read from the ASTM specifications, at
// 0/75/200/400 °F, converted exactly. C591: upper end of the tabulated range.
func TestMaterialKPoints_ASTMRead(t *testing.T) {
	type pt struct{ f, k float64 }
	cases := []struct {
		slug   string
		source string
		pts    []pt
	}{
		{"elastomeric_c534_gr1", "ASTM C534 Grade 1", []pt{{0, 0.26}, {75, 0.28}}},
		{"elastomeric_c534_gr2", "ASTM C534 Grade 2", []pt{{0, 0.26}, {75, 0.30}, {200, 0.38}}},
		{"cellular_glass_c552_t1", "ASTM C552 Type I", []pt{{0, 0.27}, {75, 0.31}, {200, 0.40}, {400, 0.58}}},
		{"cellular_glass_c552_t2", "ASTM C552 Type II", []pt{{0, 0.29}, {75, 0.34}, {200, 0.43}, {400, 0.63}}},
		{"polyiso_c591", "ASTM C591 (upper end 0.19–0.22, 0.26–0.30)", []pt{{0, 0.22}, {75, 0.22}, {200, 0.30}}},
		{"calcium_silicate_c533_t1", "ASTM C533 Type I at 100 °F", []pt{{100, 0.41}}},
	}
	for _, c := range cases {
		m, ok := MaterialBySlug(c.slug)
		if !ok {
			t.Fatalf("%s missing", c.slug)
		}
		for _, p := range c.pts {
			found := false
			for _, kp := range m.KPoints {
				if math.Abs(kp.MeanC-degC(p.f)) < 1e-9 {
					found = true
					if math.Abs(kp.K-wmk(p.k)) > 1e-12 {
						t.Errorf("%s (%s) at %g °F: k %.9g W/(m·K), want %g Btu·in = %.9g", c.slug, c.source, p.f, kp.K, p.k, wmk(p.k))
					}
				}
			}
			if !found {
				t.Errorf("%s (%s): no point at %g °F", c.slug, c.source, p.f)
			}
		}
	}
}

// Service limits read in the ASTM specifications (docs/references.md), °F.
func TestMaterialServiceLimits_ASTMRead(t *testing.T) {
	cases := []struct {
		slug   string
		minF   float64
		maxF   float64
		source string
	}{
		{"elastomeric_c534_gr1", -297, 220, "ASTM C534 Grade 1"},
		{"elastomeric_c534_gr2", -297, 350, "ASTM C534 Grade 2 (upper limit read; lower from memory)"},
		{"cellular_glass_c552_t1", -450, 800, "ASTM C552"},
		{"cellular_glass_c552_t2", -450, 800, "ASTM C552"},
		{"polyiso_c591", -297, 300, "ASTM C591"},
		{"phenolic_c1126", -290, 257, "ASTM C1126 Type III"},
		{"mineral_fiber_pipe_c547_t1", 0, 850, "ASTM C547 Type I"},
		{"mineral_fiber_pipe_c547_t2", 0, 1200, "ASTM C547 Types II/III"},
		{"calcium_silicate_c533_t1", 80, 1200, "ASTM C533 Type I"},
		{"perlite_c610", 80, 1200, "ASTM C610"},
	}
	for _, c := range cases {
		m, _ := MaterialBySlug(c.slug)
		if math.Abs(m.MinC-degC(c.minF)) > 1e-9 || math.Abs(m.MaxC-degC(c.maxF)) > 1e-9 {
			t.Errorf("%s (%s): %g..%g °C, want %g..%g °F", c.slug, c.source, m.MinC, m.MaxC, c.minF, c.maxF)
		}
	}
}

// Thickness series, common practice.
func TestThicknessSeries(t *testing.T) {
	inch := ThicknessSeriesInch()
	wantIn := []float64{0.5, 1, 1.5, 2, 2.5, 3, 3.5, 4, 4.5, 5, 6}
	if len(inch) != len(wantIn) {
		t.Fatalf("inch series %v", inch)
	}
	for i, v := range wantIn {
		if math.Abs(inch[i]-v*25.4) > 1e-9 {
			t.Errorf("inch series[%d] = %g mm, want %g in", i, inch[i], v)
		}
	}
	metric := ThicknessSeriesMetric()
	wantMM := []float64{13, 20, 25, 30, 40, 50, 60, 70, 80, 90, 100, 120, 140, 160}
	if len(metric) != len(wantMM) {
		t.Fatalf("metric series %v", metric)
	}
	for i := range wantMM {
		if metric[i] != wantMM[i] {
			t.Errorf("metric series[%d] = %g, want %g", i, metric[i], wantMM[i])
		}
	}
	for _, m := range Materials() {
		ms := m.ThicknessesMetricMM
		if len(ms) < 4 {
			t.Errorf("%s: metric series %v, want one (DN lines and metric projects size from it)", m.Slug, ms)
		}
		for i, v := range ms {
			if v != math.Round(v) || v <= 0 || (i > 0 && v <= ms[i-1]) {
				t.Errorf("%s: metric series %v: whole millimetres, ascending (common practice)", m.Slug, ms)
				break
			}
		}
		if top, inTop := ms[len(ms)-1], m.ThicknessesMM[len(m.ThicknessesMM)-1]; top > inTop+5 || top < inTop-30 {
			t.Errorf("%s: metric series up to %g mm against the inch series up to %g mm", m.Slug, top, inTop)
		}
	}
	if got := MetricFromInch(inch); !slices.Equal(got, []float64{15, 25, 40, 50, 65, 75, 90, 100, 115, 125, 150}) {
		t.Errorf("MetricFromInch(inch series) = %v", got)
	}
	inch[0] = 0
	if ThicknessSeriesInch()[0] != 12.7 {
		t.Error("inch series changed through a returned copy")
	}
	if m, _ := MaterialBySlug("glass_blanket_c553"); !m.Compressible || m.CompressionPct != 25 {
		t.Errorf("duct wrap: compressible %v %g %%, want 25 %% (common practice)", m.Compressible, m.CompressionPct)
	}
}
