package store_test

import (
	"context"
	"encoding/json"
	"errors"
	"reflect"
	"slices"
	"strings"
	"testing"

	"github.com/jackc/pgx/v5"

	"lagwright/catalog"
	"lagwright/field"
	"lagwright/store"
	"lagwright/store/storetest"
)

// customMaterial is a valid custom material: an invented data sheet's points.
func customMaterial(slug string) store.Material {
	return store.Material{Material: catalog.Material{
		Slug: slug, Name: "Site foam", Category: "custom foam", Spec: "maker data sheet 2024",
		KPoints: []catalog.KPoint{{MeanC: 0, K: 0.030}, {MeanC: 24, K: 0.032}, {MeanC: 50, K: 0.035}},
		MinC:    -40, MaxC: 120,
		ThicknessesMM: []float64{20, 30, 40, 50},
		MaxLayerMM:    50,
		Source:        "invented data sheet for tests",
	}}
}

func fieldsOf(err error) []string {
	var fe field.Errors
	if !errors.As(err, &fe) {
		return nil
	}
	var out []string
	for _, f := range fe {
		out = append(out, f.Field)
	}
	return out
}

// Material.Validate names every bad field (rules: the list; bounds shared
// with the engine's inline k_points check).
func TestMaterialValidate(t *testing.T) {
	for _, tc := range []struct {
		name   string
		edit   func(m *store.Material)
		fields []string // nil: valid
	}{
		{"valid", func(m *store.Material) {}, nil},
		{"compressible with 25 %", func(m *store.Material) { m.Compressible, m.CompressionPct = true, 25 }, nil},
		{"slug too short", func(m *store.Material) { m.Slug = "a" }, []string{"slug"}},
		{"slug upper case", func(m *store.Material) { m.Slug = "Foam" }, []string{"slug"}},
		{"slug with dash", func(m *store.Material) { m.Slug = "site-foam" }, []string{"slug"}},
		{"slug 61 chars", func(m *store.Material) { m.Slug = strings.Repeat("a", 61) }, []string{"slug"}},
		{"slug reserved", func(m *store.Material) { m.Slug = "new" }, []string{"slug"}},
		{"no name, category, source", func(m *store.Material) { m.Name, m.Category, m.Source = " ", "", "" },
			[]string{"name", "category", "source"}},
		{"one k point", func(m *store.Material) { m.KPoints = m.KPoints[:1] }, []string{"k_points"}},
		{"k zero", func(m *store.Material) { m.KPoints[1].K = 0 }, []string{"k_points[1]"}},
		{"k above 10", func(m *store.Material) { m.KPoints[2].K = 10.5 }, []string{"k_points[2]"}},
		{"mean temperature repeated", func(m *store.Material) { m.KPoints[2].MeanC = 24 }, []string{"k_points[2]"}},
		{"mean temperature decreasing", func(m *store.Material) { m.KPoints[1].MeanC = -5 }, []string{"k_points[1]"}},
		{"mean temperature below absolute zero", func(m *store.Material) { m.KPoints[0].MeanC = -300 }, []string{"k_points[0]"}},
		{"service range reversed", func(m *store.Material) { m.MinC, m.MaxC = 120, -40 }, []string{"max_temp_c"}},
		{"service range empty", func(m *store.Material) { m.MaxC = m.MinC }, []string{"max_temp_c"}},
		{"no thicknesses", func(m *store.Material) { m.ThicknessesMM = nil }, []string{"thicknesses_mm"}},
		{"thickness descending", func(m *store.Material) { m.ThicknessesMM = []float64{30, 20} }, []string{"thicknesses_mm[1]"}},
		{"thickness 0", func(m *store.Material) { m.ThicknessesMM = []float64{0, 20} }, []string{"thicknesses_mm[0]"}},
		{"thickness over 600", func(m *store.Material) { m.ThicknessesMM = []float64{20, 601} }, []string{"thicknesses_mm[1]"}},
		{"max layer 0", func(m *store.Material) { m.MaxLayerMM = 0 }, []string{"max_layer_mm"}},
		{"compression without compressible", func(m *store.Material) { m.CompressionPct = 10 }, []string{"compression_pct"}},
		{"compression 80 %", func(m *store.Material) { m.Compressible, m.CompressionPct = true, 80 }, []string{"compression_pct"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			m := customMaterial("site_foam")
			tc.edit(&m)
			var got []string
			for _, f := range m.Validate() {
				got = append(got, f.Field)
			}
			if !slices.Equal(got, tc.fields) {
				t.Errorf("fields = %v, want %v", got, tc.fields)
			}
		})
	}
	// Every built-in class passes the rules custom materials must pass.
	for _, c := range catalog.Materials() {
		if fe := (store.Material{Material: c}).Validate(); len(fe) > 0 {
			t.Errorf("built-in %s fails Validate: %v", c.Slug, fe)
		}
	}
}

func TestJacketValidate(t *testing.T) {
	valid := store.Jacket{Jacket: catalog.Jacket{Slug: "site_jacket", Name: "Site jacket", Emittance: 0.9, Source: "test"}}
	for _, tc := range []struct {
		name   string
		edit   func(j *store.Jacket)
		fields []string
	}{
		{"valid", func(j *store.Jacket) {}, nil},
		{"emittance 0 and 1 allowed", func(j *store.Jacket) { j.Emittance = 1 }, nil},
		{"emittance above 1", func(j *store.Jacket) { j.Emittance = 1.2 }, []string{"emittance"}},
		{"emittance negative", func(j *store.Jacket) { j.Emittance = -0.1 }, []string{"emittance"}},
		{"permeance negative", func(j *store.Jacket) { j.PermeancePerm = -1 }, []string{"permeance_perm"}},
		{"bad slug, no name, no source", func(j *store.Jacket) { j.Slug, j.Name, j.Source = "x y", "", "" },
			[]string{"slug", "name", "source"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			j := valid
			tc.edit(&j)
			var got []string
			for _, f := range j.Validate() {
				got = append(got, f.Field)
			}
			if !slices.Equal(got, tc.fields) {
				t.Errorf("fields = %v, want %v", got, tc.fields)
			}
		})
	}
	for _, c := range catalog.Jackets() {
		if fe := (store.Jacket{Jacket: c}).Validate(); len(fe) > 0 {
			t.Errorf("built-in %s fails Validate: %v", c.Slug, fe)
		}
	}
}

type rowVersion struct {
	data    string
	version int
}

// snapshot reads every material and jacket row's data and version.
func snapshot(t *testing.T, st *store.Store) map[string]rowVersion {
	t.Helper()
	ctx := context.Background()
	out := map[string]rowVersion{}
	mats, err := st.Materials(ctx)
	if err != nil {
		t.Fatal(err)
	}
	for _, m := range mats {
		v := m.Version
		m.Version, m.UpdatedAt = 0, m.UpdatedAt.UTC()
		js, _ := json.Marshal(m)
		out["material:"+m.Slug] = rowVersion{string(js), v}
	}
	jackets, err := st.Jackets(ctx)
	if err != nil {
		t.Fatal(err)
	}
	for _, j := range jackets {
		v := j.Version
		j.Version = 0
		js, _ := json.Marshal(j)
		out["jacket:"+j.Slug] = rowVersion{string(js), v}
	}
	return out
}

// Starting twice (the template database is seeded once; seeding again is a second
// start) leaves the same rows and versions, and the rows hold the catalog's data.
func TestSeedCatalogTwice(t *testing.T) {
	ctx := context.Background()
	st := storetest.NewDB(t)
	before := snapshot(t, st)
	if err := st.SeedCatalog(ctx); err != nil {
		t.Fatal(err)
	}
	after := snapshot(t, st)
	if !reflect.DeepEqual(before, after) {
		t.Errorf("a second start changed the library:\n%v\n---\n%v", before, after)
	}
	if want := len(catalog.Materials()) + len(catalog.Jackets()); len(after) != want {
		t.Errorf("%d rows, want %d", len(after), want)
	}
	for _, c := range catalog.Materials() {
		m, err := st.Material(ctx, c.Slug)
		if err != nil {
			t.Fatal(err)
		}
		if !m.Builtin || m.Version != 1 || !reflect.DeepEqual(m.Material, c) {
			t.Errorf("%s: builtin %v version %d\n%+v\nwant %+v", c.Slug, m.Builtin, m.Version, m.Material, c)
		}
	}
	for _, c := range catalog.Jackets() {
		j, err := st.Jacket(ctx, c.Slug)
		if err != nil {
			t.Fatal(err)
		}
		if !j.Builtin || j.Version != 1 || j.Jacket != c {
			t.Errorf("%s: builtin %v version %d %+v, want %+v", c.Slug, j.Builtin, j.Version, j.Jacket, c)
		}
	}
}

// A built-in row whose data differs from the catalog (as after a catalog fix) is
// updated with its version bumped; the other built-ins and every custom row keep
// their data and version.
func TestSeedCatalogBumpsChangedBuiltin(t *testing.T) {
	ctx := context.Background()
	dsn := storetest.NewDSN(t)
	st, err := store.Open(ctx, dsn)
	if err != nil {
		t.Fatal(err)
	}
	defer st.Close()
	if _, err := st.CreateMaterial(ctx, customMaterial("site_foam")); err != nil {
		t.Fatal(err)
	}
	if _, err := st.CreateJacket(ctx, store.Jacket{Jacket: catalog.Jacket{Slug: "site_jacket", Name: "Site jacket",
		Emittance: 0.5, Source: "test"}}); err != nil {
		t.Fatal(err)
	}
	conn, err := pgx.Connect(ctx, dsn)
	if err != nil {
		t.Fatal(err)
	}
	defer conn.Close(ctx)
	// The rows as an older catalog would have left them.
	for _, sql := range []string{
		`UPDATE materials SET k_points = '[{"t_c": 0, "k_w_mk": 0.05}, {"t_c": 100, "k_w_mk": 0.06}]' WHERE slug = 'perlite_c610'`,
		`UPDATE jackets SET emittance = 0.5 WHERE slug = 'canvas'`,
	} {
		if _, err := conn.Exec(ctx, sql); err != nil {
			t.Fatal(err)
		}
	}
	before := snapshot(t, st)
	if err := st.SeedCatalog(ctx); err != nil {
		t.Fatal(err)
	}
	after := snapshot(t, st)
	for key, b := range before {
		a := after[key]
		switch key {
		case "material:perlite_c610", "jacket:canvas":
			if a.version != b.version+1 || a.data == b.data {
				t.Errorf("%s: version %d → %d, data changed %v; want a bump and the catalog's data", key, b.version, a.version, a.data != b.data)
			}
		default:
			if a != b {
				t.Errorf("%s changed: %+v → %+v", key, b, a)
			}
		}
	}
	perlite, _ := catalog.MaterialBySlug("perlite_c610")
	if m, _ := st.Material(ctx, "perlite_c610"); !reflect.DeepEqual(m.KPoints, perlite.KPoints) {
		t.Errorf("perlite k points %v, want the catalog's %v", m.KPoints, perlite.KPoints)
	}
	if m, _ := st.Material(ctx, "site_foam"); m.Version != 1 || m.Builtin {
		t.Errorf("custom material after seeding: version %d builtin %v", m.Version, m.Builtin)
	}
}

// A line in a project that uses slugs.
func mustLine(t *testing.T, st *store.Store, tag, input string, materials ...string) {
	t.Helper()
	ctx := context.Background()
	p, err := st.CreateProject(ctx, store.Project{Name: "Plant room " + tag, Units: "si"})
	if err != nil {
		t.Fatal(err)
	}
	if _, err := st.CreateLine(ctx, store.Line{ProjectID: p.ID, Tag: tag, Input: json.RawMessage(input)}, materials); err != nil {
		t.Fatal(err)
	}
}

func TestCustomMaterialLifecycle(t *testing.T) {
	ctx := context.Background()
	st := storetest.NewDB(t)

	m, err := st.CreateMaterial(ctx, customMaterial("site_foam"))
	if err != nil {
		t.Fatal(err)
	}
	if m.Version != 1 || m.Builtin || m.Slug != "site_foam" || len(m.KPoints) != 3 || m.KPoints[1] != (catalog.KPoint{MeanC: 24, K: 0.032}) {
		t.Fatalf("created %+v", m)
	}
	list, err := st.Materials(ctx)
	if err != nil {
		t.Fatal(err)
	}
	if len(list) != len(catalog.Materials())+1 {
		t.Errorf("list has %d materials, want %d", len(list), len(catalog.Materials())+1)
	}

	// Edit: the version moves on, and the library (the analysis' resolver) sees it.
	m.KPoints[1].K = 0.033
	m.Compressible, m.CompressionPct = true, 20
	m2, err := st.UpdateMaterial(ctx, m)
	if err != nil {
		t.Fatal(err)
	}
	if m2.Version != 2 || m2.KPoints[1].K != 0.033 || m2.CompressionPct != 20 {
		t.Errorf("updated %+v", m2)
	}
	lib, err := st.Library(ctx)
	if err != nil {
		t.Fatal(err)
	}
	if got, ok := lib.Material("site_foam"); !ok || got.KPoints[1].K != 0.033 || got.CompressionPct != 20 || lib.Version("material:site_foam") != 2 {
		t.Errorf("library: %+v %v version %d", got, ok, lib.Version("material:site_foam"))
	}
	// The stale version (1) is refused.
	if _, err := st.UpdateMaterial(ctx, m); !errors.Is(err, store.ErrConflict) {
		t.Errorf("stale update: %v, want ErrConflict", err)
	}

	if err := st.DeleteMaterial(ctx, "site_foam"); err != nil {
		t.Fatal(err)
	}
	if _, err := st.Material(ctx, "site_foam"); !errors.Is(err, store.ErrNotFound) {
		t.Errorf("after delete: %v, want ErrNotFound", err)
	}
}

func TestCustomMaterialRefusals(t *testing.T) {
	ctx := context.Background()
	st := storetest.NewDB(t)
	if _, err := st.CreateMaterial(ctx, customMaterial("site_foam")); err != nil {
		t.Fatal(err)
	}
	mustLine(t, st, "CHW-7", `{"layers":[{"material":"site_foam","thickness_mm":25}]}`, "site_foam")
	builtin, err := st.Material(ctx, "polyiso_c591")
	if err != nil {
		t.Fatal(err)
	}
	badPoints := customMaterial("other_foam")
	badPoints.KPoints = []catalog.KPoint{{MeanC: 50, K: 0.03}, {MeanC: 20, K: -1}}

	for _, tc := range []struct {
		name   string
		op     func() error
		want   error
		fields []string
	}{
		{"create with a built-in slug", func() error {
			_, err := st.CreateMaterial(ctx, customMaterial("polyiso_c591"))
			return err
		}, store.ErrBuiltinSlug, nil},
		{"create a duplicate", func() error {
			_, err := st.CreateMaterial(ctx, customMaterial("site_foam"))
			return err
		}, store.ErrSlugTaken, nil},
		{"create with bad k points", func() error {
			_, err := st.CreateMaterial(ctx, badPoints)
			return err
		}, nil, []string{"k_points[1]"}},
		{"edit a built-in", func() error {
			builtin.Name = "Mine now"
			_, err := st.UpdateMaterial(ctx, builtin)
			return err
		}, store.ErrBuiltin, nil},
		{"edit a missing material", func() error {
			_, err := st.UpdateMaterial(ctx, customMaterial("nobody"))
			return err
		}, store.ErrNotFound, nil},
		{"delete a built-in", func() error { return st.DeleteMaterial(ctx, "polyiso_c591") }, store.ErrBuiltin, nil},
		{"delete a missing material", func() error { return st.DeleteMaterial(ctx, "nobody") }, store.ErrNotFound, nil},
		{"delete one in use", func() error { return st.DeleteMaterial(ctx, "site_foam") }, store.ErrInUse, nil},
	} {
		t.Run(tc.name, func(t *testing.T) {
			err := tc.op()
			if tc.want != nil && !errors.Is(err, tc.want) {
				t.Errorf("err = %v, want %v", err, tc.want)
			}
			if got := fieldsOf(err); !slices.Equal(got, tc.fields) {
				t.Errorf("field errors %v, want %v", got, tc.fields)
			}
		})
	}
	var inUse *store.InUseError
	if err := st.DeleteMaterial(ctx, "site_foam"); !errors.As(err, &inUse) || inUse.Count != 1 ||
		!slices.Equal(inUse.Lines, []string{"CHW-7 (Plant room CHW-7)"}) {
		t.Errorf("in use: %v (%+v)", err, inUse)
	}
	if m, err := st.Material(ctx, "site_foam"); err != nil || m.Version != 1 {
		t.Errorf("the refused material changed: %+v %v", m, err)
	}
}

func TestCustomJacketLifecycleAndRefusals(t *testing.T) {
	ctx := context.Background()
	st := storetest.NewDB(t)
	j, err := st.CreateJacket(ctx, store.Jacket{Jacket: catalog.Jacket{Slug: "site_jacket", Name: "Site jacket",
		Emittance: 0.85, VapourRetarder: true, PermeancePerm: 0.01, Use: "indoor", Source: "test"}})
	if err != nil {
		t.Fatal(err)
	}
	if j.Version != 1 || j.Builtin || j.PermeancePerm != 0.01 || !j.VapourRetarder {
		t.Fatalf("created %+v", j)
	}
	j.Emittance = 0.8
	j2, err := st.UpdateJacket(ctx, j)
	if err != nil || j2.Version != 2 || j2.Emittance != 0.8 {
		t.Fatalf("updated %+v %v", j2, err)
	}
	if _, err := st.UpdateJacket(ctx, j); !errors.Is(err, store.ErrConflict) {
		t.Errorf("stale update: %v, want ErrConflict", err)
	}
	if _, err := st.CreateJacket(ctx, store.Jacket{Jacket: catalog.Jacket{Slug: "pvc_jacket", Name: "x", Source: "x"}}); !errors.Is(err, store.ErrBuiltinSlug) {
		t.Errorf("built-in slug: %v", err)
	}
	if err := st.DeleteJacket(ctx, "pvc_jacket"); !errors.Is(err, store.ErrBuiltin) {
		t.Errorf("delete built-in: %v", err)
	}
	pvc, _ := st.Jacket(ctx, "pvc_jacket")
	if _, err := st.UpdateJacket(ctx, pvc); !errors.Is(err, store.ErrBuiltin) {
		t.Errorf("edit built-in: %v", err)
	}
	mustLine(t, st, "HW-1", `{"jacket":"site_jacket","layers":[]}`)
	var inUse *store.InUseError
	if err := st.DeleteJacket(ctx, "site_jacket"); !errors.As(err, &inUse) || inUse.Count != 1 || inUse.Lines[0] != "HW-1 (Plant room HW-1)" {
		t.Errorf("delete in use: %v", err)
	}
	// Once no line names it, it goes.
	if _, err := st.CreateJacket(ctx, store.Jacket{Jacket: catalog.Jacket{Slug: "spare_jacket", Name: "Spare", Emittance: 0.9, Source: "t"}}); err != nil {
		t.Fatal(err)
	}
	if err := st.DeleteJacket(ctx, "spare_jacket"); err != nil {
		t.Errorf("delete unused: %v", err)
	}
	if _, err := st.Jacket(ctx, "spare_jacket"); !errors.Is(err, store.ErrNotFound) {
		t.Errorf("after delete: %v", err)
	}
}
