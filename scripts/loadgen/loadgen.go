// Command loadgen measures the app under load on loopback: it seeds (or reuses) a
// project of -lines lines (package demo's line list repeated under new tags, through
// the JSON API), then drives three scenarios with -clients concurrent clients, each
// bounded by -requests and -duration:
//
//   - page:   GET /projects/{id}, the project page;
//   - static: the same bytes, saved to a temporary folder and served by http.FileServer
//     in this process on another loopback port (the baseline);
//   - calc:   POST /api/v1/calc with one demo line.
//
// It reports throughput, p50 and p99 latency and errors (transport errors or any
// status but 200). It refuses any target that is not a loopback address, and stops by
// itself. When the app requires login, set LOADGEN_USER and LOADGEN_PASSWORD.
//
//	go run ./scripts/loadgen -url http://127.0.0.1:8080 -duration 10s
package main

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"net"
	"net/http"
	"net/http/cookiejar"
	"net/url"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"sync"
	"sync/atomic"
	"time"

	"lagwright/demo"
)

// Options bound a run.
type Options struct {
	Target    string        // base URL of the app: loopback only
	Also      []string      // more instances of the same app (same database): page and calc requests go round robin over all
	ProjectID int64         // 0: seed a new project of Lines lines
	Lines     int           // lines to seed (default 500)
	Clients   int           // concurrent clients (default 64)
	Requests  int           // at most this many requests per scenario
	Duration  time.Duration // and at most this long per scenario
	User      string        // optional login
	Password  string
}

// Result is one scenario's figures.
type Result struct {
	Name     string
	Requests int
	Errors   int
	Elapsed  time.Duration
	P50, P99 time.Duration
	Bytes    int64  // of one answer
	FirstErr string // the first failure, to say what failed
}

// RPS is the throughput in requests per second.
func (r Result) RPS() float64 { return float64(r.Requests) / r.Elapsed.Seconds() }

// checkLoopback refuses any target whose host is not a loopback address.
func checkLoopback(target string) (*url.URL, error) {
	u, err := url.Parse(target)
	if err != nil || (u.Scheme != "http" && u.Scheme != "https") || u.Host == "" {
		return nil, fmt.Errorf("loadgen: target %q is not an http(s) URL", target)
	}
	h := u.Hostname()
	if strings.EqualFold(h, "localhost") {
		return u, nil
	}
	if ip := net.ParseIP(h); ip != nil && ip.IsLoopback() {
		return u, nil
	}
	return nil, fmt.Errorf("loadgen: refusing target %q: only loopback addresses (127.0.0.0/8, ::1, localhost)", target)
}

// Run seeds or reuses the project and runs the three scenarios.
func Run(ctx context.Context, opt Options, log io.Writer) ([]Result, error) {
	base, err := checkLoopback(opt.Target)
	if err != nil {
		return nil, err
	}
	opt.Lines = cmp(opt.Lines, 500)
	opt.Clients = cmp(opt.Clients, 64)
	opt.Requests = cmp(opt.Requests, 100000)
	if opt.Duration <= 0 {
		opt.Duration = 10 * time.Second
	}
	jar, _ := cookiejar.New(nil)
	client := &http.Client{Jar: jar, Timeout: 30 * time.Second, Transport: &http.Transport{
		MaxIdleConns: opt.Clients * 2, MaxIdleConnsPerHost: opt.Clients * 2, DisableCompression: true,
		DialContext: (&net.Dialer{Timeout: 5 * time.Second}).DialContext,
	}}
	defer client.CloseIdleConnections()
	app := strings.TrimRight(base.String(), "/")
	apps := []string{app}
	for _, t := range opt.Also {
		u, err := checkLoopback(t)
		if err != nil {
			return nil, err
		}
		apps = append(apps, strings.TrimRight(u.String(), "/"))
	}
	var turn atomic.Int64
	next := func() string { return apps[int(turn.Add(1))%len(apps)] }
	if opt.User != "" {
		if err := login(ctx, client, app, opt.User, opt.Password); err != nil {
			return nil, err
		}
	}
	id := opt.ProjectID
	if id == 0 {
		t0 := time.Now()
		if id, err = seed(ctx, client, app, opt.Lines); err != nil {
			return nil, err
		}
		fmt.Fprintf(log, "seeded project %d with %d lines in %v\n", id, opt.Lines, time.Since(t0).Round(time.Millisecond))
	}
	pagePath := fmt.Sprintf("/projects/%d", id)
	page, err := get(ctx, client, app+pagePath)
	if err != nil {
		return nil, err
	}
	dir, err := os.MkdirTemp("", "loadgen-")
	if err != nil {
		return nil, err
	}
	defer os.RemoveAll(dir)
	if err := os.WriteFile(filepath.Join(dir, "page.html"), page, 0o644); err != nil {
		return nil, err
	}
	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		return nil, err
	}
	fs := &http.Server{Handler: http.FileServer(http.Dir(dir)), ReadHeaderTimeout: 5 * time.Second}
	go func() { _ = fs.Serve(ln) }()
	defer fs.Close()
	staticURL := "http://" + ln.Addr().String() + "/page.html"

	// One demo line as the calc command takes it: its input with the project's indoor air.
	in := demo.Lines()[0].Input
	set := demo.Settings()
	amb := set.Indoor.AmbientTempC
	in.AmbientTempC, in.RelativeHumidityPct = &amb, set.Indoor.RelativeHumidityPct
	calcBody, _ := json.Marshal(in)
	scenarios := []struct {
		name string
		req  func(ctx context.Context) (*http.Request, error)
	}{
		{"page", func(ctx context.Context) (*http.Request, error) {
			return http.NewRequestWithContext(ctx, "GET", next()+pagePath, nil)
		}},
		{"static", func(ctx context.Context) (*http.Request, error) {
			return http.NewRequestWithContext(ctx, "GET", staticURL, nil)
		}},
		{"calc", func(ctx context.Context) (*http.Request, error) {
			r, err := http.NewRequestWithContext(ctx, "POST", next()+"/api/v1/calc", bytes.NewReader(calcBody))
			if err == nil {
				r.Header.Set("Content-Type", "application/json")
			}
			return r, err
		}},
	}
	var out []Result
	for _, sc := range scenarios {
		res := drive(ctx, client, sc.name, sc.req, opt)
		if sc.name != "calc" {
			res.Bytes = int64(len(page))
		}
		out = append(out, res)
		fmt.Fprintf(log, "%-6s %6d requests in %5.2fs  %8.0f req/s  p50 %7.2f ms  p99 %7.2f ms  errors %d\n", res.Name, res.Requests,
			res.Elapsed.Seconds(), res.RPS(), ms(res.P50), ms(res.P99), res.Errors)
		if res.FirstErr != "" {
			fmt.Fprintf(log, "       first error: %s\n", res.FirstErr)
		}
	}
	return out, nil
}

func ms(d time.Duration) float64 { return float64(d) / float64(time.Millisecond) }

func cmp(v, def int) int {
	if v <= 0 {
		return def
	}
	return v
}

// drive runs one scenario with opt.Clients workers until opt.Requests are sent or
// opt.Duration has passed.
func drive(ctx context.Context, client *http.Client, name string, mk func(context.Context) (*http.Request, error), opt Options) Result {
	// No new request after the deadline; requests in flight finish (each bounded by the
	// client's timeout), so a slow page is measured, not cut off.
	deadline := time.Now().Add(opt.Duration)
	var sent, errs atomic.Int64
	var firstErr atomic.Value
	lat := make([][]time.Duration, opt.Clients)
	var wg sync.WaitGroup
	t0 := time.Now()
	for w := range opt.Clients {
		wg.Go(func() {
			for ctx.Err() == nil && time.Now().Before(deadline) && sent.Add(1) <= int64(opt.Requests) {
				req, err := mk(ctx)
				if err != nil {
					errs.Add(1)
					continue
				}
				t := time.Now()
				resp, err := client.Do(req)
				if err == nil {
					_, err = io.Copy(io.Discard, resp.Body)
					resp.Body.Close()
					if err == nil && resp.StatusCode != http.StatusOK {
						err = fmt.Errorf("status %d", resp.StatusCode)
					}
				}
				lat[w] = append(lat[w], time.Since(t))
				if err != nil {
					errs.Add(1)
					firstErr.CompareAndSwap(nil, err.Error())
				}
			}
		})
	}
	wg.Wait()
	elapsed := time.Since(t0)
	all := slices.Concat(lat...)
	slices.Sort(all)
	r := Result{Name: name, Requests: len(all), Errors: int(errs.Load()), Elapsed: elapsed}
	r.FirstErr, _ = firstErr.Load().(string)
	if len(all) > 0 {
		r.P50, r.P99 = all[len(all)*50/100], all[min(len(all)-1, len(all)*99/100)]
	}
	return r
}

func get(ctx context.Context, c *http.Client, u string) ([]byte, error) {
	req, err := http.NewRequestWithContext(ctx, "GET", u, nil)
	if err != nil {
		return nil, err
	}
	resp, err := c.Do(req)
	if err != nil {
		return nil, err
	}
	defer resp.Body.Close()
	b, err := io.ReadAll(resp.Body)
	if err == nil && resp.StatusCode != http.StatusOK {
		err = fmt.Errorf("loadgen: GET %s: status %d", u, resp.StatusCode)
	}
	return b, err
}

func postJSON(ctx context.Context, c *http.Client, u string, v any) (map[string]any, error) {
	body, err := json.Marshal(v)
	if err != nil {
		return nil, err
	}
	req, err := http.NewRequestWithContext(ctx, "POST", u, bytes.NewReader(body))
	if err != nil {
		return nil, err
	}
	req.Header.Set("Content-Type", "application/json")
	resp, err := c.Do(req)
	if err != nil {
		return nil, err
	}
	defer resp.Body.Close()
	var m map[string]any
	if err := json.NewDecoder(resp.Body).Decode(&m); err != nil {
		return nil, fmt.Errorf("loadgen: POST %s: %d, %w", u, resp.StatusCode, err)
	}
	if resp.StatusCode != http.StatusCreated {
		return nil, fmt.Errorf("loadgen: POST %s: status %d: %v", u, resp.StatusCode, m["errors"])
	}
	return m, nil
}

func login(ctx context.Context, c *http.Client, app, user, password string) error {
	form := url.Values{"name": {user}, "password": {password}}
	req, err := http.NewRequestWithContext(ctx, "POST", app+"/login", strings.NewReader(form.Encode()))
	if err != nil {
		return err
	}
	req.Header.Set("Content-Type", "application/x-www-form-urlencoded")
	resp, err := c.Do(req) // follows the 303 with the new cookie
	if err != nil {
		return err
	}
	resp.Body.Close()
	if resp.Request.URL.Path == "/login" {
		return errors.New("loadgen: login failed")
	}
	return nil
}

// seed creates a project with n lines: demo's lines repeated, tagged -Rk for the k-th copy.
func seed(ctx context.Context, c *http.Client, app string, n int) (int64, error) {
	p, err := postJSON(ctx, c, app+"/api/v1/projects", map[string]any{
		"name": fmt.Sprintf("Load test, %d lines (%s)", n, time.Now().Format("2006-01-02 15:04:05")), "units": "si", "settings": demo.Settings()})
	if err != nil {
		return 0, err
	}
	idf, _ := p["id"].(float64)
	id := int64(idf)
	lines := demo.Lines()
	jobs := make(chan int)
	errc := make(chan error, 8)
	var wg sync.WaitGroup
	for range 8 {
		wg.Go(func() {
			for i := range jobs {
				dl := lines[i%len(lines)]
				m := map[string]any{}
				js, _ := json.Marshal(dl.Input)
				_ = json.Unmarshal(js, &m)
				m["tag"] = fmt.Sprintf("%s-R%d", dl.Tag, i/len(lines)+1)
				m["service"], m["location"], m["exposure"], m["notes"], m["fittings"] = dl.Service, dl.Location, dl.Exposure, dl.Notes, dl.Fittings
				if _, err := postJSON(ctx, c, fmt.Sprintf("%s/api/v1/projects/%d/lines", app, id), m); err != nil {
					select {
					case errc <- err:
					default:
					}
				}
			}
		})
	}
	for i := range n {
		jobs <- i
	}
	close(jobs)
	wg.Wait()
	select {
	case err := <-errc:
		return id, err
	default:
	}
	return id, nil
}
