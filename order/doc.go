// Package order holds what is known about when variables are fixed: tiers
// of variable names, earliest first, plus forbidden and required edges.
//
// A variable may be caused only by variables in strictly earlier tiers. For
// each variable the compiled Plan lists its candidate parents (every
// variable of an earlier tier that is not forbidden) and its required
// parents (always kept, unpenalised). Because candidates always come
// earlier, any graph built from them is acyclic.
//
// Orders are read from a line-oriented text form or from JSON (see Parse).
// The text form:
//
//	# Comments start with '#'; blank lines are ignored.
//	tier traits: age sex
//	tier baseline: bmi, diabetes
//	tier: "implant type"          # a tier label is optional; quote names with spaces
//	forbid sex -> diabetes
//	require age -> bmi
//
// Each tier line lists names separated by spaces or commas, in the order
// of the tier lines. The JSON form has exactly this shape:
//
//	{"tiers": [["age","sex"],["bmi","diabetes"]], "forbidden": [["sex","diabetes"]], "required": [["age","bmi"]]}
//
// FromTimes builds tiers from each variable's typical time of occurrence.
package order
