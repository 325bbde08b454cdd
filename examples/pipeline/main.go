// Command pipeline shows a research-pipeline step: it reads a CSV file and
// an order file, runs Discover, and writes every export (result JSON, DOT,
// GraphML and an edge table) to an output folder.
//
//	go run ./examples/pipeline -data study.csv -order study.order -out results/
package main

import (
	"context"
	"encoding/csv"
	"flag"
	"fmt"
	"log"
	"os"
	"path/filepath"
	"strconv"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/order"
	"github.com/antecedent-lab/antecedent/table"
)

func run(ctx context.Context, dataPath, orderPath, outDir string, seed uint64) (*antecedent.Result, error) {
	df, err := os.Open(dataPath)
	if err != nil {
		return nil, err
	}
	defer df.Close()
	d, err := table.ReadCSV(df, nil)
	if err != nil {
		return nil, err
	}
	of, err := os.Open(orderPath)
	if err != nil {
		return nil, err
	}
	defer of.Close()
	o, err := order.Parse(of)
	if err != nil {
		return nil, err
	}
	res, err := antecedent.DiscoverContext(ctx, d, o, &antecedent.Config{Seed: seed})
	if err != nil {
		return nil, err
	}
	if err := os.MkdirAll(outDir, 0o755); err != nil {
		return nil, err
	}
	jf, err := os.Create(filepath.Join(outDir, "result.json"))
	if err != nil {
		return nil, err
	}
	if err := res.WriteJSON(jf); err != nil {
		jf.Close()
		return nil, err
	}
	jf.Close()
	g, err := res.Graph()
	if err != nil {
		return nil, err
	}
	dot, err := g.DOT("network")
	if err != nil {
		return nil, err
	}
	if err := os.WriteFile(filepath.Join(outDir, "network.dot"), dot, 0o644); err != nil {
		return nil, err
	}
	gf, err := os.Create(filepath.Join(outDir, "network.graphml"))
	if err != nil {
		return nil, err
	}
	if err := g.GraphML(gf); err != nil {
		gf.Close()
		return nil, err
	}
	gf.Close()
	ef, err := os.Create(filepath.Join(outDir, "edges.csv"))
	if err != nil {
		return nil, err
	}
	w := csv.NewWriter(ef)
	w.Write([]string{"from", "to", "coefficient", "lower", "upper", "standardized"})
	f := func(x float64) string { return strconv.FormatFloat(x, 'g', 6, 64) }
	for _, e := range res.Edges {
		w.Write([]string{e.From, e.To, f(e.Coefficient), f(e.Lower), f(e.Upper), f(e.Standardized)})
	}
	w.Flush()
	if err := w.Error(); err != nil {
		ef.Close()
		return nil, err
	}
	return res, ef.Close()
}

func main() {
	data := flag.String("data", "", "CSV file")
	ord := flag.String("order", "", "order file")
	out := flag.String("out", "results", "output folder")
	seed := flag.Uint64("seed", 1, "seed")
	flag.Parse()
	res, err := run(context.Background(), *data, *ord, *out, *seed)
	if err != nil {
		log.Fatal(err)
	}
	fmt.Printf("%d edges among %d variables written to %s\n", len(res.Edges), len(res.Nodes), *out)
}
