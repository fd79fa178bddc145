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

// tableCacheSize bounds each server's table cache (a 500-line table is ~0.6 MB).
const tableCacheSize = 64

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
// user), least recently used first out. Safe for concurrent use.
type tableCache struct {
	mu    sync.Mutex
	max   int
	order *list.List // of *tableEntry, most recent at the front
	byKey map[tableKey]*list.Element
}

func newTableCache(max int) *tableCache {
	return &tableCache{max: max, order: list.New(), byKey: map[tableKey]*list.Element{}}
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

func (c *tableCache) put(t *tableEntry) {
	c.mu.Lock()
	defer c.mu.Unlock()
	if e, ok := c.byKey[t.key]; ok {
		e.Value = t
		c.order.MoveToFront(e)
		return
	}
	c.byKey[t.key] = c.order.PushFront(t)
	for c.order.Len() > c.max {
		old := c.order.Back()
		c.order.Remove(old)
		delete(c.byKey, old.Value.(*tableEntry).key)
	}
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
