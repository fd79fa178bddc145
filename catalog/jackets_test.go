package catalog

import (
	"strings"
	"testing"
)

// Emittance presets against docs/references.md's table (ranges read in published emissivity tables,
// or values from memory as labelled).
func TestJackets(t *testing.T) {
	cases := []struct {
		slug     string
		eps      float64
		lo, hi   float64 // range the preset must sit in
		retarder bool
		basis    string
	}{
		{"aluminium_new", 0.05, 0.04, 0.09, false, "Incropera 6th ed. Table A.11 range"},
		{"aluminium_weathered", 0.15, 0.1, 0.3, false, "Incropera 6th ed. Table A.11 range"},
		{"stainless_steel_jacket", 0.13, 0.07, 0.28, false, "from memory; tables 0.07–0.28"},
		{"stainless_steel_dull", 0.30, 0.30, 0.30, false, "from memory"},
		{"galvanised_new", 0.10, 0.07, 0.13, false, "Incropera 6th ed. Table A.11 range"},
		{"galvanised_dull", 0.27, 0.26, 0.28, false, "Incropera 6th ed. Table A.11 range"},
		{"painted_metal", 0.90, 0.90, 0.96, false, "Incropera 6th ed. Table A.11 range"},
		{"pvc_jacket", 0.92, 0.90, 0.94, true, "Incropera 6th ed. Table A.11 range; retarder from memory"},
		{"all_service_jacket", 0.90, 0.88, 0.97, true, "paper, Incropera 6th ed. Table A.11 range"},
		{"fsk", 0.05, 0.04, 0.09, true, "foil face as new aluminium; retarder from memory"},
		{"mastic", 0.90, 0.90, 0.90, true, "from memory"},
		{"canvas", 0.90, 0.90, 0.90, false, "from memory"},
	}
	js := Jackets()
	if len(js) != len(cases) {
		t.Errorf("%d jackets, want %d", len(js), len(cases))
	}
	seen := map[string]bool{}
	for _, j := range js {
		if seen[j.Slug] {
			t.Errorf("duplicate jacket slug %q", j.Slug)
		}
		seen[j.Slug] = true
		if !(j.Emittance > 0 && j.Emittance <= 1) || j.Name == "" || j.Use == "" || j.Source == "" {
			t.Errorf("%s: ε %g name %q use %q source %q", j.Slug, j.Emittance, j.Name, j.Use, j.Source)
		}
		if j.PermeancePerm < 0 || (j.PermeancePerm > 0 && !j.VapourRetarder) {
			t.Errorf("%s: permeance %g perm, retarder %v", j.Slug, j.PermeancePerm, j.VapourRetarder)
		}
		if strings.Contains(strings.ToLower(j.Slug), "none") {
			t.Errorf("jacket %q: there is no none jacket", j.Slug)
		}
	}
	for _, c := range cases {
		j, ok := JacketBySlug(c.slug)
		if !ok {
			t.Errorf("missing jacket %q", c.slug)
			continue
		}
		if j.Emittance != c.eps || j.Emittance < c.lo || j.Emittance > c.hi || j.VapourRetarder != c.retarder {
			t.Errorf("%s (%s): ε %g retarder %v, want %g in [%g, %g] retarder %v",
				c.slug, c.basis, j.Emittance, j.VapourRetarder, c.eps, c.lo, c.hi, c.retarder)
		}
	}
	if _, ok := JacketBySlug("none"); ok {
		t.Error("JacketBySlug found a none jacket")
	}
}

// Pipe-wall materials: k common practice; emittance as labelled in docs/references.md.
func TestPipeMaterials(t *testing.T) {
	cases := []struct {
		slug  string
		k     float64
		eps   float64
		basis string
	}{
		{"carbon_steel", 50, 0.79, "oxidised steel 0.74–0.82"},
		{"stainless_steel", 16, 0.30, "from memory"},
		{"copper", 385, 0.65, "oxidised copper, from memory"},
		{"galvanised_steel", 50, 0.27, "dull galvanised 0.26–0.28"},
		{"pvc", 0.19, 0.92, "PVC 0.90–0.94"},
	}
	ms := PipeMaterials()
	if len(ms) != len(cases) {
		t.Errorf("%d pipe materials, want %d", len(ms), len(cases))
	}
	seen := map[string]bool{}
	for _, m := range ms {
		if seen[m.Slug] {
			t.Errorf("duplicate pipe material slug %q", m.Slug)
		}
		seen[m.Slug] = true
	}
	for _, c := range cases {
		m, ok := PipeMaterialBySlug(c.slug)
		if !ok || m.WallK != c.k || m.BareEmittance != c.eps || m.Source == "" {
			t.Errorf("%s (%s): %v k %g ε %g source %q", c.slug, c.basis, ok, m.WallK, m.BareEmittance, m.Source)
		}
	}
}

// Cautions apply only inside their bands: CUI −4..175 °C (NACE SP0198, from memory),
// stainless SCC 50..150 °C (from memory), PVC above 60 °C (common practice).
func TestPipeMaterialCautionsAt(t *testing.T) {
	cases := []struct {
		slug   string
		tC     float64
		want   int
		substr string
	}{
		{"carbon_steel", 80, 1, "corrosion under insulation"},
		{"carbon_steel", -4, 1, "corrosion under insulation"},
		{"carbon_steel", 175, 1, "corrosion under insulation"},
		{"carbon_steel", -20, 0, ""},
		{"carbon_steel", 250, 0, ""},
		{"stainless_steel", 100, 1, "ASTM C795"},
		{"stainless_steel", 20, 0, ""},
		{"stainless_steel", 200, 0, ""},
		{"pvc", 80, 1, "service temperature limit"},
		{"pvc", 40, 0, ""},
		{"copper", 80, 0, ""},
		{"galvanised_steel", 80, 0, ""},
	}
	for _, c := range cases {
		m, _ := PipeMaterialBySlug(c.slug)
		got := m.CautionsAt(c.tC)
		if len(got) != c.want || (c.want > 0 && !strings.Contains(got[0], c.substr)) {
			t.Errorf("%s at %g °C: %q, want %d containing %q", c.slug, c.tC, got, c.want, c.substr)
		}
	}
	cs, _ := PipeMaterialBySlug("carbon_steel")
	if cs.CUIMinC != -4 || cs.CUIMaxC != 175 || len(cs.Cautions) == 0 {
		t.Errorf("carbon steel CUI band %g..%g, cautions %d", cs.CUIMinC, cs.CUIMaxC, len(cs.Cautions))
	}
}
