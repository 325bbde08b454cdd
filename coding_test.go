package antecedent_test

import (
	"context"
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/order"
	"github.com/antecedent-lab/antecedent/table"
)

// TestEffectScales checks that every effect says its scale: a continuous
// parent per unit and per standard deviation, a binary parent for its
// coded-1 value against the reference (no standard deviation), each level
// of a categorical parent against the reference (issue 13).
func TestEffectScales(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 4))
	var b strings.Builder
	b.WriteString("dose,treated,site,y\n")
	for range 600 {
		dose := 10 + 3*r.NormFloat64()
		treated := []string{"no", "yes"}[r.IntN(2)]
		site := []string{"north", "south", "east"}[r.IntN(3)]
		y := 0.5*dose + r.NormFloat64()
		if treated == "yes" {
			y += 2
		}
		if site == "south" {
			y -= 3
		}
		fmt.Fprintf(&b, "%.3f,%s,%s,%.3f\n", dose, treated, site, y)
	}
	d, err := table.ReadCSV(strings.NewReader(b.String()), &table.CSVOptions{Reference: map[string]string{"site": "east"}})
	if err != nil {
		t.Fatal(err)
	}
	res, err := antecedent.DiscoverContext(context.Background(), d, &order.Order{Tiers: [][]string{{"dose", "treated", "site"}, {"y"}}}, &antecedent.Config{Folds: 5})
	if err != nil {
		t.Fatal(err)
	}
	y, _ := res.Node("y")
	yc, _ := d.Column("y")
	sdY := sd(yc)
	want := map[string]struct {
		contrast string
		perSD    float64 // the factor from estimate to standardised effect
	}{
		"dose":       {"per unit", sd(mustColumn(t, d, "dose")) / sdY},
		"treated":    {`"yes" vs "no"`, 1 / sdY},
		"site=north": {`"north" vs "east"`, 1 / sdY},
		"site=south": {`"south" vs "east"`, 1 / sdY},
	}
	if len(y.Effects) != len(want) {
		t.Fatalf("effects %+v", y.Effects)
	}
	for _, e := range y.Effects {
		w := want[e.Term]
		if e.Contrast != w.contrast {
			t.Errorf("%s: contrast %q, want %q", e.Term, e.Contrast, w.contrast)
		}
		// The refit standardises with the sample standard deviation;
		// allow for its n−1 against our n.
		if got := float64(e.Standardized) / float64(e.Estimate); math.Abs(got/w.perSD-1) > 0.01 {
			t.Errorf("%s: standardised/estimate %g, want %g", e.Term, got, w.perSD)
		}
	}
}

func mustColumn(t *testing.T, d *table.Dataset, name string) []float64 {
	c, err := d.Column(name)
	if err != nil {
		t.Fatal(err)
	}
	return c
}

func sd(x []float64) float64 {
	var m, s float64
	for _, v := range x {
		m += v
	}
	m /= float64(len(x))
	for _, v := range x {
		s += (v - m) * (v - m)
	}
	return math.Sqrt(s / float64(len(x)))
}
