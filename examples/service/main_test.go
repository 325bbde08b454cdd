package main

import (
	"bytes"
	"encoding/json"
	"mime/multipart"
	"net/http"
	"net/http/httptest"
	"strings"
	"testing"
	"time"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/demo"
)

func upload(t *testing.T, data, ord []byte) (*bytes.Buffer, string) {
	t.Helper()
	return uploadBody(data, ord)
}

// uploadBody returns a multipart form with the files data (when not nil)
// and order, and its content type.
func uploadBody(data, ord []byte) (*bytes.Buffer, string) {
	var body bytes.Buffer
	mw := multipart.NewWriter(&body)
	if data != nil {
		fw, _ := mw.CreateFormFile("data", "data.csv")
		fw.Write(data)
	}
	fw, _ := mw.CreateFormFile("order", "study.order")
	fw.Write(ord)
	mw.Close()
	return &body, mw.FormDataContentType()
}

func demoFiles(t *testing.T) ([]byte, []byte) {
	data, err := demo.File("joint_replacement.csv")
	if err != nil {
		t.Fatal(err)
	}
	ord, err := demo.File("joint_replacement.order")
	if err != nil {
		t.Fatal(err)
	}
	// The first 800 rows keep the test quick.
	return rowsOf(data, 800), ord
}

// demoFull returns the whole demo data.
func demoFull() ([]byte, error) { return demo.File("joint_replacement.csv") }

func TestDiscoverEndpoint(t *testing.T) {
	data, ord := demoFiles(t)
	srv := httptest.NewServer(New(Limits{MaxBytes: 8 << 20, MaxTime: time.Minute, Workers: 2}))
	defer srv.Close()
	body, ctype := upload(t, data, ord)
	resp, err := http.Post(srv.URL, ctype, body)
	if err != nil {
		t.Fatal(err)
	}
	defer resp.Body.Close()
	if resp.StatusCode != http.StatusOK {
		t.Fatalf("status %d", resp.StatusCode)
	}
	res, err := antecedent.ReadResult(resp.Body)
	if err != nil {
		t.Fatal(err)
	}
	if len(res.Nodes) != 18 || len(res.Edges) == 0 {
		t.Errorf("%d nodes, %d edges", len(res.Nodes), len(res.Edges))
	}
}

func TestLimits(t *testing.T) {
	data, ord := demoFiles(t)
	cases := []struct {
		name string
		lim  Limits
		data []byte
		ord  []byte
		code int
		msg  string
	}{
		{"too large", Limits{MaxBytes: 1000, MaxTime: time.Minute}, data, ord, http.StatusRequestEntityTooLarge, "larger than"},
		{"too slow", Limits{MaxBytes: 8 << 20, MaxTime: time.Millisecond, MaxEstimate: time.Hour}, data, ord, http.StatusServiceUnavailable, "longer than"},
		{"estimated too slow", Limits{MaxBytes: 8 << 20, MaxTime: 10 * time.Millisecond}, data, ord, http.StatusRequestEntityTooLarge, "800 rows × 18 columns would need"},
		{"estimated too large", Limits{MaxBytes: 8 << 20, MaxTime: time.Minute, MaxMemory: 1 << 20}, data, ord, http.StatusRequestEntityTooLarge, "this service allows 1 MiB"},
		{"bad order", Limits{MaxBytes: 8 << 20, MaxTime: time.Minute}, data, []byte("tier: nobody\n"), http.StatusUnprocessableEntity, "unknown names"},
		{"bad csv", Limits{MaxBytes: 8 << 20, MaxTime: time.Minute}, []byte("a,b\n1\n"), ord, http.StatusUnprocessableEntity, "line 2"},
		{"no data", Limits{MaxBytes: 8 << 20, MaxTime: time.Minute}, nil, ord, http.StatusBadRequest, "data"},
	}
	for _, c := range cases {
		body, ctype := upload(t, c.data, c.ord)
		req := httptest.NewRequest(http.MethodPost, "/discover", body)
		req.Header.Set("Content-Type", ctype)
		rec := httptest.NewRecorder()
		New(c.lim).ServeHTTP(rec, req)
		var msg map[string]string
		json.Unmarshal(rec.Body.Bytes(), &msg)
		if rec.Code != c.code || !strings.Contains(msg["error"], c.msg) {
			t.Errorf("%s: %d %q, want %d mentioning %q", c.name, rec.Code, msg["error"], c.code, c.msg)
		}
	}
}
