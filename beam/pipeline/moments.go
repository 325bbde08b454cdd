package pipeline

import (
	"encoding/binary"
	"fmt"
	"math"

	"github.com/antecedent-lab/antecedent/lasso"
)

// tileSize is the side of a tile of a cross-product matrix: 128² float64
// values, 128 KiB per element on the wire.
const tileSize = 128

// tileKey names a part of fold k's moments: the weight and sums (tile -1,
// -1) or the cross products of rows [ti·T, …) and columns [tj·T, …), ti ≤ tj.
func tileKey(k, ti, tj int) string { return fmt.Sprintf("%d/%d/%d", k, ti, tj) }

// blockMoments returns the tiles of each fold's moments over the block's
// rows, about shift. ids are the fold ids of every row of the table.
func blockMoments(sc *schema, b *block, ids []int, folds int) (map[string][]float64, error) {
	shift := sc.shift()
	q := len(shift)
	cols := make([][]float64, q)
	for t := range cols {
		cols[t] = make([]float64, b.Rows)
	}
	b.designTo(sc, cols)
	out := map[string][]float64{}
	byFold := make([][]int, folds)
	for i := range b.Rows {
		k := ids[b.Offset+i]
		byFold[k] = append(byFold[k], i)
	}
	for k, rows := range byFold {
		if len(rows) == 0 {
			continue // nil rows would mean every row
		}
		m := lasso.NewMoments(shift)
		if err := m.Accumulate(cols, nil, rows); err != nil {
			return nil, err
		}
		out[tileKey(k, -1, -1)] = append([]float64{m.Weight}, m.Sum...)
		for ti := 0; ti*tileSize < q; ti++ {
			for tj := ti; tj*tileSize < q; tj++ {
				var tile []float64
				for r := ti * tileSize; r < min(q, (ti+1)*tileSize); r++ {
					tile = append(tile, m.Cross[r*q+tj*tileSize:r*q+min(q, (tj+1)*tileSize)]...)
				}
				out[tileKey(k, ti, tj)] = tile
			}
		}
	}
	return out, nil
}

// foldMoments rebuilds each fold's moments from the summed tiles. A fold
// without rows anywhere has no tiles and zero moments.
func foldMoments(shift []float64, folds int, tiles map[string][]float64) ([]*lasso.Moments, error) {
	q := len(shift)
	held := make([]*lasso.Moments, folds)
	for k := range held {
		m := lasso.NewMoments(shift)
		held[k] = m
		ws, ok := tiles[tileKey(k, -1, -1)]
		if !ok {
			continue
		}
		if len(ws) != q+1 {
			return nil, fmt.Errorf("pipeline: fold %d sums have %d values for %d columns", k, len(ws), q)
		}
		m.Weight = ws[0]
		copy(m.Sum, ws[1:])
		for ti := 0; ti*tileSize < q; ti++ {
			for tj := ti; tj*tileSize < q; tj++ {
				tile := tiles[tileKey(k, ti, tj)]
				r0, r1 := ti*tileSize, min(q, (ti+1)*tileSize)
				c0, c1 := tj*tileSize, min(q, (tj+1)*tileSize)
				if len(tile) != (r1-r0)*(c1-c0) {
					return nil, fmt.Errorf("pipeline: fold %d tile %d,%d has %d values", k, ti, tj, len(tile))
				}
				w := c1 - c0
				for r := r0; r < r1; r++ {
					for c := c0; c < c1; c++ {
						x := tile[(r-r0)*w+c-c0]
						m.Cross[r*q+c] = x
						m.Cross[c*q+r] = x
					}
				}
			}
		}
	}
	return held, nil
}

func floatsToBytes(x []float64) []byte {
	b := make([]byte, 8*len(x))
	for i, v := range x {
		binary.LittleEndian.PutUint64(b[8*i:], math.Float64bits(v))
	}
	return b
}

func bytesToFloats(b []byte) []float64 {
	x := make([]float64, len(b)/8)
	for i := range x {
		x[i] = math.Float64frombits(binary.LittleEndian.Uint64(b[8*i:]))
	}
	return x
}

// addBytes sums two encoded float64 vectors elementwise into a new one.
func addBytes(a, b []byte) []byte {
	if len(a) != len(b) {
		// Tiles of one key always have one length; keep the longer
		// rather than panic, and let foldMoments report the shape.
		if len(a) > len(b) {
			return a
		}
		return b
	}
	x, y := bytesToFloats(a), bytesToFloats(b)
	for i := range x {
		x[i] += y[i]
	}
	return floatsToBytes(x)
}
