package main

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"io"
	"mime/multipart"
	"net/http"
	"net/http/cookiejar"
	"net/url"
	"os"
	"os/exec"
	"path/filepath"
	"runtime"
	"strings"
	"sync"
	"syscall"
	"testing"
	"time"

	"lagwright/store/storetest"
)

// instance is one `lagwright serve` process of the test.
type instance struct {
	cmd    *exec.Cmd
	stderr *syncBuffer
	base   string // http://127.0.0.1:port
}

func startInstance(t *testing.T, bin, dsn string) *instance {
	t.Helper()
	in := &instance{stderr: &syncBuffer{}}
	in.cmd = exec.Command(bin, "serve")
	in.cmd.Env = append(os.Environ(), "DATABASE_URL="+dsn, "LAGWRIGHT_ADDR=127.0.0.1:0", "LAGWRIGHT_AUTH=required",
		"LAGWRIGHT_DATA="+t.TempDir())
	in.cmd.Stderr = in.stderr
	if err := in.cmd.Start(); err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() {
		if in.cmd.ProcessState == nil {
			_ = in.cmd.Process.Kill()
			_ = in.cmd.Wait()
		}
	})
	for deadline := time.Now().Add(time.Minute); ; {
		if m := listeningRE.FindStringSubmatch(in.stderr.String()); m != nil {
			in.base = "http://" + m[1]
			return in
		}
		if time.Now().After(deadline) {
			t.Fatalf("instance did not start:\n%s", in.stderr.String())
		}
		time.Sleep(50 * time.Millisecond)
	}
}

// stop sends SIGTERM and wants a clean exit.
func (in *instance) stop(t *testing.T) {
	t.Helper()
	_ = in.cmd.Process.Signal(syscall.SIGTERM)
	if err := in.cmd.Wait(); err != nil {
		t.Errorf("instance %s exit: %v\n%s", in.base, err, in.stderr.String())
	}
}

// instanceLines writes n valid pipe lines as CSV (an invented hot-water system).
func instanceLines(n int) string {
	var b strings.Builder
	b.WriteString("tag,service,location,pipe_size,length [m],operating_temp [°C],layer1_material,layer1_thickness [mm],jacket\n")
	for i := range n {
		fmt.Fprintf(&b, "HW-%05d,Heating hot water,indoor,NPS 2,%d,%d,mineral_fiber_pipe_c547_t1,40,all_service_jacket\n", i, 5+i%40, 60+i%30)
	}
	return b.String()
}

// TestTwoInstancesOneDatabase: two `lagwright serve` processes on one PostgreSQL. A
// signed-in session works on both; an import queued through one is followed to its
// end through the other and its lines are seen by both; the login limit counts the
// attempts made on both; a load spread over both (reads and line additions) gets no
// error.
func TestTwoInstancesOneDatabase(t *testing.T) {
	if testing.Short() {
		t.Skip("builds the binary")
	}
	dsn := storetest.NewDSN(t)
	bin := filepath.Join(t.TempDir(), "lagwright")
	build := exec.Command(filepath.Join(runtime.GOROOT(), "bin", "go"), "build", "-o", bin, ".")
	if out, err := build.CombinedOutput(); err != nil {
		t.Fatalf("go build: %v\n%s", err, out)
	}
	var out bytes.Buffer
	if err := run(context.Background(), []string{"user", "add", "ana"}, env(map[string]string{"DATABASE_URL": dsn}),
		strings.NewReader("correct horse 1\n"), &out, io.Discard); err != nil {
		t.Fatal(err)
	}
	a, b := startInstance(t, bin, dsn), startInstance(t, bin, dsn)

	jar, _ := cookiejar.New(nil) // cookies are per host, not per port: one session for both
	client := &http.Client{Jar: jar, Timeout: time.Minute, CheckRedirect: func(*http.Request, []*http.Request) error { return http.ErrUseLastResponse }}
	post := func(target, ctype string, body io.Reader) *http.Response {
		t.Helper()
		res, err := client.Post(target, ctype, body)
		if err != nil {
			t.Fatal(err)
		}
		return res
	}
	get := func(target string) (int, string) {
		t.Helper()
		res, err := client.Get(target)
		if err != nil {
			t.Fatal(err)
		}
		defer res.Body.Close()
		body, _ := io.ReadAll(res.Body)
		return res.StatusCode, string(body)
	}
	login := func(base, name, password string) int {
		t.Helper()
		res := post(base+"/login", "application/x-www-form-urlencoded", strings.NewReader(url.Values{"name": {name}, "password": {password}}.Encode()))
		res.Body.Close()
		return res.StatusCode
	}
	if code := login(a.base, "ana", "correct horse 1"); code != http.StatusSeeOther {
		t.Fatalf("login on A = %d", code)
	}
	res := post(b.base+"/api/v1/projects", "application/json", strings.NewReader(`{"name": "Two instances (invented)", "units": "si"}`))
	var proj struct{ ID int64 }
	_ = json.NewDecoder(res.Body).Decode(&proj)
	res.Body.Close()
	if res.StatusCode != http.StatusCreated || proj.ID == 0 {
		t.Fatalf("create project on B with A's session = %d", res.StatusCode)
	}

	// An import queued through A, followed through B.
	var form bytes.Buffer
	mw := multipart.NewWriter(&form)
	_ = mw.WriteField("text", instanceLines(800))
	_ = mw.Close()
	res = post(fmt.Sprintf("%s/projects/%d/import/commit", a.base, proj.ID), mw.FormDataContentType(), &form)
	res.Body.Close()
	loc := res.Header.Get("Location")
	if res.StatusCode != http.StatusSeeOther || !strings.Contains(loc, "/import/jobs/") {
		t.Fatalf("import commit on A = %d %q", res.StatusCode, loc)
	}
	var frag string
	for deadline := time.Now().Add(2 * time.Minute); time.Now().Before(deadline); time.Sleep(200 * time.Millisecond) {
		code, body := get(b.base + loc)
		if code != http.StatusOK {
			t.Fatalf("progress on B = %d", code)
		}
		frag = body
		if strings.Contains(frag, `data-phase="done"`) || strings.Contains(frag, `data-phase="failed"`) {
			break
		}
	}
	if !strings.Contains(frag, `data-phase="done"`) || !strings.Contains(frag, "800 lines imported") {
		t.Fatalf("import followed on B did not end done:\n%.2000s", frag)
	}
	for _, in := range []*instance{a, b} {
		code, body := get(fmt.Sprintf("%s/api/v1/projects/%d/lines", in.base, proj.ID))
		var lines []any
		_ = json.Unmarshal([]byte(body), &lines)
		if code != http.StatusOK || len(lines) != 800 {
			t.Errorf("lines seen on %s = %d, %d lines; want 800", in.base, code, len(lines))
		}
	}

	// Load over both: reads and line additions, alternating instances.
	var mu sync.Mutex
	count, failures := 0, []string{}
	var wg sync.WaitGroup
	for c := range 6 {
		wg.Go(func() {
			for i := range 30 {
				in := []*instance{a, b}[(c+i)%2]
				var code int
				switch i % 3 {
				case 0:
					code, _ = get(fmt.Sprintf("%s/projects/%d", in.base, proj.ID))
				case 1:
					code, _ = get(fmt.Sprintf("%s/api/v1/projects/%d/lines", in.base, proj.ID))
				default:
					body := fmt.Sprintf(`{"tag": "LOAD-%d-%d", "geometry": "pipe", "pipe_size": "NPS 1", "operating_temp_c": 70, "length_m": 3,
						"layers": [{"material": "mineral_fiber_pipe_c547_t1", "thickness_mm": 25}], "jacket": "all_service_jacket"}`, c, i)
					r := post(fmt.Sprintf("%s/api/v1/projects/%d/lines", in.base, proj.ID), "application/json", strings.NewReader(body))
					r.Body.Close()
					code = r.StatusCode
				}
				mu.Lock()
				count++
				if code >= 300 {
					failures = append(failures, fmt.Sprintf("%s #%d: %d", in.base, i, code))
				}
				mu.Unlock()
			}
		})
	}
	wg.Wait()
	if len(failures) > 0 {
		t.Errorf("%d of %d requests over both instances failed: %v", len(failures), count, failures)
	}
	t.Logf("load over both instances: %d requests, %d errors", count, len(failures))

	// The login limit counts attempts on both instances.
	for i := range 5 {
		inst := []*instance{a, b}[i%2]
		if code := login(inst.base, "mallory", "wrong password"); code != http.StatusUnauthorized {
			t.Fatalf("wrong password %d on %s = %d, want 401", i+1, inst.base, code)
		}
	}
	for _, inst := range []*instance{a, b} {
		if code := login(inst.base, "mallory", "wrong password"); code != http.StatusTooManyRequests {
			t.Errorf("6th attempt, on %s = %d, want 429", inst.base, code)
		}
	}
	a.stop(t)
	b.stop(t)
}
