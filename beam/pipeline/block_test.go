package pipeline

import (
	"math"
	"reflect"
	"strconv"
	"strings"
	"testing"

	"github.com/antecedent-lab/antecedent/table"
)

// TestRebuiltTableEqualsReadCSV checks that summarising, encoding and
// rebuilding shards gives the dataset table.ReadCSV reads from their
// concatenation (the outside reference here is the core's own reader):
// a column that turns to text in a later shard keeps the number's text
// before and the cell's own text after; a shard may hold one level of a
// text column, or no rows.
func TestRebuiltTableEqualsReadCSV(t *testing.T) {
	header := "site,sex,flag,x"
	shards := [][]string{
		{"north,F,true,0.5", "south,F,false,1"},
		{},
		{"east,F,TRUE,NA", "north,F,0,2"},
		{"south,M,1,3", "NA,F,false,4"},
	}
	var all []string
	var blocks []block
	var sums []summary
	cells := make([]*shardCells, len(shards))
	for i, rows := range shards {
		all = append(all, rows...)
		c, err := parseShard(strings.NewReader(header+"\n"+strings.Join(rows, "\n")), "test")
		if err != nil {
			t.Fatal(err)
		}
		cells[i] = c
		s, err := summarise(i, c)
		if err != nil {
			t.Fatal(err)
		}
		sums = append(sums, s)
	}
	sc := buildSchema(sums)
	if sc.Problem != "" {
		t.Fatal(sc.Problem)
	}
	for i, c := range cells {
		b, err := encodeShard(&sc, i, c)
		if err != nil {
			t.Fatal(err)
		}
		blocks = append(blocks, b)
	}
	got, err := dataset(&sc, blocks)
	if err != nil {
		t.Fatal(err)
	}
	want, err := table.ReadCSV(strings.NewReader(header+"\n"+strings.Join(all, "\n")), nil)
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(got.Variables(), want.Variables()) {
		t.Errorf("variables\n got %+v\nwant %+v", got.Variables(), want.Variables())
	}
	if !sameColumns(got.Columns(), want.Columns()) {
		t.Errorf("columns\n got %v\nwant %v", got.Columns(), want.Columns())
	}
	// 0/1 columns travel as bits: flag's block in shard 3 is two bits.
	if c := blocks[3].Cols[2]; c.Bits == nil || c.Floats != nil {
		t.Errorf("flag not encoded as bits: %+v", c)
	}
}

func sameColumns(a, b [][]float64) bool {
	if len(a) != len(b) {
		return false
	}
	for j := range a {
		if len(a[j]) != len(b[j]) {
			return false
		}
		for i := range a[j] {
			x, y := a[j][i], b[j][i]
			if x != y && !(math.IsNaN(x) && math.IsNaN(y)) {
				return false
			}
		}
	}
	return true
}

// TestTilesRoundTrip checks that moments cut into tiles and summed by key
// come back as the moments of the union (a table wider than one tile).
func TestTilesRoundTrip(t *testing.T) {
	const q = tileSize + 7
	var names []string
	for j := range q {
		names = append(names, "v"+strconv.Itoa(j))
	}
	rows := []string{}
	for i := range 40 {
		var c []string
		for j := range q {
			c = append(c, strconv.Itoa((i*j+i)%10)+"."+strconv.Itoa((i+j)%7))
		}
		rows = append(rows, strings.Join(c, ","))
	}
	header := strings.Join(names, ",")
	var sums []summary
	var cells []*shardCells
	for i, part := range [][]string{rows[:13], rows[13:]} {
		c, err := parseShard(strings.NewReader(header+"\n"+strings.Join(part, "\n")), "test")
		if err != nil {
			t.Fatal(err)
		}
		s, err := summarise(i, c)
		if err != nil {
			t.Fatal(err)
		}
		cells, sums = append(cells, c), append(sums, s)
	}
	sc := buildSchema(sums)
	ids := make([]int, sc.Rows)
	for i := range ids {
		ids[i] = i % 3
	}
	total := map[string][]float64{}
	for i, c := range cells {
		b, err := encodeShard(&sc, i, c)
		if err != nil {
			t.Fatal(err)
		}
		tiles, err := blockMoments(&sc, &b, ids, 3)
		if err != nil {
			t.Fatal(err)
		}
		for k, v := range tiles {
			if old, ok := total[k]; ok {
				v = bytesToFloats(addBytes(floatsToBytes(old), floatsToBytes(v)))
			}
			total[k] = v
		}
	}
	held, err := foldMoments(sc.shift(), 3, total)
	if err != nil {
		t.Fatal(err)
	}
	all, _ := parseShard(strings.NewReader(header+"\n"+strings.Join(rows, "\n")), "test")
	d, err := table.ReadCSV(strings.NewReader(header+"\n"+strings.Join(rows, "\n")), nil)
	if err != nil || all.rows() != 40 {
		t.Fatal(err)
	}
	cols := d.Columns()
	for k, m := range held {
		for a := range q {
			for b := range q {
				var want float64
				for i := range ids {
					if ids[i] == k {
						want += (cols[a][i] - m.Shift[a]) * (cols[b][i] - m.Shift[b])
					}
				}
				if math.Abs(m.Cross[a*q+b]-want) > 1e-9*math.Max(1, math.Abs(want)) {
					t.Fatalf("fold %d cross %d,%d = %g, want %g", k, a, b, m.Cross[a*q+b], want)
				}
			}
		}
	}
}

// TestMixedColumnRefused checks that a column of numbers with stray text
// is refused, as the single-machine reader refuses it, never re-typed.
func TestMixedColumnRefused(t *testing.T) {
	header := "age,y"
	shards := [][]string{{"61,1", "70,0"}, {"12O,1", "55,0"}}
	var sums []summary
	for i, rows := range shards {
		c, err := parseShard(strings.NewReader(header+"\n"+strings.Join(rows, "\n")), "test")
		if err != nil {
			t.Fatal(err)
		}
		s, err := summarise(i, c)
		if err != nil {
			t.Fatal(err)
		}
		sums = append(sums, s)
	}
	if sc := buildSchema(sums); !strings.Contains(sc.Problem, `"age" mixes numbers and text`) {
		t.Errorf("problem %q", sc.Problem)
	}
	if _, err := table.ReadCSV(strings.NewReader(header+"\n61,1\n70,0\n12O,1\n55,0\n"), nil); err == nil {
		t.Error("the single-machine reader accepted the column")
	}
}
