// Package pipeline runs antecedent's discovery as an Apache Beam pipeline,
// so that Dataflow, Flink or Spark (through Beam's portable runners), or
// Prism in this process, do the sharding, shuffling, retries and
// scheduling. The result equals antecedent.Discover's on the same table,
// order and configuration (continuous nodes to the rounding of a different
// summation order).
//
// The table comes as CSV shards (one header each, the same in every
// shard), read through Beam's file systems, so local paths and cloud
// storage both work. Row i of the table is row i of the shards taken in
// the order given. The stages are:
//
//	summarise   each shard: rows, and per column what decides its kind
//	schema      one element: kinds, levels, row offsets, column means
//	encode      each shard again: a compact block (0/1 columns as bits,
//	            text as level codes, other numbers as float64)
//	moments     each block: per-fold moments of the design columns over
//	            its rows, in tiles, summed by key across blocks
//	plan        one element: the job's nodes to fit
//	fit         each node, on any worker: antecedent.Job.FitNode
//	assemble    one element: antecedent.Job.Assemble, written as JSON
//
// Fold ids are cv.Random over global row indices, so a block needs its
// offset, which the schema gives. The fit and assemble stages rebuild the
// whole table from the blocks (a side input): a worker must hold the
// blocks plus the table as float64 columns, 8·n·c bytes for n rows and c
// design columns (1.6 GB for a million rows and 200 columns). The
// moments stage holds one block at a time, so it serves any number of
// rows.
package pipeline
