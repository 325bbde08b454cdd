// Package refit estimates effects by unpenalised regression of a response
// on a chosen set of predictors: least squares for a Gaussian response
// (standard errors from the residual variance with n − k − 1 degrees of
// freedom, intervals from Student's t) and maximum likelihood by
// Newton–Raphson with step halving for other families (standard errors
// from the inverse Fisher information with dispersion 1, normal
// intervals). It works on the predictors scaled to unit spread so that
// very different scales stay well conditioned.
package refit
