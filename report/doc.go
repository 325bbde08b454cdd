// Package report renders a discovery result as one self-contained HTML
// file: no external scripts, fonts or images, so it opens from disk with no
// network. It is built with html/template, so every variable name and
// message is escaped.
//
// The page shows the network drawn by time — one column per tier, earliest
// on the left, nodes ordered by the barycentre heuristic of layered drawing
// (Sugiyama, Tagawa & Toda 1981) to reduce crossings — with edges as curves
// whose width shows selection frequency (or effect size without stability
// selection) and whose style shows the sign of the effect; hovering or
// focusing a node highlights its Markov blanket. For each node it gives the
// family, rows used, cross-validated score, selected penalty and rule, the
// parents' effects with intervals, the cross-validation curve and the
// coefficient paths; and a summary of the data, settings, timings, the
// stability bound and the cautions that go with any causal reading of
// observational data.
package report
