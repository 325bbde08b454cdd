package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"log"
	"net"
	"net/http"
	"strconv"
	"strings"
	"sync"
	"sync/atomic"
	"time"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/order"
	"github.com/antecedent-lab/antecedent/table"
)

// Limits bound what one request may ask of the service and how many it
// serves at once. Zero values mean the defaults written on each field.
type Limits struct {
	MaxBytes int64         // request body; 0 means 32 MiB
	MaxTime  time.Duration // wall time of one discovery; 0 means 2 minutes
	MaxRows  int           // data rows; 0 means no bound beyond MaxBytes
	Workers  int           // nodes fitted at once in one discovery; 0 means 1
	Folds    int           // cross-validation folds; 0 means the library's default

	// MaxRunning discoveries run at once (0 means 1); MaxWaiting more
	// requests may wait for a turn (0 means none). Others get 503.
	MaxRunning, MaxWaiting int
	// RetryAfter is advised to refused clients; 0 means 5 s.
	RetryAfter time.Duration

	// MaxMemory refuses a request whose estimated memory (Estimate)
	// exceeds it; 0 means no bound.
	MaxMemory int64
	// MaxEstimate refuses a request whose estimated time exceeds it; 0
	// means MaxTime. The estimate is a coarse bound, so MaxTime still
	// stops a discovery that runs over.
	MaxEstimate time.Duration

	// ReadHeaderTimeout and ReadTimeout (headers; whole request) cut off
	// slow clients; 0 means 10 s and 1 minute. Used by NewServer.
	ReadHeaderTimeout, ReadTimeout time.Duration
}

func (l Limits) withDefaults() Limits {
	def := func(p *time.Duration, d time.Duration) {
		if *p == 0 {
			*p = d
		}
	}
	if l.MaxBytes == 0 {
		l.MaxBytes = 32 << 20
	}
	def(&l.MaxTime, 2*time.Minute)
	def(&l.RetryAfter, 5*time.Second)
	def(&l.MaxEstimate, l.MaxTime)
	def(&l.ReadHeaderTimeout, 10*time.Second)
	def(&l.ReadTimeout, time.Minute)
	l.Workers = max(l.Workers, 1)
	l.MaxRunning = max(l.MaxRunning, 1)
	l.MaxWaiting = max(l.MaxWaiting, 0)
	return l
}

// Service is the /discover handler with its admission queue.
type Service struct {
	lim     Limits
	inside  chan struct{} // one token per admitted request, running or waiting
	running chan struct{} // one token per running discovery
	jobs    context.Context
	cancel  context.CancelFunc // cancels every discovery at the shutdown deadline
	closing atomic.Bool
	wg      sync.WaitGroup // admitted requests

	served, busy, refused, abandoned atomic.Int64
}

// New returns a Service with the limits lim.
func New(lim Limits) *Service {
	lim = lim.withDefaults()
	s := &Service{lim: lim,
		inside:  make(chan struct{}, lim.MaxRunning+lim.MaxWaiting),
		running: make(chan struct{}, lim.MaxRunning),
	}
	s.jobs, s.cancel = context.WithCancel(context.Background())
	return s
}

// Limits returns the service's limits with defaults filled in.
func (s *Service) Limits() Limits { return s.lim }

// Stats counts what the service has done since it started.
type Stats struct {
	Running, Waiting int   // now
	Served           int64 // answered with a result
	Busy             int64 // refused with 503 because the queue was full or the service closing
	Refused          int64 // refused with 413 by the estimate
	Abandoned        int64 // discoveries cancelled because the client went away
}

// Stats returns the current counts.
func (s *Service) Stats() Stats {
	run := len(s.running)
	return Stats{Running: run, Waiting: len(s.inside) - run, Served: s.served.Load(), Busy: s.busy.Load(),
		Refused: s.refused.Load(), Abandoned: s.abandoned.Load()}
}

// Shutdown stops srv accepting connections and refuses new requests, lets
// running discoveries finish until ctx is done, then cancels them and waits
// for their handlers to answer (a cancelled discovery returns promptly). It
// returns ctx's error when discoveries had to be cancelled.
func (s *Service) Shutdown(ctx context.Context, srv *http.Server) error {
	s.closing.Store(true)
	err := srv.Shutdown(ctx)
	if err != nil {
		s.cancel()
		s.wg.Wait()
		// The handlers have answered; give the server a bounded time to
		// send those answers before closing what is left.
		fin, done := context.WithTimeout(context.Background(), answerTime)
		defer done()
		if srv.Shutdown(fin) != nil {
			srv.Close()
		}
	}
	s.Wait()
	return err
}

// Wait returns once no admitted request is left.
func (s *Service) Wait() {
	s.wg.Wait()
	s.cancel()
}

// tooBusy refuses r with 503 and Retry-After. It first reads what is left
// of the body (at most MaxBytes, within the read timeout, into a small
// buffer): a server that closes a connection with unread data resets it,
// and the client, still sending, would never see the refusal.
func (s *Service) tooBusy(w http.ResponseWriter, r *http.Request, why string) {
	io.Copy(io.Discard, http.MaxBytesReader(w, r.Body, s.lim.MaxBytes))
	s.busy.Add(1)
	w.Header().Set("Retry-After", strconv.Itoa(int((s.lim.RetryAfter+time.Second-1)/time.Second)))
	httpError(w, http.StatusServiceUnavailable, why)
}

// ServeHTTP answers POST requests with form fields data (a CSV file) and
// order (a file or a text field).
func (s *Service) ServeHTTP(w http.ResponseWriter, r *http.Request) {
	if r.Method != http.MethodPost {
		httpError(w, http.StatusMethodNotAllowed, "use POST with form fields data (CSV) and order")
		return
	}
	if s.closing.Load() {
		s.tooBusy(w, r, "the service is shutting down; try again later")
		return
	}
	select {
	case s.inside <- struct{}{}:
	default:
		s.tooBusy(w, r, fmt.Sprintf("busy: %d discoveries running and %d waiting; try again later", s.lim.MaxRunning, s.lim.MaxWaiting))
		return
	}
	s.wg.Add(1)
	defer func() {
		<-s.inside
		s.wg.Done()
	}()
	s.serve(w, r)
}

func (s *Service) serve(w http.ResponseWriter, r *http.Request) {
	lim := s.lim
	r.Body = http.MaxBytesReader(w, r.Body, lim.MaxBytes)
	if err := r.ParseMultipartForm(lim.MaxBytes); err != nil {
		var tooBig *http.MaxBytesError
		var ne net.Error
		switch {
		case errors.As(err, &tooBig):
			httpError(w, http.StatusRequestEntityTooLarge, fmt.Sprintf("request larger than %d bytes", lim.MaxBytes))
		case errors.As(err, &ne) && ne.Timeout():
			httpError(w, http.StatusRequestTimeout, "request body not received in time")
		default:
			httpError(w, http.StatusBadRequest, "expected a multipart form: "+oneLine(err.Error()))
		}
		return
	}
	defer r.MultipartForm.RemoveAll()
	dataFile, _, err := r.FormFile("data")
	if err != nil {
		httpError(w, http.StatusBadRequest, "missing form file \"data\"")
		return
	}
	defer dataFile.Close()

	// The estimate comes from a scan of the upload, before it is parsed.
	rows, cols, err := shape(dataFile)
	if err != nil {
		httpError(w, http.StatusBadRequest, "reading the upload: "+oneLine(err.Error()))
		return
	}
	est := Estimate(rows, cols, lim)
	if (lim.MaxMemory > 0 && est.Bytes > lim.MaxMemory) || est.Time > lim.MaxEstimate {
		s.refused.Add(1)
		writeJSON(w, http.StatusRequestEntityTooLarge, map[string]any{
			"error": fmt.Sprintf("%d rows × %d columns would need about %d MiB and %.1f s; this service allows %d MiB and %.1f s per request",
				rows, cols, est.Bytes>>20, est.Time.Seconds(), lim.MaxMemory>>20, lim.MaxEstimate.Seconds()),
			"estimate": est,
		})
		return
	}
	if _, err := dataFile.Seek(0, io.SeekStart); err != nil {
		httpError(w, http.StatusInternalServerError, "rewinding the upload")
		return
	}
	d, err := table.ReadCSV(dataFile, &table.CSVOptions{MaxRows: lim.MaxRows})
	if err != nil {
		httpError(w, http.StatusUnprocessableEntity, oneLine(err.Error()))
		return
	}
	var orderText string
	if f, _, err := r.FormFile("order"); err == nil {
		b, err := io.ReadAll(f)
		f.Close()
		if err != nil {
			httpError(w, http.StatusBadRequest, oneLine(err.Error()))
			return
		}
		orderText = string(b)
	} else {
		orderText = r.FormValue("order")
	}
	o, err := order.Parse(strings.NewReader(orderText))
	if err != nil {
		httpError(w, http.StatusUnprocessableEntity, oneLine(err.Error()))
		return
	}

	// Wait for a turn; give up if the client leaves or the service stops.
	select {
	case s.running <- struct{}{}:
		defer func() { <-s.running }()
	case <-r.Context().Done():
		s.abandoned.Add(1)
		return
	case <-s.jobs.Done():
		s.tooBusy(w, r, "the service is shutting down; try again later")
		return
	}
	ctx, cancel := context.WithTimeout(r.Context(), lim.MaxTime)
	defer cancel()
	stopOnShutdown := context.AfterFunc(s.jobs, cancel)
	defer stopOnShutdown()
	res, err := antecedent.DiscoverContext(ctx, d, o, Config(lim))
	switch {
	case err == nil:
	case errors.Is(err, context.DeadlineExceeded):
		httpError(w, http.StatusServiceUnavailable, fmt.Sprintf("discovery took longer than %v", lim.MaxTime))
		return
	case r.Context().Err() != nil:
		s.abandoned.Add(1)
		return // the client went away
	case s.jobs.Err() != nil:
		s.tooBusy(w, r, "the service shut down before the discovery finished; try again later")
		return
	default:
		httpError(w, http.StatusUnprocessableEntity, oneLine(err.Error()))
		return
	}
	s.served.Add(1)
	writeDeadline(w)
	w.Header().Set("Content-Type", "application/json")
	if err := res.WriteJSON(w); err != nil {
		log.Printf("writing response: %v", err)
	}
}

// Config is the discovery settings the service uses under lim; a direct
// call with it gives the service's result.
func Config(lim Limits) *antecedent.Config {
	lim = lim.withDefaults()
	return &antecedent.Config{Workers: lim.Workers, Folds: lim.Folds}
}

func oneLine(s string) string { return strings.Join(strings.Fields(s), " ") }
