package cv

import "github.com/antecedent-lab/antecedent/lasso"

// heldOut holds a fold's held-out values of the predictors a path ever
// uses, gathered once so that the predictions at each of its penalties
// read contiguous memory: 0/1 columns as the positions of their ones,
// other columns densely.
type heldOut struct {
	dense [][]float64 // by path predictor position; nil when unused or 0/1
	ones  [][]int32
	bin   []bool
	rows  int
}

func gatherHeldOut(path *lasso.Path, cols [][]float64, rows []int) *heldOut {
	p := len(path.Predictors)
	h := &heldOut{dense: make([][]float64, p), ones: make([][]int32, p), bin: make([]bool, p), rows: len(rows)}
	h.extend(path, cols, rows, 0)
	return h
}

// extend gathers the held-out values of the predictors that the fits of
// path from penalty index from on use and h lacks.
func (h *heldOut) extend(path *lasso.Path, cols [][]float64, rows []int, from int) {
	for _, s := range path.Coefficients[from:] {
		for _, j := range s.Index {
			if !h.bin[j] && h.dense[j] == nil {
				h.gather(j, cols[path.Predictors[j]], rows)
			}
		}
	}
}

// gather stores the held-out values of column c as predictor j.
func (h *heldOut) gather(j int, c []float64, rows []int) {
	bin := len(rows) < 1<<31
	var ones []int32
	for t, i := range rows {
		x := c[i]
		if x == 1 {
			ones = append(ones, int32(t))
		} else if x != 0 {
			bin = false
			break
		}
	}
	if bin {
		h.bin[j], h.ones[j] = true, ones
		return
	}
	col := make([]float64, len(rows))
	for t, i := range rows {
		col[t] = c[i]
	}
	h.dense[j] = col
}

// meanTo writes the fitted means of the path's fit at penalty index k for
// the held-out rows into dst.
func (h *heldOut) meanTo(dst []float64, path *lasso.Path, k int) {
	dst = dst[:h.rows]
	b0 := path.Intercept[k]
	for i := range dst {
		dst[i] = b0
	}
	s := path.Coefficients[k]
	for t, j := range s.Index {
		b := s.Value[t]
		if h.bin[j] {
			for _, i := range h.ones[j] {
				dst[i] += b
			}
			continue
		}
		for i, x := range h.dense[j][:len(dst)] {
			dst[i] += b * x
		}
	}
	fam := path.Family
	if _, ok := fam.(lasso.Gaussian); ok {
		return
	}
	for i, e := range dst {
		dst[i] = fam.Mean(e)
	}
}
