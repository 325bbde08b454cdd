// Package stability measures how often each candidate predictor of one
// response is selected when the lasso is refitted on random halves of the
// rows: complementary-pairs subsampling (Shah & Samworth 2013, JRSS-B
// 75:55–80), in which each of Pairs random splits of the rows into two
// halves is fitted on both halves at one fixed penalty. Bound gives the
// error bound of Meinshausen & Bühlmann (2010) for a frequency threshold.
package stability
