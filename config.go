package antecedent

import (
	"fmt"
	"math"

	"github.com/antecedent-lab/antecedent/cv"
)

// MissingPolicy says what Discover does with missing values.
type MissingPolicy int

const (
	// MissingIsError refuses data with missing values, naming the columns
	// and their first missing rows.
	MissingIsError MissingPolicy = iota
	// CompleteCase drops every row with a missing value in any variable.
	CompleteCase
	// AvailableCase fits each node on the rows where it and all its
	// candidate parents are present.
	AvailableCase
)

var missingNames = []string{"error", "complete-case", "available-case"}

// String returns the policy's name.
func (m MissingPolicy) String() string {
	if m >= 0 && int(m) < len(missingNames) {
		return missingNames[m]
	}
	return fmt.Sprintf("MissingPolicy(%d)", int(m))
}

// MarshalText implements encoding.TextMarshaler.
func (m MissingPolicy) MarshalText() ([]byte, error) { return []byte(m.String()), nil }

// UnmarshalText implements encoding.TextUnmarshaler.
func (m *MissingPolicy) UnmarshalText(b []byte) error {
	for i, n := range missingNames {
		if n == string(b) {
			*m = MissingPolicy(i)
			return nil
		}
	}
	return fmt.Errorf("antecedent: unknown missing-value policy %q (want error, complete-case or available-case)", b)
}

// Stability configures complementary-pairs subsampling (Shah & Samworth
// 2013, JRSS-B 75:55–80): each of Pairs random splits of a node's rows
// into two halves is fitted on both halves at the node's selected penalty,
// giving every candidate edge a selection frequency over 2·Pairs fits.
type Stability struct {
	// Pairs is the number of complementary pairs; zero turns stability
	// selection off.
	Pairs int `json:"pairs"`
	// Threshold is the frequency an edge must reach to be kept, in
	// (0.5, 1]; zero means 0.75.
	Threshold float64 `json:"threshold"`
}

// Progress reports how far a run has come: Done of Total tasks.
type Progress struct {
	Done, Total int
	Stage       string // "nodes" or "stability"
}

// Config configures Discover. The zero value, or a nil *Config, gives the
// defaults written on each field. A Config is stored in the Result.
type Config struct {
	// Folds is the number of cross-validation folds; zero means 10.
	Folds int `json:"folds"`
	// Rule chooses each node's penalty; zero means the one-standard-error
	// rule.
	Rule cv.Rule `json:"rule"`
	// Measure is the cross-validated loss; zero means deviance.
	Measure cv.Measure `json:"measure"`
	// Mixing is the L1 share of the penalty in (0, 1]; zero means 1, the
	// lasso.
	Mixing float64 `json:"mixing"`
	// Penalties is the length of each node's penalty path; zero means 100.
	Penalties int `json:"penalties"`
	// Tolerance is the solver's convergence threshold; zero means 1e-7.
	Tolerance float64 `json:"tolerance"`
	// Seed makes folds and subsamples reproducible.
	Seed uint64 `json:"seed"`
	// Workers bounds the nodes fitted at once; zero means GOMAXPROCS.
	Workers int `json:"workers"`
	// Missing is the missing-value policy.
	Missing MissingPolicy `json:"missing"`
	// Stability turns on stability selection when Pairs > 0.
	Stability Stability `json:"stability"`
	// SameTier also reports associations between variables of the same
	// tier, as undirected links kept outside the graph.
	SameTier bool `json:"same_tier"`
	// Progress, when set, is called after each task, from one goroutine
	// at a time. It is not stored.
	Progress func(Progress) `json:"-"`
}

func (c *Config) resolve() (Config, error) {
	var r Config
	if c != nil {
		r = *c
	}
	if r.Folds == 0 {
		r.Folds = 10
	}
	if r.Folds < 2 {
		return r, fmt.Errorf("%w: %d folds, need at least 2", ErrConfig, r.Folds)
	}
	if r.Rule != cv.OneStandardError && r.Rule != cv.MinimumLoss {
		return r, fmt.Errorf("%w: unknown rule %d", ErrConfig, int(r.Rule))
	}
	if _, err := cv.ParseMeasure(r.Measure.String()); err != nil {
		return r, fmt.Errorf("%w: %v", ErrConfig, err)
	}
	if r.Measure == cv.DefaultMeasure {
		r.Measure = cv.Deviance
	}
	if r.Mixing == 0 {
		r.Mixing = 1
	}
	if !(r.Mixing > 0 && r.Mixing <= 1) {
		return r, fmt.Errorf("%w: mixing %g outside (0, 1]", ErrConfig, r.Mixing)
	}
	if r.Penalties == 0 {
		r.Penalties = 100
	}
	if r.Penalties < 2 {
		return r, fmt.Errorf("%w: %d penalties, need at least 2", ErrConfig, r.Penalties)
	}
	if r.Tolerance == 0 {
		r.Tolerance = 1e-7
	}
	if !(r.Tolerance > 0) || math.IsInf(r.Tolerance, 0) {
		return r, fmt.Errorf("%w: tolerance %g", ErrConfig, r.Tolerance)
	}
	if r.Workers < 0 {
		return r, fmt.Errorf("%w: %d workers", ErrConfig, r.Workers)
	}
	if r.Missing < MissingIsError || r.Missing > AvailableCase {
		return r, fmt.Errorf("%w: unknown missing-value policy %d", ErrConfig, int(r.Missing))
	}
	if r.Stability.Pairs < 0 {
		return r, fmt.Errorf("%w: %d stability pairs", ErrConfig, r.Stability.Pairs)
	}
	if r.Stability.Pairs > 0 {
		if r.Stability.Threshold == 0 {
			r.Stability.Threshold = 0.75
		}
		if !(r.Stability.Threshold > 0.5 && r.Stability.Threshold <= 1) {
			return r, fmt.Errorf("%w: stability threshold %g outside (0.5, 1]", ErrConfig, r.Stability.Threshold)
		}
	}
	return r, nil
}
