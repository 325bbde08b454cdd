package table_test

import (
	"errors"
	"fmt"
	"log"
	"math"
	"strings"

	"github.com/antecedent-lab/antecedent/table"
)

// ExampleReadCSV reads a small table with a numeric, a 0/1, a two-valued
// text and a three-valued text column, and a missing cell, choosing the
// reference level of site; each variable's coding says which value is 1
// and what effects are measured against.
func ExampleReadCSV() {
	in := `age,smoker,readmitted,site
61,1,no,north
70,0,yes,south
55,1,no,east
48,,no,north
`
	d, err := table.ReadCSV(strings.NewReader(in), &table.CSVOptions{Reference: map[string]string{"site": "east"}})
	if err != nil {
		log.Fatal(err)
	}
	for _, v := range d.Variables() {
		fmt.Println(strings.TrimSpace(fmt.Sprintln(v.Name, v.Kind, v.Levels, v.Coding())))
	}
	fmt.Println(d.Missing())
	// Output:
	// age continuous []
	// smoker binary [0 1] 1 vs 0 (reference)
	// readmitted binary [no yes] "yes" = 1, "no" = 0 (reference)
	// site categorical [east north south] "north", "south" each vs "east" (reference)
	// table: missing values: "smoker" has 1 missing value (line 5); choose the missing-value policy complete-case or available-case to proceed
}

// ExampleCSVError_Describe shows an odd cell reported with its line and
// column, and the fixes written as a program's own settings.
func ExampleCSVError_Describe() {
	in := "age,smoker\n61,1\n7O,0\n55,1\n"
	_, err := table.ReadCSV(strings.NewReader(in), nil)
	var ce *table.CSVError
	if errors.As(err, &ce) {
		fmt.Println(ce.Describe(func(f table.Fix) string { return "--as-is " + f.Value }))
	}
	// Output:
	// CSV line 3, column 1 ("age"): "7O" is not a number, and the column's other 2 values are; correct the file, or --as-is age (to read the column as text)
}

// ExampleDataset_Usable shows the rows each missing-value policy keeps.
func ExampleDataset_Usable() {
	nan := func() float64 { var z float64; return z / z }()
	d, err := table.NewDataset([]string{"a", "b", "c"}, [][]float64{
		{1, 2, 3, 4},
		{0, nan, 1, 1},
		{5, 6, nan, 8},
	})
	if err != nil {
		log.Fatal(err)
	}
	all, _ := d.Usable(table.MissingCompleteCase, nil)
	ab, _ := d.Usable(table.MissingAvailableCase, []int{0, 1})
	_, err = d.Usable(table.MissingRefused, nil)
	fmt.Println(all, ab, err != nil)
	// Output:
	// [0 3] [0 2 3] true
}

// ExampleDataset_SetReference measures a three-level variable's effects
// against a chosen level instead of the default (the most common one).
func ExampleDataset_SetReference() {
	d := &table.Dataset{}
	if err := d.AddText("stage", []string{"early", "late", "early", "middle", "early"}, 0); err != nil {
		log.Fatal(err)
	}
	fmt.Println(d.Variables()[0].Coding())
	if err := d.SetReference("stage", "late"); err != nil {
		log.Fatal(err)
	}
	fmt.Println(d.Variables()[0].Coding())
	for _, c := range d.Terms(0) {
		fmt.Println(d.TermName(c), d.Contrast(c), d.Columns()[c])
	}
	// Output:
	// "late", "middle" each vs "early" (reference)
	// "early", "middle" each vs "late" (reference)
	// stage=early "early" vs "late" [1 0 1 0 1]
	// stage=middle "middle" vs "late" [0 0 0 1 0]
}

// ExampleBuilder feeds typed cells, as a reader of a typed source does:
// the column of booleans becomes binary false/true, the text column's
// levels are decided as ReadCSV decides them, and a null is missing.
func ExampleBuilder() {
	b, err := table.NewBuilder([]string{"dose", "treated", "arm"}, nil, "result row")
	if err != nil {
		fmt.Println(err)
		return
	}
	doses := []float64{1.5, 2, math.NaN(), 3.25}
	arms := []string{"control", "drug", "drug", "placebo"}
	for i := range 4 {
		b.Number(0, doses[i])
		if i == 2 {
			b.Missing(1)
		} else {
			b.Bool(1, i%2 == 1)
		}
		b.Text(2, arms[i])
	}
	d, err := b.Dataset()
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, v := range d.Variables() {
		fmt.Println(strings.TrimSpace(fmt.Sprintf("%s: %v %s", v.Name, v.Kind, v.Coding())))
	}
	// Output:
	// dose: continuous
	// treated: binary "true" = 1, "false" = 0 (reference)
	// arm: categorical "drug", "placebo" each vs "control" (reference)
}
