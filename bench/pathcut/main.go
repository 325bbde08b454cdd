// Command pathcut checks that stopping cross-validated paths past their
// minimum (cv.Settings.WholePath false, the default) changes no answer: it
// runs Discover on simulated tiered networks, writes each node's parents
// and its best, one-SE and selected penalties, and compares two such files.
//
//	go run ./bench/pathcut -out cut.json                 # the default
//	go run ./bench/pathcut -whole -out whole.json        # every penalty
//	go run ./bench/pathcut -compare whole.json,cut.json
//	go run ./bench/pathcut -windows -n 5000 -p 40 -networks 3   # the rule's window on whole paths
//
// The same command built from an older commit (without -whole) gives the
// "before" file for a comparison across commits. Networks are drawn by
// package simulate (5 tiers, edge probability 2/p) with fixed seeds, under
// both the adaptive (default) and the plain lasso selections, so that the
// first stage's minimum is checked as well as the second's.
package main

import (
	"context"
	"encoding/json"
	"flag"
	"fmt"
	"log"
	"os"
	"strings"
	"time"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/simulate"
	"github.com/antecedent-lab/antecedent/table"
)

// nodeAnswer is what must not change.
type nodeAnswer struct {
	Parents              []string
	Best, OneSE, Penalty float64
	CurvePoints          int
	Fitted               bool
}

type setting struct {
	n, p   int
	binary float64
}

func main() {
	out := flag.String("out", "", "write the answers to this JSON file")
	whole := flag.Bool("whole", false, "fit every penalty (cv.Settings.WholePath)")
	networks := flag.Int("networks", 4, "networks per setting")
	compare := flag.String("compare", "", "compare two answer files: a.json,b.json")
	win := flag.Bool("windows", false, "check the rule's window on whole binomial paths instead (see -n, -p)")
	n := flag.Int("n", 5_000, "rows, with -windows")
	p := flag.Int("p", 40, "variables, with -windows")
	flag.Parse()
	if *win {
		windows(*n, *p, *networks)
		return
	}
	if *compare != "" {
		if err := compareFiles(*compare); err != nil {
			log.Fatal(err)
		}
		return
	}
	settings := []setting{{2_000, 30, 1}, {2_000, 30, 0.5}, {5_000, 40, 1}, {5_000, 40, 0.5}, {1_000, 20, 1}}
	answers := map[string]nodeAnswer{}
	start := time.Now()
	for _, s := range settings {
		for seed := uint64(1); seed <= uint64(*networks); seed++ {
			m, o, err := simulate.Random(simulate.RandomSettings{Variables: s.p, Tiers: 5, BinaryShare: s.binary}, seed)
			if err != nil {
				log.Fatal(err)
			}
			sample, err := m.Sample(s.n, seed+1000)
			if err != nil {
				log.Fatal(err)
			}
			d, err := table.NewDataset(sample.Names, sample.Columns)
			if err != nil {
				log.Fatal(err)
			}
			for _, sel := range []antecedent.Selection{antecedent.AdaptiveLasso, antecedent.PenalisedLasso} {
				cfg := &antecedent.Config{Seed: seed, Folds: 10, Selection: sel}
				setWhole(cfg, *whole)
				res, err := antecedent.DiscoverContext(context.Background(), d, o, cfg)
				if err != nil {
					log.Fatal(err)
				}
				for _, nd := range res.Nodes {
					key := fmt.Sprintf("n%d p%d binary%g seed%d %s %s", s.n, s.p, s.binary, seed, sel, nd.Name)
					answers[key] = nodeAnswer{Parents: nd.Parents, Best: finite(float64(nd.BestPenalty)), OneSE: finite(float64(nd.OneSEPenalty)),
						Penalty: finite(float64(nd.Penalty)), CurvePoints: len(nd.Curve), Fitted: nd.Fitted}
				}
			}
		}
	}
	fmt.Fprintf(os.Stderr, "%d node fits in %.1f s\n", len(answers), time.Since(start).Seconds())
	if *out != "" {
		b, err := json.MarshalIndent(answers, "", " ")
		if err != nil {
			log.Fatal(err)
		}
		if err := os.WriteFile(*out, b, 0o644); err != nil {
			log.Fatal(err)
		}
	}
}

func compareFiles(list string) error {
	names := strings.Split(list, ",")
	if len(names) != 2 {
		return fmt.Errorf("want two files, got %q", list)
	}
	var a, b map[string]nodeAnswer
	for i, dst := range []*map[string]nodeAnswer{&a, &b} {
		buf, err := os.ReadFile(names[i])
		if err != nil {
			return err
		}
		if err := json.Unmarshal(buf, dst); err != nil {
			return err
		}
	}
	if len(a) != len(b) {
		return fmt.Errorf("%d and %d node fits", len(a), len(b))
	}
	var differ, fitted, points, pointsB int
	for k, x := range a {
		y, ok := b[k]
		if !ok {
			return fmt.Errorf("%s missing from %s", k, names[1])
		}
		if x.Fitted {
			fitted++
		}
		points += x.CurvePoints
		pointsB += y.CurvePoints
		same := x.Fitted == y.Fitted && strings.Join(x.Parents, ",") == strings.Join(y.Parents, ",") &&
			close(x.Best, y.Best) && close(x.OneSE, y.OneSE) && close(x.Penalty, y.Penalty)
		if !same {
			differ++
			fmt.Printf("differs: %s\n  %+v\n  %+v\n", k, x, y)
		}
	}
	fmt.Printf("%d node fits (%d fitted): %d differ in parents or penalties; curve points %d → %d (%.0f%%)\n",
		len(a), fitted, differ, points, pointsB, 100*float64(pointsB)/float64(max(points, 1)))
	if differ > 0 {
		return fmt.Errorf("%d node fits differ", differ)
	}
	return nil
}

// finite returns x, or −1 for the NaN penalties of unfitted nodes (JSON
// has no NaN).
func finite(x float64) float64 {
	if x != x {
		return -1
	}
	return x
}

// close reports whether two penalties agree to 1e-9 relative (NaN equals
// NaN).
func close(x, y float64) bool {
	if x != x || y != y {
		return x != x && y != y
	}
	d := x - y
	if d < 0 {
		d = -d
	}
	return d <= 1e-9*max(x, y, -x, -y)
}
