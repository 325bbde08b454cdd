// Package intervention reads a discovered network as a generative model
// and asks it what an intervention would change.
//
// New takes a result of antecedent.Discover and the data it was discovered
// on, and refits every variable's equation on its discovered parents
// without penalty: least squares with its residual standard deviation for
// a continuous variable, logistic regression for a binary one. The Model
// can then
//
//   - answer a Question by g-computation (Robins 1986): set the cause to a
//     value, shift it, or switch a binary cause on rather than off; keep
//     every row's values of the variables that are not descendants of the
//     cause; regenerate the descendants in time order from their equations
//     (continuous: fitted mean plus the row's own residual; binary: fitted
//     probability, drawn when later variables need a value); and report
//     the mean of each outcome under both settings, their difference and,
//     for a binary outcome, their ratio, with percentile bootstrap
//     intervals whose resamples refit the equations (parent sets fixed);
//
//   - decompose a linear part by Wright's path rule (Wright 1921,
//     "Correlation and causation", J. Agricultural Research 20:557–585;
//     Wright 1934, Ann. Math. Statist. 5:161–215): with every variable
//     from the cause to the outcome continuous, the total effect is
//
//     total = Σ over directed paths cause → … → outcome of Π coefficients on the path
//
//     split into the direct effect and the part through each mediator;
//
//   - name adjustment sets the graph implies for the cause's total effect
//     on an outcome — the cause's parents, and the optimal set of Henckel,
//     Perković & Maathuis (2022), JRSS-B 84(2):579–599 — and estimate the
//     effect by one regression of the outcome on the cause and each set,
//     side by side with the g-computation;
//
//   - draw new studies of any size (Sample), for study planning.
//
// Every answer carries Cautions: it holds only if the network and the
// time order are right and nothing important is unmeasured; it is a
// hypothesis for planning, not a treatment recommendation.
//
// Chart returns the few numbers a report needs to draw an answer.
package intervention
