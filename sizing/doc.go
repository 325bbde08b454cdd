// Package sizing plans the size of a study by simulation: how many rows
// does discovery need to find an edge with a given probability, and how
// many edges does it find that are not there?
//
// Run draws studies of several sizes from a known network — a Generator:
// the network discovered on earlier data read as a model
// (intervention.Model), or a model written by hand (FromModel over a
// simulate.Model) — runs the same discovery on each (antecedent.Discover
// with one Config: the same rule, folds, measure and settings) and counts,
// for each edge of the network, the share of studies that find it, and
// the number of edges found that the network lacks. Each share p over R
// studies carries its Monte Carlo standard error
//
//	SE = √(p(1 − p)/R)
//
// and each mean count its sample standard deviation over √R.
//
// Plan.RowsFor answers "rows needed to find A → B with 80% probability":
// the shares are made non-decreasing in the number of rows by the
// pool-adjacent-violators algorithm (Ayer et al. 1955, Ann. Math. Statist.
// 26:641–647; Barlow et al. 1972, Statistical Inference under Order
// Restrictions), and the first crossing of the target is interpolated
// linearly in the logarithm of the rows between the two sizes around it.
//
// Answer pairs a plan with its rows needed; its Chart gives the numbers a
// report draws.
//
// Studies are seeded, so a plan is reproducible; long runs report progress
// and stop when their context is cancelled. The answer treats the
// generating network as the truth: see Cautions.
package sizing
