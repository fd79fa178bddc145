package handlers

import (
	"container/list"
	"context"
	"io"
	"sync"

	"github.com/a-h/templ"

	"lagwright/calc"
	"lagwright/results"
)

// tableCacheBytes bounds the rendered HTML each server's table cache holds (a
// 500-line table is ~0.6 MB, a 10,000-line one ~30 MB).
const tableCacheBytes = 96 << 20

// tableKey names one rendered line-list table: the project and its version (its
// settings and units), the sort, and store.ListFingerprint (every line's version,
// position and result hash, and the library's versions), with the method version and
// build. The key comes from the database, so instances behind a load balancer agree on
// it and any write through any of them makes it miss.
type tableKey struct {
	project       int64
	version       int
	units, sort   string
	fingerprint   string
	method, build string
}

type tableEntry struct {
	key       tableKey
	html      []byte
	lineCount int
}

// tableCache keeps rendered line-list tables (the status summary, the table and its
// totals: everything of the project page built from the lines, nothing from the
// user), least recently used first out, within maxBytes of HTML. Safe for concurrent
// use.
type tableCache struct {
	mu       sync.Mutex
	maxBytes int
	bytes    int        // HTML held
	order    *list.List // of *tableEntry, most recent at the front
	byKey    map[tableKey]*list.Element
	building map[tableKey]*tableBuild // renders under way, one per key
}

// tableBuild is one render under way; views that miss on the same key while it
// runs wait for it instead of rendering the same table again (64 first views of a
// 500-line project are one render, not 64).
type tableBuild struct {
	done  chan struct{}
	entry *tableEntry
	err   error
}

func newTableCache(maxBytes int) *tableCache {
	return &tableCache{maxBytes: maxBytes, order: list.New(), byKey: map[tableKey]*list.Element{},
		building: map[tableKey]*tableBuild{}}
}

// getOrBuild returns the table under k: held, being built by another view (waited
// for), or built now by build, which also says whether the table may be kept (only a
// table of all-fresh lines is). The build runs without the caller's cancellation, so
// a client that leaves does not fail the views waiting on it.
func (c *tableCache) getOrBuild(ctx context.Context, k tableKey, build func(context.Context) (*tableEntry, bool, error)) (*tableEntry, error) {
	c.mu.Lock()
	if e, ok := c.byKey[k]; ok {
		c.order.MoveToFront(e)
		c.mu.Unlock()
		return e.Value.(*tableEntry), nil
	}
	if b, ok := c.building[k]; ok {
		c.mu.Unlock()
		select {
		case <-b.done:
			return b.entry, b.err
		case <-ctx.Done():
			return nil, ctx.Err()
		}
	}
	b := &tableBuild{done: make(chan struct{})}
	c.building[k] = b
	c.mu.Unlock()

	var keep bool
	b.entry, keep, b.err = build(context.WithoutCancel(ctx))
	if b.err == nil && keep {
		c.put(b.entry)
	}
	c.mu.Lock()
	delete(c.building, k)
	c.mu.Unlock()
	close(b.done)
	return b.entry, b.err
}

func (c *tableCache) get(k tableKey) (*tableEntry, bool) {
	c.mu.Lock()
	defer c.mu.Unlock()
	e, ok := c.byKey[k]
	if !ok {
		return nil, false
	}
	c.order.MoveToFront(e)
	return e.Value.(*tableEntry), true
}

// put keeps t, dropping the least recently used tables while the cache holds more
// than its bound. A table larger than a quarter of the bound is not kept at all.
func (c *tableCache) put(t *tableEntry) {
	if len(t.html) > c.maxBytes/4 {
		return
	}
	c.mu.Lock()
	defer c.mu.Unlock()
	if e, ok := c.byKey[t.key]; ok {
		c.bytes -= len(e.Value.(*tableEntry).html)
		e.Value = t
		c.order.MoveToFront(e)
	} else {
		c.byKey[t.key] = c.order.PushFront(t)
	}
	c.bytes += len(t.html)
	for c.bytes > c.maxBytes {
		old := c.order.Back()
		c.order.Remove(old)
		oe := old.Value.(*tableEntry)
		delete(c.byKey, oe.key)
		c.bytes -= len(oe.html)
	}
}

// held is the HTML the cache holds, in bytes, and its number of tables.
func (c *tableCache) held() (bytes, tables int) {
	c.mu.Lock()
	defer c.mu.Unlock()
	return c.bytes, c.order.Len()
}

func (s *Server) tables() *tableCache { return s.tableCache }

func newTableKey(project int64, version int, units, sort, fingerprint string) tableKey {
	return tableKey{project: project, version: version, units: units, sort: sort, fingerprint: fingerprint,
		method: calc.MethodVersion, build: results.BuildID()}
}

// rawHTML writes already rendered (and escaped) HTML.
func rawHTML(b []byte) templ.Component {
	return templ.ComponentFunc(func(_ context.Context, w io.Writer) error {
		_, err := w.Write(b)
		return err
	})
}
