package handlers

import (
	"context"
	"encoding/json"
	"fmt"
	"net/http"
	"net/http/httptest"
	"strings"
	"sync"
	"testing"

	"lagwright/store/storetest"
)

// 100 PATCHes of one line, all with the version read: exactly one wins, 99 get 409, and
// the saved line is version+1 with the winner's change (no lost update).
func TestConcurrentPatchOneWinner(t *testing.T) {
	st := storetest.NewDB(t)
	s, logs := newServer(t, st)
	h := s.Routes()
	ids := fixture(t, st, h)
	before, err := st.Line(context.Background(), ids.project, ids.line)
	if err != nil {
		t.Fatal(err)
	}
	srv := httptest.NewServer(h) // real connections, real concurrency
	defer srv.Close()
	url := fmt.Sprintf("%s/api/v1/projects/%d/lines/%d", srv.URL, ids.project, ids.line)

	const n = 100
	codes := make([]int, n)
	var wg sync.WaitGroup
	start := make(chan struct{})
	for i := range n {
		wg.Go(func() {
			<-start
			body := fmt.Sprintf(`{"version": %d, "service": "writer %d"}`, before.Version, i)
			req, _ := http.NewRequest("PATCH", url, strings.NewReader(body))
			req.Header.Set("Content-Type", "application/json")
			resp, err := srv.Client().Do(req)
			if err != nil {
				t.Error(err)
				return
			}
			resp.Body.Close()
			codes[i] = resp.StatusCode
		})
	}
	close(start)
	wg.Wait()

	winner, conflicts := -1, 0
	for i, c := range codes {
		switch c {
		case http.StatusOK:
			if winner >= 0 {
				t.Errorf("two winners: %d and %d", winner, i)
			}
			winner = i
		case http.StatusConflict:
			conflicts++
		default:
			t.Errorf("writer %d got %d", i, c)
		}
	}
	if winner < 0 || conflicts != n-1 {
		t.Fatalf("%d conflicts and winner %d; want 99 and one winner\n%s", conflicts, winner, logs)
	}
	after, err := st.Line(context.Background(), ids.project, ids.line)
	if err != nil {
		t.Fatal(err)
	}
	if after.Version != before.Version+1 || after.Service != fmt.Sprintf("writer %d", winner) {
		t.Errorf("saved line: version %d service %q; want %d and %q", after.Version, after.Service, before.Version+1, fmt.Sprintf("writer %d", winner))
	}
	var in map[string]any
	if err := json.Unmarshal(after.Input, &in); err != nil || in["geometry"] == nil {
		t.Errorf("the input was damaged: %v %s", err, after.Input)
	}
}
