package lasso

import (
	"errors"
	"fmt"
	"math"
	"sync"
)

// Index lists, once for many fits, the rows where each 0/1 column of a
// data set holds its rarer value. A fit normally lists its own 0/1
// predictors over its own rows; with an Index in Data, every fit on a
// subset of the index's rows (the folds of a cross-validation, the nodes
// of a network) reads the one shared list of each column instead, and
// runs over all the index's rows, giving those it leaves out weight zero.
// The memory of the lists is then paid once rather than once per fit; a
// fit on a strict subset pays in time and per-row memory for the rows it
// leaves out (a tenth more for the fold fits of a 10-fold
// cross-validation), and the result changes only by rounding.
//
// Columns are listed on first use; an Index is safe for concurrent use.
// The columns must not change while it is in use.
type Index struct {
	cols [][]float64
	rows []int // nil: every row
	n    int   // number of rows listed over
	col  []indexColumn

	// free holds arrays over the index's rows that finished fits gave
	// back, for the next fits: one node's fits reuse the last node's
	// instead of leaving the collector gigabytes of garbage.
	mu   sync.Mutex
	free [][]float64
}

// buffer returns a zeroed array over the index's rows, recycled when one
// is free.
func (x *Index) buffer() []float64 {
	x.mu.Lock()
	k := len(x.free)
	if k == 0 {
		x.mu.Unlock()
		return make([]float64, x.n)
	}
	b := x.free[k-1]
	x.free[k-1] = nil
	x.free = x.free[:k-1]
	x.mu.Unlock()
	clear(b)
	return b
}

// recycle takes back arrays from buffer (nil entries are skipped); the
// caller must not use them after.
func (x *Index) recycle(bufs ...[]float64) {
	x.mu.Lock()
	defer x.mu.Unlock()
	for _, b := range bufs {
		if b != nil && len(b) == x.n {
			x.free = append(x.free, b)
		}
	}
}

type indexColumn struct {
	once sync.Once
	// bin reports that the column holds only 0 and 1 on the index's
	// rows; list then holds the positions, among those rows, of its
	// rarer value: of its zeros when flip is set, else of its ones.
	bin  bool
	flip bool
	list []int32
}

// NewIndex returns an index of the 0/1 columns of cols over rows (nil:
// every row; otherwise increasing row numbers). It returns an error when
// the columns differ in length, a row is out of range or rows do not
// increase, or there are 2³¹−1 rows or more.
func NewIndex(cols [][]float64, rows []int) (*Index, error) {
	n := -1
	for j, c := range cols {
		if c == nil {
			continue
		}
		if n >= 0 && len(c) != n {
			return nil, fmt.Errorf("%w: index column %d has %d rows, column before it %d", ErrLength, j, len(c), n)
		}
		n = len(c)
	}
	if n < 0 {
		return nil, errors.New("lasso: an index needs at least one column")
	}
	for t, i := range rows {
		if i < 0 || i >= n || (t > 0 && i <= rows[t-1]) {
			return nil, fmt.Errorf("%w: index row %d (entry %d) of %d rows: rows must increase and lie in range", ErrIndex, i, t, n)
		}
	}
	m := n
	if rows != nil {
		m = len(rows)
	}
	if m >= math.MaxInt32 {
		return nil, fmt.Errorf("%w: an index lists at most %d rows, not %d", ErrIndex, math.MaxInt32-1, m)
	}
	return &Index{cols: cols, rows: rows, n: m, col: make([]indexColumn, len(cols))}, nil
}

// column returns the listing of column j, forming it on first use.
func (x *Index) column(j int) *indexColumn {
	c := &x.col[j]
	c.once.Do(func() { c.bin, c.flip, c.list = listRarer(x.cols[j], x.rows, x.n) })
	return c
}

// listRarer returns whether c holds only 0 and 1 on rows (n of them; nil:
// every row) and, if so, the positions among them of its rarer value (of
// its zeros, flip set, when ones are the more).
func listRarer(c []float64, rows []int, n int) (bin, flip bool, list []int32) {
	ones := 0
	visit := func(x float64) bool {
		ones += b2i(x == 1)
		return x == 0 || x == 1
	}
	if rows == nil {
		for _, x := range c[:n] {
			if !visit(x) {
				return false, false, nil
			}
		}
	} else {
		for _, i := range rows {
			if !visit(c[i]) {
				return false, false, nil
			}
		}
	}
	flip = 2*ones > n
	want, count := 1.0, ones
	if flip {
		want, count = 0, n-ones
	}
	list = make([]int32, 0, count)
	if rows == nil {
		for t, x := range c[:n] {
			if x == want {
				list = append(list, int32(t))
			}
		}
	} else {
		for t, i := range rows {
			if c[i] == want {
				list = append(list, int32(t))
			}
		}
	}
	return true, flip, list
}

// check returns an error unless the fit's columns are the index's at
// every predictor in pred.
func (x *Index) check(cols [][]float64, pred []int) error {
	if len(cols) != len(x.cols) {
		return fmt.Errorf("%w: the data has %d columns, its index %d", ErrIndex, len(cols), len(x.cols))
	}
	for _, j := range pred {
		a, b := cols[j], x.cols[j]
		if len(a) != len(b) || (len(a) > 0 && &a[0] != &b[0]) {
			return fmt.Errorf("%w: predictor column %d is not the column the index lists", ErrIndex, j)
		}
	}
	return nil
}

// members returns, for a fit on rows (increasing; nil: every row of the
// columns, total of them), whether it uses each of the index's rows; nil
// when it uses them all. It returns an error naming a row the index does
// not list.
func (x *Index) members(rows []int, total int) ([]bool, error) {
	if rows == nil {
		if x.rows == nil || len(x.rows) == total {
			return nil, nil // the index lists every row (rows are distinct)
		}
		return nil, fmt.Errorf("%w: the fit uses all %d rows, the index lists %d", ErrIndex, total, x.n)
	}
	in := make([]bool, x.n)
	k := 0 // next fit row to place
	for g := range in {
		i := g
		if x.rows != nil {
			i = x.rows[g]
		}
		if k < len(rows) && rows[k] < i {
			break
		}
		if k < len(rows) && rows[k] == i {
			in[g] = true
			k++
		}
	}
	if k < len(rows) {
		return nil, fmt.Errorf("%w: fit row %d (entry %d) is not among the index's rows, or rows do not increase", ErrIndex, rows[k], k)
	}
	if k == x.n {
		return nil, nil
	}
	return in, nil
}
