package intervention

import (
	"math"

	"github.com/antecedent-lab/antecedent"
)

// Number is a float64 written to JSON as null when it is NaN (unknown or
// not defined).
type Number = antecedent.Number

// Cautions are printed with every answer.
var Cautions = []string{
	"These numbers read the discovered network as a causal model: they hold only if the network and the time order are right and nothing important is unmeasured.",
	"They are a hypothesis for planning a study, not a treatment recommendation, and no substitute for clinical judgement, local rules or review by licensed statisticians and clinicians.",
}

// Estimate is a point estimate with its bootstrap standard error and
// percentile interval.
type Estimate struct {
	Value Number `json:"value"`
	SE    Number `json:"se"`
	Lower Number `json:"lower"`
	Upper Number `json:"upper"`
}

func unknown() Estimate {
	n := Number(math.NaN())
	return Estimate{n, n, n, n}
}

// Answer is the answer to a Question.
type Answer struct {
	Cause string `json:"cause"`
	A     Action `json:"a"`
	B     Action `json:"b"`
	// Rows is the number of rows the g-computation ran over.
	Rows int `json:"rows"`
	// Resamples is the number of bootstrap resamples; Failed of them
	// could not refit an equation and were left out.
	Resamples int     `json:"resamples"`
	Failed    int     `json:"failed_resamples"`
	Level     float64 `json:"level"`
	// Draws is the number of draws of each binary variable that later
	// regenerated variables depend on (1 when there is none).
	Draws    int       `json:"draws"`
	Seed     uint64    `json:"seed"`
	Outcomes []Outcome `json:"outcomes"`
	// Method says how the numbers were computed.
	Method   []string `json:"method"`
	Warnings []string `json:"warnings,omitempty"`
	Cautions []string `json:"cautions"`
}

// Outcome is what the model says about one outcome.
type Outcome struct {
	Name string `json:"name"`
	// Binary outcomes report risks (means of a 0/1 variable).
	Binary bool `json:"binary"`
	// Downstream is false when the outcome is not a descendant of the
	// cause in the network: its mean is then the same under both
	// settings.
	Downstream bool `json:"downstream"`
	// MeanA and MeanB are the outcome's means under the two settings;
	// Difference is MeanA − MeanB and Ratio MeanA / MeanB (binary
	// outcomes only).
	MeanA      Estimate `json:"mean_a"`
	MeanB      Estimate `json:"mean_b"`
	Difference Estimate `json:"difference"`
	Ratio      Estimate `json:"ratio"`
	// Paths decomposes the effect along directed paths when every
	// variable between the cause and the outcome, and the outcome, is
	// continuous (linear); otherwise it is nil and PathsNote says why.
	Paths     *Paths `json:"paths,omitempty"`
	PathsNote string `json:"paths_note,omitempty"`
	// Adjusted holds the estimates from single regressions of the outcome
	// on the cause and an adjustment set the network implies.
	Adjusted []Adjusted `json:"adjusted"`
}

// Paths is the decomposition of a linear total effect by Wright's path
// rule: the total effect of a unit change in the cause is the sum, over
// directed paths, of the products of the path's coefficients. All values
// are per unit of the cause (from 0 to 1 for a binary cause); the
// g-computation difference of a linear part equals Total times the mean
// change in the cause.
type Paths struct {
	Total  Estimate `json:"total"`
	Direct Estimate `json:"direct"`
	// Mediators holds, for each variable between the cause and the
	// outcome, the part of the total effect carried by paths through it
	// (the effect of the cause on it times its total effect on the
	// outcome) and that part's share of the total. Paths through several
	// mediators count towards each, so shares may sum to more than one.
	Mediators []Mediator `json:"mediators"`
	// Routes lists the directed paths with the products of their fitted
	// coefficients, largest first (at most 20).
	Routes []Route `json:"routes"`
}

// Mediator is the part of an effect carried through one variable.
type Mediator struct {
	Name   string   `json:"name"`
	Effect Estimate `json:"effect"`
	Share  Number   `json:"share"`
}

// Route is one directed path and the product of its coefficients.
type Route struct {
	Path    []string `json:"path"`
	Product Number   `json:"product"`
}

// Adjusted is the estimate of a regression of the outcome on the cause and
// an adjustment set: least squares for a continuous outcome, logistic for
// a binary one.
type Adjusted struct {
	// Name says which set: "parents of the cause" or "optimal".
	Name string   `json:"name"`
	Set  []string `json:"set"`
	// Coefficient is the cause's coefficient (per unit; log odds for a
	// binary outcome) with the model-based standard error and 95%
	// interval of the regression on all rows.
	Coefficient Number `json:"coefficient"`
	SE          Number `json:"se"`
	Lower       Number `json:"lower"`
	Upper       Number `json:"upper"`
	// Difference is the regression's answer to the question: the mean of
	// the outcome's fitted values with the cause under A minus under B,
	// over the rows (for a continuous outcome, the coefficient times the
	// mean change in the cause), with a bootstrap interval from the same
	// resamples as the g-computation.
	Difference Estimate `json:"difference"`
}
