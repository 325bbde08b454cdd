package main

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"
)

func TestMedian(t *testing.T) {
	for _, c := range []struct {
		in   []float64
		want float64
	}{
		{[]float64{3}, 3},
		{[]float64{5, 1, 3}, 3},
		{[]float64{4, 1, 3, 2}, 2.5},
	} {
		if got := median(c.in); got != c.want {
			t.Errorf("median(%v) = %g, want %g", c.in, got, c.want)
		}
	}
	if !math.IsNaN(median(nil)) {
		t.Error("median of nothing is not NaN")
	}
}

// TestMatchSignal checks that the matched continuous networks' true edges
// are as strong as the binary ones by the oracle's median |z|, and that
// weights were scaled down to get there (a binary child carries less
// information per row than a continuous one with unit noise: common
// practice).
func TestMatchSignal(t *testing.T) {
	for _, strength := range []struct {
		name   string
		lo, hi float64
	}{{"weak", 0.15, 0.4}, {"strong", 0.4, 1}} {
		b := setting{kind: "binary", n: 300, p: 12, parents: 2, lo: strength.lo, hi: strength.hi, strength: strength.name}
		c := b
		c.kind, c.match = "continuous", &b
		m, target, _ := matchSignal(c)
		if got := medianOracleZ(m); math.Abs(got/target-1) > 0.01 {
			t.Errorf("%s: matched median |z| %.3f, binary %.3f", strength.name, got, target)
		}
		if !(m.scale > 0 && m.scale < 1) {
			t.Errorf("%s: weights scaled by %g", strength.name, m.scale)
		}
	}
}

// TestRecordsRoundTrip checks that outcomes written by -raw read back the
// same, unknown values included, and that merging counts a repeated
// network once.
func TestRecordsRoundTrip(t *testing.T) {
	in := []record{
		{Setting: "binary n=200", Kind: "binary", Procedure: "one-SE rule", Seed: 1,
			outcome: outcome{precision: 0.5, recall: math.NaN(), f1: 0.25, falseBinary: 2, binaryNodes: 7, seconds: 1.5,
				freqs: []float64{0.6, 1}, truths: []bool{false, true}, oracleZ: []float64{2.5}}},
		{Setting: "binary n=200", Kind: "binary", Procedure: "one-SE rule", Seed: 2, outcome: outcome{precision: 1}},
	}
	path := filepath.Join(t.TempDir(), "raw.jsonl")
	f, err := os.Create(path)
	if err != nil {
		t.Fatal(err)
	}
	enc := json.NewEncoder(f)
	for _, r := range append(in, in[0]) {
		if err := enc.Encode(r); err != nil {
			t.Fatal(err)
		}
	}
	f.Close()
	out, err := readRecords(path)
	if err != nil {
		t.Fatal(err)
	}
	out = dedupe(out)
	if len(out) != 2 {
		t.Fatalf("%d records after dedupe, want 2", len(out))
	}
	a, b := in[0], out[0]
	if a.Setting != b.Setting || a.Seed != b.Seed || a.precision != b.precision || !math.IsNaN(b.recall) ||
		a.falseBinary != b.falseBinary || a.binaryNodes != b.binaryNodes || !reflect.DeepEqual(a.freqs, b.freqs) ||
		!reflect.DeepEqual(a.truths, b.truths) || !reflect.DeepEqual(a.oracleZ, b.oracleZ) {
		t.Errorf("read back %+v, wrote %+v", b, a)
	}
	var sb strings.Builder
	report(&sb, out, nil)
	if !strings.Contains(sb.String(), "| binary n=200 (2) | one-SE rule | 0.750 ± 0.250 |") {
		t.Errorf("table:\n%s", sb.String())
	}
}

// TestMatched checks the binary-against-continuous table: settings paired
// by sizes and signal under the same procedure, the false parents per
// child and F1 as means over networks, and the difference's standard error
// (the two standard errors in quadrature), worked by hand.
func TestMatched(t *testing.T) {
	bin := func(seed, falseParents int, f1 float64) record {
		return record{Setting: "binary n=10 p=5 2 parents weak", Kind: "binary", Procedure: "rule", Seed: seed,
			outcome: outcome{falseBinary: falseParents, binaryNodes: 4, f1: f1, recall: 0.5}}
	}
	cont := func(seed, falseParents int, f1 float64) record {
		return record{Setting: "continuous n=10 p=5 2 parents weak, weights ×0.200 to match binary", Kind: "continuous", Procedure: "rule", Seed: seed,
			outcome: outcome{falseContinuous: falseParents, contNode: 4, f1: f1, recall: 0.5}}
	}
	recs := []record{
		bin(1, 0, 0.5), bin(2, 2, 0.7), cont(1, 0, 0.4), cont(2, 0, 0.4),
		// No partner: another procedure, and a setting of other sizes.
		{Setting: "binary n=10 p=5 2 parents weak", Kind: "binary", Procedure: "other", Seed: 1, outcome: outcome{binaryNodes: 4}},
		{Setting: "continuous n=20 p=5 2 parents weak", Kind: "continuous", Procedure: "rule", Seed: 1, outcome: outcome{contNode: 4}},
		// Not of the same signal: the standard suite's unscaled weights.
		{Setting: "continuous n=10 p=5 2 parents weak", Kind: "continuous", Procedure: "rule", Seed: 1, outcome: outcome{contNode: 4, falseContinuous: 4}},
	}
	pairs := matchedPairs(recs)
	if len(pairs) != 1 || pairs[0].setting != "n=10 p=5 2 parents weak" || pairs[0].procedure != "rule" ||
		len(pairs[0].binary) != 2 || len(pairs[0].continuous) != 2 {
		t.Fatalf("pairs %+v", pairs)
	}
	var b strings.Builder
	printMatched(&b, recs)
	// False parents per child: binary 0 and 0.5, mean 0.25, SE 0.25;
	// continuous 0, SE 0; difference +0.25 ± 0.25. F1: binary 0.6 ± 0.1,
	// continuous 0.4 ± 0: +0.2 ± 0.1, two standard errors exactly (not
	// marked either way).
	want := "| n=10 p=5 2 parents weak | rule | 0.250 / 0.000 | +0.250 ± 0.250 | 0.600 / 0.400 | +0.200 ± 0.100 |"
	if !strings.Contains(b.String(), want) {
		t.Errorf("table\n%s\nwant the row\n%s", b.String(), want)
	}
}
