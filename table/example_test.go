package table_test

import (
	"fmt"
	"log"
	"strings"

	"github.com/antecedent-lab/antecedent/table"
)

// ExampleReadCSV reads a small table with a numeric, a 0/1, a two-valued
// text and a three-valued text column, and a missing cell.
func ExampleReadCSV() {
	in := `age,smoker,sex,site
61,1,female,north
70,0,male,south
55,1,male,east
48,,female,north
`
	d, err := table.ReadCSV(strings.NewReader(in), nil)
	if err != nil {
		log.Fatal(err)
	}
	for _, v := range d.Variables() {
		fmt.Println(v.Name, v.Kind, v.Levels)
	}
	fmt.Println(d.Missing())
	// Output:
	// age continuous []
	// smoker binary []
	// sex binary [female male]
	// site categorical [east north south]
	// table: missing values: "smoker" has 1 (rows 4); choose a missing-value policy (complete-case or available-case) to proceed
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
	all, _ := d.Usable(table.CompleteCase, nil)
	ab, _ := d.Usable(table.AvailableCase, []int{0, 1})
	_, err = d.Usable(table.MissingIsError, nil)
	fmt.Println(all, ab, err != nil)
	// Output:
	// [0 3] [0 2 3] true
}
