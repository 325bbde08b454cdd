// Package table holds the data a discovery runs on: a Dataset of named
// variables stored column-major, each with a kind (continuous, binary or
// categorical) and, for text variables, its levels; readers that build a
// Dataset from CSV; and the detection of missing values.
//
// A numeric column whose present values are all 0 or 1 is binary, any
// other numeric column continuous. A text column with two values is
// binary; with more it is categorical and enters a regression as one
// indicator column per level after the first (the reference). Missing
// values are NaN; Missing lists them per variable and Present gives the
// rows where a set of variables is complete.
//
// The package knows no solver: which loss a variable is fitted with, and
// what is done about missing values, are decided by the caller.
package table
