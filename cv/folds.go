package cv

import (
	"fmt"
	"math/rand/v2"
	"slices"
	"sort"
)

// Folds assigns rows to K cross-validation folds.
type Folds struct {
	// K is the number of folds.
	K int
	// ID holds the fold of each row, in [0, K); −1 leaves a row out of
	// every fold.
	ID []int
}

// seedStream keeps fold randomness apart from other users of the same seed.
const seedStream = 0x63762d666f6c6473 // "cv-folds"

func checkK(n, k int) error {
	if k < 2 {
		return fmt.Errorf("%w: %d folds, need at least 2", ErrFolds, k)
	}
	if k > n {
		return fmt.Errorf("%w: %d folds for %d rows", ErrFolds, k, n)
	}
	return nil
}

// Random assigns n rows to k folds at random, fold sizes differing by at
// most one. The same seed gives the same folds.
func Random(n, k int, seed uint64) (*Folds, error) {
	if err := checkK(n, k); err != nil {
		return nil, err
	}
	rng := rand.New(rand.NewPCG(seed, seedStream))
	f := &Folds{K: k, ID: make([]int, n)}
	for t, i := range rng.Perm(n) {
		f.ID[i] = t % k
	}
	return f, nil
}

// Stratified assigns rows with 0/1 labels to k folds at random so that each
// fold's count of ones, and of zeros, is as equal as integers allow (they
// differ by at most one between folds), and fold sizes differ by at most
// one. It returns an error for labels other than 0 and 1.
func Stratified(labels []float64, k int, seed uint64) (*Folds, error) {
	if err := checkK(len(labels), k); err != nil {
		return nil, err
	}
	var ones, zeros []int
	for i, y := range labels {
		switch y {
		case 1:
			ones = append(ones, i)
		case 0:
			zeros = append(zeros, i)
		default:
			return nil, fmt.Errorf("%w: label at row %d is %g, want 0 or 1", ErrFolds, i, y)
		}
	}
	rng := rand.New(rand.NewPCG(seed, seedStream))
	rng.Shuffle(len(ones), func(a, b int) { ones[a], ones[b] = ones[b], ones[a] })
	rng.Shuffle(len(zeros), func(a, b int) { zeros[a], zeros[b] = zeros[b], zeros[a] })
	f := &Folds{K: k, ID: make([]int, len(labels))}
	// Deal the ones round-robin, then the zeros continuing where the ones
	// stopped, so the totals balance as well.
	t := 0
	for _, i := range ones {
		f.ID[i] = t % k
		t++
	}
	for _, i := range zeros {
		f.ID[i] = t % k
		t++
	}
	return f, nil
}

// Grouped assigns rows to k folds so that rows sharing a group (repeated
// visits of one patient, say) stay in one fold. Groups are placed largest
// first, each into the fold with the fewest rows so far, ties broken at
// random; it returns an error when there are fewer groups than folds.
func Grouped(groups []string, k int, seed uint64) (*Folds, error) {
	if k < 2 {
		return nil, fmt.Errorf("%w: %d folds, need at least 2", ErrFolds, k)
	}
	index := map[string]int{}
	var names []string
	var sizes []int
	rowGroup := make([]int, len(groups))
	for i, g := range groups {
		j, ok := index[g]
		if !ok {
			j = len(names)
			index[g] = j
			names = append(names, g)
			sizes = append(sizes, 0)
		}
		sizes[j]++
		rowGroup[i] = j
	}
	if len(names) < k {
		return nil, fmt.Errorf("%w: %d folds for %d groups", ErrFolds, k, len(names))
	}
	rng := rand.New(rand.NewPCG(seed, seedStream))
	order := rng.Perm(len(names))
	sort.SliceStable(order, func(a, b int) bool { return sizes[order[a]] > sizes[order[b]] })
	load := make([]int, k)
	foldOf := make([]int, len(names))
	for _, g := range order {
		best := 0
		for f := 1; f < k; f++ {
			if load[f] < load[best] {
				best = f
			}
		}
		foldOf[g] = best
		load[best] += sizes[g]
	}
	f := &Folds{K: k, ID: make([]int, len(groups))}
	for i, g := range rowGroup {
		f.ID[i] = foldOf[g]
	}
	return f, nil
}

// Given wraps caller-chosen fold ids: K is the largest id plus one, and
// every fold from 0 to K−1 must hold a row; −1 leaves a row out. The ids
// are copied.
func Given(ids []int) (*Folds, error) {
	k := 0
	for i, id := range ids {
		if id < -1 {
			return nil, fmt.Errorf("%w: fold id %d at row %d", ErrFolds, id, i)
		}
		k = max(k, id+1)
	}
	if k < 2 {
		return nil, fmt.Errorf("%w: %d folds, need at least 2", ErrFolds, k)
	}
	seen := make([]bool, k)
	for _, id := range ids {
		if id >= 0 {
			seen[id] = true
		}
	}
	if f := slices.Index(seen, false); f >= 0 {
		return nil, fmt.Errorf("%w: fold %d holds no rows", ErrFolds, f)
	}
	return &Folds{K: k, ID: slices.Clone(ids)}, nil
}

// Split returns the training and held-out rows of fold f among rows (nil
// means every row); rows outside every fold (id −1) are in neither.
func (fs *Folds) Split(f int, rows []int) (train, held []int) {
	held = fs.Held(f, rows)
	n := len(fs.ID)
	if rows != nil {
		n = len(rows)
	}
	train = make([]int, 0, max(n-len(held), 0))
	visit := func(i int) {
		if id := fs.ID[i]; id >= 0 && id != f {
			train = append(train, i)
		}
	}
	if rows == nil {
		for i := range fs.ID {
			visit(i)
		}
	} else {
		for _, i := range rows {
			visit(i)
		}
	}
	return train, held
}

// Held returns the held-out rows of fold f among rows (nil means every
// row), without building the training list.
func (fs *Folds) Held(f int, rows []int) []int {
	count := 0
	if rows == nil {
		for _, id := range fs.ID {
			if id == f {
				count++
			}
		}
	} else {
		for _, i := range rows {
			if fs.ID[i] == f {
				count++
			}
		}
	}
	held := make([]int, 0, count)
	if rows == nil {
		for i, id := range fs.ID {
			if id == f {
				held = append(held, i)
			}
		}
	} else {
		for _, i := range rows {
			if fs.ID[i] == f {
				held = append(held, i)
			}
		}
	}
	return held
}
