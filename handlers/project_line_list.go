package handlers

import (
	"context"
	"crypto/rand"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"fmt"
	"io"
	"os"
	"strconv"
	"sync"

	"lagwright/analysis"
	"lagwright/calc"
	"lagwright/store"
)

// buildID names the running program: a hash of its executable, so that a new build
// (whose defaults or effective-input rules may differ without a new method version)
// never trusts a freshness key written by an older one. When the executable cannot be
// read, a random token: keys then hold for this process only, which is still correct.
var buildID = sync.OnceValue(func() string {
	h := sha256.New()
	if exe, err := os.Executable(); err == nil {
		if f, err := os.Open(exe); err == nil {
			_, err = io.Copy(h, f)
			f.Close()
			if err == nil {
				return hex.EncodeToString(h.Sum(nil)[:12])
			}
		}
	}
	b := make([]byte, 12)
	_, _ = rand.Read(b)
	return "run-" + hex.EncodeToString(b)
})

// resultKeyer writes the freshness key of a project's lines (store.ResultKey): a
// stored result hash checked once under the same line version, project version
// (its settings), library fingerprint (every material's and jacket's version), method
// version and build needs no re-hash: the effective input and the versions it depends
// on are the same, so its hash is too. Any change to one of them changes the key,
// and the page falls back to the hash.
type resultKeyer struct{ conditions string }

func newResultKeyer(p store.Project, lib *store.Library) resultKeyer {
	return resultKeyer{conditions: fmt.Sprintf("p%d.%d|%s|%s|%s", p.ID, p.Version, lib.Fingerprint(), calc.MethodVersion, buildID())}
}

func (k resultKeyer) key(lineVersion int, hash string) string {
	return "v" + strconv.Itoa(lineVersion) + "|" + k.conditions + "|" + hash
}

// listLines loads a project's lines for the line list, with the freshness rule of
// projectLines but reading only what the list shows: each stored result arrives cut
// down to its summary (store.ListLines) and decodes into a sparse analysis.Stored that
// buildListRow and lineStatus read exactly as they read the whole one. A line whose
// freshness key matches is fresh without a re-hash; otherwise its effective input is
// hashed: fresh lines get their key saved, stale ones (hash differs, no result, or a
// summary that does not read) are analysed on every core and saved with their key.
// Recomputed lines carry their whole answer.
func (s *Server) listLines(ctx context.Context, p store.Project, set analysis.ProjectSettings, lib *store.Library) ([]LineView, error) {
	views, _, err := s.listLinesFresh(ctx, p, set, lib)
	return views, err
}

// listLinesFresh is listLines that also says whether every line was already fresh
// (none recomputed): only such a view may be kept in the table cache.
func (s *Server) listLinesFresh(ctx context.Context, p store.Project, set analysis.ProjectSettings, lib *store.Library) ([]LineView, bool, error) {
	raw, err := s.store.ListLines(ctx, p.ID)
	if err != nil {
		return nil, false, err
	}
	keyer := newResultKeyer(p, lib)
	views := make([]LineView, len(raw))
	var stale []int
	var staleHash []string
	var keys []store.ResultKey
	for i, r := range raw {
		l := store.Line{ID: r.ID, ProjectID: p.ID, Version: r.Version, Tag: r.Tag, Service: r.Service, Location: r.Location,
			Exposure: r.Exposure, Input: r.Input, Fittings: r.Fittings, ResultHash: r.ResultHash}
		own, fit, err := decodeLine(l)
		if err != nil {
			return nil, false, err
		}
		views[i] = LineView{Line: l, Own: own, Fittings: fit, Effective: set.Effective(r.Location, own, fit)}
		if r.Summary != nil && r.ResultKey == keyer.key(r.Version, r.ResultHash) &&
			json.Unmarshal(r.Summary, &views[i].Result) == nil {
			continue
		}
		views[i].Result = analysis.Stored{}
		hash := analysis.ResultHash(views[i].Effective, versions(lib, views[i].Effective))
		if r.Summary != nil && hash == r.ResultHash && json.Unmarshal(r.Summary, &views[i].Result) == nil {
			keys = append(keys, store.ResultKey{LineID: r.ID, Hash: hash, Key: keyer.key(r.Version, hash)})
			continue
		}
		views[i].Result = analysis.Stored{}
		stale, staleHash = append(stale, i), append(staleHash, hash)
	}
	if len(stale) > 0 {
		inputs := make([]analysis.Input, len(stale))
		for j, i := range stale {
			inputs[j] = views[i].Effective
		}
		results, err := analysis.AnalyseMany(inputs, lib)
		if err != nil {
			return nil, false, err
		}
		updates := make([]store.ResultUpdate, len(stale))
		for j, i := range stale {
			views[i].Result = results[j]
			updates[j] = store.ResultUpdate{LineID: views[i].Line.ID, Result: results[j].Marshal(), Hash: staleHash[j]}
			views[i].Line.ResultHash = staleHash[j]
			keys = append(keys, store.ResultKey{LineID: views[i].Line.ID, Hash: staleHash[j],
				Key: keyer.key(views[i].Line.Version, staleHash[j])})
		}
		if err := s.store.SaveResults(ctx, updates); err != nil {
			return nil, false, err
		}
	}
	if err := s.store.SaveResultKeys(ctx, keys); err != nil {
		return nil, false, err
	}
	return views, len(stale) == 0, nil
}
