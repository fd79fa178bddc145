package handlers

import (
	"context"
	"encoding/json"
	"fmt"
	"math"
	"testing"

	"lagwright/analysis"
	"lagwright/catalog"
	"lagwright/store/storetest"
)

// The command (catalog resolver) and the app (the database's library) give the same
// answer, byte for byte, for every built-in material and every built-in jacket, on a
// representative line in the material's service range (hot, and chilled where the
// material serves below ambient).
func TestLibraryAgreesWithCatalog(t *testing.T) {
	ctx := context.Background()
	st := storetest.NewDB(t)
	lib, err := st.Library(ctx)
	if err != nil {
		t.Fatal(err)
	}
	compare := func(t *testing.T, in string) {
		t.Helper()
		want, err := analysis.Run([]byte(in), analysis.CatalogResolver{})
		if err != nil {
			t.Fatalf("catalog: %v\n%s", err, in)
		}
		got, err := analysis.Run([]byte(in), lib)
		if err != nil {
			t.Fatalf("library: %v", err)
		}
		wj, _ := json.Marshal(want)
		gj, _ := json.Marshal(got)
		if string(wj) != string(gj) {
			t.Errorf("command and app differ:\n%s\n---\n%s", wj, gj)
		}
	}
	for _, m := range catalog.Materials() {
		thickness := m.ThicknessesMM[min(2, len(m.ThicknessesMM)-1)]
		temps := []float64{math.Max(m.MinC+1, math.Min(120, m.MaxC-5))}
		if m.MinC < 5 {
			temps = append(temps, 5)
		}
		for _, op := range temps {
			t.Run(fmt.Sprintf("%s at %.0f °C", m.Slug, op), func(t *testing.T) {
				compare(t, fmt.Sprintf(`{"geometry":"pipe","pipe_size":"NPS 4","operating_temp_c":%g,"ambient_temp_c":24,
					"relative_humidity_pct":60,"length_m":30,"layers":[{"material":%q,"thickness_mm":%g}],
					"jacket":"aluminium_new","criteria":{"energy_code":"ashrae-90.1-2016","max_surface_temp_c":60}}`,
					op, m.Slug, thickness))
			})
		}
	}
	for _, j := range catalog.Jackets() {
		t.Run("jacket "+j.Slug, func(t *testing.T) {
			compare(t, fmt.Sprintf(`{"geometry":"pipe","pipe_size":"NPS 2","operating_temp_c":6,"ambient_temp_c":30,
				"relative_humidity_pct":70,"layers":[{"material":"cellular_glass_c552_t2","thickness_mm":38.1}],"jacket":%q}`, j.Slug))
		})
	}
}
