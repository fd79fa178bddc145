package results

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

// BuildID names the running program: a hash of its executable, so that a new build
// (whose defaults or effective-input rules may differ without a new method version)
// never trusts a freshness key written by an older one. When the executable cannot be
// read, a random token: keys then hold for this process only, which is still correct.
var BuildID = sync.OnceValue(func() string {
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

// keyer writes the freshness key of a project's lines (store.ResultKey): a stored
// result hash checked once under the same line version, project version (its
// settings), library fingerprint (every material's and jacket's version), method
// version and build needs no re-hash: the effective input and the versions it depends
// on are the same, so its hash is too. Any change to one of them changes the key,
// and the list falls back to the hash.
type keyer struct{ conditions string }

func newKeyer(p store.Project, lib *store.Library) keyer {
	return keyer{conditions: fmt.Sprintf("p%d.%d|%s|%s|%s", p.ID, p.Version, lib.Fingerprint(), calc.MethodVersion, BuildID())}
}

func (k keyer) key(lineVersion int, hash string) string {
	return "v" + strconv.Itoa(lineVersion) + "|" + k.conditions + "|" + hash
}

// List loads a project's lines for the line list, reading only what the list shows:
// each stored answer arrives cut down to its summary (store.ListLines) and decodes
// into a sparse analysis.Stored that reads like the whole one. A line whose freshness
// key matches is fresh without a re-hash; otherwise its effective input is hashed:
// fresh lines get their key saved, stale ones are analysed on every core and saved
// with their key (and carry their whole answer). allFresh says none was recomputed:
// only such a list may be kept in a cache.
func (r *Results) List(ctx context.Context, p store.Project, set analysis.ProjectSettings, lib *store.Library) (lines []Line, allFresh bool, err error) {
	raw, err := r.store.ListLines(ctx, p.ID)
	if err != nil {
		return nil, false, err
	}
	k := newKeyer(p, lib)
	views := make([]Line, len(raw))
	hashes := make([]string, len(raw))
	var stale []int
	var keys []store.ResultKey
	for i, rl := range raw {
		l := store.Line{ID: rl.ID, ProjectID: p.ID, Version: rl.Version, Tag: rl.Tag, Service: rl.Service, Location: rl.Location,
			Exposure: rl.Exposure, Input: rl.Input, Fittings: rl.Fittings, ResultHash: rl.ResultHash}
		own, fit, err := Decode(l)
		if err != nil {
			return nil, false, err
		}
		views[i] = Line{Line: l, Own: own, Fittings: fit, Effective: set.Effective(rl.Location, own, fit)}
		if rl.Summary != nil && rl.ResultKey == k.key(rl.Version, rl.ResultHash) &&
			json.Unmarshal(rl.Summary, &views[i].Result) == nil {
			continue
		}
		views[i].Result = analysis.Stored{}
		hashes[i] = Hash(lib, views[i].Effective)
		if rl.Summary != nil && hashes[i] == rl.ResultHash && json.Unmarshal(rl.Summary, &views[i].Result) == nil {
			keys = append(keys, store.ResultKey{LineID: rl.ID, Hash: hashes[i], Key: k.key(rl.Version, hashes[i])})
			continue
		}
		views[i].Result = analysis.Stored{}
		stale = append(stale, i)
	}
	if err := r.recompute(ctx, lib, views, stale, hashes); err != nil {
		return nil, false, err
	}
	for _, i := range stale {
		keys = append(keys, store.ResultKey{LineID: views[i].Line.ID, Hash: hashes[i], Key: k.key(views[i].Line.Version, hashes[i])})
	}
	if err := r.store.SaveResultKeys(ctx, keys); err != nil {
		return nil, false, err
	}
	return views, len(stale) == 0, nil
}
