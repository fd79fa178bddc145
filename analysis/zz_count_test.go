package analysis

import (
	"fmt"
	"os"
	"path/filepath"
	"sort"
	"testing"
	"lagwright/calc"
)

func TestZZCount(t *testing.T) {
	files, _ := filepath.Glob("testdata/golden/*.input.json")
	files = append(files, "BENCH")
	for _, f := range files {
		var data []byte
		if f == "BENCH" {
			data = []byte(`{"geometry":"pipe","pipe_size":"NPS 4","operating_temp_c":180,"ambient_temp_c":20,"relative_humidity_pct":60,
		"length_m":50,"layers":[{"material":"mineral_fiber_pipe_c547_t1","thickness_mm":50.8}],"jacket":"aluminium_new",
		"criteria":{"energy_code":"ashrae-90.1-2016","max_heat_flow_w_per_m":80},
		"economics":{"energy_price_per_kwh":0.05,"installed_cost_per_m":[{"thickness_mm":25.4,"cost":30},{"thickness_mm":38.1,"cost":36},
		{"thickness_mm":50.8,"cost":44},{"thickness_mm":63.5,"cost":52},{"thickness_mm":76.2,"cost":60},{"thickness_mm":101.6,"cost":80}]}}`)
		} else {
			data, _ = os.ReadFile(f)
		}
		var in Input
		if err := DecodeStrict(data, &in); err != nil {
			t.Fatal(err)
		}
		l, err := resolve(in, CatalogResolver{})
		if err != nil {
			t.Fatal(err)
		}
		a := &analyser{l: l}
		if _, err := a.run(); err != nil {
			t.Fatal(err)
		}
		ev := 0
		var keys []string
		all := map[solveKey]calc.Result{}
		for _, e := range a.memo {
			all[e.key] = e.res
		}
		for k, r := range a.cache {
			all[k] = r
		}
		for k, r := range all {
			ev += r.Evaluations
			keys = append(keys, fmt.Sprintf("%+v ev=%d", k, r.Evaluations))
		}
		sort.Strings(keys)
		fmt.Printf("%s: solves=%d evals=%d\n", filepath.Base(f), len(all), ev)
		for _, k := range keys {
			fmt.Println("   ", k)
		}
	}
}
