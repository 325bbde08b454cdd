package main

import (
	"bufio"
	"encoding/json"
	"fmt"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strconv"
	"time"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/simulate"
)

// pyReport is what bench/discover_reference.py prints.
type pyReport struct {
	Seconds     float64            `json:"seconds"`
	Fixed       float64            `json:"fixed_seconds"`
	Load        float64            `json:"load_seconds"`
	PeakKiB     float64            `json:"peak_kib"`
	Nodes       int                `json:"nodes"`
	Parents     map[string][]int   `json:"parents"`
	NodeSeconds map[string]float64 `json:"node_seconds"`
}

// estimate returns the fit's time for every fitted node in spec and its
// standard error: work shared by all nodes counted once, and the nodes'
// own time by the ratio estimator of a total with the candidate count as
// the auxiliary variable, from the nodes run, with its usual variance
// N²(1 − n/N)/n · Σ(t − R·c)²/(n − 1) (Cochran, Sampling Techniques, 3rd
// ed., 1977, ch. 6; from memory). The error is NaN from a single node,
// zero when every node ran.
func (r pyReport) estimate(spec []specNode) (float64, float64) {
	var sumT, sumC, allC float64
	var ts, cs []float64
	for _, nd := range spec {
		c := float64(len(nd.Candidates))
		allC += c
		if t, ok := r.NodeSeconds[fmt.Sprint(nd.Index)]; ok {
			sumT, sumC = sumT+t, sumC+c
			ts, cs = append(ts, t), append(cs, c)
		}
	}
	n, all := float64(len(ts)), float64(len(spec))
	if n == 0 || sumC == 0 {
		return math.NaN(), math.NaN()
	}
	ratio := sumT / sumC
	total := r.Fixed + ratio*allC
	if n < 2 {
		return total, math.NaN()
	}
	var ss float64
	for i := range ts {
		d := ts[i] - ratio*cs[i]
		ss += d * d
	}
	return total, math.Sqrt(all * all * (1 - n/all) / n * ss / (n - 1))
}

// runPython runs one pipeline of the reference script on spec, reading
// the data from csv when it is not empty.
func runPython(python, script, spec, pipeline, csv string) (pyReport, error) {
	args := []string{script, spec, pipeline}
	if csv != "" {
		args = append(args, csv)
	}
	cmd := exec.Command(python, args...)
	cmd.Env = append(os.Environ(), "OMP_NUM_THREADS=2", "OPENBLAS_NUM_THREADS=2")
	cmd.Stderr = os.Stderr
	out, err := cmd.Output()
	if err != nil {
		return pyReport{}, fmt.Errorf("python %s: %v", pipeline, err)
	}
	var r pyReport
	return r, json.Unmarshal(out, &r)
}

// pyWholeRun is one pipeline end to end: its CSV read and its whole
// process, the fit scaled up to every node.
type pyWholeRun struct{ read, whole float64 }

// command is one run of the built command on the case's CSV file.
type command struct {
	csv       string
	mb        float64 // size of the CSV file
	wall, cpu float64
	edges     int
	same      bool // the same edges as the fit alone
}

// runCommand writes the sample as a CSV file (shortest decimal form of
// every value, so that it reads back to the same bits) and times the
// command on it and the case's order file, as a user runs it.
func runCommand(cli, dir string, c benchCase, s *simulate.Sample, orderPath string, fitAlone *antecedent.Result) (*command, error) {
	path := filepath.Join(dir, c.name+".csv")
	f, err := os.Create(path)
	if err != nil {
		return nil, err
	}
	w := bufio.NewWriterSize(f, 1<<20)
	for j, name := range s.Names {
		if j > 0 {
			w.WriteByte(',')
		}
		w.WriteString(name)
	}
	w.WriteByte('\n')
	var buf []byte
	for i := range c.n {
		buf = buf[:0]
		for j, col := range s.Columns {
			if j > 0 {
				buf = append(buf, ',')
			}
			buf = strconv.AppendFloat(buf, col[i], 'g', -1, 64)
		}
		buf = append(buf, '\n')
		w.Write(buf)
	}
	if err := w.Flush(); err != nil {
		return nil, err
	}
	if err := f.Close(); err != nil {
		return nil, err
	}
	st, err := os.Stat(path)
	if err != nil {
		return nil, err
	}
	out := filepath.Join(dir, c.name+".command.json")
	cmd := exec.Command(cli, "discover", "--data", path, "--order", orderPath, "--json", out, "--quiet",
		"--selection", selection, "--folds", strconv.Itoa(folds), "--seed", "1")
	cmd.Stderr = os.Stderr
	t0 := time.Now()
	if err := cmd.Run(); err != nil {
		return nil, fmt.Errorf("antecedent discover: %v", err)
	}
	wall := time.Since(t0).Seconds()
	rf, err := os.Open(out)
	if err != nil {
		return nil, err
	}
	res, err := antecedent.ReadResult(rf)
	rf.Close()
	if err != nil {
		return nil, err
	}
	key := func(r *antecedent.Result) []string {
		var k []string
		for _, e := range r.Edges {
			k = append(k, e.From+"→"+e.To)
		}
		slices.Sort(k)
		return k
	}
	return &command{csv: path, mb: float64(st.Size()) / 1e6, wall: wall,
		cpu:   (cmd.ProcessState.UserTime() + cmd.ProcessState.SystemTime()).Seconds(),
		edges: len(res.Edges), same: slices.Equal(key(res), key(fitAlone))}, nil
}

// row is the case's row of the end-to-end table ("" without a command
// run); py holds the plain and the tuned pipeline, or nothing.
func (m *command) row(c benchCase, fitAlone float64, py []pyWholeRun) string {
	if m == nil {
		return ""
	}
	same := "the same as the fit alone"
	if !m.same {
		same = "DIFFERENT from the fit alone"
	}
	r := fmt.Sprintf("| %s | %.0f | %.2f (%.1f) | %.2f |", c.name, m.mb, m.wall, m.cpu, fitAlone)
	if len(py) < 2 {
		return r + fmt.Sprintf(" – | – | – | – | %d, %s |", m.edges, same)
	}
	return r + fmt.Sprintf(" %.1f, %.1f | %.1f, %.1f | %.1f× | %.1f× | %d, %s |", py[0].read, py[0].whole, py[1].read, py[1].whole,
		py[0].whole/m.wall, py[1].whole/m.wall, m.edges, same)
}
