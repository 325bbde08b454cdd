// Command service shows antecedent embedded in an analytics service: an
// HTTP handler takes a CSV upload and an order, runs Discover under the
// request's context with limits on size and time, and returns the result
// as JSON.
//
//	go run ./examples/service -addr 127.0.0.1:8080
//	curl -F data=@study.csv -F order=@study.order http://127.0.0.1:8080/discover
package main

import (
	"context"
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"io"
	"log"
	"net/http"
	"strings"
	"time"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/order"
	"github.com/antecedent-lab/antecedent/table"
)

// Limits bound what one request may ask of the service.
type Limits struct {
	MaxBytes int64         // request body
	MaxTime  time.Duration // wall time of one discovery
	MaxRows  int
	Workers  int
}

// Handler returns the /discover handler.
func Handler(lim Limits) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		if r.Method != http.MethodPost {
			httpError(w, http.StatusMethodNotAllowed, "use POST with form fields data (CSV) and order")
			return
		}
		r.Body = http.MaxBytesReader(w, r.Body, lim.MaxBytes)
		if err := r.ParseMultipartForm(lim.MaxBytes); err != nil {
			var tooBig *http.MaxBytesError
			if errors.As(err, &tooBig) {
				httpError(w, http.StatusRequestEntityTooLarge, fmt.Sprintf("request larger than %d bytes", lim.MaxBytes))
				return
			}
			httpError(w, http.StatusBadRequest, "expected a multipart form: "+err.Error())
			return
		}
		dataFile, _, err := r.FormFile("data")
		if err != nil {
			httpError(w, http.StatusBadRequest, "missing form file \"data\"")
			return
		}
		defer dataFile.Close()
		d, err := table.ReadCSV(dataFile, &table.CSVOptions{MaxRows: lim.MaxRows})
		if err != nil {
			httpError(w, http.StatusUnprocessableEntity, err.Error())
			return
		}
		var orderText string
		if f, _, err := r.FormFile("order"); err == nil {
			b, err := io.ReadAll(f)
			f.Close()
			if err != nil {
				httpError(w, http.StatusBadRequest, err.Error())
				return
			}
			orderText = string(b)
		} else {
			orderText = r.FormValue("order")
		}
		o, err := order.Parse(strings.NewReader(orderText))
		if err != nil {
			httpError(w, http.StatusUnprocessableEntity, err.Error())
			return
		}
		ctx, cancel := context.WithTimeout(r.Context(), lim.MaxTime)
		defer cancel()
		res, err := antecedent.DiscoverContext(ctx, d, o, &antecedent.Config{Workers: lim.Workers})
		switch {
		case errors.Is(err, context.DeadlineExceeded):
			httpError(w, http.StatusServiceUnavailable, fmt.Sprintf("discovery took longer than %v", lim.MaxTime))
			return
		case errors.Is(err, context.Canceled):
			return // the client went away
		case err != nil:
			httpError(w, http.StatusUnprocessableEntity, err.Error())
			return
		}
		w.Header().Set("Content-Type", "application/json")
		if err := res.WriteJSON(w); err != nil {
			log.Printf("writing response: %v", err)
		}
	})
}

func httpError(w http.ResponseWriter, code int, msg string) {
	w.Header().Set("Content-Type", "application/json")
	w.WriteHeader(code)
	json.NewEncoder(w).Encode(map[string]string{"error": msg})
}

func main() {
	addr := flag.String("addr", "127.0.0.1:8080", "listen address")
	flag.Parse()
	mux := http.NewServeMux()
	mux.Handle("/discover", Handler(Limits{MaxBytes: 32 << 20, MaxTime: 2 * time.Minute, MaxRows: 200_000, Workers: 2}))
	srv := &http.Server{Addr: *addr, Handler: mux, ReadHeaderTimeout: 10 * time.Second}
	log.Printf("listening on %s", *addr)
	log.Fatal(srv.ListenAndServe())
}
