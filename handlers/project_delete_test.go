package handlers

import (
	"context"
	"errors"
	"net/http"
	"strconv"
	"strings"
	"testing"

	"lagwright/store"
	"lagwright/store/storetest"
)

// TestProjectDelete: the project page offers a delete, the confirm page asks first
// (GET changes nothing) and the POST removes the project with its lines.
func TestProjectDelete(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	h := s.Routes()
	p := createTestProject(t, st, "si")
	base := "/projects/" + strconv.FormatInt(p.ID, 10)
	if rec := do(t, h, "GET", base, nil, nil); !strings.Contains(rec.Body.String(), `href="`+base+`/delete"`) {
		t.Fatalf("the project page has no delete link")
	}
	rec := do(t, h, "GET", base+"/delete", nil, nil)
	if rec.Code != http.StatusOK || !strings.Contains(rec.Body.String(), "confirm-delete-project") {
		t.Fatalf("GET %s/delete = %d, want the confirm page", base, rec.Code)
	}
	if _, err := st.Project(context.Background(), p.ID); err != nil {
		t.Fatalf("the confirm page changed something: %v", err)
	}
	rec = postPage(t, h, base+"/delete", nil, nil)
	if rec.Code != http.StatusSeeOther || rec.Header().Get("Location") != "/projects" {
		t.Fatalf("POST %s/delete = %d to %q, want 303 to /projects", base, rec.Code, rec.Header().Get("Location"))
	}
	if _, err := st.Project(context.Background(), p.ID); !errors.Is(err, store.ErrNotFound) {
		t.Errorf("the project is still there: %v", err)
	}
}
