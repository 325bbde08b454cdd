package pipeline

import (
	"fmt"
	"maps"
	"slices"

	"github.com/antecedent-lab/antecedent/table"
)

// schema is the table's layout, formed from every shard's summary.
type schema struct {
	Names   []string
	Offsets []int // first global row of each shard
	Rows    int
	Vars    []varSchema
	Missing bool   // some cell is missing
	Numbers bool   // some column holds numbers other than 0 and 1
	Problem string // why the table cannot be read ("" when it can)
}

// varSchema is one variable's layout.
type varSchema struct {
	Text bool // a text column: Levels hold its sorted distinct values
	// TextShard and TextRow locate the table's first text cell: cells of
	// earlier shards, and of that shard before that row, keep their
	// number's text.
	TextShard, TextRow int
	Levels             []string
	Terms              int       // design columns
	Shift              []float64 // of each design column: near its mean
}

// buildSchema merges the summaries of every shard, in shard order.
func buildSchema(sums []summary) schema {
	slices.SortFunc(sums, func(a, b summary) int { return a.Index - b.Index })
	var sc schema
	if len(sums) == 0 {
		sc.Problem = "no shards"
		return sc
	}
	sc.Names = sums[0].Names
	for _, s := range sums {
		if !slices.Equal(s.Names, sc.Names) {
			sc.Problem = fmt.Sprintf("shard %d has header %q, shard 0 has %q", s.Index, s.Names, sc.Names)
			return sc
		}
		sc.Offsets = append(sc.Offsets, sc.Rows)
		sc.Rows += s.Rows
	}
	if sc.Rows == 0 {
		sc.Problem = "header only, no data rows"
		return sc
	}
	for j, name := range sc.Names {
		v := varSchema{TextShard: -1, TextRow: -1}
		var sum float64
		var present, missing int
		nonBinary := false
		for t, s := range sums {
			c := s.Columns[j]
			missing += c.Missing
			if v.TextShard < 0 && c.FirstText >= 0 {
				v.TextShard, v.TextRow = t, c.FirstText
			}
			sum += c.Sum
			present += c.Present
			nonBinary = nonBinary || c.NonBinary
		}
		sc.Missing = sc.Missing || missing > 0
		if v.TextShard < 0 {
			v.Terms = 1
			v.Shift = []float64{sum / float64(max(present, 1))}
			sc.Numbers = sc.Numbers || nonBinary
			sc.Vars = append(sc.Vars, v)
			continue
		}
		v.Text = true
		levels := map[string]bool{}
		for t, s := range sums {
			c := s.Columns[j]
			switch {
			case t < v.TextShard:
				maps.Copy(levels, c.Numbers)
			case t == v.TextShard:
				maps.Copy(levels, c.Numbers)
				maps.Copy(levels, c.Tail)
			default:
				maps.Copy(levels, c.Texts)
			}
		}
		v.Levels = slices.Sorted(maps.Keys(levels))
		if numbersAmongText(levels) {
			// The single-machine reader refuses or asks about a column of
			// numbers with stray text (table.CSVOptions.AsIs); the
			// pipeline never re-types a column silently, so it refuses
			// every mix.
			sc.Problem = fmt.Sprintf("column %q mixes numbers and text; correct the file (the command line's reader lists the odd cells)", name)
			return sc
		}
		switch {
		case len(v.Levels) > maxLevels:
			sc.Problem = fmt.Sprintf("column %q has more than %d distinct text values", name, maxLevels)
			return sc
		case len(v.Levels) < 2:
			sc.Problem = fmt.Sprintf("text column %q has %d distinct values; it needs two or more", name, len(v.Levels))
			return sc
		}
		v.Terms = len(v.Levels) - 1
		v.Shift = make([]float64, v.Terms)
		for t := range v.Shift {
			v.Shift[t] = 0.5 // indicators: any shift within their range keeps the sums stable
		}
		sc.Vars = append(sc.Vars, v)
	}
	return sc
}

// shift returns the shift of every design column, in order.
func (sc *schema) shift() []float64 {
	var out []float64
	for _, v := range sc.Vars {
		out = append(out, v.Shift...)
	}
	return out
}

// numbersAmongText reports whether any of a text column's values reads as
// a number (or true/false).
func numbersAmongText(levels map[string]bool) bool {
	for l := range levels {
		if _, ok, _ := table.ParseCell(l); ok && !table.IsMissingCell(l) {
			return true
		}
	}
	return false
}
