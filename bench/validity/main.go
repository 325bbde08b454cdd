// Command validity measures how well discovery recovers known networks: it
// simulates suites of random tiered networks (continuous, binary and
// mixed; several sample sizes and effect sizes; fixed seeds), runs the
// selection procedures on each, and prints precision, recall and F1 of the
// directed edges with Monte Carlo standard errors, false edges per node by
// the child's kind, and the calibration of stability-selection
// frequencies. Its tables are the evidence for the defaults in the README.
//
//	go run ./bench/validity                 # the standard suite
//	go run ./bench/validity -suite quick    # a small suite for a first look
//	go run ./bench/validity -networks 5     # fewer networks per setting
//	go run ./bench/validity -suite matched  # binary beside continuous networks of the same signal
//	go run ./bench/validity -first 21 -networks 10 -raw more.jsonl   # more networks, kept
//	go run ./bench/validity -merge runs/a.jsonl,more.jsonl           # one table from kept runs
//
// Each row also gives the true edges' median |z| in the oracle's fit (each
// child regressed without penalty on its true parents), a measure of
// signal that reads the same for binary and continuous children; the
// matched suite scales the continuous networks' weights until that median
// equals the binary networks' at the same size.
package main

import (
	"context"
	"encoding/json"
	"flag"
	"fmt"
	"io"
	"log"
	"math"
	"os"
	"regexp"
	"runtime"
	"slices"
	"sort"
	"strings"
	"sync"
	"time"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/cv"
	"github.com/antecedent-lab/antecedent/dag"
	"github.com/antecedent-lab/antecedent/internal/jsonfloat"
	"github.com/antecedent-lab/antecedent/internal/refit"
	"github.com/antecedent-lab/antecedent/lasso"
	"github.com/antecedent-lab/antecedent/order"
	"github.com/antecedent-lab/antecedent/simulate"
	"github.com/antecedent-lab/antecedent/table"
)

// setting is one family of simulated networks.
type setting struct {
	kind     string  // continuous, binary or mixed
	n, p     int     // rows and variables
	parents  float64 // expected parents per node
	lo, hi   float64 // absolute edge weights, drawn uniformly
	strength string  // weak or strong
	// scale multiplies the edge weights (zero means 1); match, when set,
	// asks for the scale at which the true edges' median oracle |z|
	// equals that of the networks of setting *match (see matchSignal).
	scale float64
	match *setting
}

func (s setting) String() string {
	d := fmt.Sprintf("%s n=%d p=%d %g parents %s", s.kind, s.n, s.p, s.parents, s.strength)
	if s.parents == 0 {
		d = fmt.Sprintf("%s n=%d p=%d no edges", s.kind, s.n, s.p)
	}
	switch {
	case s.match != nil && s.scale == 0:
		d += ", weights scaled to match " + s.match.kind
	case s.match != nil:
		d += fmt.Sprintf(", weights ×%.3f to match %s", s.scale, s.match.kind)
	case s.scale != 0:
		d += fmt.Sprintf(", weights ×%.3f", s.scale)
	}
	return d
}

// procedure is one way of choosing parents.
type procedure struct {
	name string
	cfg  func(seed uint64) *antecedent.Config
	keep func(e dag.Edge, res *antecedent.Result) bool // nil keeps every edge
}

func suite(name string) ([]setting, error) {
	kinds := []string{"continuous", "binary", "mixed"}
	signals := []struct {
		name   string
		lo, hi float64
	}{{"weak", 0.15, 0.4}, {"strong", 0.4, 1}}
	var out []setting
	switch name {
	case "quick":
		for _, k := range kinds {
			out = append(out, setting{kind: k, n: 1000, p: 20, parents: 2, lo: 0.4, hi: 1, strength: "strong"})
		}
	case "standard":
		for _, k := range kinds {
			for _, n := range []int{200, 1000, 5000, 20000} {
				for _, sg := range signals {
					out = append(out, setting{kind: k, n: n, p: 30, parents: 2, lo: sg.lo, hi: sg.hi, strength: sg.name})
				}
			}
		}
		out = append(out, setting{kind: "mixed", n: 5000, p: 50, parents: 2, lo: 0.4, hi: 1, strength: "strong"})
	case "matched":
		// Binary networks beside continuous ones of the same signal: the
		// same sizes, the continuous networks' weights scaled down until
		// their true edges are as strong, by the oracle's |z|, as in the
		// binary networks.
		for _, n := range []int{200, 1000, 5000} {
			for _, sg := range signals {
				b := setting{kind: "binary", n: n, p: 30, parents: 2, lo: sg.lo, hi: sg.hi, strength: sg.name}
				c := b
				c.kind, c.match = "continuous", &b
				out = append(out, b, c)
			}
		}
		// No signal at all: every edge a selection reports is false.
		for _, n := range []int{1000, 5000} {
			for _, k := range []string{"binary", "continuous"} {
				out = append(out, setting{kind: k, n: n, p: 30})
			}
		}
	case "dense":
		for _, k := range kinds {
			for _, n := range []int{500, 2000, 20000} {
				out = append(out, setting{kind: k, n: n, p: 60, parents: 3.5, lo: 0.3, hi: 1, strength: "strong"})
			}
		}
		out = append(out, setting{kind: "continuous", n: 2000, p: 100, parents: 3.5, lo: 0.3, hi: 1, strength: "strong"})
	default:
		return nil, fmt.Errorf("unknown suite %q (quick, standard, dense or matched)", name)
	}
	return out, nil
}

// calibrationThresholds are the frequencies at which the share of true
// edges among those selected at least that often is reported.
var calibrationThresholds = []float64{0.6, 0.7, 0.8, 0.9, 1}

const stabilityPairs = 25

func procedures() []procedure {
	rule := func(r cv.Rule) func(uint64) *antecedent.Config {
		return func(seed uint64) *antecedent.Config {
			// The textbook lasso, named: the default selection is not.
			return &antecedent.Config{Seed: seed, Workers: 1, Selection: antecedent.PenalisedLasso, CV: cv.Settings{Rule: r}}
		}
	}
	stable := func(seed uint64) *antecedent.Config {
		// The lowest threshold the configuration allows, so that every
		// edge selected in over half the fits is reported with its
		// frequency; thresholds are applied afterwards.
		return &antecedent.Config{Seed: seed, Workers: 1, Stability: antecedent.Stability{Pairs: stabilityPairs, Threshold: 0.51}}
	}
	selection := func(sel antecedent.Selection, r cv.Rule) func(uint64) *antecedent.Config {
		return func(seed uint64) *antecedent.Config {
			return &antecedent.Config{Seed: seed, Workers: 1, Selection: sel, CV: cv.Settings{Rule: r}}
		}
	}
	return []procedure{
		{name: "minimum rule", cfg: rule(cv.MinimumLoss)},
		{name: "one-SE rule", cfg: rule(cv.OneStandardError)},
		{name: "adaptive one-SE", cfg: selection(antecedent.AdaptiveLasso, cv.OneStandardError)},
		{name: "adaptive half-SE", cfg: selection(antecedent.AdaptiveLasso, cv.HalfStandardError)},
		{name: "adaptive quarter-SE", cfg: selection(antecedent.AdaptiveLasso, cv.QuarterStandardError)},
		{name: "adaptive paired", cfg: selection(antecedent.AdaptiveLasso, cv.PairedDifference)},
		{name: "adaptive minimum", cfg: selection(antecedent.AdaptiveLasso, cv.MinimumLoss)},
		{name: "relaxed one-SE", cfg: selection(antecedent.RelaxedLasso, cv.OneStandardError)},
		{name: "relaxed minimum", cfg: selection(antecedent.RelaxedLasso, cv.MinimumLoss)},
		{name: "stability ≥ 0.75", cfg: stable, keep: func(e dag.Edge, _ *antecedent.Result) bool { return e.Frequency >= 0.75 }},
		{name: "stability ≥ 0.9", cfg: stable, keep: func(e dag.Edge, _ *antecedent.Result) bool { return e.Frequency >= 0.9 }},
		{name: "stability: bound ≤ 1 per node", cfg: stable, keep: perNodeBound},
	}
}

// perNodeBound keeps a stability-selected edge when its frequency reaches
// a threshold chosen from the data for its child: the smallest π for which
// the Meinshausen & Bühlmann (2010, Theorem 1) bound q²/((2π−1)p) on the
// child's expected false parents is at most 1 (q the mean number of
// parents selected per half, p the candidates), kept within [0.6, 1]
// (the range of thresholds the same paper recommends starts at 0.6; above
// 1 the bound cannot be met and only edges selected in every half stay).
func perNodeBound(e dag.Edge, res *antecedent.Result) bool {
	for _, n := range res.Stability.Nodes {
		if n.Name == e.To {
			pi := 0.5 + n.Selected*n.Selected/(2*float64(n.Candidates))
			return e.Frequency >= min(1, max(0.6, pi))
		}
	}
	return false
}

// outcome is one procedure on one network.
type outcome struct {
	precision, recall, f1 float64
	falseBinary           int // false edges into binary children
	falseContinuous       int
	binaryNodes, contNode int
	seconds               float64
	freqs                 []float64 // stability frequencies of reported edges
	truths                []bool    // whether each of them is true
	oracleZ               []float64 // the true edges' oracle |z| (see oracleZ)
}

func main() {
	log.SetFlags(0)
	suiteName := flag.String("suite", "standard", "quick, standard, dense or matched")
	procNames := flag.String("procedures", "", "comma-separated procedure names to run (default all)")
	networks := flag.Int("networks", 20, "networks per setting")
	first := flag.Int("first", 1, "seed of the first network (networks take seeds first, first+1, …)")
	workers := flag.Int("workers", runtime.GOMAXPROCS(0), "networks run at once")
	only := flag.String("only", "", "run only settings whose description matches this regular expression")
	rawPath := flag.String("raw", "", "also append every outcome (one procedure on one network) to this file as a JSON line")
	merge := flag.String("merge", "", "print the tables of the outcomes in these comma-separated -raw files instead of running (a repeated setting, procedure and seed counts once)")
	flag.Parse()
	settings, err := suite(*suiteName)
	if err != nil {
		log.Fatal(err)
	}
	match, err := regexp.Compile(*only)
	if err != nil {
		log.Fatal(err)
	}
	procs := procedures()
	if *procNames != "" {
		want := strings.Split(*procNames, ",")
		procs = slices.DeleteFunc(procs, func(p procedure) bool { return !slices.Contains(want, p.name) })
	}
	start := time.Now()
	w := os.Stdout
	if *merge != "" {
		var recs []record
		for _, path := range strings.Split(*merge, ",") {
			r, err := readRecords(path)
			if err != nil {
				log.Fatal(err)
			}
			recs = append(recs, r...)
		}
		recs = dedupe(recs)
		fmt.Fprintf(w, "Validity tables merged from %s: %d outcomes; %s, %d cores.\n\n", *merge, len(recs), runtime.Version(), runtime.NumCPU())
		report(w, recs, nil)
		return
	}
	if *first < 1 || *networks < 1 {
		log.Fatalf("-first %d, -networks %d: both must be at least 1", *first, *networks)
	}
	var raw *json.Encoder
	if *rawPath != "" {
		f, err := os.OpenFile(*rawPath, os.O_CREATE|os.O_APPEND|os.O_WRONLY, 0o644)
		if err != nil {
			log.Fatal(err)
		}
		defer f.Close()
		raw = json.NewEncoder(f)
	}
	fmt.Fprintf(w, "Validity suite %q: %d networks per setting, seeds %d…%d; %s, %d cores.\n\n", *suiteName, *networks, *first, *first+*networks-1, runtime.Version(), runtime.NumCPU())
	printHeader(w)
	var recs []record
	var notes []string
	for _, s := range settings {
		if !match.MatchString(s.String()) {
			continue
		}
		if s.match != nil {
			var target, reached float64
			s, target, reached = matchSignal(s)
			notes = append(notes, fmt.Sprintf("%s: weights in [%.4g, %.4g] give a median oracle |z| of %.2f on seeds %d…%d, where %s gives %.2f.",
				s, s.lo*s.scale, s.hi*s.scale, reached, calibrationFirst, calibrationFirst+calibrationSeeds-1, s.match, target))
		}
		res := run(s, procs, *first, *networks, *workers)
		done := len(recs)
		for pi, p := range procs {
			for k, o := range res[pi] {
				r := record{Setting: s.String(), Kind: s.kind, Procedure: p.name, Seed: *first + k, outcome: o}
				recs = append(recs, r)
				if raw != nil {
					if err := raw.Encode(r); err != nil {
						log.Fatal(err)
					}
				}
			}
		}
		printRows(w, recs[done:])
	}
	printTail(w, recs, notes)
	fmt.Fprintf(w, "\nTotal time %.0f s.\n", time.Since(start).Seconds())
}

// record is one procedure on one network, as -raw writes it.
type record struct {
	Setting, Kind, Procedure string
	Seed                     int
	outcome
}

// recordJSON is a record's JSON form: the outcome's fields exported, and
// unknown values as null.
type recordJSON struct {
	Setting, Kind, Procedure string
	Seed                     int
	Precision, Recall, F1    jsonfloat.Float
	FalseBinary              int
	FalseContinuous          int
	BinaryNodes              int
	ContinuousNodes          int
	Seconds                  jsonfloat.Float
	Frequencies              []float64
	Truths                   []bool
	OracleZ                  []float64
}

// MarshalJSON and UnmarshalJSON carry the outcome's fields.
func (r record) MarshalJSON() ([]byte, error) {
	o := r.outcome
	f := func(x float64) jsonfloat.Float { return jsonfloat.Float(x) }
	return json.Marshal(recordJSON{r.Setting, r.Kind, r.Procedure, r.Seed, f(o.precision), f(o.recall), f(o.f1), o.falseBinary,
		o.falseContinuous, o.binaryNodes, o.contNode, f(o.seconds), o.freqs, o.truths, o.oracleZ})
}

func (r *record) UnmarshalJSON(b []byte) error {
	var p recordJSON
	if err := json.Unmarshal(b, &p); err != nil {
		return err
	}
	*r = record{Setting: p.Setting, Kind: p.Kind, Procedure: p.Procedure, Seed: p.Seed, outcome: outcome{
		precision: float64(p.Precision), recall: float64(p.Recall), f1: float64(p.F1), falseBinary: p.FalseBinary,
		falseContinuous: p.FalseContinuous, binaryNodes: p.BinaryNodes, contNode: p.ContinuousNodes,
		seconds: float64(p.Seconds), freqs: p.Frequencies,
		truths: p.Truths, oracleZ: p.OracleZ}}
	return nil
}

// readRecords reads a file that -raw wrote.
func readRecords(path string) ([]record, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	var out []record
	dec := json.NewDecoder(f)
	for line := 1; ; line++ {
		var r record
		if err := dec.Decode(&r); err == io.EOF {
			return out, nil
		} else if err != nil {
			return nil, fmt.Errorf("%s: record %d: %w", path, line, err)
		}
		out = append(out, r)
	}
}

// dedupe keeps the first record of each setting, procedure and seed, and
// says how many it dropped.
func dedupe(recs []record) []record {
	seen := map[[3]string]bool{}
	var out []record
	for _, r := range recs {
		k := [3]string{r.Setting, r.Procedure, fmt.Sprint(r.Seed)}
		if seen[k] {
			continue
		}
		seen[k] = true
		out = append(out, r)
	}
	if d := len(recs) - len(out); d > 0 {
		log.Printf("%d repeated outcomes (same setting, procedure and seed) left out", d)
	}
	return out
}

// report prints the table of recs, grouped by setting and procedure in
// the order they first appear, then the notes and the calibration (see
// printTail).
func report(w io.Writer, recs []record, notes []string) {
	printHeader(w)
	printRows(w, recs)
	printTail(w, recs, notes)
}

func printHeader(w io.Writer) {
	fmt.Fprintln(w, "| setting | procedure | precision | recall | F1 | false edges per binary / continuous child | median oracle \\|z\\| | s per network |")
	fmt.Fprintln(w, "|---|---|---|---|---|---|---|---|")
}

// groups returns recs by setting and procedure, in the order they first
// appear, each sorted by seed.
func groups(recs []record) [][]record {
	type key struct{ setting, procedure string }
	var order []key
	by := map[key][]record{}
	for _, r := range recs {
		k := key{r.Setting, r.Procedure}
		if by[k] == nil {
			order = append(order, k)
		}
		by[k] = append(by[k], r)
	}
	out := make([][]record, len(order))
	for i, k := range order {
		rs := by[k]
		sort.Slice(rs, func(a, b int) bool { return rs[a].Seed < rs[b].Seed })
		out[i] = rs
	}
	return out
}

func outcomes(rs []record) []outcome {
	os := make([]outcome, len(rs))
	for i, r := range rs {
		os[i] = r.outcome
	}
	return os
}

func printRows(w io.Writer, recs []record) {
	for _, rs := range groups(recs) {
		printRow(w, fmt.Sprintf("%s (%d)", rs[0].Setting, len(rs)), rs[0].Procedure, outcomes(rs))
	}
}

// printTail prints the notes and the calibration of the stability
// frequencies in recs (from the first stability procedure of each
// setting; they all share one run).
func printTail(w io.Writer, recs []record, notes []string) {
	calib := map[string][][2]int{} // kind → per threshold (true, total)
	calibrated := map[string]bool{}
	for _, rs := range groups(recs) {
		if !strings.HasPrefix(rs[0].Procedure, "stability") || calibrated[rs[0].Setting] {
			continue
		}
		calibrated[rs[0].Setting] = true
		kind := rs[0].Kind
		for _, o := range outcomes(rs) {
			c := calib[kind]
			if c == nil {
				c = make([][2]int, len(calibrationThresholds))
			}
			for i, f := range o.freqs {
				for k, th := range calibrationThresholds {
					if f >= th-1e-12 {
						c[k][1]++
						if o.truths[i] {
							c[k][0]++
						}
					}
				}
			}
			calib[kind] = c
		}
	}
	printMatched(w, recs)
	if len(notes) > 0 {
		fmt.Fprintln(w)
		for _, n := range notes {
			fmt.Fprintln(w, n)
		}
	}
	if len(calib) == 0 {
		return
	}
	fmt.Fprintf(w, "\nCalibration of stability frequencies (%d complementary pairs): of the edges selected with frequency ≥ f, the share that are true.\n\n", stabilityPairs)
	fmt.Fprint(w, "| networks |")
	for _, th := range calibrationThresholds {
		fmt.Fprintf(w, " f ≥ %.1f |", th)
	}
	fmt.Fprintln(w)
	fmt.Fprintln(w, "|---|"+strings.Repeat("---|", len(calibrationThresholds)))
	kinds := make([]string, 0, len(calib))
	for k := range calib {
		kinds = append(kinds, k)
	}
	sort.Strings(kinds)
	for _, k := range kinds {
		fmt.Fprintf(w, "| %s |", k)
		for _, c := range calib[k] {
			if c[1] == 0 {
				fmt.Fprint(w, " – |")
				continue
			}
			fmt.Fprintf(w, " %.3f (%d) |", float64(c[0])/float64(c[1]), c[1])
		}
		fmt.Fprintln(w)
	}
}

// matchedPair is a binary setting's outcomes under one procedure beside
// those of the continuous setting of the same signal.
type matchedPair struct {
	setting, procedure string
	binary, continuous []outcome
}

// matchedPairs pairs every binary setting of recs with the continuous
// setting of the same sizes and signal under the same procedure: the
// matched suite's "continuous …, weights … to match binary" settings, or,
// without edges, the continuous setting of the same sizes. The standard
// and dense suites' continuous settings, whose weights are not scaled, are
// not of the same signal and are never paired.
func matchedPairs(recs []record) []matchedPair {
	type key struct{ setting, procedure string }
	cont := map[key][]outcome{}
	for _, rs := range groups(recs) {
		name := rs[0].Setting
		// Only settings of the same signal by construction: weights scaled
		// to match the binary networks, or no edges at all.
		if rs[0].Kind == "continuous" && (strings.HasSuffix(name, "to match binary") || strings.HasSuffix(name, "no edges")) {
			base, _, _ := strings.Cut(name, ",")
			cont[key{strings.TrimPrefix(base, "continuous "), rs[0].Procedure}] = outcomes(rs)
		}
	}
	var out []matchedPair
	for _, rs := range groups(recs) {
		if rs[0].Kind != "binary" {
			continue
		}
		k := key{strings.TrimPrefix(rs[0].Setting, "binary "), rs[0].Procedure}
		if c := cont[k]; c != nil {
			out = append(out, matchedPair{setting: k.setting, procedure: k.procedure, binary: outcomes(rs), continuous: c})
		}
	}
	return out
}

// printMatched prints, for every binary setting of recs with a continuous
// one of the same signal beside it, the differences binary − continuous
// of the false parents per fitted child and of F1, as means over the
// networks ± the standard error of the difference (the two settings'
// networks are drawn independently, so their standard errors add in
// quadrature: common practice).
func printMatched(w io.Writer, recs []record) {
	pairs := matchedPairs(recs)
	if len(pairs) == 0 {
		return
	}
	fmt.Fprint(w, "\nBinary against continuous networks of the same signal (differences binary − continuous, means over networks ± standard error; a difference beyond two standard errors either way is marked: more or fewer false parents, higher or lower F1).\n\n")
	fmt.Fprintln(w, "| setting | procedure | false parents per child: binary / continuous | difference | F1: binary / continuous | difference |")
	fmt.Fprintln(w, "|---|---|---|---|---|---|")
	perChild := func(os []outcome, binary bool) []float64 {
		xs := make([]float64, len(os))
		for i, o := range os {
			xs[i] = float64(o.falseContinuous) / float64(o.contNode)
			if binary {
				xs[i] = float64(o.falseBinary) / float64(o.binaryNodes)
			}
		}
		return xs
	}
	f1 := func(os []outcome) []float64 {
		xs := make([]float64, len(os))
		for i, o := range os {
			xs[i] = o.f1
		}
		return xs
	}
	diff := func(a, b []float64, up, down string) (string, string) {
		ma, sa := meanSE(a)
		mb, sb := meanSE(b)
		if math.IsNaN(ma) || math.IsNaN(mb) {
			return "–", "–"
		}
		d, se := ma-mb, math.Hypot(sa, sb)
		if math.IsNaN(se) {
			return fmt.Sprintf("%.3f / %.3f", ma, mb), fmt.Sprintf("%+.3f", d) // one network a side
		}
		mark := ""
		switch {
		case d > 2*se:
			mark = " (" + up + ")"
		case d < -2*se:
			mark = " (" + down + ")"
		}
		return fmt.Sprintf("%.3f / %.3f", ma, mb), fmt.Sprintf("%+.3f ± %.3f%s", d, se, mark)
	}
	noTruth := func(os []outcome) bool {
		for _, o := range os {
			if !math.IsNaN(o.recall) {
				return false
			}
		}
		return true
	}
	for _, p := range pairs {
		fp, fpd := diff(perChild(p.binary, true), perChild(p.continuous, false), "more", "fewer")
		f, fd := diff(f1(p.binary), f1(p.continuous), "higher", "lower")
		if noTruth(p.binary) && noTruth(p.continuous) {
			f, fd = "–", "–" // no true edges: F1 says nothing
		}
		fmt.Fprintf(w, "| %s | %s | %s | %s | %s | %s |\n", p.setting, p.procedure, fp, fpd, f, fd)
	}
}

// run fits every procedure on the networks of setting s and returns the
// outcomes by procedure and network.
func run(s setting, procs []procedure, first, networks, workers int) [][]outcome {
	out := make([][]outcome, len(procs))
	for i := range out {
		out[i] = make([]outcome, networks)
	}
	jobs := make(chan int)
	var wg sync.WaitGroup
	for range workers {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for k := range jobs {
				network(s, uint64(first+k), procs, out, k)
			}
		}()
	}
	for k := range networks {
		jobs <- k
	}
	close(jobs)
	wg.Wait()
	return out
}

// draw simulates network seed of setting s: the model, its order and a
// sample of s.n rows.
func draw(s setting, seed uint64) (*simulate.Model, *order.Order, *simulate.Sample) {
	binary := map[string]float64{"continuous": 0, "binary": 1, "mixed": 0.5}[s.kind]
	scale := s.scale
	if scale == 0 {
		scale = 1
	}
	// Expected parents: each earlier node is a parent with probability q;
	// a node has (p − p/T)/2 earlier nodes on average over T tiers.
	tiers := 5
	q := math.Min(1, s.parents/(float64(s.p)*(1-1/float64(tiers))/2))
	m, o, err := simulate.Random(simulate.RandomSettings{Variables: s.p, Tiers: tiers, BinaryShare: binary, EdgeProbability: q,
		MinWeight: s.lo * scale, MaxWeight: s.hi * scale}, seed)
	if err != nil {
		log.Fatal(err)
	}
	if s.parents == 0 {
		// A network without edges: the nodes as drawn, their parents
		// dropped.
		for i := range m.Nodes {
			m.Nodes[i].Parents, m.Nodes[i].Weights = nil, nil
		}
	}
	sample, err := m.Sample(s.n, seed+1000)
	if err != nil {
		log.Fatal(err)
	}
	return m, o, sample
}

// oracleZ returns |coefficient / standard error| of every true edge in the
// oracle's fit: each child regressed, without penalty, on its true parents
// (least squares or logistic), on the sample. It measures how strong the
// edges are in the data, whatever the kinds of the nodes.
func oracleZ(m *simulate.Model, sample *simulate.Sample) []float64 {
	col := map[string][]float64{}
	for i, name := range sample.Names {
		col[name] = sample.Columns[i]
	}
	var zs []float64
	for _, nd := range m.Nodes {
		if len(nd.Parents) == 0 {
			continue
		}
		x := make([][]float64, len(nd.Parents))
		for k, p := range nd.Parents {
			x[k] = col[p]
		}
		var fam lasso.Family = lasso.Gaussian{}
		if nd.Binary {
			fam = lasso.Binomial{}
		}
		f, err := refit.Regress(context.Background(), fam, x, col[nd.Name], nil)
		if err != nil {
			log.Fatal(err)
		}
		for k := range nd.Parents {
			z := math.Abs(f.Coef[k] / f.SE[k])
			if math.IsNaN(z) {
				z = 0 // not estimable: no evidence in the data
			}
			zs = append(zs, z)
		}
	}
	return zs
}

// calibrationSeeds are the networks on which matchSignal compares signals;
// they are not among the networks scored (seeds from 1).
const calibrationSeeds, calibrationFirst = 10, 100001

// medianOracleZ pools the true edges of the calibration networks of s.
func medianOracleZ(s setting) float64 {
	var zs []float64
	for k := range calibrationSeeds {
		m, _, sample := draw(s, uint64(calibrationFirst+k))
		zs = append(zs, oracleZ(m, sample)...)
	}
	return median(zs)
}

func median(xs []float64) float64 {
	if len(xs) == 0 {
		return math.NaN()
	}
	xs = slices.Clone(xs)
	slices.Sort(xs)
	if len(xs)%2 == 1 {
		return xs[len(xs)/2]
	}
	return (xs[len(xs)/2-1] + xs[len(xs)/2]) / 2
}

// matchSignal returns s with its edge weights scaled so that the median
// oracle |z| of its true edges equals that of s.match, both on the
// calibration networks, with the two medians (the target, then the one
// reached): bisection on the log of the scale, in [1/256, 4], to within
// 1% of the target (the median rises with the scale).
func matchSignal(s setting) (setting, float64, float64) {
	target := medianOracleZ(*s.match)
	lo, hi := math.Log(1.0/256), math.Log(4)
	var z float64
	for range 40 {
		s.scale = math.Exp((lo + hi) / 2)
		z = medianOracleZ(s)
		if math.Abs(z/target-1) < 0.01 {
			break
		}
		if z < target {
			lo = math.Log(s.scale)
		} else {
			hi = math.Log(s.scale)
		}
	}
	return s, target, z
}

// network draws network seed of setting s and runs each procedure on it;
// procedures sharing a configuration share one run.
func network(s setting, seed uint64, procs []procedure, out [][]outcome, k int) {
	m, o, sample := draw(s, seed)
	d, err := table.NewDataset(sample.Names, sample.Columns)
	if err != nil {
		log.Fatal(err)
	}
	g, err := m.Graph()
	if err != nil {
		log.Fatal(err)
	}
	zs := oracleZ(m, sample)
	truth := g.Edges()
	isTrue := map[[2]string]bool{}
	for _, e := range truth {
		isTrue[[2]string{e.From, e.To}] = true
	}
	kindOf := map[string]bool{}
	for _, nd := range m.Nodes {
		kindOf[nd.Name] = nd.Binary
	}
	cache := map[string]*antecedent.Result{}
	times := map[string]float64{}
	for pi, p := range procs {
		cfg := p.cfg(seed)
		key := fmt.Sprintf("%+v", *cfg)
		res := cache[key]
		if res == nil {
			t0 := time.Now()
			res, err = antecedent.DiscoverContext(context.Background(), d, o, cfg)
			if err != nil {
				log.Fatalf("%v seed %d, %s: %v", s, seed, p.name, err)
			}
			cache[key], times[key] = res, time.Since(t0).Seconds()
		}
		var est []dag.Edge
		var oc outcome
		for _, e := range res.Edges {
			if !math.IsNaN(e.Frequency) {
				oc.freqs = append(oc.freqs, e.Frequency)
				oc.truths = append(oc.truths, isTrue[[2]string{e.From, e.To}])
			}
			if p.keep == nil || p.keep(e, res) {
				est = append(est, e)
				if !isTrue[[2]string{e.From, e.To}] {
					if kindOf[e.To] {
						oc.falseBinary++
					} else {
						oc.falseContinuous++
					}
				}
			}
		}
		for _, nd := range res.Nodes {
			if !nd.Fitted {
				continue
			}
			if kindOf[nd.Name] {
				oc.binaryNodes++
			} else {
				oc.contNode++
			}
		}
		c, err := dag.Compare(est, truth)
		if err != nil {
			log.Fatal(err)
		}
		oc.precision, oc.recall, oc.f1 = c.Precision, c.Recall, c.F1
		if math.IsNaN(oc.precision) {
			oc.precision = 1 // no edge reported: none of them is false
		}
		if math.IsNaN(oc.f1) {
			oc.f1 = 0
		}
		oc.seconds = times[key]
		oc.oracleZ = zs
		out[pi][k] = oc
	}
}

// meanSE returns the mean of xs (NaN skipped) and its Monte Carlo standard
// error.
func meanSE(xs []float64) (float64, float64) {
	xs = slices.DeleteFunc(slices.Clone(xs), math.IsNaN)
	if len(xs) == 0 {
		return math.NaN(), math.NaN()
	}
	var s, ss float64
	for _, x := range xs {
		s += x
	}
	m := s / float64(len(xs))
	for _, x := range xs {
		ss += (x - m) * (x - m)
	}
	if len(xs) < 2 {
		return m, math.NaN()
	}
	return m, math.Sqrt(ss/float64(len(xs)-1)) / math.Sqrt(float64(len(xs)))
}

func printRow(w io.Writer, s string, name string, os []outcome) {
	col := func(f func(o outcome) float64) string {
		xs := make([]float64, len(os))
		for i, o := range os {
			xs[i] = f(o)
		}
		m, se := meanSE(xs)
		return fmt.Sprintf("%.3f ± %.3f", m, se)
	}
	var fb, fc, nb, nc int
	var secs float64
	for _, o := range os {
		fb += o.falseBinary
		fc += o.falseContinuous
		nb += o.binaryNodes
		nc += o.contNode
		secs += o.seconds
	}
	ratio := func(a, b int) string {
		if b == 0 {
			return "–"
		}
		return fmt.Sprintf("%.3f", float64(a)/float64(b))
	}
	var zs []float64
	for _, o := range os {
		zs = append(zs, o.oracleZ...)
	}
	fmt.Fprintf(w, "| %s | %s | %s | %s | %s | %s / %s | %.1f | %.2f |\n", s, name,
		col(func(o outcome) float64 { return o.precision }), col(func(o outcome) float64 { return o.recall }),
		col(func(o outcome) float64 { return o.f1 }), ratio(fb, nb), ratio(fc, nc), median(zs), secs/float64(len(os)))
}
