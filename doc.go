// Package antecedent discovers a sparse causal network from an
// observational table whose variables are ordered in time.
//
// Given a Dataset and an order.Order (tiers of variables, earliest first,
// with optional forbidden and required edges), Discover regresses every
// variable with an L1 penalty on all variables of earlier tiers — linear
// for continuous variables, logistic for binary ones, or a caller's own
// lasso.Family — chooses each penalty by cross-validation (the
// one-standard-error rule by default), and keeps the predictors with
// non-zero coefficients as the variable's parents. Because candidates
// always come earlier in time, the union of parent sets is acyclic. Each
// node is scored by cross-validated AUC (binary) or R² (continuous), its
// parents are refitted without penalty for effect sizes with 95%
// intervals (odds ratios for binary nodes), and optional stability
// selection gives every edge a selection frequency and the run a bound on
// the expected number of false edges.
//
//	d, err := table.ReadCSV(file, nil)
//	o, err := order.Parse(orderFile)
//	res, err := antecedent.Discover(d, o)
//	g, err := res.Graph() // a dag.Graph: parents, Markov blankets, DOT, GraphML
//
// The result is a hypothesis drawn from observational data. Unmeasured
// confounding, selection and measurement error can all produce edges that
// are not causal or hide ones that are; the time order must be right for
// the directions to mean anything. Results do not replace clinical
// judgement, local rules, or licensed statistical and medical review.
//
// The work is split into packages usable on their own: table (the data),
// lasso (the path solver), cv (folds and penalty selection), metrics
// (scores), order (tiers and constraints), dag (the graph value and graph
// comparison) and simulate (data from a known graph). This package ties
// them together and owns only the per-node pipeline and the result. The
// map of packages and their import direction is in DEVELOPERS.md.
package antecedent
