// Package demo is the shipped demonstration study: a synthetic study of
// recovery after joint replacement (5,000 patients, 18 variables in six
// tiers), drawn by package simulate from a known network. The data are
// synthetic and describe no real patients. The library never imports this
// package; the command-line tool, the examples and the tests do.
package demo
