// Command service shows antecedent embedded in an analytics service: an
// HTTP handler takes a CSV upload and an order, runs Discover under the
// request's context and returns the result as JSON. It holds under load:
//
//   - at most MaxRunning discoveries run and MaxWaiting more wait; beyond
//     that a request is refused at once with 503 and a Retry-After header;
//   - before any work, the cost of a request is estimated from its rows ×
//     columns (Estimate), and one that would not fit the memory or time
//     allowed is refused with 413 and the estimate;
//   - a client that goes away cancels its discovery (the request's context);
//   - slow clients are cut off by read-header and read timeouts;
//   - Shutdown lets running discoveries finish until its deadline, then
//     cancels them and waits for their handlers to answer.
//
// Usage:
//
//	go run ./examples/service -addr 127.0.0.1:8080
//	curl -F data=@study.csv -F order=@study.order http://127.0.0.1:8080/discover
//
// Results are hypotheses from observational data, not findings; see the
// README's cautions.
package main

import (
	"context"
	"encoding/json"
	"flag"
	"log"
	"net"
	"net/http"
	"os"
	"os/signal"
	"syscall"
	"time"
)

// answerTime bounds the writing of one answer, against a client that
// stops reading.
const answerTime = 30 * time.Second

// writeDeadline gives the answer answerTime from now to be written.
func writeDeadline(w http.ResponseWriter) {
	http.NewResponseController(w).SetWriteDeadline(time.Now().Add(answerTime))
}

func main() {
	addr := flag.String("addr", "127.0.0.1:8080", "listen address")
	grace := flag.Duration("grace", 30*time.Second, "on SIGINT or SIGTERM, time running discoveries get to finish")
	flag.Parse()
	svc := New(Limits{MaxBytes: 32 << 20, MaxTime: 2 * time.Minute, MaxRows: 200_000, Workers: 2,
		MaxRunning: 2, MaxWaiting: 8, MaxMemory: 2 << 30})
	mux := http.NewServeMux()
	mux.Handle("/discover", svc)
	srv := NewServer(mux, svc.Limits())
	ln, err := net.Listen("tcp", *addr)
	if err != nil {
		log.Fatal(err)
	}
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	defer stop()
	go func() {
		<-ctx.Done()
		stop()
		sctx, cancel := context.WithTimeout(context.Background(), *grace)
		defer cancel()
		if err := svc.Shutdown(sctx, srv); err != nil {
			log.Printf("shutdown: %v (running discoveries were cancelled)", err)
		}
	}()
	log.Printf("listening on %s", ln.Addr())
	if err := srv.Serve(ln); err != http.ErrServerClosed {
		log.Fatal(err)
	}
	svc.Wait()
}

// NewServer returns an http.Server for h with the timeouts of lim: slow
// clients cannot hold a connection by trickling headers or a body, and a
// keep-alive connection idle for a minute is closed. There is no server-wide write
// timeout, since a request may wait its turn and then run for MaxTime; the
// Service sets a write deadline on each answer instead.
func NewServer(h http.Handler, lim Limits) *http.Server {
	lim = lim.withDefaults()
	return &http.Server{
		Handler:           h,
		ReadHeaderTimeout: lim.ReadHeaderTimeout,
		ReadTimeout:       lim.ReadTimeout,
		IdleTimeout:       time.Minute,
		MaxHeaderBytes:    64 << 10,
	}
}

func httpError(w http.ResponseWriter, code int, msg string) {
	writeJSON(w, code, map[string]string{"error": msg})
}

func writeJSON(w http.ResponseWriter, code int, v any) {
	writeDeadline(w)
	w.Header().Set("Content-Type", "application/json")
	w.WriteHeader(code)
	json.NewEncoder(w).Encode(v)
}
