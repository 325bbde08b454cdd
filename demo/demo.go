package demo

import (
	"bytes"
	"embed"
	"fmt"
	"io"
	"strconv"
	"strings"

	"github.com/antecedent-lab/antecedent/dag"
	"github.com/antecedent-lab/antecedent/order"
	"github.com/antecedent-lab/antecedent/simulate"
	"github.com/antecedent-lab/antecedent/table"
)

// The demonstration scenario: a hospital network's study of recovery after
// joint replacement. The data are synthetic, drawn by package simulate from
// Model with Seed; nothing in them describes real patients.
const (
	Seed = 20261202
	Rows = 5000
)

//go:embed testdata
var files embed.FS

// Model returns the known graph behind the demonstration data: 18
// variables in six tiers (patient traits, baseline conditions, surgical
// choices, in-hospital complications, discharge, outcomes after discharge). Effects are on natural
// scales: years, kg/m², g/dL, minutes, days, and log odds for binary
// variables.
func Model() *simulate.Model {
	p := func(names ...string) []string { return names }
	w := func(ws ...float64) []float64 { return ws }
	return &simulate.Model{Nodes: []simulate.Node{
		{Name: "age", Intercept: 68, NoiseSD: 9},
		{Name: "female", Binary: true, Prevalence: 0.55},
		{Name: "smoker", Binary: true, Prevalence: 0.15},

		{Name: "bmi", Parents: p("age", "female"), Weights: w(-0.07, 0.8), Intercept: 33.5, NoiseSD: 4.5},
		{Name: "diabetes", Binary: true, Parents: p("age", "smoker"), Weights: w(0.04, 0.5), Prevalence: 0.2},
		{Name: "heart_disease", Binary: true, Parents: p("age", "smoker", "female"), Weights: w(0.06, 0.9, -0.5), Prevalence: 0.13},
		{Name: "kidney_disease", Binary: true, Parents: p("age"), Weights: w(0.07), Prevalence: 0.08},
		{Name: "hemoglobin", Parents: p("age", "female"), Weights: w(-0.03, -1.3), Intercept: 16.5, NoiseSD: 1.1},

		{Name: "general_anaesthesia", Binary: true, Parents: p("heart_disease", "bmi"), Weights: w(-0.9, 0.05), Prevalence: 0.35},
		{Name: "operation_minutes", Parents: p("bmi"), Weights: w(2.0), Intercept: 40, NoiseSD: 18},
		{Name: "tranexamic_acid", Binary: true, Parents: p("kidney_disease"), Weights: w(-1.5), Prevalence: 0.7},
		{Name: "cemented_implant", Binary: true, Parents: p("age"), Weights: w(0.06), Prevalence: 0.4},

		{Name: "transfusion", Binary: true, Parents: p("hemoglobin", "tranexamic_acid", "operation_minutes"), Weights: w(-0.7, -1.0, 0.015), Prevalence: 0.08},
		{Name: "wound_infection", Binary: true, Parents: p("diabetes", "bmi", "smoker", "operation_minutes"), Weights: w(0.9, 0.06, 0.8, 0.012), Prevalence: 0.05},
		{Name: "delirium", Binary: true, Parents: p("age", "general_anaesthesia"), Weights: w(0.09, 0.8), Prevalence: 0.07},
		{Name: "length_of_stay", Parents: p("age", "transfusion", "wound_infection", "delirium"), Weights: w(0.03, 1.0, 2.5, 1.8), Intercept: 0.8, NoiseSD: 1.2},

		{Name: "readmitted_30d", Binary: true, Parents: p("wound_infection", "heart_disease", "delirium", "length_of_stay"), Weights: w(1.6, 0.7, 0.6, 0.15), Prevalence: 0.09},
		{Name: "mobility_90d", Parents: p("age", "bmi", "delirium", "wound_infection"), Weights: w(-0.35, -0.5, -6, -8), Intercept: 125, NoiseSD: 8},
	}}
}

// Order returns the time order of the demonstration scenario.
func Order() *order.Order {
	return &order.Order{
		Labels: []string{"traits", "baseline", "surgery", "in-hospital", "discharge", "outcomes"},
		Tiers: [][]string{
			{"age", "female", "smoker"},
			{"bmi", "diabetes", "heart_disease", "kidney_disease", "hemoglobin"},
			{"general_anaesthesia", "operation_minutes", "tranexamic_acid", "cemented_implant"},
			{"transfusion", "wound_infection", "delirium"},
			{"length_of_stay"},
			{"readmitted_30d", "mobility_90d"},
		},
	}
}

// TextCodes names the binary variables that the demonstration CSV writes
// as text, as exports often do, with the words for 0 and 1. Read back,
// "no" is their reference level and "yes" is coded 1, as in Model.
var TextCodes = map[string][2]string{"readmitted_30d": {"no", "yes"}}

// WriteFiles writes the demonstration data (CSV), order (text form) and
// known graph (edge-list CSV) drawn from Model with Seed.
func WriteFiles(data, orderText, truth io.Writer) error {
	m := Model()
	s, err := m.Sample(Rows, Seed)
	if err != nil {
		return err
	}
	var b strings.Builder
	b.WriteString(strings.Join(s.Names, ",") + "\n")
	for i := range Rows {
		for j, c := range s.Columns {
			if j > 0 {
				b.WriteByte(',')
			}
			if t, ok := TextCodes[m.Nodes[j].Name]; ok {
				b.WriteString(t[int(c[i])])
			} else if m.Nodes[j].Binary {
				b.WriteString(strconv.Itoa(int(c[i])))
			} else {
				b.WriteString(strconv.FormatFloat(c[i], 'f', 2, 64))
			}
		}
		b.WriteByte('\n')
	}
	if _, err := io.WriteString(data, b.String()); err != nil {
		return err
	}
	if _, err := io.WriteString(orderText, "# Demonstration order: synthetic joint-replacement study (antecedent).\n"); err != nil {
		return err
	}
	if err := Order().WriteText(orderText); err != nil {
		return err
	}
	g, err := m.Graph()
	if err != nil {
		return err
	}
	fmt.Fprintln(truth, "from,to,weight")
	for _, e := range g.Edges() {
		fmt.Fprintf(truth, "%s,%s,%g\n", e.From, e.To, e.Coefficient)
	}
	return nil
}

// Load returns the demonstration dataset, its order and its known graph,
// from the copies embedded in the package. The data are synthetic.
func Load() (*table.Dataset, *order.Order, *dag.Graph, error) {
	data, err := File("joint_replacement.csv")
	if err != nil {
		return nil, nil, nil, err
	}
	d, err := table.ReadCSV(bytes.NewReader(data), nil)
	if err != nil {
		return nil, nil, nil, err
	}
	ot, err := File("joint_replacement.order")
	if err != nil {
		return nil, nil, nil, err
	}
	o, err := order.Parse(bytes.NewReader(ot))
	if err != nil {
		return nil, nil, nil, err
	}
	tr, err := File("joint_replacement_truth.csv")
	if err != nil {
		return nil, nil, nil, err
	}
	g, err := dag.ReadEdgeCSV(bytes.NewReader(tr))
	if err != nil {
		return nil, nil, nil, err
	}
	return d, o, g, nil
}

// File returns an embedded demonstration file by base name
// ("joint_replacement.csv", "joint_replacement.order",
// "joint_replacement_truth.csv").
func File(name string) ([]byte, error) {
	return files.ReadFile("testdata/" + name)
}
