package antecedent_test

import (
	"bytes"
	"context"
	"encoding/json"
	"strings"
	"testing"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/cv"
	"github.com/antecedent-lab/antecedent/lasso"
	"github.com/antecedent-lab/antecedent/order"
	"github.com/antecedent-lab/antecedent/table"
)

// FuzzReadResult checks that result decoding never panics and that an
// accepted result survives a second round trip unchanged.
func FuzzReadResult(f *testing.F) {
	d, o, _ := smallProblemFuzz()
	res, err := antecedent.DiscoverContext(context.Background(), d, o, &antecedent.Config{Folds: 3, CV: cv.Settings{Path: lasso.Settings{NumPenalties: 8}}})
	if err == nil {
		b, _ := json.Marshal(res)
		f.Add(b)
	}
	f.Add([]byte(`{"nodes":[{"name":"a"},{"name":"b"}],"edges":[{"from":"a","to":"b","coefficient":null}]}`))
	f.Add([]byte(`{"nodes":[{"name":"a"},{"name":"b"}],"edges":[{"from":"a","to":"b"},{"from":"b","to":"a"}]}`))
	f.Fuzz(func(t *testing.T, in []byte) {
		r, err := antecedent.ReadResult(bytes.NewReader(in))
		if err != nil {
			return
		}
		b, err := json.Marshal(r)
		if err != nil {
			t.Fatalf("re-marshal: %v", err)
		}
		r2, err := antecedent.ReadResult(bytes.NewReader(b))
		if err != nil {
			t.Fatalf("second read: %v", err)
		}
		b2, _ := json.Marshal(r2)
		if !bytes.Equal(b, b2) {
			t.Fatal("second round trip changed the result")
		}
	})
}

func smallProblemFuzz() (*table.Dataset, *order.Order, error) {
	names := []string{"a", "b", "c"}
	cols := [][]float64{{1, 2, 3, 4, 5, 6, 7, 8, 9}, {0, 1, 0, 1, 1, 0, 1, 0, 1}, {2, 3, 5, 4, 7, 8, 8, 10, 12}}
	d, err := table.NewDataset(names, cols)
	return d, &order.Order{Tiers: [][]string{{"a"}, {"b"}, {"c"}}}, err
}

// FuzzDiscover runs Discover on small matrices built from the input: it
// must not panic, must return an acyclic graph with no edge backwards in
// time, and must give the same output twice.
func FuzzDiscover(f *testing.F) {
	f.Add([]byte{3, 12, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 13, 14, 15, 16, 17, 18, 19, 20, 200, 100, 50, 25})
	f.Add(bytes.Repeat([]byte{0, 1}, 40))
	f.Add(bytes.Repeat([]byte{255, 0, 7}, 50))
	f.Fuzz(func(t *testing.T, in []byte) {
		if len(in) < 4 {
			return
		}
		p := 2 + int(in[0])%4
		n := 8 + int(in[1])%25
		body := in[2:]
		names := make([]string, p)
		cols := make([][]float64, p)
		for j := range p {
			names[j] = string(rune('a' + j))
			cols[j] = make([]float64, n)
			binary := len(body) > 0 && body[j%len(body)]%3 == 0
			for i := range n {
				var b byte
				if len(body) > 0 {
					b = body[(j*n+i)%len(body)]
				}
				if binary {
					cols[j][i] = float64(b % 2)
				} else {
					cols[j][i] = float64(int(b)-128) / 16
				}
			}
		}
		d, err := table.NewDataset(names, cols)
		if err != nil {
			return
		}
		o := &order.Order{}
		for j := range p {
			if j == 0 || (len(body) > 0 && body[j%len(body)]%2 == 0) {
				o.Tiers = append(o.Tiers, nil)
			}
			o.Tiers[len(o.Tiers)-1] = append(o.Tiers[len(o.Tiers)-1], names[j])
		}
		cfg := &antecedent.Config{Folds: 3, CV: cv.Settings{Path: lasso.Settings{NumPenalties: 10}}}
		res, err := antecedent.DiscoverContext(context.Background(), d, o, cfg)
		if err != nil {
			if !strings.HasPrefix(err.Error(), "antecedent: ") && !strings.HasPrefix(err.Error(), "order: ") {
				t.Fatalf("error without a package prefix: %v", err)
			}
			return
		}
		if _, err := res.Graph(); err != nil {
			t.Fatalf("graph: %v", err)
		}
		plan, _ := o.Compile(names)
		for _, e := range res.Edges {
			if plan.Tier[plan.Index(e.From)] >= plan.Tier[plan.Index(e.To)] {
				t.Fatalf("edge %s -> %s goes backwards in time", e.From, e.To)
			}
		}
		res2, err := antecedent.DiscoverContext(context.Background(), d, o, cfg)
		if err != nil {
			t.Fatalf("second run failed: %v", err)
		}
		res.Timings, res2.Timings = antecedent.Timings{}, antecedent.Timings{}
		b1, _ := json.Marshal(res)
		b2, _ := json.Marshal(res2)
		if !bytes.Equal(b1, b2) {
			t.Fatal("two runs gave different results")
		}
	})
}
