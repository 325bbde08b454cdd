// Package report renders a discovery result as one self-contained HTML
// file: no external scripts, fonts or images, so it opens from disk with no
// network. It is built with html/template, so every variable name and
// message is escaped.
//
// The page shows the discovered network drawn by time, as layered drawing
// does it (Sugiyama, Tagawa & Toda 1981): one column per tier, earliest on
// the left; an edge that skips tiers gets one virtual point, a lane, in
// each column it crosses, and lanes are ordered with the boxes by the
// barycentre heuristic to reduce crossings. Edges change height only in the
// gaps between columns and cross a column only along a lane between its
// boxes, so no edge passes behind a box. Arrivals and departures are spread
// along the boxes' sides. Edge width shows selection frequency (or effect
// size without stability selection) and dashes a negative effect; hovering
// or focusing a node lights its own relations: its parents, its children
// and its children's other parents.
//
// For each node it gives the family, rows used, cross-validated score,
// selected penalty and rule, the parents' effects with intervals, and two
// charts against the penalty (log scale, strong end on the left): the
// held-out error with a band of ±1 standard error and the chosen penalty
// as one labelled point, and the coefficient paths with the chosen terms
// coloured by sign and named where they were chosen; each parent's row
// names the procedure that chose it and the evidence the result carries (a
// selection frequency, a penalty weight). A summary gives the data,
// settings, timings, the stability bound, in two plain sentences how the
// parents were chosen (antecedent.Config.SelectionExplanation), and the
// cautions that go with any causal reading of observational data.
//
// Answers to questions asked of the network (Options.Interventions and
// Options.Plans) get a section of their own, with their cautions, one
// chart each, drawn from the numbers their packages' Chart methods give:
// an intervention answer as dots with horizontal intervals, one block per
// outcome (its mean or risk under each setting; the difference by
// g-computation beside the adjustment-set regressions, on an axis that
// shows zero; the ratio of risks; the path decomposition), every value
// printed beside its dot and an axis that does not start at zero marked
// as cut; a study plan as the share of simulated studies that find each
// edge against the rows on a logarithmic axis, shares from 0 to 1 with
// ±1 Monte Carlo standard error bars, the target share and the rows
// needed marked, and a table of the shares and false edges per study.
package report
