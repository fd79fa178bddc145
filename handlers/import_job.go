package handlers

import (
	"context"
	"crypto/rand"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"net/http"
	"os"
	"regexp"
	"sync"
	"sync/atomic"
	"time"

	"github.com/a-h/templ"
	"github.com/go-chi/chi/v5"

	"lagwright/linelist"
	"lagwright/store"
	"lagwright/web"
)

// Background imports run as jobs in PostgreSQL (store/jobs.go), so with several app
// instances on one database any of them may run a queued import and any of them can
// show its progress: the commit queues the job, a runner claims it under a lease it
// renews, records progress in the job's row, and saves the lines and marks the job
// done in one transaction. A runner that dies loses its lease and another instance
// starts the import again (it is one transaction: it happened or it did not). Each
// instance runs at most importJobsMax imports at once; a finished job is kept an hour.
const (
	importJobKind    = "import"
	importJobTimeout = 10 * time.Minute
	importJobsMax    = 2 // imports this instance runs at once
	jobLease         = 30 * time.Second
	jobPoll          = time.Second
	jobProgressEvery = 250 * time.Millisecond
)

var jobIDPattern = regexp.MustCompile(`^[0-9a-f]{32}$`)

// jobRunner claims and runs queued jobs for this instance.
type jobRunner struct {
	s       *Server
	name    string        // this runner in the jobs table (host/pid/random)
	kick    chan struct{} // a job was queued here
	polling atomic.Bool   // RunJobs is running
	oneOffs atomic.Int32  // workers started by nudge
}

func newJobRunner(s *Server) *jobRunner {
	host, _ := os.Hostname()
	b := make([]byte, 4)
	_, _ = rand.Read(b)
	return &jobRunner{s: s, name: fmt.Sprintf("%s/%d/%s", host, os.Getpid(), hex.EncodeToString(b)), kick: make(chan struct{}, 1)}
}

// RunJobs runs queued jobs (queued by any instance) on importJobsMax workers, looking
// every second and at once when this instance queues one, until ctx ends; a job
// running then goes back to the queue for another instance. It returns when its
// workers have stopped.
func (s *Server) RunJobs(ctx context.Context) {
	r := s.runner
	r.polling.Store(true)
	defer r.polling.Store(false)
	var wg sync.WaitGroup
	for range importJobsMax {
		wg.Go(func() {
			t := time.NewTicker(jobPoll)
			defer t.Stop()
			for {
				for ctx.Err() == nil && r.runOne(ctx) {
				}
				select {
				case <-ctx.Done():
					return
				case <-t.C:
				case <-r.kick:
				}
			}
		})
	}
	wg.Wait()
}

// nudge is called after this instance queued a job. Under RunJobs a worker looks at
// once; without it (tests, tools) a one-off worker runs queued jobs until none is left.
func (r *jobRunner) nudge() {
	if r.polling.Load() {
		select {
		case r.kick <- struct{}{}:
		default:
		}
		return
	}
	if r.oneOffs.Add(1) > importJobsMax {
		r.oneOffs.Add(-1)
		return
	}
	go func() {
		defer r.oneOffs.Add(-1)
		for r.runOne(context.Background()) {
		}
	}()
}

// runOne claims and runs one import; false when there was none (or the database
// failed).
func (r *jobRunner) runOne(ctx context.Context) bool {
	s := r.s
	j, ok, err := s.store.ClaimJob(ctx, importJobKind, r.name, jobLease)
	if err != nil {
		if ctx.Err() == nil {
			s.log.Warn("claim job", "err", err)
		}
		return false
	}
	if !ok {
		return false
	}
	jctx, cancel := context.WithTimeout(ctx, importJobTimeout)
	defer cancel()
	// Renew the lease while the job runs; stop the job when another runner has it.
	stop := make(chan struct{})
	defer close(stop)
	go func() {
		t := time.NewTicker(jobLease / 3)
		defer t.Stop()
		for {
			select {
			case <-stop:
				return
			case <-t.C:
				if err := s.store.RenewJob(jctx, j.ID, r.name, jobLease); errors.Is(err, store.ErrJobLost) {
					cancel()
				}
			}
		}
	}()
	func() {
		defer func() {
			if rec := recover(); rec != nil {
				s.log.Error("import job panic", "job", j.ID, "project", j.ProjectID, "panic", rec)
				_ = s.store.FailJob(context.WithoutCancel(ctx), j.ID, r.name, "something went wrong on our side; it has been logged", nil)
			}
		}()
		s.runImportJob(jctx, r, j)
	}()
	if ctx.Err() != nil { // this instance is stopping: another one takes the job up
		_ = s.store.ReleaseJob(context.WithoutCancel(ctx), j.ID, r.name)
	}
	return true
}

// runImportJob checks and analyses the list (progress: rows analysed), then saves it
// and marks the job done in one transaction, or records why it failed.
func (s *Server) runImportJob(ctx context.Context, r *jobRunner, j store.Job) {
	fail := func(err error, msg string, problems []linelist.RowError) {
		if ctx.Err() != nil && errors.Is(err, context.Canceled) || errors.Is(err, store.ErrJobLost) {
			return // stopping, or another runner has the job
		}
		if err := s.store.FailJob(context.WithoutCancel(ctx), j.ID, r.name, msg, problems); err != nil && !errors.Is(err, store.ErrJobLost) {
			s.log.Error("import job: record failure", "job", j.ID, "err", err)
		}
	}
	failWith := func(err error) {
		e := classify(err)
		if e.Code == CodeInternal {
			s.log.Error("import job", "job", j.ID, "project", j.ProjectID, "err", err)
		}
		fail(err, e.Message, nil)
	}
	p, err := s.store.Project(ctx, j.ProjectID)
	if err != nil {
		failWith(err)
		return
	}
	var mu sync.Mutex
	var last time.Time
	plan, err := s.planImport(ctx, p, j.Payload, func(done, total int) {
		mu.Lock()
		defer mu.Unlock()
		if time.Since(last) < jobProgressEvery && done < total {
			return
		}
		last = time.Now()
		_ = s.store.JobProgress(ctx, j.ID, r.name, "analysing", done, total, jobLease)
	})
	if err != nil {
		failWith(err)
		return
	}
	if !plan.OK() {
		fail(nil, "the line list has problems (listed below)", plan.Problems)
		return
	}
	_ = s.store.JobProgress(ctx, j.ID, r.name, "saving", len(plan.Lines), len(plan.Lines), jobLease)
	if _, err := s.store.CreateLinesForJob(ctx, j.ID, r.name, p.ID, plan.Lines, plan.Materials); err != nil {
		failWith(err)
	}
}

// startImportJob queues the import of text into p and returns the job's id.
func (s *Server) startImportJob(ctx context.Context, p store.Project, text []byte) (string, error) {
	id, err := s.store.EnqueueJob(ctx, importJobKind, p.ID, text)
	if err != nil {
		return "", err
	}
	s.runner.nudge()
	return id, nil
}

// importProgress shows a background import: GET /projects/{id}/import/jobs/{job}.
// htmx requests get the progress fragment only. Any instance answers it.
func (s *Server) importProgress(w http.ResponseWriter, r *http.Request) {
	p, _ := projectOf(r)
	id := chi.URLParam(r, "job")
	notFound := NotFound("import (it may have finished more than an hour ago)")
	if !jobIDPattern.MatchString(id) {
		s.fail(w, r, notFound)
		return
	}
	j, err := s.store.Job(r.Context(), id)
	if errors.Is(err, store.ErrNotFound) || (err == nil && (j.Kind != importJobKind || j.ProjectID != p.ID)) {
		err = notFound
	}
	if err != nil {
		s.fail(w, r, err)
		return
	}
	view := s.importJobView(p, j)
	w.Header().Set("Cache-Control", "no-store")
	if r.Header.Get("HX-Request") == "true" {
		templ.Handler(web.ImportProgressPage(view), templ.WithFragments("progress")).ServeHTTP(w, r)
		return
	}
	templ.Handler(web.ImportProgressPage(view)).ServeHTTP(w, r)
}

// importJobView is the progress page of a job. A queued job shows as analysing,
// with nothing done yet.
func (s *Server) importJobView(p store.Project, j store.Job) web.ImportProgressView {
	phase := j.Phase
	switch j.State {
	case store.JobQueued:
		phase = "analysing"
	case store.JobRunning:
		if phase == "" {
			phase = "analysing"
		}
	default:
		phase = j.State // done | failed
	}
	var problems []linelist.RowError
	if len(j.Problems) > 0 {
		_ = json.Unmarshal(j.Problems, &problems) // written by FailJob from the same type
	}
	return web.ImportProgressView{
		Assets: s.assets.urls, ProjectName: p.Name, ProjectURL: projectURL(p.ID), ImportURL: importURL(p.ID),
		JobURL: importJobURL(p.ID, j.ID), Phase: phase, Done: j.Done, Total: j.Total, Created: j.Created,
		Message: j.Message, Problems: importProblems(problems),
	}
}
