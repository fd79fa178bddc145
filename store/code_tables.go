package store

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"regexp"
	"sort"

	"github.com/jackc/pgx/v5"

	"lagwright/catalog"
	"lagwright/field"
)

// CodeTable is an energy-code table as stored and as the API carries it. Temperatures are
// °F, sizes inches, conductivities Btu·in/(h·ft²·°F) and thicknesses inches, as the
// published tables print them; an open end of a range is null.
type CodeTable struct {
	ID           string         `json:"id"`
	Name         string         `json:"name"`
	Edition      string         `json:"edition"`
	Jurisdiction string         `json:"jurisdiction"`
	Kind         string         `json:"kind"` // "pipe"
	Systems      []string       `json:"systems"`
	Columns      []CodeColumn   `json:"columns"` // five nominal size columns
	Rows         []CodeRow      `json:"rows"`
	RefEnd       string         `json:"ref_end"` // "upper" | "lower": the k the correction uses
	Footnotes    []CodeFootnote `json:"footnotes"`
	Source       string         `json:"source"`
	Builtin      bool           `json:"builtin"`
	Version      int            `json:"version"`
}

// CodeColumn is a nominal pipe size column: min ≤ size < max (max null: no upper end).
type CodeColumn struct {
	Label        string   `json:"label"`
	MinNominalIn float64  `json:"min_nominal_in"`
	MaxNominalIn *float64 `json:"max_nominal_in"`
}

// CodeRow is a fluid temperature row (see catalog.CodeRow for the edge rule).
type CodeRow struct {
	Service      string    `json:"service"` // "heating" | "cooling"
	Label        string    `json:"label"`
	MinF         *float64  `json:"min_f"`
	MaxF         *float64  `json:"max_f"`
	MinExclusive bool      `json:"min_exclusive"`
	MaxExclusive bool      `json:"max_exclusive"`
	KMin         float64   `json:"k_min"`
	KMax         float64   `json:"k_max"`
	MeanRatingF  float64   `json:"mean_rating_f"`
	ThicknessIn  []float64 `json:"thickness_in"`
}

// CodeFootnote is a named reduction option of the table.
type CodeFootnote struct {
	Name string `json:"name"`
	Text string `json:"text"`
}

// Bounds of a code table.
const (
	codeColumns      = 5
	maxCodeRows      = 40
	maxCodeFootnotes = 20
	maxCodeKBtu      = 5  // Btu·in/(h·ft²·°F): well above any insulation
	maxCodeThickIn   = 20 // in
)

var codeIDRE = regexp.MustCompile(`^[a-z0-9][a-z0-9._-]{1,59}$`)

// Validate names every bad cell (rows[2].thickness_in[3], columns[4].label …).
func (t CodeTable) Validate() field.Errors {
	var fe field.Errors
	if !codeIDRE.MatchString(t.ID) || t.ID == "new" {
		fe.Add("id", "2–60 characters: lower-case letters, digits, '.', '-' and '_', starting with a letter or digit")
	}
	validateText(&fe, "name", t.Name, true, MaxTextLen)
	validateText(&fe, "edition", t.Edition, true, MaxTextLen)
	validateText(&fe, "jurisdiction", t.Jurisdiction, false, MaxTextLen)
	validateText(&fe, "source", t.Source, false, MaxSourceLen)
	if t.Kind != "pipe" {
		fe.Add("kind", `must be "pipe" (thickness by temperature row and size column)`)
	}
	if len(t.Systems) == 0 {
		fe.Add("systems", "name at least one system the table covers")
	}
	for i, s := range t.Systems {
		if !catalog.IsSystem(s) {
			fe.Add(fmt.Sprintf("systems[%d]", i), "unknown system %q", s)
		}
	}
	if t.RefEnd != "upper" && t.RefEnd != "lower" {
		fe.Add("ref_end", `must be "upper" or "lower" (the end of a row's conductivity range the correction uses)`)
	}
	if len(t.Columns) != codeColumns {
		fe.Add("columns", "must have %d nominal size columns", codeColumns)
	}
	for i, c := range t.Columns {
		pre := fmt.Sprintf("columns[%d].", i)
		validateText(&fe, pre+"label", c.Label, true, MaxTextLen)
		if !finite(c.MinNominalIn) || c.MinNominalIn < 0 {
			fe.Add(pre+"min_nominal_in", "must be 0 or more")
		}
		if c.MaxNominalIn != nil && (!finite(*c.MaxNominalIn) || *c.MaxNominalIn <= c.MinNominalIn) {
			fe.Add(pre+"max_nominal_in", "must be greater than min_nominal_in (null: no upper end)")
		}
	}
	switch {
	case len(t.Rows) == 0:
		fe.Add("rows", "give at least one temperature row")
	case len(t.Rows) > maxCodeRows:
		fe.Add("rows", "must have at most %d rows", maxCodeRows)
	}
	for i, r := range t.Rows {
		pre := fmt.Sprintf("rows[%d].", i)
		if r.Service != "heating" && r.Service != "cooling" {
			fe.Add(pre+"service", `must be "heating" or "cooling"`)
		}
		validateText(&fe, pre+"label", r.Label, true, MaxTextLen)
		for _, e := range []struct {
			name string
			v    *float64
		}{{"min_f", r.MinF}, {"max_f", r.MaxF}} {
			if e.v != nil && (!finite(*e.v) || *e.v < -460 || *e.v > 2000) {
				fe.Add(pre+e.name, "must be between −460 and 2000 °F (null: open end)")
			}
		}
		if r.MinF == nil && r.MaxF == nil {
			fe.Add(pre+"max_f", "give min_f, max_f or both")
		}
		if r.MinF != nil && r.MaxF != nil && *r.MinF >= *r.MaxF {
			fe.Add(pre+"max_f", "must be greater than min_f")
		}
		if !finite(r.KMin) || r.KMin <= 0 || r.KMin > maxCodeKBtu {
			fe.Add(pre+"k_min", "must be greater than 0 and at most %d Btu·in/(h·ft²·°F)", maxCodeKBtu)
		}
		if !finite(r.KMax) || r.KMax < r.KMin || r.KMax > maxCodeKBtu {
			fe.Add(pre+"k_max", "must be at least k_min and at most %d Btu·in/(h·ft²·°F)", maxCodeKBtu)
		}
		if !finite(r.MeanRatingF) || r.MeanRatingF < -300 || r.MeanRatingF > 1200 {
			fe.Add(pre+"mean_rating_f", "must be between −300 and 1200 °F")
		}
		if len(r.ThicknessIn) != len(t.Columns) || len(r.ThicknessIn) != codeColumns {
			fe.Add(pre+"thickness_in", "must have one thickness per size column (%d)", codeColumns)
		}
		for j, th := range r.ThicknessIn {
			if !finite(th) || th < 0 || th > maxCodeThickIn {
				fe.Add(fmt.Sprintf("%sthickness_in[%d]", pre, j), "must be 0 – %d in", maxCodeThickIn)
			}
		}
	}
	if len(t.Footnotes) > maxCodeFootnotes {
		fe.Add("footnotes", "must have at most %d footnotes", maxCodeFootnotes)
	}
	for i, f := range t.Footnotes {
		validateText(&fe, fmt.Sprintf("footnotes[%d].name", i), f.Name, true, MaxTextLen)
		validateText(&fe, fmt.Sprintf("footnotes[%d].text", i), f.Text, false, MaxSourceLen)
	}
	return fe
}

// Catalog converts the stored table to the calculation's form (open ends ±Inf).
func (t CodeTable) Catalog() catalog.CodeTable {
	out := catalog.CodeTable{ID: t.ID, Name: t.Name, Edition: t.Edition, Jurisdiction: t.Jurisdiction, Kind: t.Kind,
		Systems: append([]string(nil), t.Systems...), RefEnd: t.RefEnd, Source: t.Source}
	for i := 0; i < len(t.Columns) && i < codeColumns; i++ {
		c := t.Columns[i]
		out.Columns[i] = catalog.CodeColumn{Label: c.Label, MinNominalIn: c.MinNominalIn, MaxNominalIn: orInf(c.MaxNominalIn, 1)}
	}
	for _, r := range t.Rows {
		cr := catalog.CodeRow{Service: r.Service, Label: r.Label, MinF: orInf(r.MinF, -1), MaxF: orInf(r.MaxF, 1),
			MinExclusive: r.MinExclusive, MaxExclusive: r.MaxExclusive, KMin: r.KMin, KMax: r.KMax, MeanRatingF: r.MeanRatingF}
		copy(cr.ThicknessIn[:], r.ThicknessIn)
		out.Rows = append(out.Rows, cr)
	}
	for _, f := range t.Footnotes {
		out.Footnotes = append(out.Footnotes, catalog.CodeFootnote{Name: f.Name, Text: f.Text})
	}
	return out
}

// codeTableOf is a catalog table in the stored form (±Inf ends as null).
func codeTableOf(c catalog.CodeTable) CodeTable {
	t := CodeTable{ID: c.ID, Name: c.Name, Edition: c.Edition, Jurisdiction: c.Jurisdiction, Kind: c.Kind,
		Systems: append([]string{}, c.Systems...), RefEnd: c.RefEnd, Source: c.Source, Footnotes: []CodeFootnote{}}
	for _, col := range c.Columns {
		t.Columns = append(t.Columns, CodeColumn{Label: col.Label, MinNominalIn: col.MinNominalIn, MaxNominalIn: finiteOrNil(col.MaxNominalIn)})
	}
	for _, r := range c.Rows {
		t.Rows = append(t.Rows, CodeRow{Service: r.Service, Label: r.Label, MinF: finiteOrNil(r.MinF), MaxF: finiteOrNil(r.MaxF),
			MinExclusive: r.MinExclusive, MaxExclusive: r.MaxExclusive, KMin: r.KMin, KMax: r.KMax, MeanRatingF: r.MeanRatingF,
			ThicknessIn: append([]float64(nil), r.ThicknessIn[:]...)})
	}
	for _, f := range c.Footnotes {
		t.Footnotes = append(t.Footnotes, CodeFootnote{Name: f.Name, Text: f.Text})
	}
	return t
}

func orInf(v *float64, sign int) float64 {
	if v == nil {
		return math.Inf(sign)
	}
	return *v
}

func finiteOrNil(v float64) *float64 {
	if math.IsInf(v, 0) {
		return nil
	}
	return &v
}

// body is what the jsonb column holds: the table less its identity and bookkeeping.
func (t CodeTable) body() []byte {
	t.Builtin, t.Version = false, 0
	js, _ := json.Marshal(t)
	return js
}

func scanCodeTable(row pgx.CollectableRow) (CodeTable, error) {
	var t CodeTable
	var body []byte
	var id string
	var builtin bool
	var version int
	if err := row.Scan(&id, &body, &builtin, &version); err != nil {
		return CodeTable{}, err
	}
	if err := json.Unmarshal(body, &t); err != nil {
		return CodeTable{}, fmt.Errorf("code table %s: %w", id, err)
	}
	t.ID, t.Builtin, t.Version = id, builtin, version
	return t, nil
}

const codeTableColumns = `slug, body, builtin, version`

// seedCodeTables upserts the catalog's built-in tables (a changed one bumps its version).
func seedCodeTables(ctx context.Context, tx pgx.Tx) error {
	for _, c := range catalog.CodeTables() {
		t := codeTableOf(c)
		_, err := tx.Exec(ctx, `
			INSERT INTO code_tables (slug, name, edition, kind, body, builtin) VALUES ($1, $2, $3, $4, $5, true)
			ON CONFLICT (slug) DO UPDATE SET name = EXCLUDED.name, edition = EXCLUDED.edition, kind = EXCLUDED.kind,
			    body = EXCLUDED.body, version = code_tables.version + 1, updated_at = now()
			WHERE code_tables.builtin AND code_tables.body IS DISTINCT FROM EXCLUDED.body`,
			t.ID, t.Name, t.Edition, t.Kind, t.body())
		if err != nil {
			return fmt.Errorf("store: seed code table %s: %w", t.ID, err)
		}
	}
	return nil
}

// CodeTables lists every energy-code table, built-in first, then by name and edition.
func (s *Store) CodeTables(ctx context.Context) ([]CodeTable, error) {
	rows, _ := s.pool.Query(ctx, `SELECT `+codeTableColumns+` FROM code_tables ORDER BY NOT builtin, name, edition, slug`)
	list, err := pgx.CollectRows(rows, scanCodeTable)
	if err != nil {
		return nil, fmt.Errorf("store: code tables: %w", err)
	}
	return list, nil
}

// CodeTable returns one table, or ErrNotFound.
func (s *Store) CodeTable(ctx context.Context, id string) (CodeTable, error) {
	rows, _ := s.pool.Query(ctx, `SELECT `+codeTableColumns+` FROM code_tables WHERE slug = $1`, id)
	t, err := pgx.CollectExactlyOneRow(rows, scanCodeTable)
	if errors.Is(err, pgx.ErrNoRows) {
		return CodeTable{}, fmt.Errorf("store: code table %q: %w", id, ErrNotFound)
	}
	if err != nil {
		return CodeTable{}, fmt.Errorf("store: code table %q: %w", id, err)
	}
	return t, nil
}

// CreateCodeTable adds a custom table at version 1: field.Errors naming every bad cell,
// ErrBuiltinSlug for a built-in's id, ErrSlugTaken for another custom table's.
func (s *Store) CreateCodeTable(ctx context.Context, t CodeTable) (CodeTable, error) {
	if err := t.Validate().Err(); err != nil {
		return CodeTable{}, err
	}
	if _, ok := catalog.CodeTableByID(t.ID); ok {
		return CodeTable{}, fmt.Errorf("store: create code table %q: %w", t.ID, ErrBuiltinSlug)
	}
	rows, _ := s.pool.Query(ctx, `
		INSERT INTO code_tables (slug, name, edition, kind, body) VALUES ($1, $2, $3, $4, $5)
		ON CONFLICT (slug) DO NOTHING RETURNING `+codeTableColumns, t.ID, t.Name, t.Edition, t.Kind, t.body())
	out, err := pgx.CollectExactlyOneRow(rows, scanCodeTable)
	if errors.Is(err, pgx.ErrNoRows) {
		return CodeTable{}, s.slugTaken(ctx, "code_tables", t.ID)
	}
	if err != nil {
		return CodeTable{}, fmt.Errorf("store: create code table %q: %w", t.ID, err)
	}
	return out, nil
}

// UpdateCodeTable saves a custom table if its version is still t.Version and returns it
// with the next version (lines that use it become stale). field.Errors, ErrBuiltin,
// ErrConflict (stale version) or ErrNotFound.
func (s *Store) UpdateCodeTable(ctx context.Context, t CodeTable) (CodeTable, error) {
	if err := t.Validate().Err(); err != nil {
		return CodeTable{}, err
	}
	rows, _ := s.pool.Query(ctx, `
		UPDATE code_tables SET name = $3, edition = $4, kind = $5, body = $6, version = version + 1, updated_at = now()
		WHERE slug = $1 AND version = $2 AND NOT builtin
		RETURNING `+codeTableColumns, t.ID, t.Version, t.Name, t.Edition, t.Kind, t.body())
	out, err := pgx.CollectExactlyOneRow(rows, scanCodeTable)
	if errors.Is(err, pgx.ErrNoRows) {
		return CodeTable{}, s.whyNotUpdated(ctx, "code_tables", t.ID)
	}
	if err != nil {
		return CodeTable{}, fmt.Errorf("store: update code table %q: %w", t.ID, err)
	}
	return out, nil
}

// DeleteCodeTable removes a custom table that no line and no project names: ErrBuiltin,
// an *InUseError naming the users, or ErrNotFound.
func (s *Store) DeleteCodeTable(ctx context.Context, id string) error {
	return s.deleteLibraryRow(ctx, "energy-code table", "code_tables", id, `
		SELECT count(*) OVER (), tag, name FROM (
		    SELECT l.tag, p.name, l.position AS pos, l.id FROM lines l JOIN projects p ON p.id = l.project_id
		    WHERE l.input->'criteria'->>'energy_code' = $1
		    UNION ALL
		    SELECT 'project settings', p.name, -1, p.id FROM projects p
		    WHERE p.settings->'criteria'->>'energy_code' = $1) u
		ORDER BY name, pos, id LIMIT 5`)
}

// loadCodeTables adds every code table to the library snapshot.
func (s *Store) loadCodeTables(ctx context.Context, lib *Library) error {
	list, err := s.CodeTables(ctx)
	if err != nil {
		return err
	}
	lib.codeTables = make(map[string]libCodeTable, len(list))
	for _, t := range list {
		lib.codeTables[t.ID] = libCodeTable{t: t.Catalog(), version: t.Version, builtin: t.Builtin}
		lib.codeOrder = append(lib.codeOrder, t.ID)
	}
	return nil
}

type libCodeTable struct {
	t       catalog.CodeTable
	version int
	builtin bool
}

// CodeTable returns an energy-code table by id (analysis.Resolver).
func (l *Library) CodeTable(id string) (catalog.CodeTable, bool) {
	t, ok := l.codeTables[id]
	return t.t, ok
}

// CodeTableList lists the tables, built-in first, then by name (for pickers).
func (l *Library) CodeTableList() []catalog.CodeTable {
	out := make([]catalog.CodeTable, 0, len(l.codeOrder))
	for _, id := range l.codeOrder {
		out = append(out, l.codeTables[id].t)
	}
	if len(out) == 0 { // a snapshot built without the database
		out = catalog.CodeTables()
		sort.Slice(out, func(i, j int) bool { return out[i].Name < out[j].Name })
	}
	return out
}
