package main

import (
	"bufio"
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"log"
	"net"
	"net/http"
	"runtime"
	"strings"
	"sync"
	"sync/atomic"
	"testing"
	"time"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/order"
	"github.com/antecedent-lab/antecedent/table"
)

// lockedBuffer collects the server's error log from many goroutines.
type lockedBuffer struct {
	mu sync.Mutex
	b  bytes.Buffer
}

func (l *lockedBuffer) Write(p []byte) (int, error) {
	l.mu.Lock()
	defer l.mu.Unlock()
	return l.b.Write(p)
}

func (l *lockedBuffer) String() string {
	l.mu.Lock()
	defer l.mu.Unlock()
	return l.b.String()
}

// startServer serves svc on a loopback port and returns its base URL.
func startServer(t *testing.T, svc *Service) (*http.Server, string, *lockedBuffer) {
	t.Helper()
	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	mux := http.NewServeMux()
	mux.Handle("/discover", svc)
	srv := NewServer(mux, svc.Limits())
	errs := &lockedBuffer{}
	srv.ErrorLog = log.New(errs, "", 0)
	go srv.Serve(ln)
	return srv, "http://" + ln.Addr().String() + "/discover", errs
}

// withoutTimings returns the result JSON with its timings removed, the
// only part that differs between two runs of the same discovery.
func withoutTimings(t *testing.T, b []byte) string {
	t.Helper()
	var m map[string]any
	if err := json.Unmarshal(b, &m); err != nil {
		t.Fatalf("result is not JSON: %v: %.200s", err, b)
	}
	delete(m, "timings")
	out, err := json.Marshal(m)
	if err != nil {
		t.Fatal(err)
	}
	return string(out)
}

// direct runs the discovery the service would run, without the service.
func direct(t *testing.T, data, ord []byte, lim Limits) string {
	t.Helper()
	d, err := table.ReadCSV(bytes.NewReader(data), nil)
	if err != nil {
		t.Fatal(err)
	}
	o, err := order.Parse(bytes.NewReader(ord))
	if err != nil {
		t.Fatal(err)
	}
	res, err := antecedent.DiscoverContext(context.Background(), d, o, Config(lim))
	if err != nil {
		t.Fatal(err)
	}
	var b bytes.Buffer
	if err := res.WriteJSON(&b); err != nil {
		t.Fatal(err)
	}
	return withoutTimings(t, b.Bytes())
}

// settle waits, within a limit, until at most want goroutines run, and
// returns the last count.
func settle(want int) int {
	n := runtime.NumGoroutine()
	for i := 0; i < 500 && n > want; i++ {
		time.Sleep(20 * time.Millisecond)
		n = runtime.NumGoroutine()
	}
	return n
}

// peakHeap samples HeapInuse until stop is closed and returns the peak.
func peakHeap(stop <-chan struct{}) <-chan uint64 {
	out := make(chan uint64, 1)
	go func() {
		var peak uint64
		var m runtime.MemStats
		tick := time.NewTicker(5 * time.Millisecond)
		defer tick.Stop()
		for {
			runtime.ReadMemStats(&m)
			peak = max(peak, m.HeapInuse)
			select {
			case <-stop:
				out <- peak
				return
			case <-tick.C:
			}
		}
	}()
	return out
}

// rowsOf returns the header and the first n data rows of the demo data.
func rowsOf(data []byte, n int) []byte {
	lines := strings.SplitAfterN(string(data), "\n", n+2)
	return []byte(strings.Join(lines[:n+1], ""))
}

// loadLimits are the service's limits in the load test: two discoveries
// at once, ten waiting, and a memory bound that 1,200 rows of the demo's
// 18 columns fit and 2,500 rows do not.
var loadLimits = Limits{
	MaxBytes: 256 << 10, MaxTime: 30 * time.Second, MaxEstimate: time.Hour, Workers: 1, Folds: 3,
	MaxRunning: 2, MaxWaiting: 10, RetryAfter: time.Second,
	MaxMemory: Estimate(1200, 18, Limits{Workers: 1, Folds: 3}).Bytes,
	// Read timeouts leave room for valid uploads on a busy machine and stay
	// well under the slow clients' own 20-second limit.
	ReadHeaderTimeout: 2 * time.Second, ReadTimeout: 10 * time.Second,
}

// The load test sends loadRequests requests, fewer under the race
// detector (which slows discoveries several times) so the test stays well
// under a minute,
// and loadConcurrency at once.
var (
	loadRequests    = map[bool]int{false: 120, true: 12}[raceDetector]
	loadConcurrency = map[bool]int{false: 16, true: 4}[raceDetector]
)

// Figures of the load test, reported in the README's Guarantees table.
const (
	// loadRetries bounds the tries of a valid, invalid or oversized request
	// the service answers busy, 100 ms apart.
	loadRetries = 20
	// loadHeapBound bounds the test process's HeapInuse peak. The service
	// holds at most 12 admitted requests (2 running, 10 waiting), each with a
	// body under 256 KiB kept twice (the form and the parsed table) and a
	// running discovery well under its 1,200-row estimate (about 2 MiB);
	// the clients' bodies, the expected results and the Go runtime add a
	// few MiB. 64 MiB leaves room while still catching an unbounded queue
	// or a leak of bodies (120 requests × up to 300 KiB).
	loadHeapBound = 64 << 20
)

// TestLoad sends a mix of valid, invalid, oversized, slow and abandoned
// requests at once to a service on a loopback port and checks that it never
// panics or leaks goroutines, keeps memory bounded, and answers every valid
// request with the result of a direct call or a clear refusal.
func TestLoad(t *testing.T) {
	data, ord := demoFiles(t)
	full, err := demoFull()
	if err != nil {
		t.Fatal(err)
	}
	valid := [][]byte{rowsOf(data, 100), rowsOf(data, 150), rowsOf(data, 200)}
	want := make([]string, len(valid))
	for i, d := range valid {
		want[i] = direct(t, d, ord, loadLimits)
	}
	huge := rowsOf(full, 2500) // under MaxBytes, over the memory estimate
	if len(huge) > int(loadLimits.MaxBytes) {
		t.Fatalf("the estimate case is %d bytes, over MaxBytes", len(huge))
	}
	oversized := bytes.Repeat([]byte("1,2,3\n"), int(loadLimits.MaxBytes)/6+1000)

	runtime.GC()
	before := runtime.NumGoroutine()
	stopHeap := make(chan struct{})
	heap := peakHeap(stopHeap)

	svc := New(loadLimits)
	srv, url, serverLog := startServer(t, svc)
	// Each request gets its own connection, as the slow and abandoned
	// ones do: a client that sends on a kept-alive connection the server is
	// closing sees EOF and must retry (common practice), which would blur
	// what this test measures.
	client := &http.Client{Timeout: 45 * time.Second, // a limit, not an assertion
		Transport: &http.Transport{DisableKeepAlives: true}}
	host := strings.TrimPrefix(strings.TrimSuffix(url, "/discover"), "http://")

	type outcome struct {
		kind string
		code int
		err  error
	}
	var (
		mu       sync.Mutex
		outcomes = map[string]map[string]int{}
		failures []string
		correct  atomic.Int64
	)
	record := func(kind, what string) {
		mu.Lock()
		defer mu.Unlock()
		if outcomes[kind] == nil {
			outcomes[kind] = map[string]int{}
		}
		outcomes[kind][what]++
	}
	fail := func(format string, args ...any) {
		mu.Lock()
		defer mu.Unlock()
		failures = append(failures, fmt.Sprintf(format, args...))
	}
	// post sends one request; retrying post tries again, a bounded number of
	// times, while the service answers busy, as a patient client does.
	post := func(ctx context.Context, d, o []byte) (*http.Response, []byte, error) {
		body, ctype := uploadBody(d, o)
		req, _ := http.NewRequestWithContext(ctx, http.MethodPost, url, body)
		req.Header.Set("Content-Type", ctype)
		resp, err := client.Do(req)
		if err != nil {
			return nil, nil, err
		}
		defer resp.Body.Close()
		b, err := io.ReadAll(resp.Body)
		return resp, b, err
	}
	retrying := func(d, o []byte) (*http.Response, []byte, error) {
		for try := 1; ; try++ {
			resp, b, err := post(context.Background(), d, o)
			if err != nil || resp.StatusCode != http.StatusServiceUnavailable || try == loadRetries {
				return resp, b, err
			}
			time.Sleep(100 * time.Millisecond)
		}
	}
	// refusal checks a clear refusal: a status, a JSON message, and for
	// 503 a Retry-After. A 408 (the body did not arrive within the read
	// timeout, as on a loaded machine) is a clear refusal of any request.
	refusal := func(kind string, resp *http.Response, b []byte, codes ...int) {
		var msg map[string]any
		json.Unmarshal(b, &msg)
		text, _ := msg["error"].(string)
		if resp.StatusCode == http.StatusServiceUnavailable {
			if resp.Header.Get("Retry-After") == "" || !strings.Contains(text, "try again") {
				fail("%s: 503 without Retry-After or message: %q", kind, b)
			}
			record(kind, "503 busy")
			return
		}
		for _, c := range append(codes, http.StatusRequestTimeout) {
			if resp.StatusCode == c && text != "" {
				record(kind, fmt.Sprint(c))
				return
			}
		}
		fail("%s: status %d %q, want one of %v with a message", kind, resp.StatusCode, b, codes)
	}

	kinds := []func(i int){
		// Valid: answered with the direct call's result, or refused as busy.
		func(i int) {
			k := i % len(valid)
			resp, b, err := retrying(valid[k], ord)
			switch {
			case err != nil:
				fail("valid: %v", err)
			case resp.StatusCode == http.StatusOK:
				if got := withoutTimings(t, b); got != want[k] {
					fail("valid %d: result differs from a direct call", k)
				} else {
					correct.Add(1)
					record("valid", "200 identical")
				}
			default:
				refusal("valid", resp, b)
			}
		},
		// Invalid: a bad CSV, an unknown name in the order, no data.
		func(i int) {
			var d, o []byte
			switch i % 3 {
			case 0:
				d, o = []byte("a,b\n1\n"), ord
			case 1:
				d, o = valid[0], []byte("tier: nobody\n")
			case 2:
				d, o = nil, ord
			}
			resp, b, err := retrying(d, o)
			if err != nil {
				fail("invalid: %v", err)
				return
			}
			refusal("invalid", resp, b, http.StatusUnprocessableEntity, http.StatusBadRequest)
		},
		// Oversized: a body over MaxBytes, or rows × columns over the
		// memory estimate.
		func(i int) {
			d := huge
			if i%2 == 0 {
				d = oversized
			}
			resp, b, err := retrying(d, ord)
			if err != nil {
				// The server may close the connection while a body over the
				// limit is still being sent; that refuses it too.
				if !errors.Is(err, context.DeadlineExceeded) {
					record("oversized", "connection closed")
					return
				}
				fail("oversized: %v", err)
				return
			}
			refusal("oversized", resp, b, http.StatusRequestEntityTooLarge)
			if i%2 == 1 && resp.StatusCode == http.StatusRequestEntityTooLarge && !bytes.Contains(b, []byte(`"estimate"`)) {
				fail("oversized by estimate: no estimate in %q", b)
			}
		},
		// Slow: headers, then half the body, then nothing; the read timeout
		// must close the connection.
		func(i int) {
			c, err := net.Dial("tcp", host)
			if err != nil {
				fail("slow: %v", err)
				return
			}
			defer c.Close()
			c.SetDeadline(time.Now().Add(20 * time.Second)) // a limit on the test
			body, ctype := uploadBody(valid[0], ord)
			if i%2 == 0 {
				fmt.Fprintf(c, "POST /discover HTTP/1.1\r\nHost: x\r\nContent-Type: %s\r\nContent-Length: %d\r\n\r\n", ctype, body.Len())
				c.Write(body.Bytes()[:body.Len()/2])
			} else {
				io.WriteString(c, "POST /discover HTTP/1.1\r\nHost: x\r\n") // headers never end
			}
			resp, err := http.ReadResponse(bufio.NewReader(c), nil)
			if err == nil {
				io.Copy(io.Discard, resp.Body)
				resp.Body.Close()
				record("slow", fmt.Sprint(resp.StatusCode))
				return
			}
			var ne net.Error
			if errors.As(err, &ne) && ne.Timeout() {
				fail("slow: the server kept the connection open")
				return
			}
			record("slow", "connection closed")
		},
		// Abandoned: the client gives up soon after sending.
		func(i int) {
			ctx, cancel := context.WithTimeout(context.Background(), time.Duration(20+(i%9)*30)*time.Millisecond)
			defer cancel()
			resp, b, err := post(ctx, valid[2], ord)
			if err != nil {
				record("abandoned", "client gave up")
				return
			}
			if resp.StatusCode == http.StatusOK && withoutTimings(t, b) != want[2] {
				fail("abandoned but answered: result differs")
			}
			record("abandoned", fmt.Sprint(resp.StatusCode))
		},
	}

	jobs := make(chan int)
	var wg sync.WaitGroup
	for range loadConcurrency {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range jobs {
				// Valid requests are half the load, the rest split evenly.
				k := 0
				if i%2 == 1 {
					k = 1 + (i/2)%(len(kinds)-1)
				}
				kinds[k](i)
			}
		}()
	}
	for i := range loadRequests {
		jobs <- i
	}
	close(jobs)
	wg.Wait()

	ctx, cancel := context.WithTimeout(context.Background(), 10*time.Second)
	defer cancel()
	if err := svc.Shutdown(ctx, srv); err != nil {
		t.Errorf("shutdown: %v", err)
	}
	client.CloseIdleConnections()
	close(stopHeap)
	peak := <-heap
	after := settle(before)

	for _, f := range failures {
		t.Error(f)
	}
	if strings.Contains(serverLog.String(), "panic") {
		t.Errorf("server log:\n%s", serverLog.String())
	}
	if after > before {
		t.Errorf("%d goroutines before, %d after", before, after)
	}
	if peak > loadHeapBound {
		t.Errorf("peak HeapInuse %d MiB, over the %d MiB bound", peak>>20, loadHeapBound>>20)
	}
	if correct.Load() == 0 {
		t.Error("no valid request was answered")
	}
	// Each kind must have reached its own check, not only the queue.
	for _, kind := range []string{"valid", "invalid", "oversized"} {
		if outcomes[kind]["503 busy"] == sum(outcomes[kind]) {
			t.Errorf("every %s request was refused as busy: %v", kind, outcomes[kind])
		}
	}
	st := svc.Stats()
	if st.Running != 0 || st.Waiting != 0 {
		t.Errorf("after shutdown: %+v", st)
	}
	t.Logf("%d requests, %d at once; outcomes %v; service %+v; %d failures; peak HeapInuse %.1f MiB (bound %d MiB); goroutines %d before, %d after",
		loadRequests, loadConcurrency, outcomes, st, len(failures), float64(peak)/(1<<20), loadHeapBound>>20, before, after)
}

func sum(m map[string]int) int {
	n := 0
	for _, v := range m {
		n += v
	}
	return n
}
