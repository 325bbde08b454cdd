package antecedent_test

import (
	"bytes"
	"context"
	"encoding/json"
	"testing"

	"github.com/antecedent-lab/antecedent"
)

// TestWriteJSONSameBytes checks that the streamed WriteJSON writes exactly
// what encoding/json's MarshalIndent writes for the whole result.
func TestWriteJSONSameBytes(t *testing.T) {
	d, o, _ := smallProblem(t, 5)
	res, err := antecedent.DiscoverContext(context.Background(), d, o, &antecedent.Config{Seed: 2, Stability: antecedent.Stability{Pairs: 2}})
	if err != nil {
		t.Fatal(err)
	}
	for _, r := range []*antecedent.Result{res, {}, {Nodes: []antecedent.Node{}}} {
		var got bytes.Buffer
		if err := r.WriteJSON(&got); err != nil {
			t.Fatal(err)
		}
		want, err := json.MarshalIndent(r, "", "  ")
		if err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(got.Bytes(), append(want, '\n')) {
			t.Fatalf("WriteJSON differs from MarshalIndent (%d and %d bytes)", got.Len(), len(want)+1)
		}
	}
}

// BenchmarkWriteJSON writes the result of a small discovery.
func BenchmarkWriteJSON(b *testing.B) {
	d, o, _ := smallProblem(b, 5)
	res, err := antecedent.DiscoverContext(context.Background(), d, o, nil)
	if err != nil {
		b.Fatal(err)
	}
	var buf bytes.Buffer
	b.ReportAllocs()
	for range b.N {
		buf.Reset()
		if err := res.WriteJSON(&buf); err != nil {
			b.Fatal(err)
		}
	}
	b.SetBytes(int64(buf.Len()))
}
