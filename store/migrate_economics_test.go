package store_test

import (
	"context"
	"encoding/json"
	"io/fs"
	"testing"

	"github.com/jackc/pgx/v5"

	"lagwright/analysis"
	"lagwright/migrations"
	"lagwright/store"
	"lagwright/store/storetest"
)

// TestMigrationEconomicsBases runs migration 0020 over settings in the older one-basis
// form: the single price, hours and CO2 go to both bases, the efficiency to heating, the
// COP to cooling, shared keys stay, a block without a price goes, and every result
// decodes strictly and validates.
func TestMigrationEconomicsBases(t *testing.T) {
	ctx := context.Background()
	dsn := storetest.NewDSN(t)
	st, err := store.Open(ctx, dsn)
	if err != nil {
		t.Fatal(err)
	}
	defer st.Close()
	old := []string{
		`{"indoor":{"ambient_temp_c":24,"wind_m_s":0},"outdoor":{"ambient_temp_c":30,"wind_m_s":3},"criteria":{},"fittings":{},
		  "economics":{"energy_price_per_kwh":0.035,"efficiency":0.82,"hours_per_year":6000,"co2_kg_per_kwh":0.2,"discount_rate":0.06,"life_years":15}}`,
		`{"indoor":{"ambient_temp_c":24,"wind_m_s":0},"outdoor":{"ambient_temp_c":30,"wind_m_s":3},"criteria":{},"fittings":{},
		  "economics":{"energy_price_per_kwh":0.12,"cop":3.5}}`,
		`{"indoor":{"ambient_temp_c":24,"wind_m_s":0},"outdoor":{"ambient_temp_c":30,"wind_m_s":3},"criteria":{},"fittings":{},
		  "economics":{"discount_rate":0.06}}`,
	}
	var ids []int64
	for i, s := range old {
		p, err := st.CreateProject(ctx, store.Project{Name: "migration case " + string(rune('A'+i)), Units: "si", Settings: json.RawMessage(s)})
		if err != nil {
			t.Fatal(err)
		}
		ids = append(ids, p.ID)
	}
	up, err := fs.ReadFile(migrations.FS, "0020_economics_bases.up.sql")
	if err != nil {
		t.Fatal(err)
	}
	conn, err := pgx.Connect(ctx, dsn)
	if err != nil {
		t.Fatal(err)
	}
	defer conn.Close(ctx)
	if _, err := conn.Exec(ctx, string(up)); err != nil {
		t.Fatalf("migration 0020: %v", err)
	}
	f := func(v float64) *float64 { return &v }
	want := []*analysis.Economics{
		{Heating: &analysis.HeatingBasis{PricePerKWh: f(0.035), Efficiency: f(0.82), HoursPerYear: f(6000), CO2KgPerKWh: f(0.2)},
			Cooling:      &analysis.CoolingBasis{PricePerKWh: f(0.035), HoursPerYear: f(6000), CO2KgPerKWh: f(0.2)},
			DiscountRate: f(0.06)},
		{Heating: &analysis.HeatingBasis{PricePerKWh: f(0.12)}, Cooling: &analysis.CoolingBasis{PricePerKWh: f(0.12), COP: f(3.5)}},
		nil,
	}
	for i, id := range ids {
		p, err := st.Project(ctx, id)
		if err != nil {
			t.Fatal(err)
		}
		var set analysis.ProjectSettings
		if err := analysis.DecodeStrict(p.Settings, &set); err != nil {
			t.Fatalf("case %d: migrated settings %s do not decode: %v", i, p.Settings, err)
		}
		if err := set.Validate(); err != nil {
			t.Errorf("case %d: migrated settings %s do not validate: %v", i, p.Settings, err)
		}
		got, _ := json.Marshal(set.Economics)
		exp, _ := json.Marshal(want[i])
		if i == 0 { // life_years is an int: compare it apart
			if set.Economics == nil || set.Economics.LifeYears == nil || *set.Economics.LifeYears != 15 {
				t.Errorf("case 0: life years lost: %s", p.Settings)
			} else {
				set.Economics.LifeYears = nil
				got, _ = json.Marshal(set.Economics)
			}
		}
		if string(got) != string(exp) {
			t.Errorf("case %d: economics %s, want %s", i, got, exp)
		}
	}
}
