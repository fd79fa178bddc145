package store

import (
	"context"
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"slices"
	"strconv"

	"github.com/jackc/pgx/v5"
)

// ListLine is a line as the project page's list reads it: its own input and fittings
// as raw JSON, and only the parts of its stored result the list shows (Summary).
type ListLine struct {
	ID         int64
	Version    int
	Tag        string
	Service    string
	Location   string
	Exposure   string
	Input      []byte
	Fittings   []byte
	ResultHash string
	ResultKey  string // see SaveResultKeys; '' when never checked
	// Summary is shaped like the stored result (analysis.Stored JSON) but holds only
	// "errors" and, under "output", the operating temperature, heat flows, surface
	// temperatures (with the duct faces), condensation margin, the checks (migration 0010), the sizing's per-criterion
	// thicknesses, governing criterion and unmet criteria, and the energy-code row's
	// "required" and "pass". nil when no result is stored.
	Summary []byte
}

// ListLines reads a project's lines in their order for the line list. It never reads
// the stored results themselves: Summary is the generated column result_summary
// (migration 0006, function line_result_summary), which PostgreSQL derives from
// result on every write of it, about a tenth of its size and small enough to be
// stored uncompressed beside the row.
func (s *Store) ListLines(ctx context.Context, projectID int64) ([]ListLine, error) {
	rows, err := s.pool.Query(ctx, `SELECT id, version, tag, service, location, exposure, input, fittings, result_hash,
		result_key, result_summary FROM lines WHERE project_id = $1 ORDER BY position, id`, projectID)
	if err != nil {
		return nil, fmt.Errorf("store: line list of project %d: %w", projectID, err)
	}
	var out []ListLine
	for rows.Next() {
		var l ListLine
		if err := rows.Scan(&l.ID, &l.Version, &l.Tag, &l.Service, &l.Location, &l.Exposure, &l.Input, &l.Fittings,
			&l.ResultHash, &l.ResultKey, &l.Summary); err != nil {
			rows.Close()
			return nil, fmt.Errorf("store: line list of project %d: %w", projectID, err)
		}
		out = append(out, l)
	}
	if err := rows.Err(); err != nil {
		return nil, fmt.Errorf("store: line list of project %d: %w", projectID, err)
	}
	return out, nil
}

// ResultKey records that a line's stored result hash was checked fresh under the
// conditions Key names (the caller's choice: it must change whenever the hash could).
type ResultKey struct {
	LineID int64
	Hash   string // the result hash that was checked
	Key    string
}

// SaveResultKeys stores freshness keys, each only while the line still holds the
// result hash that was checked (a result saved meanwhile keeps its own, older key,
// which then no longer matches). It never touches the lines' versions.
func (s *Store) SaveResultKeys(ctx context.Context, keys []ResultKey) error {
	if len(keys) == 0 {
		return nil
	}
	batch := &pgx.Batch{}
	for _, k := range keys {
		batch.Queue(`UPDATE lines SET result_key = $3 WHERE id = $1 AND result_hash = $2`, k.LineID, k.Hash, k.Key)
	}
	if err := s.pool.SendBatch(ctx, batch).Close(); err != nil {
		return fmt.Errorf("store: save result keys: %w", err)
	}
	return nil
}

// Fingerprint names this snapshot of the library: every material's and jacket's slug
// and version. Any edit, addition or removal changes it.
func (l *Library) Fingerprint() string {
	keys := make([]string, 0, len(l.materials)+len(l.jackets))
	for slug, m := range l.materials {
		keys = append(keys, "m:"+slug+"="+strconv.Itoa(m.version))
	}
	for slug, j := range l.jackets {
		keys = append(keys, "j:"+slug+"="+strconv.Itoa(j.version))
	}
	slices.Sort(keys)
	h := sha256.New()
	for _, k := range keys {
		h.Write([]byte(k))
		h.Write([]byte{0})
	}
	return hex.EncodeToString(h.Sum(nil)[:12])
}

// ListFingerprint names, in one cheap query, everything a project's line list is
// built from besides the project row itself: each line's id, version (bumped by every
// edit), position, result hash, and the transaction that last wrote the row (xmin:
// any UPDATE, including SaveResults, which changes neither version nor, when a result
// is saved again under the same hash, the hash), the number of lines, and the library
// (every material's and jacket's slug and version). Any insert, edit, delete or
// reorder of a line, any result saved and any library edit changes it. It reads no
// input or result column, so it stays cheap. Saving freshness keys (result_key) also
// changes it (xmin): harmless, the next view simply renders once more.
func (s *Store) ListFingerprint(ctx context.Context, projectID int64) (string, error) {
	var fp string
	err := s.pool.QueryRow(ctx, `
		SELECT (SELECT count(*)::text || '.' || coalesce(md5(string_agg(
		               id::text || ':' || version || ':' || position || ':' || xmin::text || ':' || result_hash,
		               ',' ORDER BY position, id)), '')
		        FROM lines WHERE project_id = $1)
		    || '|' || (SELECT coalesce(md5(string_agg(slug || '=' || version, ',' ORDER BY slug)), '') FROM materials)
		    || '|' || (SELECT coalesce(md5(string_agg(slug || '=' || version, ',' ORDER BY slug)), '') FROM jackets)`,
		projectID).Scan(&fp)
	if err != nil {
		return "", fmt.Errorf("store: line list fingerprint of project %d: %w", projectID, err)
	}
	return fp, nil
}
