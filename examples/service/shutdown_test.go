package main

import (
	"context"
	"encoding/json"
	"errors"
	"io"
	"net/http"
	"strings"
	"testing"
	"time"
)

// waitFor polls cond, within a limit, and reports whether it came true.
func waitFor(cond func() bool) bool {
	for range 1500 {
		if cond() {
			return true
		}
		time.Sleep(20 * time.Millisecond)
	}
	return cond()
}

type answer struct {
	code  int
	retry string
	body  []byte
	err   error
}

// send posts the demo data in the background.
func send(ctx context.Context, url string, data, ord []byte) <-chan answer {
	out := make(chan answer, 1)
	go func() {
		body, ctype := uploadBody(data, ord)
		req, _ := http.NewRequestWithContext(ctx, http.MethodPost, url, body)
		req.Header.Set("Content-Type", ctype)
		resp, err := http.DefaultClient.Do(req)
		if err != nil {
			out <- answer{err: err}
			return
		}
		defer resp.Body.Close()
		b, err := io.ReadAll(resp.Body)
		out <- answer{resp.StatusCode, resp.Header.Get("Retry-After"), b, err}
	}()
	return out
}

// longLimits let one long discovery (the whole demo study, ten folds, one
// worker: seconds) run at a time, with no queue.
var longLimits = Limits{MaxBytes: 8 << 20, MaxTime: time.Minute, MaxEstimate: time.Hour, Workers: 1,
	MaxRunning: 1, RetryAfter: 3 * time.Second}

// TestQueueFullAndClientGone fills the service, checks the next request is
// refused at once with 503 and Retry-After, then lets the first client go
// away and checks its discovery is cancelled.
func TestQueueFullAndClientGone(t *testing.T) {
	full, err := demoFull()
	if err != nil {
		t.Fatal(err)
	}
	_, ord := demoFiles(t)
	svc := New(longLimits)
	srv, url, _ := startServer(t, svc)
	defer srv.Close()

	ctx, leave := context.WithCancel(context.Background())
	first := send(ctx, url, full, ord)
	if !waitFor(func() bool { return svc.Stats().Running == 1 }) {
		t.Fatal("the first discovery never started")
	}
	a := <-send(context.Background(), url, full, ord)
	var msg map[string]string
	json.Unmarshal(a.body, &msg)
	if a.code != http.StatusServiceUnavailable || a.retry != "3" || !strings.Contains(msg["error"], "busy") {
		t.Errorf("second request: %d, Retry-After %q, %q", a.code, a.retry, a.body)
	}
	leave()
	if a := <-first; !errors.Is(a.err, context.Canceled) {
		t.Errorf("first request: %+v", a)
	}
	if !waitFor(func() bool { st := svc.Stats(); return st.Abandoned == 1 && st.Running == 0 }) {
		t.Errorf("the abandoned discovery was not cancelled: %+v", svc.Stats())
	}
}

// TestShutdown checks both ends of a graceful shutdown: with time enough a
// running discovery finishes and is answered; past the deadline it is
// cancelled and answered 503, and Shutdown returns.
func TestShutdown(t *testing.T) {
	full, err := demoFull()
	if err != nil {
		t.Fatal(err)
	}
	data, ord := demoFiles(t)
	cases := []struct {
		name  string
		data  []byte
		grace time.Duration
		code  int
		err   error
	}{
		{"finishes", rowsOf(data, 200), time.Minute, http.StatusOK, nil},
		{"cancels", full, 50 * time.Millisecond, http.StatusServiceUnavailable, context.DeadlineExceeded},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			svc := New(longLimits)
			srv, url, _ := startServer(t, svc)
			got := send(context.Background(), url, c.data, ord)
			if !waitFor(func() bool { return svc.Stats().Running == 1 }) {
				t.Fatal("the discovery never started")
			}
			ctx, cancel := context.WithTimeout(context.Background(), c.grace)
			defer cancel()
			if err := svc.Shutdown(ctx, srv); !errors.Is(err, c.err) {
				t.Errorf("Shutdown: %v, want %v", err, c.err)
			}
			a := <-got
			if a.err != nil || a.code != c.code {
				t.Fatalf("answer %d %v %.200s, want %d", a.code, a.err, a.body, c.code)
			}
			if c.code == http.StatusOK {
				if withoutTimings(t, a.body) != direct(t, c.data, ord, longLimits) {
					t.Error("result differs from a direct call")
				}
			} else if a.retry == "" || !strings.Contains(string(a.body), "shut down") {
				t.Errorf("refusal without Retry-After or reason: %q", a.body)
			}
			if _, err := http.Post(url, "text/plain", nil); err == nil {
				t.Error("the server still accepts connections")
			}
		})
	}
}
