package main

import (
	"bytes"
	"context"
	"log/slog"
	"net/http/httptest"
	"strings"
	"testing"
	"time"

	"lagwright/handlers"
	"lagwright/store/storetest"
)

func TestMain(m *testing.M) { storetest.Main(m) }

func TestRefusesNonLoopback(t *testing.T) {
	for _, tc := range []struct {
		url string
		ok  bool
	}{
		{"http://127.0.0.1:8080", true},
		{"http://127.8.0.1:8080", true},
		{"http://[::1]:8080", true},
		{"http://localhost:8080/", true},
		{"http://10.0.0.5:8080", false},
		{"http://0.0.0.0:8080", false},
		{"http://example.com", false},
		{"http://127.0.0.1.nip.io", false},
		{"ftp://127.0.0.1", false},
		{"127.0.0.1:8080", false},
	} {
		_, err := checkLoopback(tc.url)
		if (err == nil) != tc.ok {
			t.Errorf("checkLoopback(%q) = %v, want ok=%v", tc.url, err, tc.ok)
		}
	}
	if _, err := Run(context.Background(), Options{Target: "http://192.0.2.1:8080"}, &bytes.Buffer{}); err == nil || !strings.Contains(err.Error(), "refusing") {
		t.Errorf("Run on a non-loopback target: %v", err)
	}
}

// A short bounded run against the app in-process: 500 lines, 64 clients, new requests for 0.5 s per
// scenario. It checks the generator works and nothing fails; figures come from the
// long form (README).
func TestShortLoad(t *testing.T) {
	st := storetest.NewDB(t)
	s, err := handlers.New(st, slog.New(slog.DiscardHandler), handlers.Config{})
	if err != nil {
		t.Fatal(err)
	}
	srv := httptest.NewServer(s.Routes())
	defer srv.Close()
	var log bytes.Buffer
	res, err := Run(context.Background(), Options{Target: srv.URL, Lines: 500, Clients: 64, Requests: 2000, Duration: 500 * time.Millisecond}, &log)
	if err != nil {
		t.Fatal(err)
	}
	t.Log("\n" + log.String())
	if len(res) != 3 {
		t.Fatalf("%d scenarios", len(res))
	}
	for _, r := range res {
		if r.Requests == 0 || r.Errors != 0 || r.P50 <= 0 || r.P99 < r.P50 {
			t.Errorf("%s: %+v", r.Name, r)
		}
	}
	if res[0].Bytes < 100_000 {
		t.Errorf("the 500-line page is only %d bytes", res[0].Bytes)
	}
}
