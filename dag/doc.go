// Package dag holds a directed acyclic graph of named variables with edge
// attributes, and answers the questions asked of a causal network: each
// node's parents and children, its Markov blanket (parents, children and
// the children's other parents), ancestors, descendants and a topological
// order.
//
// New checks acyclicity when the graph is built, so a Graph value is always
// a DAG. Graph implements gonum's graph.Directed, so gonum's algorithms
// (topo.Sort, path searches) work on it unchanged. Nodes may carry data
// (NodeData: tier of the time order, kind, levels, coding).
//
// A graph is written in four forms and read back from each with every
// edge attribute exact: JSON (whose keys match the discovery's result
// JSON, so ReadJSON reads either), GraphML (the open XML standard; typed
// data keys with descriptions), DOT (Graphviz's language; each tier one row
// of rank same, exact values as extra attributes) and an edge-list CSV
// ("from,to,…"; no node data). Read tells the forms apart by their first
// characters.
//
// Compare scores an estimated edge list against a true one: directed
// precision, recall and F1, skeleton precision and recall, and the
// structural Hamming distance of Tsamardinos, Brown & Aliferis (2006),
// Machine Learning 65:31–78, in its DAG form: missing + extra + reversed
// edges, a reversed edge counted once.
package dag
