package handlers

import (
	"context"
	"fmt"
	"io"
	"net"
	"net/http"
	"strconv"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/jackc/pgx/v5/pgconn"

	"lagwright/store"
	"lagwright/store/storetest"
)

// freezer relays TCP connections to a PostgreSQL server and can stop relaying
// (holding every byte, accepting new connections without answering): to the app the
// server is frozen, as under SIGSTOP or a network that drops packets.
type freezer struct {
	ln     net.Listener
	dial   func() (net.Conn, error)
	mu     sync.Mutex
	frozen bool
	thaw   chan struct{}
	conns  []net.Conn
}

func newFreezer(t *testing.T, dsn string) (*freezer, string) {
	t.Helper()
	cfg, err := pgconn.ParseConfig(dsn)
	if err != nil {
		t.Fatal(err)
	}
	network, addr := "tcp", net.JoinHostPort(cfg.Host, strconv.Itoa(int(cfg.Port)))
	if strings.HasPrefix(cfg.Host, "/") {
		network, addr = "unix", fmt.Sprintf("%s/.s.PGSQL.%d", cfg.Host, cfg.Port)
	}
	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	f := &freezer{ln: ln, dial: func() (net.Conn, error) { return net.Dial(network, addr) }, thaw: make(chan struct{})}
	t.Cleanup(f.close)
	go f.accept()
	host, port, _ := net.SplitHostPort(ln.Addr().String())
	proxied := fmt.Sprintf("host=%s port=%s user=%s dbname=%s sslmode=disable", host, port, cfg.User, cfg.Database)
	if cfg.Password != "" {
		proxied += " password=" + cfg.Password
	}
	return f, proxied
}

func (f *freezer) accept() {
	for {
		c, err := f.ln.Accept()
		if err != nil {
			return
		}
		go f.relayConn(c)
	}
}

func (f *freezer) relayConn(c net.Conn) {
	f.wait()
	up, err := f.dial()
	if err != nil {
		c.Close()
		return
	}
	f.mu.Lock()
	f.conns = append(f.conns, c, up)
	f.mu.Unlock()
	go f.pipe(up, c)
	f.pipe(c, up)
}

// pipe copies src to dst, holding each chunk while frozen.
func (f *freezer) pipe(dst, src net.Conn) {
	defer dst.Close()
	defer src.Close()
	buf := make([]byte, 32<<10)
	for {
		n, err := src.Read(buf)
		if n > 0 {
			f.wait()
			if _, werr := dst.Write(buf[:n]); werr != nil {
				return
			}
		}
		if err != nil {
			return
		}
	}
}

func (f *freezer) wait() {
	f.mu.Lock()
	frozen, thaw := f.frozen, f.thaw
	f.mu.Unlock()
	if frozen {
		<-thaw
	}
}

func (f *freezer) freeze() {
	f.mu.Lock()
	defer f.mu.Unlock()
	if !f.frozen {
		f.frozen, f.thaw = true, make(chan struct{})
	}
}

func (f *freezer) unfreeze() {
	f.mu.Lock()
	defer f.mu.Unlock()
	if f.frozen {
		f.frozen = false
		close(f.thaw)
	}
}

func (f *freezer) close() {
	f.unfreeze()
	f.ln.Close()
	f.mu.Lock()
	defer f.mu.Unlock()
	for _, c := range f.conns {
		c.Close()
	}
}

// TestDatabaseFrozen: with PostgreSQL frozen (it takes connections and bytes but
// never answers), pages, the API and calc answer 503 naming the database, bounded by
// the statement and acquire timeouts instead of the operating system's TCP timeout;
// when it thaws the app answers again by itself.
func TestDatabaseFrozen(t *testing.T) {
	dsn := storetest.NewDSN(t)
	fr, proxied := newFreezer(t, dsn)
	ctx := context.Background()
	st, err := store.OpenWith(ctx, proxied, store.Options{StatementTimeout: time.Second, AcquireTimeout: time.Second})
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(st.Close)
	p, err := st.CreateProject(ctx, store.Project{Name: "Frozen", Units: "si"})
	if err != nil {
		t.Fatal(err)
	}
	s, logs := newServer(t, st)
	h := s.Routes()
	type req struct{ method, path, body string }
	reqs := []req{
		{"GET", "/projects", ""},
		{"GET", fmt.Sprintf("/projects/%d", p.ID), ""},
		{"GET", "/materials", ""},
		{"GET", fmt.Sprintf("/api/v1/projects/%d", p.ID), ""},
		{"POST", "/api/v1/projects", `{"name":"during"}`},
		{"POST", "/api/v1/calc", `{"geometry":"pipe","pipe_size":"NPS 2","operating_temp_c":150,"ambient_temp_c":20,"layers":[{"material":"mineral_fiber_pipe_c547_t1","thickness_mm":50}],"jacket":"pvc_jacket"}`},
	}
	run := func(rq req) *http.Response {
		t.Helper()
		done := make(chan *http.Response, 1)
		go func() {
			rec := do(t, h, rq.method, rq.path, strings.NewReader(rq.body), map[string]string{"Content-Type": "application/json"})
			done <- rec.Result()
		}()
		select {
		case res := <-done:
			return res
		case <-time.After(60 * time.Second): // far beyond the timeouts: the request hangs
			t.Fatalf("%s %s: no answer with the database frozen", rq.method, rq.path)
			return nil
		}
	}
	for _, rq := range reqs {
		if res := run(rq); res.StatusCode >= 300 {
			b, _ := io.ReadAll(res.Body)
			t.Fatalf("%s %s before the freeze = %d %s", rq.method, rq.path, res.StatusCode, b)
		}
	}

	fr.freeze()
	var wg sync.WaitGroup
	for _, rq := range reqs {
		wg.Go(func() {
			res := run(rq)
			body, _ := io.ReadAll(res.Body)
			if res.StatusCode != http.StatusServiceUnavailable || !strings.Contains(string(body), "database") {
				t.Errorf("%s %s with the database frozen = %d %.200s; want 503 naming the database", rq.method, rq.path, res.StatusCode, body)
			}
		})
	}
	wg.Wait()
	if strings.Contains(logs.String(), "internal error") {
		t.Errorf("the frozen database was logged as an internal error:\n%s", logs)
	}

	fr.unfreeze()
	for i := 0; ; i++ {
		if rec := do(t, h, "GET", "/readyz", nil, nil); rec.Code == http.StatusOK {
			break
		}
		if i > 100 {
			t.Fatal("not ready after the database thawed")
		}
		time.Sleep(100 * time.Millisecond)
	}
	for _, rq := range reqs[:4] {
		if res := run(rq); res.StatusCode != http.StatusOK {
			t.Errorf("%s %s after the thaw = %d", rq.method, rq.path, res.StatusCode)
		}
	}
}
