package handlers

import (
	"context"
	"crypto/rand"
	"encoding/hex"
	"fmt"
	"net/http"
	"sync"
	"time"

	"github.com/a-h/templ"
	"github.com/go-chi/chi/v5"

	"lagwright/linelist"
	"lagwright/store"
	"lagwright/web"
)

// Background imports: a large commit runs as a job kept in s.jobs under "import:<id>"
// (a random id), so that a page can show its progress while it runs. Jobs live in
// memory only: a restart forgets them (the import itself is one transaction, so it
// either happened or did not). A finished job is forgotten an hour after it ends.
const (
	importJobTimeout = 10 * time.Minute
	importJobKeep    = time.Hour
	importJobsMax    = 2 // imports running at once
)

// importJob is one background import.
type importJob struct {
	projectID int64

	mu       sync.Mutex
	phase    string // "analysing" | "saving" | "done" | "failed"
	done     int    // rows analysed
	total    int
	created  int
	message  string
	problems []linelist.RowError
	ended    time.Time
}

func (j *importJob) set(f func(j *importJob)) {
	j.mu.Lock()
	defer j.mu.Unlock()
	f(j)
}

// view is a snapshot of the job for the progress page.
func (j *importJob) view(s *Server, p store.Project, id string) web.ImportProgressView {
	j.mu.Lock()
	defer j.mu.Unlock()
	return web.ImportProgressView{
		Assets: s.assets.urls, ProjectName: p.Name, ProjectURL: impProjectURL(p.ID), ImportURL: impImportURL(p.ID),
		JobURL: impJobURL(p.ID, id), Phase: j.phase, Done: j.done, Total: j.total, Created: j.created,
		Message: j.message, Problems: impProblems(j.problems),
	}
}

func impJobURL(projectID int64, id string) string {
	return fmt.Sprintf("/projects/%d/import/jobs/%s", projectID, id)
}

// startImportJob runs the import of text into p in the background and returns the
// job's id. It refuses when importJobsMax imports are running already.
func (s *Server) startImportJob(ctx context.Context, p store.Project, text []byte) (string, error) {
	running := 0
	now := time.Now()
	s.jobs.Range(func(k, v any) bool {
		j, ok := v.(*importJob)
		if !ok {
			return true
		}
		j.mu.Lock()
		ended := j.ended
		j.mu.Unlock()
		switch {
		case ended.IsZero():
			running++
		case now.Sub(ended) > importJobKeep:
			s.jobs.Delete(k)
		}
		return true
	})
	if running >= importJobsMax {
		return "", &Error{Code: CodeUnavailable, Message: "Other imports are running; try again in a minute."}
	}
	b := make([]byte, 16)
	_, _ = rand.Read(b) // crypto/rand.Read never fails
	id := hex.EncodeToString(b)
	job := &importJob{projectID: p.ID, phase: "analysing"}
	s.jobs.Store("import:"+id, job)

	ctx, cancel := context.WithTimeout(context.WithoutCancel(ctx), importJobTimeout)
	go func() {
		defer cancel()
		defer func() {
			if rec := recover(); rec != nil {
				s.log.Error("import job panic", "project", p.ID, "panic", rec)
				job.set(func(j *importJob) {
					j.phase, j.message, j.ended = "failed", "something went wrong on our side; it has been logged", time.Now()
				})
			}
		}()
		s.runImportJob(ctx, p, text, job)
	}()
	return id, nil
}

// runImportJob checks and analyses the list (progress: rows analysed), saves it in
// one transaction, and records the outcome.
func (s *Server) runImportJob(ctx context.Context, p store.Project, text []byte, job *importJob) {
	fail := func(msg string, problems []linelist.RowError) {
		job.set(func(j *importJob) { j.phase, j.message, j.problems, j.ended = "failed", msg, problems, time.Now() })
	}
	plan, err := s.planImport(ctx, p, text, func(done, total int) {
		job.set(func(j *importJob) { j.done, j.total = done, total })
	})
	if err != nil {
		e := classify(err)
		if e.Code == CodeInternal {
			s.log.Error("import job", "project", p.ID, "err", err)
		}
		fail(e.Message, nil)
		return
	}
	if !plan.OK() {
		fail("the line list has problems (listed below)", plan.Problems)
		return
	}
	job.set(func(j *importJob) { j.phase, j.done, j.total = "saving", len(plan.Lines), len(plan.Lines) })
	n, err := s.store.CreateLines(ctx, p.ID, plan.Lines, plan.Materials)
	if err != nil {
		e := classify(err)
		if e.Code == CodeInternal {
			s.log.Error("import job", "project", p.ID, "err", err)
		}
		fail(e.Message, nil)
		return
	}
	job.set(func(j *importJob) { j.phase, j.created, j.ended = "done", n, time.Now() })
}

// importProgress shows a background import: GET /projects/{id}/import/jobs/{job}.
// htmx requests get the progress fragment only.
func (s *Server) importProgress(w http.ResponseWriter, r *http.Request) {
	p, _ := projectOf(r)
	id := chi.URLParam(r, "job")
	v, ok := s.jobs.Load("import:" + id)
	job, isJob := v.(*importJob)
	if !ok || !isJob || job.projectID != p.ID {
		s.fail(w, r, NotFound("import (it may have finished more than an hour ago, or the server restarted)"))
		return
	}
	view := job.view(s, p, id)
	w.Header().Set("Cache-Control", "no-store")
	if r.Header.Get("HX-Request") == "true" {
		templ.Handler(web.ImportProgressPage(view), templ.WithFragments("progress")).ServeHTTP(w, r)
		return
	}
	templ.Handler(web.ImportProgressPage(view)).ServeHTTP(w, r)
}
