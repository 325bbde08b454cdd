package pipeline

import (
	"bytes"
	"encoding/csv"
	"encoding/gob"
	"errors"
	"fmt"
	"io"
	"math"
	"strings"

	"github.com/antecedent-lab/antecedent/table"
)

// maxLevels bounds a text column's distinct values, as table.ReadCSV's
// default does.
const maxLevels = 50

// shardCells is one shard's cells, trimmed, column-major.
type shardCells struct {
	names []string
	cells [][]string
}

// parseShard reads one CSV shard with a header row. A shard with a header
// and no rows is empty, not an error.
func parseShard(r io.Reader, path string) (*shardCells, error) {
	cr := csv.NewReader(r)
	head, err := cr.Read()
	if errors.Is(err, io.EOF) {
		return nil, fmt.Errorf("pipeline: shard %s: empty file, expected a header row", path)
	}
	if err != nil {
		return nil, fmt.Errorf("pipeline: shard %s: %w", path, err)
	}
	s := &shardCells{names: make([]string, len(head)), cells: make([][]string, len(head))}
	for j, h := range head {
		if j == 0 {
			h = strings.TrimPrefix(h, "\ufeff")
		}
		s.names[j] = strings.TrimSpace(h)
	}
	for {
		rec, err := cr.Read()
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			return nil, fmt.Errorf("pipeline: shard %s: %w", path, err)
		}
		for j, c := range rec {
			s.cells[j] = append(s.cells[j], strings.TrimSpace(c))
		}
	}
	return s, nil
}

func (s *shardCells) rows() int {
	if len(s.cells) == 0 {
		return 0
	}
	return len(s.cells[0])
}

// summary is what one shard tells the schema.
type summary struct {
	Index   int
	Names   []string
	Rows    int
	Columns []columnSummary
}

// columnSummary describes one column of one shard. A column turns to text
// at its first cell that is not a number (FirstText, -1 when none); cells
// read before that keep their number's text, later ones their own, as
// table.ReadCSV does over the whole table.
type columnSummary struct {
	FirstText int
	Sum       float64 // present numbers, before FirstText
	Present   int
	Missing   int
	NonBinary bool            // a present number other than 0 or 1
	Numbers   map[string]bool // FormatCell texts of cells before FirstText, at most maxLevels+1
	Texts     map[string]bool // every present cell's own text, at most maxLevels+1
	Tail      map[string]bool // own texts from FirstText on, at most maxLevels+1
}

func summarise(index int, s *shardCells) (summary, error) {
	sum := summary{Index: index, Names: s.names, Rows: s.rows(), Columns: make([]columnSummary, len(s.names))}
	for j, col := range s.cells {
		c := columnSummary{FirstText: -1, Numbers: map[string]bool{}, Texts: map[string]bool{}, Tail: map[string]bool{}}
		for i, cell := range col {
			if table.IsMissingCell(cell) {
				c.Missing++
				continue
			}
			addCapped(c.Texts, cell)
			if c.FirstText >= 0 {
				addCapped(c.Tail, cell)
				continue
			}
			x, ok, err := table.ParseCell(cell)
			if err != nil {
				return sum, fmt.Errorf("pipeline: shard %d, row %d, column %q: %w", index, i+1, s.names[j], err)
			}
			if !ok {
				c.FirstText = i
				addCapped(c.Tail, cell)
				continue
			}
			if math.IsNaN(x) {
				c.Missing++ // a spelling of NaN that IsMissingCell does not know
				continue
			}
			c.Present++
			c.Sum += x
			if x != 0 && x != 1 {
				c.NonBinary = true
			}
			addCapped(c.Numbers, table.FormatCell(x))
		}
		sum.Columns[j] = c
	}
	return sum, nil
}

func addCapped(m map[string]bool, s string) {
	if len(m) <= maxLevels {
		m[s] = true
	}
}

func encodeGob(v any) ([]byte, error) {
	var b bytes.Buffer
	if err := gob.NewEncoder(&b).Encode(v); err != nil {
		return nil, err
	}
	return b.Bytes(), nil
}

func decodeGob(b []byte, v any) error { return gob.NewDecoder(bytes.NewReader(b)).Decode(v) }
