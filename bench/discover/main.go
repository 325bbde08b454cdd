// Command discover times the whole job — a penalised, cross-validated
// regression of every variable on the earlier tiers — in antecedent and in
// two scikit-learn pipelines doing the same work (bench/discover_reference.py),
// side by side in one run, and prints a Markdown table of wall times, peak
// memory, ratios and how far the edge sets agree.
//
//	go run ./bench/discover                        # the whole table
//	go run ./bench/discover -cases S,M             # some cases
//	go run ./bench/discover -cases L-continuous -python-nodes 20
//	go run ./bench/discover -cases scale -skip-python
//	go run ./bench/discover -cases M-binary -skip-python -before 926793d
//
// With -before REV the harness also builds itself from revision REV (in a
// temporary git work tree) and fits each case's data with that build too,
// printing a before-and-after table: both sides' times and peaks, and on
// how many nodes the parent sets agree.
//
// Each side runs in its own process so that its peak resident memory can
// be read. The data are drawn by package simulate with a fixed seed.
package main

import (
	"bufio"
	"bytes"
	"context"
	"encoding/binary"
	"encoding/json"
	"flag"
	"fmt"
	"io"
	"log"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"runtime"
	"runtime/pprof"
	"slices"
	"strings"
	"syscall"
	"time"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/cv"
	"github.com/antecedent-lab/antecedent/order"
	"github.com/antecedent-lab/antecedent/simulate"
	"github.com/antecedent-lab/antecedent/table"
)

type benchCase struct {
	name   string
	n, p   int
	binary float64
	// pyNodes is the number of nodes scikit-learn fits by default (0:
	// all; −1: none), chosen so that its side of the whole table takes
	// about an hour on the 2-core machine.
	pyNodes int
}

func allCases() []benchCase {
	out := []benchCase{
		{"S-continuous", 2_000, 30, 0, 0},
		{"S-binary", 2_000, 30, 1, 0},
		{"S-mixed", 2_000, 30, 0.5, 0},
		{"M-continuous", 20_000, 100, 0, 0},
		{"M-binary", 20_000, 100, 1, 3},
		{"M-mixed", 20_000, 100, 0.5, 3},
		{"L-continuous", 100_000, 200, 0, 16},
		{"L-binary", 100_000, 200, 1, 1},
		{"L-mixed", 100_000, 200, 0.5, 2},
	}
	for _, n := range []int{25_000, 50_000, 100_000, 200_000} {
		out = append(out, benchCase{fmt.Sprintf("scale-n%d", n), n, 50, 0, -1})
	}
	return append(out, benchCase{"wide-p1000", 10_000, 1000, 0, -1}, benchCase{"huge-n1m", 1_000_000, 100, 0, -1},
		benchCase{"huge-binary-n1m", 1_000_000, 100, 1, -1})
}

const folds = 10

func main() {
	child := flag.Bool("child", false, "internal: run antecedent on -data and report")
	dataPath := flag.String("data", "", "internal: data file")
	n := flag.Int("n", 0, "internal: rows")
	p := flag.Int("p", 0, "internal: columns")
	orderPath := flag.String("order", "", "internal: order file")
	outPath := flag.String("out", "", "internal: result file")
	only := flag.String("cases", "S,M,L,scale,wide,huge", "comma-separated cases, or prefixes such as L or scale")
	pyNodes := flag.Int("python-nodes", -1, "run scikit-learn on this many nodes (evenly spaced) and scale its time up; 0 = all; −1 = each case's default")
	skipPy := flag.Bool("skip-python", false, "time antecedent only")
	python := flag.String("python", "/usr/bin/python3", "Python with scikit-learn")
	cpuProfile := flag.String("cpuprofile", "", "write a CPU profile of antecedent's fitting in the last case run to this file")
	beforeRev := flag.String("before", "", "also fit each case with this harness built from an earlier commit (a git revision), for a before-and-after table with both sides' times, peaks and parent sets")
	endToEnd := flag.Bool("end-to-end", false, "also time the whole command on the data as a CSV file: antecedent discover against each pipeline reading the CSV with pandas")
	flag.StringVar(&selection, "selection", "lasso", "antecedent's parent selection: lasso (the textbook procedure the scikit-learn pipelines implement), adaptive (the library's default) or relaxed")
	flag.Parse()
	var sel antecedent.Selection
	if err := sel.UnmarshalText([]byte(selection)); err != nil {
		log.Fatal(err)
	}
	if *child {
		if err := runChild(*dataPath, *n, *p, *orderPath, *outPath, *cpuProfile); err != nil {
			log.Fatal(err)
		}
		return
	}
	_, file, _, _ := runtime.Caller(0)
	script := filepath.Join(filepath.Dir(file), "..", "discover_reference.py")
	dir, err := os.MkdirTemp("", "antecedent-discover-")
	if err != nil {
		log.Fatal(err)
	}
	defer os.RemoveAll(dir)
	fmt.Printf("machine: %d cores, %s; folds %d, antecedent's selection %s under its own rule (the pipelines: lasso, one-standard-error rule), 100 penalties per node\n\n", runtime.NumCPU(), runtime.Version(), folds, sel)
	var cli string
	if *endToEnd {
		cli = filepath.Join(dir, "antecedent")
		build := exec.Command("go", "build", "-o", cli, "./cmd/antecedent")
		build.Dir = filepath.Join(filepath.Dir(file), "..", "..")
		build.Stderr = os.Stderr
		if err := build.Run(); err != nil {
			log.Fatalf("building the command: %v", err)
		}
	}
	var base *baseline
	if *beforeRev != "" {
		if base, err = buildBaseline(filepath.Join(filepath.Dir(file), "..", ".."), *beforeRev, dir); err != nil {
			log.Fatal(err)
		}
	}
	fmt.Println("| case | n | p | edges | antecedent s (CPU s) | peak MiB (raw data MiB) | plain s | tuned s | vs plain | vs tuned | scikit-learn peak MiB (plain / tuned) | edge agreement |")
	fmt.Println("|---|---|---|---|---|---|---|---|---|---|---|---|")
	var e2e, versus []string
	for _, c := range allCases() {
		if !selected(c.name, *only) {
			continue
		}
		row, whole, vs, err := runCase(c, dir, script, *python, *pyNodes, *skipPy, *cpuProfile, cli, base)
		if err != nil {
			log.Fatalf("%s: %v", c.name, err)
		}
		fmt.Println(row)
		if whole != "" {
			e2e = append(e2e, whole)
		}
		if vs != "" {
			versus = append(versus, vs)
		}
	}
	if len(versus) > 0 {
		fmt.Println()
		note := "its only selection, the textbook lasso"
		if base.selects {
			note = "selection " + selection
		}
		fmt.Printf("Before (this harness built from %s, %s) and after (this build), each fitting the same data in its own process, one after the other.\n\n", base.rev, note)
		fmt.Println("| case | before s (CPU s) | after s (CPU s) | speed-up | peak MiB before → after | edges before / after | nodes with identical parents |")
		fmt.Println("|---|---|---|---|---|---|---|")
		for _, r := range versus {
			fmt.Println(r)
		}
	}
	if len(e2e) > 0 {
		fmt.Println()
		fmt.Println("End to end: the command `antecedent discover --data case.csv --order case.order --json out.json --quiet` against each pipeline's whole process (interpreter start, imports, `pandas.read_csv`, the fit, scaled up from the sampled nodes as above).")
		fmt.Println()
		fmt.Println("| case | CSV MB | command s (CPU s) | fit alone s | plain: read s, whole s | tuned: read s, whole s | vs plain | vs tuned | command's edges |")
		fmt.Println("|---|---|---|---|---|---|---|---|---|")
		for _, r := range e2e {
			fmt.Println(r)
		}
	}
}

// selection is antecedent's parent selection, by name (flag -selection).
var selection string

func selected(name, list string) bool {
	for _, s := range strings.Split(list, ",") {
		if s != "" && (name == s || strings.HasPrefix(name, s+"-")) {
			return true
		}
	}
	return false
}

type childReport struct {
	Seconds float64 `json:"seconds"`
	// CPU is the process CPU time (user and system) of the fitting: on a
	// shared machine it moves less than the wall time.
	CPU     float64 `json:"cpu_seconds"`
	PeakKiB int64   `json:"peak_kib"`
}

func runChild(path string, n, p int, orderPath, out, profile string) error {
	f, err := os.Open(path)
	if err != nil {
		return err
	}
	cols := make([][]float64, p)
	names := make([]string, p)
	// Read through one small buffer so that loading leaves no garbage
	// behind to inflate the peak memory measured.
	r := bufio.NewReaderSize(f, 1<<16)
	var buf [8]byte
	for j := range cols {
		cols[j] = make([]float64, n)
		for i := range cols[j] {
			if _, err := io.ReadFull(r, buf[:]); err != nil {
				return err
			}
			cols[j][i] = math.Float64frombits(binary.LittleEndian.Uint64(buf[:]))
		}
		names[j] = fmt.Sprintf("v%0*d", len(fmt.Sprint(p)), j+1)
	}
	f.Close()
	of, err := os.Open(orderPath)
	if err != nil {
		return err
	}
	o, err := order.Parse(of)
	of.Close()
	if err != nil {
		return err
	}
	d, err := table.NewDataset(names, cols)
	if err != nil {
		return err
	}
	if profile != "" {
		pf, err := os.Create(profile)
		if err != nil {
			return err
		}
		defer pf.Close()
		if err := pprof.StartCPUProfile(pf); err != nil {
			return err
		}
	}
	start, cpu0 := time.Now(), cpuSeconds()
	cfg := &antecedent.Config{Seed: 1, Folds: folds}
	if err := cfg.Selection.UnmarshalText([]byte(selection)); err != nil {
		return err
	}
	res, err := antecedent.DiscoverContext(context.Background(), d, o, cfg)
	if err != nil {
		return err
	}
	secs, cpu := time.Since(start).Seconds(), cpuSeconds()-cpu0
	if profile != "" {
		pprof.StopCPUProfile()
	}
	rf, err := os.Create(out)
	if err != nil {
		return err
	}
	if err := res.WriteJSON(rf); err != nil {
		return err
	}
	rf.Close()
	return json.NewEncoder(os.Stdout).Encode(childReport{Seconds: secs, CPU: cpu, PeakKiB: peakKiB()})
}

// cpuSeconds returns this process's CPU time so far, user and system.
func cpuSeconds() float64 {
	var u syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &u); err != nil {
		return math.NaN()
	}
	return float64(u.Utime.Nano()+u.Stime.Nano()) / 1e9
}

// peakKiB returns this process's peak resident set (VmHWM). getrusage's
// maximum is kept across fork and exec, so in a child it would include
// the parent's memory at the fork.
func peakKiB() int64 {
	b, err := os.ReadFile("/proc/self/status")
	if err != nil {
		return -1
	}
	for _, line := range strings.Split(string(b), "\n") {
		if rest, ok := strings.CutPrefix(line, "VmHWM:"); ok {
			var kib int64
			fmt.Sscan(strings.TrimSpace(strings.TrimSuffix(strings.TrimSpace(rest), "kB")), &kib)
			return kib
		}
	}
	return -1
}

// runCase times case c and returns its row of the fitting table and, when
// cli names the built command, its row of the end-to-end table.
func runCase(c benchCase, dir, script, python string, pyNodes int, skipPy bool, profile, cli string, base *baseline) (string, string, string, error) {
	if pyNodes < 0 {
		pyNodes = c.pyNodes
	}
	skipPy = skipPy || pyNodes < 0
	m, o, err := simulate.Random(simulate.RandomSettings{Variables: c.p, Tiers: 5, BinaryShare: c.binary}, uint64(c.n+c.p))
	if err != nil {
		return "", "", "", err
	}
	s, err := m.Sample(c.n, 7)
	if err != nil {
		return "", "", "", err
	}
	dataPath := filepath.Join(dir, c.name+".f64")
	f, err := os.Create(dataPath)
	if err != nil {
		return "", "", "", err
	}
	for _, col := range s.Columns {
		if err := binary.Write(f, binary.LittleEndian, col); err != nil {
			return "", "", "", err
		}
	}
	f.Close()
	orderPath := filepath.Join(dir, c.name+".order")
	var ob bytes.Buffer
	o.WriteText(&ob)
	os.WriteFile(orderPath, ob.Bytes(), 0o644)
	resPath := filepath.Join(dir, c.name+".json")
	self, _ := os.Executable()
	out, err := exec.Command(self, "-child", "-data", dataPath, "-n", fmt.Sprint(c.n), "-p", fmt.Sprint(c.p), "-order", orderPath, "-out", resPath, "-cpuprofile", profile, "-selection", selection).Output()
	if err != nil {
		return "", "", "", fmt.Errorf("antecedent child: %v", err)
	}
	var ours childReport
	if err := json.Unmarshal(out, &ours); err != nil {
		return "", "", "", err
	}
	rf, err := os.Open(resPath)
	if err != nil {
		return "", "", "", err
	}
	res, err := antecedent.ReadResult(rf)
	rf.Close()
	if err != nil {
		return "", "", "", err
	}
	// The original data are freed by the child; s is only needed for fold ids.
	raw := float64(c.n*c.p*8) / (1 << 20)
	row := fmt.Sprintf("| %s | %d | %d | %d | %.2f (%.1f) | %.0f (%.0f) |", c.name, c.n, c.p, len(res.Edges), ours.Seconds, ours.CPU, float64(ours.PeakKiB)/1024, raw)
	var versus string
	if base != nil {
		names := make([]string, len(res.Nodes))
		for i, nd := range res.Nodes {
			names[i] = nd.Name
		}
		if versus, err = base.compare(dir, c, dataPath, orderPath, resPath, ours, names); err != nil {
			return "", "", "", err
		}
	}
	var whole *command
	if cli != "" {
		if whole, err = runCommand(cli, dir, c, s, orderPath, res); err != nil {
			return "", "", "", err
		}
	}
	if skipPy {
		return row + " – | – | – | – | – | – |", whole.row(c, ours.Seconds, nil), versus, nil
	}
	spec, nodes, run, err := writeSpec(dir, c, res, s, pyNodes)
	if err != nil {
		return "", "", "", err
	}
	var times, ses [2]float64
	var peaks [2]float64
	var agree [2]string
	var pyWhole []pyWholeRun
	for k, pipeline := range []string{"plain", "tuned"} {
		py, err := runPython(python, script, spec, pipeline, "")
		if err != nil {
			return "", "", "", err
		}
		times[k], ses[k] = py.estimate(nodes)
		peaks[k] = py.PeakKiB / 1024
		agree[k] = agreement(res, py.Parents)
		if whole != nil {
			t0 := time.Now()
			pw, err := runPython(python, script, spec, pipeline, whole.csv)
			if err != nil {
				return "", "", "", err
			}
			// The process's wall time with the fit of the sampled nodes
			// replaced by the fit of all of them.
			wall := time.Since(t0).Seconds()
			all, _ := pw.estimate(nodes)
			pyWhole = append(pyWhole, pyWholeRun{read: pw.Load, whole: wall - pw.Seconds + all})
		}
	}
	est := func(k int) string {
		switch {
		case run == len(nodes):
			return ""
		case math.IsNaN(ses[k]):
			return fmt.Sprintf(" (est. from %d of %d nodes)", run, len(nodes))
		}
		return fmt.Sprintf(" ± %.1f (est. from %d of %d nodes)", ses[k], run, len(nodes))
	}
	return row + fmt.Sprintf(" %.1f%s | %.1f%s | %.1f× | %.1f× | %.0f / %.0f | plain: %s; tuned: %s |",
		times[0], est(0), times[1], est(1), times[0]/ours.Seconds, times[1]/ours.Seconds, peaks[0], peaks[1], agree[0], agree[1]), whole.row(c, ours.Seconds, pyWhole), versus, nil
}

type specNode struct {
	Index      int       `json:"index"`
	Slot       int       `json:"slot"`
	Binary     bool      `json:"binary"`
	Candidates []int     `json:"candidates"`
	Penalties  []float64 `json:"penalties"`
	Run        bool      `json:"run"`
}

// writeSpec writes the per-node candidates, grids and fold ids that
// antecedent used. Folds are recomputed as Discover assigns them: one
// random assignment shared by the continuous nodes, a stratified one per
// binary node.
func writeSpec(dir string, c benchCase, res *antecedent.Result, s *simulate.Sample, pyNodes int) (string, []specNode, int, error) {
	index := map[string]int{}
	for i, nd := range res.Nodes {
		index[nd.Name] = i
	}
	var nodes []specNode
	var ids []byte
	shared, _ := cv.Random(c.n, folds, 1)
	for i, nd := range res.Nodes {
		if !nd.Fitted {
			continue
		}
		sn := specNode{Index: i, Slot: len(nodes), Binary: nd.Kind == table.Binary}
		for _, cand := range nd.Candidates {
			sn.Candidates = append(sn.Candidates, index[cand])
		}
		for _, pt := range nd.Curve {
			sn.Penalties = append(sn.Penalties, float64(pt.Penalty))
		}
		f := shared
		if sn.Binary {
			f, _ = cv.Stratified(s.Columns[i], folds, 1+uint64(i)*0x9e3779b97f4a7c15)
		}
		for _, id := range f.ID {
			ids = append(ids, byte(id))
		}
		nodes = append(nodes, sn)
	}
	run := len(nodes)
	if pyNodes > 0 && pyNodes < len(nodes) {
		run = pyNodes
	}
	// A sample stratified by candidate count (per-node time grows with
	// it): the nodes in order of candidates, cut into run strata of equal
	// size, and the middle node of each.
	byCands := make([]int, len(nodes))
	for k := range byCands {
		byCands[k] = k
	}
	slices.SortStableFunc(byCands, func(a, b int) int { return len(nodes[a].Candidates) - len(nodes[b].Candidates) })
	for k := range run {
		nodes[byCands[(2*k+1)*len(nodes)/(2*run)]].Run = true
	}
	foldPath := filepath.Join(dir, c.name+".folds")
	if err := os.WriteFile(foldPath, ids, 0o644); err != nil {
		return "", nil, 0, err
	}
	spec := map[string]any{"n": c.n, "p": c.p, "data": filepath.Join(dir, c.name+".f64"), "folds": foldPath,
		"nodes": nodes, "tol": 1e-4, "jobs": 2}
	b, _ := json.Marshal(spec)
	path := filepath.Join(dir, c.name+".spec.json")
	return path, nodes, run, os.WriteFile(path, b, 0o644)
}

// agreement compares parent sets on the nodes scikit-learn ran.
func agreement(res *antecedent.Result, parents map[string][]int) string {
	index := map[string]int{}
	for i, nd := range res.Nodes {
		index[nd.Name] = i
	}
	same, diff, total := 0, 0, 0
	for k, ps := range parents {
		var i int
		fmt.Sscan(k, &i)
		var ours []int
		for _, p := range res.Nodes[i].Parents {
			ours = append(ours, index[p])
		}
		slices.Sort(ours)
		slices.Sort(ps)
		if slices.Equal(ours, ps) {
			same++
		}
		for _, p := range ours {
			if !slices.Contains(ps, p) {
				diff++
			}
		}
		for _, p := range ps {
			if !slices.Contains(ours, p) {
				diff++
			}
		}
		total += len(ours)
	}
	return fmt.Sprintf("%d/%d nodes identical, %d of %d edges differ", same, len(parents), diff, total)
}
