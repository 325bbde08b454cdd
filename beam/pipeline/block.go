package pipeline

import (
	"fmt"
	"math"

	"github.com/antecedent-lab/antecedent/table"
)

// block is one shard's rows in a compact encoding against the schema.
type block struct {
	Index, Offset, Rows int
	Cols                []blockColumn
}

// blockColumn holds one column of a block in one of three forms: level
// codes for a text column (noCode when missing), bits for numbers that
// are all 0 or 1 in the block (Absent marks missing rows), float64
// otherwise (NaN missing).
type blockColumn struct {
	Codes  []uint16
	Bits   []uint64
	Absent []uint64
	Floats []float64
}

const noCode = math.MaxUint16

// encodeShard encodes shard index against the schema.
func encodeShard(sc *schema, index int, s *shardCells) (block, error) {
	b := block{Index: index, Offset: sc.Offsets[index], Rows: s.rows(), Cols: make([]blockColumn, len(sc.Vars))}
	for j, v := range sc.Vars {
		col := s.cells[j]
		if v.Text {
			code := make(map[string]uint16, len(v.Levels))
			for l, s := range v.Levels {
				code[s] = uint16(l)
			}
			c := make([]uint16, len(col))
			for i, cell := range col {
				text := cell
				if index < v.TextShard || (index == v.TextShard && i < v.TextRow) {
					x, _, _ := table.ParseCell(cell)
					text = table.FormatCell(x)
				} else if table.IsMissingCell(cell) {
					text = ""
				}
				if text == "" {
					c[i] = noCode
					continue
				}
				l, ok := code[text]
				if !ok {
					return b, fmt.Errorf("pipeline: shard %d, column %q: %q is not among the schema's levels", index, sc.Names[j], text)
				}
				c[i] = l
			}
			b.Cols[j] = blockColumn{Codes: c}
			continue
		}
		xs := make([]float64, len(col))
		binary := true
		for i, cell := range col {
			x, ok, err := table.ParseCell(cell)
			if err != nil || !ok {
				return b, fmt.Errorf("pipeline: shard %d, row %d, column %q: %q is not a number", index, i+1, sc.Names[j], cell)
			}
			xs[i] = x
			if !math.IsNaN(x) && x != 0 && x != 1 {
				binary = false
			}
		}
		if !binary {
			b.Cols[j] = blockColumn{Floats: xs}
			continue
		}
		words := (len(xs) + 63) / 64
		c := blockColumn{Bits: make([]uint64, words)}
		for i, x := range xs {
			switch {
			case math.IsNaN(x):
				if c.Absent == nil {
					c.Absent = make([]uint64, words)
				}
				c.Absent[i/64] |= 1 << (i % 64)
			case x == 1:
				c.Bits[i/64] |= 1 << (i % 64)
			}
		}
		b.Cols[j] = c
	}
	return b, nil
}

// numbersTo writes a numeric column's values into dst (len b.Rows).
func (c *blockColumn) numbersTo(dst []float64) {
	if c.Floats != nil {
		copy(dst, c.Floats)
		return
	}
	for i := range dst {
		w, m := i/64, uint64(1)<<(i%64)
		switch {
		case c.Absent != nil && c.Absent[w]&m != 0:
			dst[i] = math.NaN()
		case c.Bits[w]&m != 0:
			dst[i] = 1
		default:
			dst[i] = 0
		}
	}
}

// designTo writes the block's design columns into dst, one slice of
// b.Rows values per design column, in the dataset's order: a number as
// itself, a text column as indicators of its levels after the first.
func (b *block) designTo(sc *schema, dst [][]float64) {
	t := 0
	for j, v := range sc.Vars {
		c := &b.Cols[j]
		if !v.Text {
			c.numbersTo(dst[t])
			t++
			continue
		}
		for l := 1; l <= v.Terms; l++ {
			d := dst[t]
			for i, code := range c.Codes {
				switch {
				case code == noCode:
					d[i] = math.NaN()
				case int(code) == l:
					d[i] = 1
				default:
					d[i] = 0
				}
			}
			t++
		}
	}
}

// dataset rebuilds the whole table from every block, as table.ReadCSV
// reads the shards' concatenation.
func dataset(sc *schema, blocks []block) (*table.Dataset, error) {
	if sc.Problem != "" {
		return nil, fmt.Errorf("pipeline: %s: %w", sc.Problem, table.ErrCSV)
	}
	if len(blocks) != len(sc.Offsets) {
		return nil, fmt.Errorf("pipeline: %d blocks for %d shards", len(blocks), len(sc.Offsets))
	}
	d, err := table.NewDataset(nil, nil)
	if err != nil {
		return nil, err
	}
	for j, v := range sc.Vars {
		if !v.Text {
			col := make([]float64, sc.Rows)
			for _, b := range blocks {
				b.Cols[j].numbersTo(col[b.Offset : b.Offset+b.Rows])
			}
			if err := d.AddColumn(sc.Names[j], col); err != nil {
				return nil, err
			}
			continue
		}
		vals := make([]string, sc.Rows)
		for _, b := range blocks {
			for i, code := range b.Cols[j].Codes {
				if code != noCode {
					vals[b.Offset+i] = v.Levels[code]
				}
			}
		}
		if err := d.AddText(sc.Names[j], vals, maxLevels); err != nil {
			return nil, err
		}
	}
	return d, nil
}
