package e2e

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"io"
	"log/slog"
	"net/http"
	"net/http/httptest"
	"net/url"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/chromedp/cdproto/runtime"
	"github.com/chromedp/chromedp"

	"lagwright/handlers"
	"lagwright/store"
	"lagwright/store/storetest"
)

const (
	// stepTimeout bounds one browser step (a click and the page it loads, a wait).
	stepTimeout = 10 * time.Second
	// artifactsDir holds a full-page screenshot of every flow.
	artifactsDir = "artifacts"
)

// app is the real server on its own database, served on loopback.
type app struct {
	URL   string
	Store *store.Store
	// HTTP talks to the same server without following redirects.
	HTTP *http.Client
	logs *syncBuffer
}

// syncBuffer collects the server's log safely across request goroutines.
type syncBuffer struct {
	mu sync.Mutex
	b  bytes.Buffer
}

func (l *syncBuffer) Write(p []byte) (int, error) {
	l.mu.Lock()
	defer l.mu.Unlock()
	return l.b.Write(p)
}

func (l *syncBuffer) String() string {
	l.mu.Lock()
	defer l.mu.Unlock()
	return l.b.String()
}

// startApp opens a fresh database, migrates and seeds it as `serve` does, and serves
// the application's routes with httptest. Any ERROR the server logs fails the test
// (only internal errors are logged at that level).
func startApp(t *testing.T, cfg handlers.Config) *app {
	t.Helper()
	ctx, cancel := context.WithTimeout(context.Background(), time.Minute)
	defer cancel()
	st, err := store.Open(ctx, storetest.NewDSN(t))
	if err != nil {
		t.Fatalf("open store: %v", err)
	}
	t.Cleanup(st.Close)
	if _, err := st.Migrate(ctx, store.MigrateUp); err != nil {
		t.Fatalf("migrate: %v", err)
	}
	if err := st.SeedCatalog(ctx); err != nil {
		t.Fatalf("seed catalog: %v", err)
	}
	logs := &syncBuffer{}
	logger := slog.New(slog.NewTextHandler(logs, &slog.HandlerOptions{Level: slog.LevelWarn}))
	if cfg.Version == "" {
		cfg.Version = "e2e"
	}
	srv, err := handlers.New(st, logger, cfg)
	if err != nil {
		t.Fatalf("handlers.New: %v", err)
	}
	ts := httptest.NewServer(srv.Routes())
	t.Cleanup(func() {
		ts.Close()
		if out := logs.String(); strings.Contains(out, "level=ERROR") {
			t.Errorf("the server logged errors:\n%s", out)
		} else if out != "" && t.Failed() {
			t.Logf("server log:\n%s", out)
		}
	})
	c := ts.Client()
	c.CheckRedirect = func(*http.Request, []*http.Request) error { return http.ErrUseLastResponse }
	return &app{URL: ts.URL, Store: st, HTTP: c, logs: logs}
}

// get fetches a path of the app and returns the response with its body read.
func (a *app) get(t *testing.T, path string) (*http.Response, []byte) {
	t.Helper()
	resp, err := a.HTTP.Get(a.URL + path)
	if err != nil {
		t.Fatalf("GET %s: %v", path, err)
	}
	defer resp.Body.Close()
	body, err := io.ReadAll(resp.Body)
	if err != nil {
		t.Fatalf("GET %s: %v", path, err)
	}
	return resp, body
}

// postJSON sends a JSON body to the API and decodes the answer into out; the status
// must be want.
func (a *app) postJSON(t *testing.T, path string, in, out any, want int) {
	t.Helper()
	b, err := json.Marshal(in)
	if err != nil {
		t.Fatal(err)
	}
	resp, err := a.HTTP.Post(a.URL+path, "application/json", bytes.NewReader(b))
	if err != nil {
		t.Fatalf("POST %s: %v", path, err)
	}
	defer resp.Body.Close()
	body, _ := io.ReadAll(resp.Body)
	if resp.StatusCode != want {
		t.Fatalf("POST %s = %d, want %d: %s", path, resp.StatusCode, want, body)
	}
	if out != nil {
		if err := json.Unmarshal(body, out); err != nil {
			t.Fatalf("POST %s: decode %s: %v", path, body, err)
		}
	}
}

// newUSProject creates a project in US units through the JSON API (the settings
// take their defaults) and returns its id.
func (a *app) newUSProject(t *testing.T, name string) int64 {
	t.Helper()
	var p struct {
		ID int64 `json:"id"`
	}
	a.postJSON(t, "/api/v1/projects", map[string]any{"name": name, "units": "us"}, &p, http.StatusCreated)
	return p.ID
}

// newDemoProject presses the demo button's form with plain HTTP and returns the
// address of the project it made.
func (a *app) newDemoProject(t *testing.T) string {
	t.Helper()
	resp, err := a.HTTP.Post(a.URL+"/projects/demo", "application/x-www-form-urlencoded", nil)
	if err != nil {
		t.Fatalf("POST /projects/demo: %v", err)
	}
	resp.Body.Close()
	loc := resp.Header.Get("Location")
	if resp.StatusCode != http.StatusSeeOther || !strings.HasPrefix(loc, "/projects/") {
		t.Fatalf("POST /projects/demo = %d to %q, want 303 to /projects/{id}", resp.StatusCode, loc)
	}
	return loc
}

// page is one browser tab on the app.
type page struct {
	t    *testing.T
	ctx  context.Context // the tab; no deadline (a deadline here would stop the browser)
	base string

	mu       sync.Mutex
	problems []string // uncaught exceptions and console errors of the pages
}

// openBrowser starts a headless chromium of its own for the test (a fresh profile
// in a temporary folder) and opens one tab. When the test ends it saves a full-page
// screenshot into artifacts/<TestName>.png, fails the test on any script error the
// pages raised, and stops the browser.
func openBrowser(t *testing.T, a *app) *page {
	t.Helper()
	// Made before the browser's cleanup is registered, so it is removed only after
	// the browser has exited.
	profile := t.TempDir()
	opts := []chromedp.ExecAllocatorOption{
		chromedp.ExecPath(chromiumPath),
		chromedp.Headless,
		chromedp.NoSandbox,
		chromedp.DisableGPU,
		chromedp.Flag("disable-background-networking", true),
		chromedp.Flag("disable-component-update", true),
		chromedp.Flag("disable-sync", true),
		chromedp.NoFirstRun,
		chromedp.NoDefaultBrowserCheck,
		chromedp.Flag("disable-quic", true),
		chromedp.Flag("disable-dev-shm-usage", true),
		chromedp.UserDataDir(profile),
		chromedp.WindowSize(1400, 1000),
	}
	allocCtx, allocCancel := chromedp.NewExecAllocator(context.Background(), opts...)
	t.Cleanup(allocCancel)
	ctx, cancel := chromedp.NewContext(allocCtx)
	t.Cleanup(cancel)

	p := &page{t: t, ctx: ctx, base: a.URL}
	// The first Run starts the browser: no timeout on it.
	if _, err := chromedp.Run(ctx, chromedp.Steps()); err != nil {
		t.Fatalf("start chromium (%s): %v", chromiumPath, err)
	}
	if err := chromedp.Listen(ctx, p.listen); err != nil {
		t.Fatalf("listen to the browser: %v", err)
	}
	t.Cleanup(func() {
		p.screenshot()
		p.mu.Lock()
		defer p.mu.Unlock()
		for _, m := range p.problems {
			t.Errorf("the page reported: %s", m)
		}
	})
	return p
}

// listen records what the pages report as broken: uncaught exceptions and
// console.error calls (htmx reports failed requests and CSP refusals there).
func (p *page) listen(ev any) {
	var msg string
	switch ev := ev.(type) {
	case *runtime.EventExceptionThrown:
		msg = "exception: " + ev.ExceptionDetails.Text
		if ev.ExceptionDetails.Exception != nil {
			msg += " " + ev.ExceptionDetails.Exception.Description
		}
	case *runtime.EventConsoleAPICalled:
		if ev.Type != runtime.ConsoleAPICalledTypeError {
			return
		}
		var parts []string
		for _, a := range ev.Args {
			if len(a.Value) > 0 {
				parts = append(parts, string(a.Value))
			} else {
				parts = append(parts, a.Description)
			}
		}
		msg = "console.error: " + strings.Join(parts, " ")
		// hx-sync="this:replace" aborts a request that a newer input replaces; htmx
		// logs the abort and its afterRequest as errors. Expected while typing.
		if strings.Contains(msg, "htmx:sendAbort") || strings.Contains(msg, "htmx:afterRequest") {
			return
		}
	default:
		return
	}
	p.mu.Lock()
	p.problems = append(p.problems, msg)
	p.mu.Unlock()
}

// screenshot saves the whole page as artifacts/<TestName>.png.
func (p *page) screenshot() { p.snapshot("") }

// snapshot saves the whole page as artifacts/<TestName>-<label>.png, for a page
// along the way worth looking at.
func (p *page) snapshot(label string) {
	p.t.Helper()
	ctx, cancel := context.WithTimeout(p.ctx, stepTimeout)
	defer cancel()
	// From the top: a sticky panel (the line results) is drawn where the page was
	// scrolled to, which misleads in a full-page image.
	_, _ = chromedp.Run(ctx, chromedp.Evaluate[chromedp.Void](`window.scrollTo(0, 0)`))
	png, err := chromedp.Run(ctx, chromedp.FullScreenshot(100))
	if err != nil {
		p.t.Logf("screenshot: %v", err)
		return
	}
	if err := os.MkdirAll(artifactsDir, 0o755); err != nil {
		p.t.Logf("screenshot: %v", err)
		return
	}
	name := strings.NewReplacer("/", "_", " ", "_").Replace(p.t.Name())
	if label != "" {
		name += "-" + label
	}
	name += ".png"
	path := filepath.Join(artifactsDir, name)
	if err := os.WriteFile(path, png, 0o644); err != nil {
		p.t.Logf("screenshot: %v", err)
		return
	}
	p.t.Logf("screenshot: e2e/%s", path)
}

// run runs one action with a step timeout and fails the test on error.
func run[T any](p *page, what string, a chromedp.Action[T]) T {
	p.t.Helper()
	ctx, cancel := context.WithTimeout(p.ctx, stepTimeout)
	defer cancel()
	v, err := chromedp.Run(ctx, a)
	if err != nil {
		p.t.Fatalf("%s: %v", what, err)
	}
	return v
}

// do runs steps in order with one step timeout.
func (p *page) do(what string, steps ...chromedp.Action[chromedp.Void]) {
	p.t.Helper()
	run(p, what, chromedp.Steps(steps...))
}

// open loads a path of the app and requires a 200 answer.
func (p *page) open(path string) {
	p.t.Helper()
	resp := run(p, "open "+path, chromedp.NavigateResponse(p.base+path))
	if resp.Status != http.StatusOK {
		p.t.Fatalf("open %s: status %d", path, resp.Status)
	}
}

// submit clicks a control that loads a new page (a form's submit button, a link),
// waits for that page and requires a 200 answer (after any redirect). It returns the
// path of the page it landed on.
func (p *page) submit(what string, sel string) string {
	p.t.Helper()
	path, status := p.submitStatus(what, sel)
	if status != http.StatusOK {
		p.t.Fatalf("%s: landed on %s with status %d", what, path, status)
	}
	return path
}

// submitStatus is submit for a page that may answer another status (a refused form).
func (p *page) submitStatus(what string, sel string) (path string, status int64) {
	p.t.Helper()
	ctx, cancel := context.WithTimeout(p.ctx, stepTimeout)
	defer cancel()
	resp, err := chromedp.RunResponse(ctx, chromedp.Click(chromedp.CSS(sel)))
	if err != nil {
		p.t.Fatalf("%s: %v", what, err)
	}
	return p.path(), resp.Status
}

// path is the path of the current address (no origin, query or fragment).
func (p *page) path() string {
	p.t.Helper()
	loc := run(p, "read the location", chromedp.Location())
	u, err := url.Parse(loc)
	if err != nil {
		p.t.Fatalf("location %q: %v", loc, err)
	}
	return u.Path
}

// typeInto replaces an input's text by typing, so the page sees the key and input
// events a person makes.
func (p *page) typeInto(sel, text string) {
	p.t.Helper()
	clear := fmt.Sprintf(`(() => { const el = document.querySelector(%s); if (el) { el.value = ""; } return !!el; })()`, jsString(sel))
	if !run(p, "clear "+sel, chromedp.Evaluate[bool](clear)) {
		p.t.Fatalf("type into %s: no such element", sel)
	}
	p.do("type "+text+" into "+sel, chromedp.SendKeys(chromedp.CSS(sel), text))
}

// choose selects an option of a select by its value, as a person does (a change
// event follows), and fails when no option has that value.
func (p *page) choose(sel, value string) {
	p.t.Helper()
	js := fmt.Sprintf(`(() => {
		const el = document.querySelector(%s);
		if (!el) return "no element";
		if (![...el.options].some(o => o.value === %s)) return "no option";
		el.value = %s;
		el.dispatchEvent(new Event("input", {bubbles: true}));
		el.dispatchEvent(new Event("change", {bubbles: true}));
		return "ok";
	})()`, jsString(sel), jsString(value), jsString(value))
	if got := run(p, "choose "+value+" in "+sel, chromedp.Evaluate[string](js)); got != "ok" {
		p.t.Fatalf("choose %q in %s: %s", value, sel, got)
	}
}

// text is the visible text of the first element matching sel, trimmed.
func (p *page) text(sel string) string {
	p.t.Helper()
	return strings.TrimSpace(run(p, "read "+sel, chromedp.Text(chromedp.CSS(sel))))
}

// value is the value of the form control matching sel.
func (p *page) value(sel string) string {
	p.t.Helper()
	return run(p, "read the value of "+sel, chromedp.Value(chromedp.CSS(sel)))
}

// count is how many elements match sel now (no waiting).
func (p *page) count(sel string) int {
	p.t.Helper()
	return run(p, "count "+sel, chromedp.Evaluate[int](fmt.Sprintf(`document.querySelectorAll(%s).length`, jsString(sel))))
}

// waitFor polls a JavaScript condition until it is true.
func (p *page) waitFor(what, cond string) {
	p.t.Helper()
	run(p, "wait until "+what, chromedp.Poll[chromedp.Void](cond,
		chromedp.WithPollingInterval(50*time.Millisecond), chromedp.WithPollingTimeout(stepTimeout)))
}

// jsString quotes s as a JavaScript string literal.
func jsString(s string) string {
	b, _ := json.Marshal(s)
	return string(b)
}

// textIfAny is the text of the first element matching sel, or "" when there is none
// (for failure messages).
func (p *page) textIfAny(sel string) string {
	p.t.Helper()
	return run(p, "read "+sel, chromedp.Evaluate[string](fmt.Sprintf(
		`(document.querySelector(%s) || {innerText: ""}).innerText`, jsString(sel))))
}

// attr reads an attribute of the first element matching sel ("" when absent).
func attr(sel, name string) chromedp.Action[string] {
	return chromedp.Evaluate[string](fmt.Sprintf(
		`(document.querySelector(%s) || {getAttribute: () => ""}).getAttribute(%s) || ""`, jsString(sel), jsString(name)))
}

// chromedpUpload sets the file of a file input, as choosing it in the dialog does.
func chromedpUpload(sel, path string) chromedp.Action[chromedp.Void] {
	return chromedp.SetUploadFiles(chromedp.CSS(sel), []string{path})
}

// fetched is what fetchHead learns about a response.
type fetched struct {
	Status      int    `json:"status"`
	Type        string `json:"type"`
	Disposition string `json:"disposition"`
	Size        int    `json:"size"`
}

// fetchHead fetches a path from the page with the browser's fetch (same origin, the
// page's cookies) and returns its status, headers and body size.
func fetchHead(path string) chromedp.Action[fetched] {
	return chromedp.Evaluate[fetched](fmt.Sprintf(`fetch(%s).then(async r => ({
		status: r.status,
		type: r.headers.get("Content-Type") || "",
		disposition: r.headers.get("Content-Disposition") || "",
		size: (await r.arrayBuffer()).byteLength,
	}))`, jsString(path)), chromedp.EvalAwaitPromise)
}
