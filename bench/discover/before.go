package main

import (
	"encoding/json"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strings"
)

// baseline is this harness built from an earlier commit (flag -before),
// whose child mode fits the same data as ours for a before-and-after
// table from one command.
type baseline struct {
	rev, bin string
	// selects reports whether that build's child takes -selection;
	// builds from before the flag ran their one selection, the textbook
	// lasso.
	selects bool
}

// buildBaseline checks out rev into a temporary work tree of the
// repository holding this harness, builds its bench/discover there and
// removes the work tree.
func buildBaseline(repo, rev, dir string) (*baseline, error) {
	tree := filepath.Join(dir, "before-tree")
	git := func(args ...string) error {
		cmd := exec.Command("git", append([]string{"-C", repo}, args...)...)
		cmd.Stderr = os.Stderr
		return cmd.Run()
	}
	if err := git("worktree", "add", "--detach", "--quiet", tree, rev); err != nil {
		return nil, fmt.Errorf("checking out %s: %v", rev, err)
	}
	defer git("worktree", "remove", "--force", tree)
	b := &baseline{rev: rev, bin: filepath.Join(dir, "before")}
	build := exec.Command("go", "build", "-o", b.bin, "./bench/discover")
	build.Dir = tree
	build.Stderr = os.Stderr
	if err := build.Run(); err != nil {
		return nil, fmt.Errorf("building bench/discover at %s: %v", rev, err)
	}
	help, _ := exec.Command(b.bin, "-h").CombinedOutput()
	b.selects = strings.Contains(string(help), "-selection")
	return b, nil
}

// compare fits the case's data files with the baseline's child and
// returns the before-and-after row against this build's report ours and
// result file resPath, over the named nodes.
func (b *baseline) compare(dir string, c benchCase, dataPath, orderPath, resPath string, ours childReport, nodes []string) (string, error) {
	out := filepath.Join(dir, c.name+".before.json")
	args := []string{"-child", "-data", dataPath, "-n", fmt.Sprint(c.n), "-p", fmt.Sprint(c.p), "-order", orderPath, "-out", out}
	if b.selects {
		args = append(args, "-selection", selection)
	}
	stdout, err := exec.Command(b.bin, args...).Output()
	if err != nil {
		return "", fmt.Errorf("child of %s: %v", b.rev, err)
	}
	var theirs childReport
	if err := json.Unmarshal(stdout, &theirs); err != nil {
		return "", err
	}
	before, err := readParents(out)
	if err != nil {
		return "", err
	}
	after, err := readParents(resPath)
	if err != nil {
		return "", err
	}
	return beforeRow(c, theirs, ours, edges(before), edges(after), sameParents(before, after, nodes), len(nodes)), nil
}

// readParents reads a result file's edges as parent sets by child; only
// the edges' end points are read, which every version writes alike.
func readParents(path string) (map[string][]string, error) {
	data, err := os.ReadFile(path)
	if err != nil {
		return nil, err
	}
	var r struct {
		Edges []struct {
			From string `json:"from"`
			To   string `json:"to"`
		} `json:"edges"`
	}
	if err := json.Unmarshal(data, &r); err != nil {
		return nil, fmt.Errorf("%s: %v", path, err)
	}
	parents := map[string][]string{}
	for _, e := range r.Edges {
		parents[e.To] = append(parents[e.To], e.From)
	}
	for _, ps := range parents {
		slices.Sort(ps)
	}
	return parents, nil
}

// edges counts the edges of parent sets by child.
func edges(parents map[string][]string) int {
	n := 0
	for _, ps := range parents {
		n += len(ps)
	}
	return n
}

// sameParents counts the nodes whose parent sets agree, over the given
// node names.
func sameParents(a, b map[string][]string, nodes []string) int {
	same := 0
	for _, v := range nodes {
		if slices.Equal(a[v], b[v]) {
			same++
		}
	}
	return same
}

// beforeRow formats a case's before-and-after row.
func beforeRow(c benchCase, before, after childReport, edgesBefore, edgesAfter, same, nodes int) string {
	cpu := func(r childReport) string {
		if r.CPU == 0 {
			return "–" // builds from before the CPU column
		}
		return fmt.Sprintf("%.1f", r.CPU)
	}
	return fmt.Sprintf("| %s | %.2f (%s) | %.2f (%s) | %.2f× | %.0f → %.0f | %d / %d | %d/%d |",
		c.name, before.Seconds, cpu(before), after.Seconds, cpu(after), before.Seconds/after.Seconds,
		float64(before.PeakKiB)/1024, float64(after.PeakKiB)/1024, edgesBefore, edgesAfter, same, nodes)
}
