package antecedent

import (
	"fmt"

	"github.com/antecedent-lab/antecedent/cv"
	"github.com/antecedent-lab/antecedent/lasso"
	"github.com/antecedent-lab/antecedent/table"
)

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
// defaults written on each field. A Config is stored in the Result with
// the defaults that hold for every node filled in (folds, the penalty
// rule, the stability threshold); each node records the penalties, measure
// and rule it was fitted with.
type Config struct {
	// Folds is the number of cross-validation folds; zero means 10.
	Folds int `json:"folds"`
	// CV configures each node's cross-validated path as package cv does:
	// CV.Path the solver (mixing, penalty grid, tolerance; lasso's
	// defaults), CV.Measure the held-out loss (default deviance) and
	// CV.Rule the penalty choice. A zero CV.Rule (cv.DefaultRule) means the
	// selection's own: the quarter-standard-error rule for the adaptive
	// lasso's second stage (chosen on the validity harness, see the
	// README), the one-standard-error rule for the textbook and relaxed
	// lasso and for stability selection.
	// A measure for 0/1 responses (AUC, misclassification) applies to
	// binary nodes; the others use deviance, and each node records the
	// measure it used. Each node's family and penalty factors are set per node, so
	// CV.Path.Family and CV.Path.PenaltyScale must be left unset; CV.Workers
	// is not used (see Workers).
	CV cv.Settings `json:"cv"`
	// Selection is how parents are chosen from each node's path; zero
	// means AdaptiveLasso. PenalisedLasso is the textbook procedure.
	Selection Selection `json:"selection"`
	// Families gives, by variable name, the loss of a variable fitted as a
	// response in place of the one its kind implies (Gaussian for
	// continuous, binomial for binary). It is not stored in the Result;
	// each node records its family's name.
	Families map[string]lasso.Family `json:"-"`
	// Seed makes folds and subsamples reproducible.
	Seed uint64 `json:"seed"`
	// Workers bounds the goroutines that fit nodes; zero means
	// GOMAXPROCS. They fit that many nodes at once, or, on tables of
	// 5·10⁷ cells or more, the folds of one node at a time, so that one
	// node's fits are held in memory rather than one per worker.
	Workers int `json:"workers"`
	// Missing is the missing-value policy.
	Missing table.MissingPolicy `json:"missing"`
	// Stability turns on stability selection when Pairs > 0.
	Stability Stability `json:"stability"`
	// SameTier also reports associations between variables of the same
	// tier, as undirected links kept outside the graph.
	SameTier bool `json:"same_tier"`
	// Progress, when set, is called after each task, from one goroutine
	// at a time. It is not stored.
	Progress func(Progress) `json:"-"`
}

// Validate returns the error Discover would return for this
// configuration before looking at any data: a value out of range, wrapping
// ErrConfig. A nil *Config is valid.
func (c *Config) Validate() error {
	_, err := c.resolve()
	return err
}

// resolve returns the configuration with Discover's own defaults filled
// in (folds, stability threshold), or an error wrapping ErrConfig for the
// first setting that is out of range (a *ConfigError). The solver's and cross-validation's
// settings are checked by their packages.
func (c *Config) resolve() (Config, error) {
	var r Config
	if c != nil {
		r = *c
	}
	if r.Folds == 0 {
		r.Folds = 10
	}
	if r.Folds < 2 {
		return r, &ConfigError{"Folds", fmt.Sprint(r.Folds), "need at least 2"}
	}
	if err := r.CV.Validate(); err != nil {
		return r, &ConfigError{"CV", "", err.Error()}
	}
	if r.CV.Path.Family != nil || r.CV.Path.PenaltyScale != nil {
		return r, &ConfigError{"CV.Path", "", "Family and PenaltyScale are set per node; use Config.Families and required edges"}
	}
	if r.Selection < AdaptiveLasso || r.Selection > RelaxedLasso {
		return r, &ConfigError{"Selection", fmt.Sprint(int(r.Selection)), "unknown selection"}
	}
	if r.CV.Rule == cv.DefaultRule {
		r.CV.Rule = cv.OneStandardError
		if r.Selection == AdaptiveLasso && r.Stability.Pairs == 0 {
			r.CV.Rule = cv.QuarterStandardError
		}
	}
	if r.Workers < 0 {
		return r, &ConfigError{"Workers", fmt.Sprint(r.Workers), "must be 0 (one per CPU) or more"}
	}
	if r.Missing < table.MissingRefused || r.Missing > table.MissingAvailableCase {
		return r, &ConfigError{"Missing", fmt.Sprint(int(r.Missing)), "unknown missing-value policy"}
	}
	if r.Stability.Pairs < 0 {
		return r, &ConfigError{"Stability.Pairs", fmt.Sprint(r.Stability.Pairs), "must be 0 (off) or more"}
	}
	if r.Stability.Pairs > 0 {
		if r.Stability.Threshold == 0 {
			r.Stability.Threshold = 0.75
		}
		if !(r.Stability.Threshold > 0.5 && r.Stability.Threshold <= 1) {
			return r, &ConfigError{"Stability.Threshold", fmt.Sprint(r.Stability.Threshold), "must be in (0.5, 1]"}
		}
	}
	return r, nil
}
