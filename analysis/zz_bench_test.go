package analysis

import "testing"

var zzJS = []byte(`{"geometry":"pipe","pipe_size":"NPS 4","operating_temp_c":180,"ambient_temp_c":20,"relative_humidity_pct":60,
		"length_m":50,"layers":[{"material":"mineral_fiber_pipe_c547_t1","thickness_mm":50.8}],"jacket":"aluminium_new",
		"criteria":{"energy_code":"ashrae-90.1-2016","max_heat_flow_w_per_m":80},
		"economics":{"energy_price_per_kwh":0.05,"installed_cost_per_m":[{"thickness_mm":25.4,"cost":30},{"thickness_mm":38.1,"cost":36},
		{"thickness_mm":50.8,"cost":44},{"thickness_mm":63.5,"cost":52},{"thickness_mm":76.2,"cost":60},{"thickness_mm":101.6,"cost":80}]}}`)

func BenchmarkZZResolve(b *testing.B) {
	var in Input
	if err := DecodeStrict(zzJS, &in); err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := resolve(in, CatalogResolver{}); err != nil {
			b.Fatal(err)
		}
	}
}
