package store

import (
	"context"
	"encoding/json"
	"fmt"
	"strings"

	"github.com/jackc/pgx/v5"

	"lagwright/catalog"
)

// Library is a snapshot of the materials and jackets in the database: the catalog's
// built-in rows and the custom ones. It resolves slugs for the analysis (it satisfies
// analysis.Resolver) and knows each row's version, so stored results know when a
// material they used has changed.
type Library struct {
	materials  map[string]libMaterial
	jackets    map[string]libJacket
	codeTables map[string]libCodeTable
	codeOrder  []string // ids, built-in first, then by name
}

type libMaterial struct {
	m       catalog.Material
	version int
	builtin bool
}

type libJacket struct {
	j       catalog.Jacket
	version int
	builtin bool
}

// Material returns a material by slug.
func (l *Library) Material(slug string) (catalog.Material, bool) {
	m, ok := l.materials[slug]
	return m.m, ok
}

// Jacket returns a jacket by slug.
func (l *Library) Jacket(slug string) (catalog.Jacket, bool) {
	j, ok := l.jackets[slug]
	return j.j, ok
}

// Version returns the version of a material or jacket (0 when unknown). Materials
// and jackets have separate slug spaces; the key is "material:slug" or "jacket:slug".
func (l *Library) Version(key string) int {
	if len(key) > 9 && key[:9] == "material:" {
		return l.materials[key[9:]].version
	}
	if len(key) > 7 && key[:7] == "jacket:" {
		return l.jackets[key[7:]].version
	}
	if id, ok := strings.CutPrefix(key, "code_table:"); ok {
		return l.codeTables[id].version
	}
	return 0
}

// kPointJSON is how k points are stored: apparent k against mean temperature.
type kPointJSON struct {
	TC float64 `json:"t_c"`
	K  float64 `json:"k_w_mk"`
}

func encodeKPoints(pts []catalog.KPoint) json.RawMessage {
	out := make([]kPointJSON, len(pts))
	for i, p := range pts {
		out[i] = kPointJSON{TC: p.MeanC, K: p.K}
	}
	js, _ := json.Marshal(out)
	return js
}

func decodeKPoints(js []byte) ([]catalog.KPoint, error) {
	var in []kPointJSON
	if err := json.Unmarshal(js, &in); err != nil {
		return nil, err
	}
	out := make([]catalog.KPoint, len(in))
	for i, p := range in {
		out[i] = catalog.KPoint{MeanC: p.TC, K: p.K}
	}
	return out, nil
}

// SeedCatalog upserts the catalog's built-in materials and jackets. It is idempotent:
// a row whose data is unchanged keeps its version; a catalog fix updates the built-in
// row and bumps its version; custom rows are never touched.
func (s *Store) SeedCatalog(ctx context.Context) error {
	return pgx.BeginFunc(ctx, s.pool, func(tx pgx.Tx) error {
		for _, m := range catalog.Materials() {
			th, _ := json.Marshal(m.ThicknessesMM)
			_, err := tx.Exec(ctx, `
				INSERT INTO materials (slug, name, category, spec, k_points, min_temp_c, max_temp_c, thicknesses_mm,
				                       max_layer_mm, compressible, compression_pct, source, builtin)
				VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11, $12, true)
				ON CONFLICT (slug) DO UPDATE SET
				    name = EXCLUDED.name, category = EXCLUDED.category, spec = EXCLUDED.spec,
				    k_points = EXCLUDED.k_points, min_temp_c = EXCLUDED.min_temp_c, max_temp_c = EXCLUDED.max_temp_c,
				    thicknesses_mm = EXCLUDED.thicknesses_mm, max_layer_mm = EXCLUDED.max_layer_mm,
				    compressible = EXCLUDED.compressible, compression_pct = EXCLUDED.compression_pct,
				    source = EXCLUDED.source, version = materials.version + 1, updated_at = now()
				WHERE materials.builtin AND (materials.name, materials.category, materials.spec, materials.k_points,
				       materials.min_temp_c, materials.max_temp_c, materials.thicknesses_mm, materials.max_layer_mm,
				       materials.compressible, materials.compression_pct, materials.source)
				    IS DISTINCT FROM (EXCLUDED.name, EXCLUDED.category, EXCLUDED.spec, EXCLUDED.k_points,
				       EXCLUDED.min_temp_c, EXCLUDED.max_temp_c, EXCLUDED.thicknesses_mm, EXCLUDED.max_layer_mm,
				       EXCLUDED.compressible, EXCLUDED.compression_pct, EXCLUDED.source)`,
				m.Slug, m.Name, m.Category, m.Spec, encodeKPoints(m.KPoints), m.MinC, m.MaxC, th, m.MaxLayerMM,
				m.Compressible, m.CompressionPct, m.Source)
			if err != nil {
				return fmt.Errorf("store: seed material %s: %w", m.Slug, err)
			}
		}
		for _, j := range catalog.Jackets() {
			var perm any
			if j.PermeancePerm > 0 {
				perm = j.PermeancePerm
			}
			_, err := tx.Exec(ctx, `
				INSERT INTO jackets (slug, name, emittance, vapour_retarder, permeance_perm, use, source, builtin)
				VALUES ($1, $2, $3, $4, $5, $6, $7, true)
				ON CONFLICT (slug) DO UPDATE SET
				    name = EXCLUDED.name, emittance = EXCLUDED.emittance, vapour_retarder = EXCLUDED.vapour_retarder,
				    permeance_perm = EXCLUDED.permeance_perm, use = EXCLUDED.use, source = EXCLUDED.source,
				    version = jackets.version + 1, updated_at = now()
				WHERE jackets.builtin AND (jackets.name, jackets.emittance, jackets.vapour_retarder, jackets.permeance_perm,
				       jackets.use, jackets.source)
				    IS DISTINCT FROM (EXCLUDED.name, EXCLUDED.emittance, EXCLUDED.vapour_retarder, EXCLUDED.permeance_perm,
				       EXCLUDED.use, EXCLUDED.source)`,
				j.Slug, j.Name, j.Emittance, j.VapourRetarder, perm, j.Use, j.Source)
			if err != nil {
				return fmt.Errorf("store: seed jacket %s: %w", j.Slug, err)
			}
		}
		return seedCodeTables(ctx, tx)
	})
}

// Library loads every material and jacket.
func (s *Store) Library(ctx context.Context) (*Library, error) {
	lib := &Library{materials: map[string]libMaterial{}, jackets: map[string]libJacket{}}
	rows, err := s.pool.Query(ctx, `
		SELECT slug, name, category, spec, k_points, coalesce(min_temp_c, -273), coalesce(max_temp_c, 1500),
		       thicknesses_mm, coalesce(max_layer_mm, 0), compressible, compression_pct, source, builtin, version
		FROM materials`)
	if err != nil {
		return nil, fmt.Errorf("store: library: %w", err)
	}
	for rows.Next() {
		var m catalog.Material
		var kp, th []byte
		var lm libMaterial
		if err := rows.Scan(&m.Slug, &m.Name, &m.Category, &m.Spec, &kp, &m.MinC, &m.MaxC, &th, &m.MaxLayerMM,
			&m.Compressible, &m.CompressionPct, &m.Source, &lm.builtin, &lm.version); err != nil {
			rows.Close()
			return nil, fmt.Errorf("store: library: %w", err)
		}
		if m.KPoints, err = decodeKPoints(kp); err != nil {
			rows.Close()
			return nil, fmt.Errorf("store: material %s: k points: %w", m.Slug, err)
		}
		if err := json.Unmarshal(th, &m.ThicknessesMM); err != nil {
			rows.Close()
			return nil, fmt.Errorf("store: material %s: thicknesses: %w", m.Slug, err)
		}
		if !m.Compressible {
			m.CompressionPct = 0
		}
		if c, ok := catalog.MaterialBySlug(m.Slug); ok && lm.builtin {
			m.Form = c.Form // the form (pipe section, board …) is display data, not stored
			// The metric series is catalog data, not stored: a built-in's comes from the
			// build (a change to it changes the method version); custom materials have
			// none and are proposed from their inch series rounded to 5 mm.
			m.ThicknessesMetricMM = c.ThicknessesMetricMM
		}
		lm.m = m
		lib.materials[m.Slug] = lm
	}
	if err := rows.Err(); err != nil {
		return nil, fmt.Errorf("store: library: %w", err)
	}
	rows, err = s.pool.Query(ctx, `
		SELECT slug, name, emittance, vapour_retarder, coalesce(permeance_perm, 0), use, source, builtin, version FROM jackets`)
	if err != nil {
		return nil, fmt.Errorf("store: library: %w", err)
	}
	defer rows.Close()
	for rows.Next() {
		var j catalog.Jacket
		var lj libJacket
		if err := rows.Scan(&j.Slug, &j.Name, &j.Emittance, &j.VapourRetarder, &j.PermeancePerm, &j.Use, &j.Source,
			&lj.builtin, &lj.version); err != nil {
			return nil, fmt.Errorf("store: library: %w", err)
		}
		if c, ok := catalog.JacketBySlug(j.Slug); ok && lj.builtin {
			// Catalog data, not stored (as a material's form and metric series): a
			// built-in jacket's solar absorptance and surface limit come from the build.
			j.SolarAbsorptance, j.AbsorptanceSource = c.SolarAbsorptance, c.AbsorptanceSource
			j.MaxSurfaceC, j.MaxSurfaceSource = c.MaxSurfaceC, c.MaxSurfaceSource
		}
		lj.j = j
		lib.jackets[j.Slug] = lj
	}
	if err := rows.Err(); err != nil {
		return nil, fmt.Errorf("store: library: %w", err)
	}
	if err := s.loadCodeTables(ctx, lib); err != nil {
		return nil, err
	}
	return lib, nil
}
