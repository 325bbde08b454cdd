// Package dag holds a directed acyclic graph of named variables with edge
// attributes, and answers the questions asked of a causal network: each
// node's parents and children, its Markov blanket (parents, children and
// the children's other parents), ancestors, descendants and a topological
// order.
//
// New checks acyclicity when the graph is built, so a Graph value is always
// a DAG. Graph implements gonum's graph.Directed, so gonum's algorithms
// (topo.Sort, path searches, dot.Marshal) work on it unchanged.
//
// Graphs export to DOT (through gonum's encoding/dot), GraphML (the open XML
// standard) and JSON, and read back from JSON or from an edge-list CSV with
// a "from,to" header, as used for a known true graph.
//
// Compare scores an estimated edge list against a true one: directed
// precision, recall and F1, skeleton precision and recall, and the
// structural Hamming distance of Tsamardinos, Brown & Aliferis (2006),
// Machine Learning 65:31–78, in its DAG form: missing + extra + reversed
// edges, a reversed edge counted once.
package dag
