package store

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"regexp"
	"strings"
	"time"

	"github.com/jackc/pgx/v5"
	"github.com/jackc/pgx/v5/pgconn"

	"lagwright/catalog"
	"lagwright/field"
)

// Errors of the library (materials and jackets), for errors.Is.
var (
	// ErrBuiltin: built-in rows come from the catalog and are read-only.
	ErrBuiltin = errors.New("built-in entries are read-only")
	// ErrBuiltinSlug: a custom entry may not take a built-in entry's slug.
	ErrBuiltinSlug = errors.New("slug belongs to a built-in entry")
	// ErrSlugTaken: another custom entry has the slug.
	ErrSlugTaken = errors.New("slug already taken")
	// ErrInUse: lines use the entry, so it cannot be deleted (see InUseError).
	ErrInUse = errors.New("in use")
)

// InUseError says which lines use a material or jacket that was to be deleted. It
// matches ErrInUse with errors.Is.
type InUseError struct {
	What  string   // "material" | "jacket"
	Slug  string   //
	Count int      // lines using it
	Lines []string // up to five, as "tag (project)"
}

func (e *InUseError) Error() string {
	s := fmt.Sprintf("%s %s is used by %d line", e.What, e.Slug, e.Count)
	if e.Count != 1 {
		s += "s"
	}
	if len(e.Lines) > 0 {
		s += ": " + strings.Join(e.Lines, ", ")
		if e.Count > len(e.Lines) {
			s += ", …"
		}
	}
	return s
}

// Is makes errors.Is(err, ErrInUse) true.
func (e *InUseError) Is(target error) bool { return target == ErrInUse }

// Bounds of a library entry. The k and temperature bounds match the machine
// interface's own checks of inline k_points (analysis), so whatever the library
// accepts the engine accepts too.
const (
	MaxKPoints      = 30
	MaxThicknesses  = 40
	MaxThicknessMM  = 600
	MaxK            = 10    // W/(m·K)
	MinMeanTempC    = -273  // °C
	MaxMeanTempC    = 1200  // °C
	MaxTextLen      = 200   // name, category, spec
	MaxSourceLen    = 2000  //
	MaxPermeance    = 1000  // US perm
	MaxCompression  = 60    // % of nominal thickness
	minSlugLen      = 2     //
	maxSlugLen      = 60    //
	reservedSlugNew = "new" // /materials/new is the form
)

var slugRE = regexp.MustCompile(`^[a-z0-9_]+$`)

func validateSlug(fe *field.Errors, slug string) {
	switch {
	case len(slug) < minSlugLen || len(slug) > maxSlugLen:
		fe.Add("slug", "must be %d to %d characters", minSlugLen, maxSlugLen)
	case !slugRE.MatchString(slug):
		fe.Add("slug", "may hold only lowercase letters, digits and underscores")
	case slug == reservedSlugNew:
		fe.Add("slug", "%q is reserved; choose another", slug)
	}
}

func validateText(fe *field.Errors, name, v string, required bool, maxLen int) {
	switch {
	case required && strings.TrimSpace(v) == "":
		fe.Add(name, "is required")
	case len(v) > maxLen:
		fe.Add(name, "must be at most %d characters", maxLen)
	}
}

func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// Material is an insulation material in the library: a built-in class seeded from
// the catalog, or a custom one from a data sheet.
type Material struct {
	catalog.Material
	Builtin   bool
	Version   int
	UpdatedAt time.Time
}

// Validate checks a material's own data and returns every problem, or nil. The
// rules: a slug of 2–60 lowercase letters, digits and underscores; a name, category
// and source; at least 2 k points with strictly increasing mean temperatures
// (−273 to 1200 °C) and 0 < k ≤ 10 W/(m·K); a service range with min < max; one or
// more thicknesses, strictly ascending, each above 0 and at most 600 mm; the
// largest single layer above 0 and at most 600 mm; and, for a compressible
// material, an installed compression of 0–60 %.
func (m Material) Validate() field.Errors {
	var fe field.Errors
	validateSlug(&fe, m.Slug)
	validateText(&fe, "name", m.Name, true, MaxTextLen)
	validateText(&fe, "category", m.Category, true, MaxTextLen)
	validateText(&fe, "spec", m.Spec, false, MaxTextLen)
	validateText(&fe, "source", m.Source, true, MaxSourceLen)

	switch n := len(m.KPoints); {
	case n < 2:
		fe.Add("k_points", "give at least 2 points (mean temperature, k)")
	case n > MaxKPoints:
		fe.Add("k_points", "give at most %d points", MaxKPoints)
	default:
		for i, p := range m.KPoints {
			f := fmt.Sprintf("k_points[%d]", i)
			switch {
			case !finite(p.MeanC) || p.MeanC < MinMeanTempC || p.MeanC > MaxMeanTempC:
				fe.Add(f, "mean temperature must be between %d and %d °C", MinMeanTempC, MaxMeanTempC)
			case !finite(p.K) || p.K <= 0 || p.K > MaxK:
				fe.Add(f, "k must be greater than 0 and at most %d W/m·K", MaxK)
			case i > 0 && p.MeanC <= m.KPoints[i-1].MeanC:
				fe.Add(f, "mean temperatures must be strictly increasing")
			}
		}
	}

	minOK := finite(m.MinC) && m.MinC >= MinMeanTempC && m.MinC <= MaxMeanTempC
	maxOK := finite(m.MaxC) && m.MaxC >= MinMeanTempC && m.MaxC <= MaxMeanTempC
	if !minOK {
		fe.Add("min_temp_c", "must be between %d and %d °C", MinMeanTempC, MaxMeanTempC)
	}
	if !maxOK {
		fe.Add("max_temp_c", "must be between %d and %d °C", MinMeanTempC, MaxMeanTempC)
	}
	if minOK && maxOK && m.MinC >= m.MaxC {
		fe.Add("max_temp_c", "must be above the lowest service temperature")
	}

	switch n := len(m.ThicknessesMM); {
	case n == 0:
		fe.Add("thicknesses_mm", "give at least one thickness")
	case n > MaxThicknesses:
		fe.Add("thicknesses_mm", "give at most %d thicknesses", MaxThicknesses)
	default:
		for i, t := range m.ThicknessesMM {
			f := fmt.Sprintf("thicknesses_mm[%d]", i)
			switch {
			case !finite(t) || t <= 0 || t > MaxThicknessMM:
				fe.Add(f, "must be greater than 0 and at most %d mm", MaxThicknessMM)
			case i > 0 && t <= m.ThicknessesMM[i-1]:
				fe.Add(f, "thicknesses must be in ascending order, each once")
			}
		}
	}
	if !finite(m.MaxLayerMM) || m.MaxLayerMM <= 0 || m.MaxLayerMM > MaxThicknessMM {
		fe.Add("max_layer_mm", "must be greater than 0 and at most %d mm", MaxThicknessMM)
	}
	if !finite(m.CompressionPct) || m.CompressionPct < 0 || m.CompressionPct > MaxCompression {
		fe.Add("compression_pct", "must be between 0 and %d %%", MaxCompression)
	} else if !m.Compressible && m.CompressionPct != 0 {
		fe.Add("compression_pct", "applies only to a compressible material")
	}
	return fe
}

const materialColumns = `slug, name, category, spec, k_points, coalesce(min_temp_c, -273), coalesce(max_temp_c, 1200),
	thicknesses_mm, coalesce(max_layer_mm, 0), compressible, compression_pct, source, builtin, version, updated_at`

func scanMaterial(row pgx.CollectableRow) (Material, error) {
	var m Material
	var kp, th []byte
	if err := row.Scan(&m.Slug, &m.Name, &m.Category, &m.Spec, &kp, &m.MinC, &m.MaxC, &th, &m.MaxLayerMM,
		&m.Compressible, &m.CompressionPct, &m.Source, &m.Builtin, &m.Version, &m.UpdatedAt); err != nil {
		return m, err
	}
	var err error
	if m.KPoints, err = decodeKPoints(kp); err != nil {
		return m, fmt.Errorf("material %s: k points: %w", m.Slug, err)
	}
	if err := json.Unmarshal(th, &m.ThicknessesMM); err != nil {
		return m, fmt.Errorf("material %s: thicknesses: %w", m.Slug, err)
	}
	if c, ok := catalog.MaterialBySlug(m.Slug); ok && m.Builtin {
		m.Form = c.Form
		m.ThicknessesMetricMM = c.ThicknessesMetricMM // catalog data, not stored (see Library)
	}
	return m, nil
}

// Materials lists every material, built-in and custom, by category and name.
func (s *Store) Materials(ctx context.Context) ([]Material, error) {
	rows, _ := s.pool.Query(ctx, `SELECT `+materialColumns+` FROM materials ORDER BY category, name, slug`)
	list, err := pgx.CollectRows(rows, scanMaterial)
	if err != nil {
		return nil, fmt.Errorf("store: materials: %w", err)
	}
	return list, nil
}

// Material returns one material, or ErrNotFound.
func (s *Store) Material(ctx context.Context, slug string) (Material, error) {
	rows, _ := s.pool.Query(ctx, `SELECT `+materialColumns+` FROM materials WHERE slug = $1`, slug)
	m, err := pgx.CollectExactlyOneRow(rows, scanMaterial)
	if errors.Is(err, pgx.ErrNoRows) {
		return Material{}, fmt.Errorf("store: material %q: %w", slug, ErrNotFound)
	}
	if err != nil {
		return Material{}, fmt.Errorf("store: material %q: %w", slug, err)
	}
	return m, nil
}

// CreateMaterial adds a custom material at version 1. Invalid data gives
// field.Errors; a built-in's slug ErrBuiltinSlug; another custom material's slug
// ErrSlugTaken.
func (s *Store) CreateMaterial(ctx context.Context, m Material) (Material, error) {
	if !m.Compressible {
		m.CompressionPct = 0
	}
	if err := m.Validate().Err(); err != nil {
		return Material{}, err
	}
	if _, ok := catalog.MaterialBySlug(m.Slug); ok {
		return Material{}, fmt.Errorf("store: create material %q: %w", m.Slug, ErrBuiltinSlug)
	}
	th, _ := json.Marshal(m.ThicknessesMM)
	rows, _ := s.pool.Query(ctx, `
		INSERT INTO materials (slug, name, category, spec, k_points, min_temp_c, max_temp_c, thicknesses_mm,
		                       max_layer_mm, compressible, compression_pct, source, builtin)
		VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11, $12, false)
		ON CONFLICT (slug) DO NOTHING
		RETURNING `+materialColumns,
		m.Slug, m.Name, m.Category, m.Spec, encodeKPoints(m.KPoints), m.MinC, m.MaxC, th, m.MaxLayerMM,
		m.Compressible, m.CompressionPct, m.Source)
	out, err := pgx.CollectExactlyOneRow(rows, scanMaterial)
	if errors.Is(err, pgx.ErrNoRows) {
		return Material{}, s.slugTaken(ctx, "materials", m.Slug)
	}
	if err != nil {
		return Material{}, fmt.Errorf("store: create material %q: %w", m.Slug, err)
	}
	return out, nil
}

// UpdateMaterial saves a custom material if its version is still m.Version and
// returns it with the next version, so stored line results that used it become
// stale. Invalid data gives field.Errors; a built-in ErrBuiltin; a stale version
// ErrConflict; a missing material ErrNotFound.
func (s *Store) UpdateMaterial(ctx context.Context, m Material) (Material, error) {
	if !m.Compressible {
		m.CompressionPct = 0
	}
	if err := m.Validate().Err(); err != nil {
		return Material{}, err
	}
	th, _ := json.Marshal(m.ThicknessesMM)
	rows, _ := s.pool.Query(ctx, `
		UPDATE materials SET name = $3, category = $4, spec = $5, k_points = $6, min_temp_c = $7, max_temp_c = $8,
		       thicknesses_mm = $9, max_layer_mm = $10, compressible = $11, compression_pct = $12, source = $13,
		       version = version + 1, updated_at = now()
		WHERE slug = $1 AND version = $2 AND NOT builtin
		RETURNING `+materialColumns,
		m.Slug, m.Version, m.Name, m.Category, m.Spec, encodeKPoints(m.KPoints), m.MinC, m.MaxC, th, m.MaxLayerMM,
		m.Compressible, m.CompressionPct, m.Source)
	out, err := pgx.CollectExactlyOneRow(rows, scanMaterial)
	if errors.Is(err, pgx.ErrNoRows) {
		return Material{}, s.whyNotUpdated(ctx, "materials", m.Slug)
	}
	if err != nil {
		return Material{}, fmt.Errorf("store: update material %q: %w", m.Slug, err)
	}
	return out, nil
}

// DeleteMaterial removes a custom material. A built-in gives ErrBuiltin; a material
// that lines use an *InUseError (errors.Is ErrInUse) naming them; a missing one
// ErrNotFound.
func (s *Store) DeleteMaterial(ctx context.Context, slug string) error {
	return s.deleteLibraryRow(ctx, "material", "materials", slug, `
		SELECT count(*) OVER (), l.tag, p.name
		FROM line_materials lm JOIN lines l ON l.id = lm.line_id JOIN projects p ON p.id = l.project_id
		WHERE lm.material_slug = $1
		ORDER BY p.name, l.position, l.id LIMIT 5`)
}

// deleteLibraryRow deletes a custom material or jacket: the row is locked, a built-in
// is refused (ErrBuiltin), and so is a row that lines use (usersQuery lists them).
func (s *Store) deleteLibraryRow(ctx context.Context, what, table, slug, usersQuery string) error {
	err := pgx.BeginFunc(ctx, s.pool, func(tx pgx.Tx) error {
		var builtin bool
		err := tx.QueryRow(ctx, `SELECT builtin FROM `+table+` WHERE slug = $1 FOR UPDATE`, slug).Scan(&builtin)
		if errors.Is(err, pgx.ErrNoRows) {
			return ErrNotFound
		}
		if err != nil {
			return err
		}
		if builtin {
			return ErrBuiltin
		}
		inUse, err := usersOf(ctx, tx, what, slug, usersQuery)
		if err != nil {
			return err
		}
		if inUse != nil {
			return inUse
		}
		_, err = tx.Exec(ctx, `DELETE FROM `+table+` WHERE slug = $1`, slug)
		return err
	})
	var pg *pgconn.PgError
	if errors.As(err, &pg) && pg.Code == "23503" {
		// A line took the row between the check and the delete: the foreign key of
		// line_materials refused it.
		err = &InUseError{What: what, Slug: slug, Count: 1}
	}
	if err != nil {
		return fmt.Errorf("store: delete %s %q: %w", what, slug, err)
	}
	return nil
}

// usersOf runs a query returning (total count, tag, project name) rows of the
// lines that use an entry, and describes them; nil when none does.
func usersOf(ctx context.Context, tx pgx.Tx, what, slug, query string) (*InUseError, error) {
	rows, err := tx.Query(ctx, query, slug)
	if err != nil {
		return nil, err
	}
	defer rows.Close()
	e := &InUseError{What: what, Slug: slug}
	for rows.Next() {
		var tag, project string
		if err := rows.Scan(&e.Count, &tag, &project); err != nil {
			return nil, err
		}
		e.Lines = append(e.Lines, fmt.Sprintf("%s (%s)", tag, project))
	}
	if err := rows.Err(); err != nil {
		return nil, err
	}
	if e.Count == 0 {
		return nil, nil
	}
	return e, nil
}

// slugTaken explains an insert that hit an existing slug.
func (s *Store) slugTaken(ctx context.Context, table, slug string) error {
	var builtin bool
	err := s.pool.QueryRow(ctx, `SELECT builtin FROM `+table+` WHERE slug = $1`, slug).Scan(&builtin)
	switch {
	case err != nil && !errors.Is(err, pgx.ErrNoRows):
		return fmt.Errorf("store: %s %q: %w", table, slug, err)
	case builtin:
		return fmt.Errorf("store: %s %q: %w", table, slug, ErrBuiltinSlug)
	default:
		return fmt.Errorf("store: %s %q: %w", table, slug, ErrSlugTaken)
	}
}

// whyNotUpdated explains an update that matched no row: missing, built-in or stale.
func (s *Store) whyNotUpdated(ctx context.Context, table, slug string) error {
	var builtin bool
	err := s.pool.QueryRow(ctx, `SELECT builtin FROM `+table+` WHERE slug = $1`, slug).Scan(&builtin)
	switch {
	case errors.Is(err, pgx.ErrNoRows):
		return fmt.Errorf("store: %s %q: %w", table, slug, ErrNotFound)
	case err != nil:
		return fmt.Errorf("store: %s %q: %w", table, slug, err)
	case builtin:
		return fmt.Errorf("store: %s %q: %w", table, slug, ErrBuiltin)
	default:
		return fmt.Errorf("store: %s %q: %w", table, slug, ErrConflict)
	}
}
