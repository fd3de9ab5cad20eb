package server

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"log/slog"
	"math/rand/v2"
	"runtime/debug"
	"sync"
	"time"

	"shiftrank/ranker"
	"shiftrank/store"
)

// Causes of a running job's context being cancelled.
var (
	errCancelRequested = errors.New("cancelled on request")
	errLeaseLost       = errors.New("lease lost to another worker")
	errShutdown        = errors.New("server shutting down")
)

// Start starts Config.Workers workers, each claiming jobs from the store
// until Shutdown, and the callback sweep (see Config.CallbackSweep), which
// runs even in a process without workers. Calling it again does nothing.
func (s *Server) Start() {
	s.mu.Lock()
	defer s.mu.Unlock()
	if s.started {
		return
	}
	s.started = true
	runCtx, hardStop := context.WithCancelCause(context.Background())
	s.hardStop = hardStop
	s.workers.Add(2)
	go func() {
		defer s.workers.Done()
		s.sweepLoop(runCtx)
	}()
	go func() {
		defer s.workers.Done()
		s.retentionLoop(runCtx)
	}()
	for i := 0; i < s.cfg.Workers; i++ {
		s.workers.Add(1)
		go func() {
			defer s.workers.Done()
			s.workLoop(runCtx, fmt.Sprintf("%s/%d", s.cfg.WorkerID, i))
		}()
	}
	s.log.Info("worker pool started", "workers", max(s.cfg.Workers, 0), "worker_id", s.cfg.WorkerID, "lease", s.cfg.Lease)
}

// Shutdown stops the pool: workers claim no more jobs, running jobs may
// finish until ctx is done, and those still running then are handed back
// to the queue (ReleaseJob) for another worker. A callback delivery under
// way gets the same grace; one waiting out its back-off stops at once. Both
// stay unsettled in the store, and the sweep of another process resumes
// them. It returns once every worker and delivery has stopped.
func (s *Server) Shutdown(ctx context.Context) error {
	s.mu.Lock()
	select {
	case <-s.stopping:
	default:
		close(s.stopping)
	}
	started := s.started
	s.mu.Unlock()
	done := make(chan struct{})
	go func() {
		s.workers.Wait()
		s.bg.Wait()
		close(done)
	}()
	select {
	case <-done:
		return nil
	case <-ctx.Done():
	}
	if started {
		s.hardStop(errShutdown)
	}
	s.bgCancel()
	<-done
	return nil
}

// notifyWorkers wakes one idle worker of this process.
func (s *Server) notifyWorkers() {
	select {
	case s.wake <- struct{}{}:
	default:
	}
}

func (s *Server) workLoop(ctx context.Context, workerID string) {
	idle := s.cfg.IdleMin
	for {
		select {
		case <-s.stopping:
			return
		default:
		}
		job, err := s.st.ClaimJob(ctx, workerID, s.cfg.Lease)
		if err == nil {
			idle = s.cfg.IdleMin
			s.runJob(ctx, workerID, job)
			continue
		}
		if !errors.Is(err, store.ErrNoJob) {
			if ctx.Err() != nil {
				return
			}
			if store.IsUnavailable(err) {
				s.throttle.warn(s.log, "claim-unavailable", "claim job: the store cannot be reached", "err", err)
			} else {
				s.log.Error("claim job", "worker", workerID, "err", err)
			}
		}
		// Jitter keeps the workers of many processes from polling in step.
		wait := idle/2 + rand.N(idle/2+1)
		t := time.NewTimer(wait)
		select {
		case <-s.stopping:
			t.Stop()
			return
		case <-s.wake:
			t.Stop()
			idle = s.cfg.IdleMin
			continue
		case <-t.C:
		}
		idle = min(idle*2, s.cfg.IdleMax)
	}
}

// runJob runs one claimed job to its end: finished, cancelled, failed,
// handed back on shutdown, or dropped when its lease was lost.
func (s *Server) runJob(parent context.Context, workerID string, job store.Job) {
	log := s.log.With("job", job.ID, "worker", workerID, "attempt", job.Attempts)
	log.Info("job started")
	start := time.Now()
	ctx, cancel := context.WithCancelCause(parent)
	defer cancel(nil)

	var req JobRequest
	rr, fields := ranker.Request{}, []FieldError(nil)
	if err := json.Unmarshal(job.Request, &req); err != nil {
		fields = []FieldError{{Detail: "stored request is unreadable: " + err.Error()}}
	} else {
		rr, fields = req.rankerRequest(s.limits())
	}
	if len(fields) > 0 {
		// Validated at submit; only a change of limits between submit and run gets here.
		s.finish(log, job, workerID, store.StatusFailed, "invalid request: "+fields[0].Field+": "+fields[0].Detail, nil)
		return
	}

	var (
		pmu     sync.Mutex
		latest  store.Progress
		written store.Progress
	)
	progress := func(p ranker.Progress) {
		pmu.Lock()
		latest = store.Progress{Generated: p.Generated, Scored: p.Scored, TotalEstimate: p.TotalEstimate}
		pmu.Unlock()
	}

	nextProgress := func() (store.Progress, bool) {
		pmu.Lock()
		defer pmu.Unlock()
		if latest == written {
			return latest, false
		}
		written = latest
		return latest, true
	}

	monitorDone := make(chan struct{})
	go func() {
		defer close(monitorDone)
		s.monitor(ctx, cancel, log, job.ID, workerID, nextProgress)
	}()

	// The ranker keeps its own time budget; this deadline only guards
	// against a ranker that overruns it.
	rctx, rcancel := context.WithTimeout(ctx, s.cfg.TimeBudget+s.cfg.TimeBudget/2+5*time.Second)
	res, err := s.rank(rctx, rr, progress)
	rcancel()
	cause := context.Cause(ctx)
	cancel(nil)
	<-monitorDone
	if p, changed := nextProgress(); changed && cause == nil {
		pctx, pc := context.WithTimeout(context.Background(), 5*time.Second)
		if err := s.st.UpdateProgress(pctx, job.ID, workerID, p); err != nil {
			log.Warn("write final progress", "err", err)
		}
		pc()
	}

	switch {
	case errors.Is(cause, errLeaseLost):
		log.Warn("job dropped: lease lost; another worker has it")
		return
	case errors.Is(cause, errShutdown):
		rel, rc := context.WithTimeout(context.Background(), 5*time.Second)
		defer rc()
		if err := s.st.ReleaseJob(rel, job.ID, workerID); err != nil {
			log.Error("hand back job", "err", err)
		} else {
			log.Info("job handed back to the queue")
		}
		return
	case errors.Is(cause, errCancelRequested):
		s.finishCancelled(log, job, workerID, res)
		return
	}
	if err != nil {
		var re *ranker.RequestError
		msg := "ranking failed: internal error"
		switch {
		case errors.As(err, &re):
			msg = "invalid request: " + re.Error()
		case errors.Is(err, context.DeadlineExceeded):
			msg = "ranking exceeded its time budget"
		default:
			log.Error("ranking failed", "err", err)
		}
		s.finish(log, job, workerID, store.StatusFailed, msg, nil)
		return
	}
	body, err := json.Marshal(res)
	if err != nil {
		log.Error("encode result", "err", err)
		s.finish(log, job, workerID, store.StatusFailed, "ranking failed: internal error", nil)
		return
	}
	log.Info("job ranked", "duration", time.Since(start).Round(time.Millisecond), "isomers", res.IsomersTotal, "scored", res.Scored)
	s.finish(log, job, workerID, store.StatusSucceeded, "", &store.Result{JobID: job.ID, IsomersTotal: res.IsomersTotal, Body: body})
}

// CancelledMessage is the error of a job cancelled on request while it
// ran; CancelledKeptMessage that of one whose best candidates so far were
// kept (GET /v1/jobs/{id}/candidates returns them).
const (
	CancelledMessage     = "cancelled on request"
	CancelledKeptMessage = "cancelled on request; the candidates scored before the cancel are kept"
)

// finishCancelled ends a job cancelled on request. A ranker that returns
// the ranking so far together with its context's error (a partial
// result, as when its own time budget runs out) has that ranking stored
// with the cancelled job, its search marked as stopped by the cancel;
// without one the job is cancelled with nothing kept.
func (s *Server) finishCancelled(log *slog.Logger, job store.Job, workerID string, res *ranker.Result) {
	if res == nil {
		s.finish(log, job, workerID, store.StatusCancelled, CancelledMessage, nil)
		return
	}
	res.Complete = false
	res.Warnings = append(res.Warnings, "The job was cancelled on request: the ranking covers only the structures scored before the cancel; the true structure may not have been reached.")
	res.Search.Status = ranker.StatusStopped
	res.Search.StopReason = StopReasonCancelled
	body, err := json.Marshal(res)
	if err != nil {
		log.Error("encode partial result", "err", err)
		s.finish(log, job, workerID, store.StatusCancelled, CancelledMessage, nil)
		return
	}
	log.Info("job cancelled; partial ranking kept", "scored", res.Scored, "candidates", len(res.Candidates))
	s.finish(log, job, workerID, store.StatusCancelled, CancelledKeptMessage,
		&store.Result{JobID: job.ID, IsomersTotal: res.IsomersTotal, Body: body})
}

// StopReasonCancelled is the search stop reason of a ranking kept from a
// job cancelled on request.
const StopReasonCancelled = "cancelled on request"

// rank calls the ranker, turning a panic into an error.
func (s *Server) rank(ctx context.Context, req ranker.Request, progress func(ranker.Progress)) (res *ranker.Result, err error) {
	defer func() {
		if v := recover(); v != nil {
			s.log.Error("panic in ranker", "panic", fmt.Sprint(v), "stack", string(debug.Stack()))
			res, err = nil, fmt.Errorf("panic: %v", v)
		}
	}()
	res, err = s.rk.Rank(ctx, req, progress)
	if err != nil && ctx.Err() == nil {
		res = nil // only a cancelled ranking may hand back a partial result
	}
	if err == nil && res == nil {
		err = errors.New("ranker returned no result")
	}
	return res, err
}

// monitor runs beside a job: it polls for a cancel request, renews the
// lease, and writes progress at a throttled rate, until ctx is done.
func (s *Server) monitor(ctx context.Context, cancel context.CancelCauseFunc, log *slog.Logger, id, workerID string, nextProgress func() (store.Progress, bool)) {
	poll := time.NewTicker(s.cfg.CancelPoll)
	defer poll.Stop()
	lastRenew, lastProgress := time.Now(), time.Now()
	renewEvery := s.cfg.Lease / 3
	for {
		select {
		case <-ctx.Done():
			return
		case <-poll.C:
		}
		qctx, qcancel := context.WithTimeout(ctx, s.cfg.Lease/2)
		if time.Since(lastRenew) >= renewEvery {
			err := s.st.RenewLease(qctx, id, workerID, s.cfg.Lease)
			switch {
			case errors.Is(err, store.ErrCancelRequested):
				qcancel()
				cancel(errCancelRequested)
				return
			case errors.Is(err, store.ErrLeaseLost):
				qcancel()
				cancel(errLeaseLost)
				return
			case err != nil && ctx.Err() == nil:
				log.Warn("renew lease", "err", err)
			case err == nil:
				lastRenew = time.Now()
			}
		}
		if yes, err := s.st.CancelRequested(qctx, id); err == nil && yes {
			qcancel()
			cancel(errCancelRequested)
			return
		} else if err != nil && ctx.Err() == nil {
			log.Warn("check cancel request", "err", err)
		}
		if time.Since(lastProgress) >= s.cfg.ProgressEvery {
			if p, changed := nextProgress(); changed {
				if err := s.st.UpdateProgress(qctx, id, workerID, p); errors.Is(err, store.ErrLeaseLost) {
					qcancel()
					cancel(errLeaseLost)
					return
				} else if err != nil && ctx.Err() == nil {
					log.Warn("write progress", "err", err)
				}
			}
			lastProgress = time.Now()
		}
		qcancel()
	}
}

// finish records the end of a job and starts its callback.
func (s *Server) finish(log *slog.Logger, job store.Job, workerID string, status store.Status, msg string, res *store.Result) {
	ctx, cancel := context.WithTimeout(context.Background(), 15*time.Second)
	defer cancel()
	if err := s.st.FinishJob(ctx, job.ID, workerID, status, msg, res); err != nil {
		if errors.Is(err, store.ErrLeaseLost) {
			log.Warn("job result dropped: lease lost; another worker has it")
		} else {
			log.Error("finish job", "err", err)
		}
		return
	}
	log.Info("job finished", "status", status)
	if job.CallbackURL == "" {
		return
	}
	final, err := s.st.GetJob(ctx, job.Owner, job.ID)
	if err != nil {
		log.Error("read finished job for callback", "err", err)
		return
	}
	// Shutdown waits for the workers before it waits for s.bg, so a worker
	// may add to s.bg even while Shutdown runs.
	s.bg.Add(1)
	go func() {
		defer s.bg.Done()
		s.deliver(s.bgCtx, final)
	}()
}

// background runs f in a goroutine that Shutdown waits for (until its
// grace ends, when f's context is cancelled). For callers outside the
// workers, such as handlers.
func (s *Server) background(f func(ctx context.Context)) {
	s.mu.Lock()
	select {
	case <-s.stopping:
		// Shutdown may already be waiting: do not add to the group it waits on.
		s.mu.Unlock()
		go f(s.bgCtx)
		return
	default:
	}
	s.bg.Add(1)
	s.mu.Unlock()
	go func() {
		defer s.bg.Done()
		f(s.bgCtx)
	}()
}

// retentionLoop deletes, every RetentionSweep, the finished jobs older than
// Retention whose callbacks are settled, until Shutdown.
func (s *Server) retentionLoop(ctx context.Context) {
	if s.cfg.Retention < 0 {
		return
	}
	for {
		s.purgeFinished(ctx)
		t := time.NewTimer(s.cfg.RetentionSweep*3/4 + rand.N(s.cfg.RetentionSweep/2+1))
		select {
		case <-s.stopping:
			t.Stop()
			return
		case <-t.C:
		}
	}
}

// purgeBatch is how many finished jobs one delete removes.
const purgeBatch = 500

// purgeFinished deletes the finished jobs older than Retention, in batches.
func (s *Server) purgeFinished(ctx context.Context) {
	total := 0
	for {
		n, err := s.st.PurgeFinished(ctx, s.cfg.Retention, purgeBatch)
		if err != nil {
			if ctx.Err() == nil {
				s.throttle.warn(s.log, "purge", "delete old finished jobs", "err", err)
			}
			break
		}
		total += n
		if n < purgeBatch {
			break
		}
		select {
		case <-s.stopping:
			return
		default:
		}
	}
	if total > 0 {
		s.log.Info("deleted old finished jobs", "jobs", total, "older_than", s.cfg.Retention)
	}
}
