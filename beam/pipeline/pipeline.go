package pipeline

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"strconv"
	"strings"
	"sync"
	"time"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/lasso"
	"github.com/antecedent-lab/antecedent/order"
	"github.com/apache/beam/sdks/v2/go/pkg/beam"
	"github.com/apache/beam/sdks/v2/go/pkg/beam/io/filesystem"
	"github.com/apache/beam/sdks/v2/go/pkg/beam/register"

	_ "github.com/apache/beam/sdks/v2/go/pkg/beam/io/filesystem/gcs"   // gs:// paths
	_ "github.com/apache/beam/sdks/v2/go/pkg/beam/io/filesystem/local" // local paths
)

func init() {
	register.DoFn3x1[context.Context, string, func([]byte), error](&summariseFn{})
	register.DoFn4x1[context.Context, []byte, func(*[]byte) bool, func([]byte), error](&schemaFn{})
	register.DoFn4x1[context.Context, string, func(*[]byte) bool, func([]byte), error](&encodeFn{})
	register.DoFn4x1[context.Context, []byte, func(*[]byte) bool, func(string, []byte), error](&momentsFn{})
	register.DoFn6x1[context.Context, []byte, func(*[]byte) bool, func(*[]byte) bool, func(*string, *[]byte) bool, func(int), error](&planFn{})
	register.DoFn6x1[context.Context, int, func(*[]byte) bool, func(*[]byte) bool, func(*string, *[]byte) bool, func([]byte), error](&fitFn{})
	register.DoFn7x1[context.Context, []byte, func(*[]byte) bool, func(*[]byte) bool, func(*string, *[]byte) bool, func(*[]byte) bool, func(string), error](&assembleFn{})
	register.Function2x1(addBytes)
	register.Emitter1[[]byte]()
	register.Emitter1[int]()
	register.Emitter1[string]()
	register.Emitter2[string, []byte]()
	register.Iter1[[]byte]()
	register.Iter2[string, []byte]()
}

// Settings describe one distributed discovery.
type Settings struct {
	// Shards are the CSV files, in row order, as paths Beam's file systems
	// read (local, gs://, s3://).
	Shards []string
	// Order is the time order of the variables.
	Order *order.Order
	// Config is the discovery's configuration; Families and Progress must
	// be unset (a custom family cannot travel to workers).
	Config *antecedent.Config
	// Output is where the result JSON is written.
	Output string
	// Attempts bounds the reads of one shard when reading fails (a storage
	// hiccup); zero means 3. The runner's own retries come on top.
	Attempts int
}

// Build adds the discovery's stages to the pipeline of scope s. The
// result is written to set.Output when the pipeline runs. It returns an
// error for settings that cannot run.
func Build(s beam.Scope, set Settings) error {
	if len(set.Shards) == 0 {
		return errors.New("pipeline: no shards")
	}
	if set.Order == nil {
		return errors.New("pipeline: no order")
	}
	if set.Output == "" {
		return errors.New("pipeline: no output path")
	}
	cfg := antecedent.Config{}
	if set.Config != nil {
		cfg = *set.Config
	}
	if cfg.Families != nil || cfg.Progress != nil {
		return errors.New("pipeline: Config.Families and Config.Progress cannot travel to workers; leave them unset")
	}
	if err := cfg.Validate(); err != nil {
		return err
	}
	cj, err := json.Marshal(cfg)
	if err != nil {
		return err
	}
	oj, err := json.Marshal(set.Order)
	if err != nil {
		return err
	}
	spec := func() jobSpec { return jobSpec{Config: string(cj), Order: string(oj)} }
	attempts := set.Attempts
	if attempts <= 0 {
		attempts = 3
	}
	refs := make([]string, len(set.Shards))
	for i, p := range set.Shards {
		refs[i] = strconv.Itoa(i) + "|" + p
	}
	shards := beam.Reshuffle(s, beam.CreateList(s, refs))
	sums := beam.ParDo(s.Scope("summarise"), &summariseFn{Attempts: attempts}, shards)
	schemaCol := beam.ParDo(s.Scope("schema"), &schemaFn{}, beam.Impulse(s), beam.SideInput{Input: sums})
	blocks := beam.ParDo(s.Scope("encode"), &encodeFn{Attempts: attempts}, shards, beam.SideInput{Input: schemaCol})
	tiles := beam.ParDo(s.Scope("moments"), &momentsFn{Config: string(cj)}, blocks, beam.SideInput{Input: schemaCol})
	summed := beam.CombinePerKey(s.Scope("sum moments"), addBytes, tiles)
	tasks := beam.ParDo(s.Scope("plan"), &planFn{jobSpec: spec()}, beam.Impulse(s),
		beam.SideInput{Input: schemaCol}, beam.SideInput{Input: blocks}, beam.SideInput{Input: summed})
	results := beam.ParDo(s.Scope("fit"), &fitFn{jobSpec: spec()}, beam.Reshuffle(s, tasks),
		beam.SideInput{Input: schemaCol}, beam.SideInput{Input: blocks}, beam.SideInput{Input: summed})
	beam.ParDo(s.Scope("assemble"), &assembleFn{jobSpec: spec(), Output: set.Output}, beam.Impulse(s),
		beam.SideInput{Input: schemaCol}, beam.SideInput{Input: blocks}, beam.SideInput{Input: summed}, beam.SideInput{Input: results})
	return nil
}

// readShard reads and parses one shard, trying up to attempts times.
func readShard(ctx context.Context, ref string, attempts int) (int, *shardCells, error) {
	idx, path, ok := strings.Cut(ref, "|")
	index, err := strconv.Atoi(idx)
	if !ok || err != nil {
		return 0, nil, fmt.Errorf("pipeline: bad shard reference %q", ref)
	}
	var last error
	for a := range attempts {
		if a > 0 {
			select {
			case <-ctx.Done():
				return 0, nil, ctx.Err()
			case <-time.After(time.Duration(a) * 200 * time.Millisecond):
			}
		}
		cells, err := readOnce(ctx, path)
		if err == nil {
			return index, cells, nil
		}
		last = err
	}
	return 0, nil, fmt.Errorf("pipeline: shard %d (%s) after %d attempts: %w", index, path, attempts, last)
}

func readOnce(ctx context.Context, path string) (*shardCells, error) {
	fs, err := filesystem.New(ctx, path)
	if err != nil {
		return nil, err
	}
	defer fs.Close()
	r, err := fs.OpenRead(ctx, path)
	if err != nil {
		return nil, err
	}
	defer r.Close()
	return parseShard(r, path)
}

// summariseFn reads a shard and emits its summary.
type summariseFn struct{ Attempts int }

func (f *summariseFn) ProcessElement(ctx context.Context, ref string, emit func([]byte)) error {
	index, cells, err := readShard(ctx, ref, f.Attempts)
	if err != nil {
		return err
	}
	sum, err := summarise(index, cells)
	if err != nil {
		return err
	}
	b, err := encodeGob(sum)
	if err != nil {
		return err
	}
	emit(b)
	return nil
}

// schemaFn merges every summary into the schema.
type schemaFn struct{}

func (f *schemaFn) ProcessElement(ctx context.Context, _ []byte, sums func(*[]byte) bool, emit func([]byte)) error {
	var all []summary
	var b []byte
	for sums(&b) {
		var s summary
		if err := decodeGob(b, &s); err != nil {
			return err
		}
		all = append(all, s)
	}
	sc := buildSchema(all)
	out, err := encodeGob(sc)
	if err != nil {
		return err
	}
	emit(out)
	return nil
}

func readSchema(it func(*[]byte) bool) (*schema, error) {
	var b []byte
	if !it(&b) {
		return nil, errors.New("pipeline: no schema")
	}
	var sc schema
	return &sc, decodeGob(b, &sc)
}

// encodeFn reads a shard again and emits its block.
type encodeFn struct{ Attempts int }

func (f *encodeFn) ProcessElement(ctx context.Context, ref string, schemaIt func(*[]byte) bool, emit func([]byte)) error {
	sc, err := readSchema(schemaIt)
	if err != nil || sc.Problem != "" {
		return err // a schema problem is reported once, by the plan stage
	}
	index, cells, err := readShard(ctx, ref, f.Attempts)
	if err != nil {
		return err
	}
	b, err := encodeShard(sc, index, cells)
	if err != nil {
		return err
	}
	out, err := encodeGob(b)
	if err != nil {
		return err
	}
	emit(out)
	return nil
}

// momentsFn emits the tiles of each fold's moments over one block.
type momentsFn struct {
	Config string

	once sync.Once
	ids  []int
	err  error
}

func (f *momentsFn) ProcessElement(ctx context.Context, blk []byte, schemaIt func(*[]byte) bool, emit func(string, []byte)) error {
	sc, err := readSchema(schemaIt)
	if err != nil || sc.Problem != "" || sc.Missing || !sc.Numbers {
		// No continuous node can share moments: rows with missing values
		// are left out per node, and 0/1 columns give logistic nodes.
		return err
	}
	var cfg antecedent.Config
	if err := json.Unmarshal([]byte(f.Config), &cfg); err != nil {
		return err
	}
	f.once.Do(func() {
		folds, err := antecedent.MomentFolds(sc.Rows, &cfg)
		if err != nil {
			f.err = err
			return
		}
		f.ids = folds.ID
	})
	if f.err != nil {
		return f.err
	}
	var b block
	if err := decodeGob(blk, &b); err != nil {
		return err
	}
	folds := cfg.Folds
	if folds == 0 {
		folds = maxFold(f.ids) + 1
	}
	tiles, err := blockMoments(sc, &b, f.ids, folds)
	if err != nil {
		return err
	}
	for k, t := range tiles {
		emit(k, floatsToBytes(t))
	}
	return nil
}

func maxFold(ids []int) int {
	m := 0
	for _, k := range ids {
		m = max(m, k)
	}
	return m
}

// jobSpec is what every worker needs to build the same antecedent.Job.
type jobSpec struct {
	Config string
	Order  string

	mu  sync.Mutex
	job *antecedent.Job
}

// jobOf builds the job once per DoFn instance from the side inputs.
func (j *jobSpec) jobOf(ctx context.Context, schemaIt, blocksIt func(*[]byte) bool, tilesIt func(*string, *[]byte) bool) (*antecedent.Job, error) {
	j.mu.Lock()
	defer j.mu.Unlock()
	if j.job != nil {
		return j.job, nil
	}
	sc, err := readSchema(schemaIt)
	if err != nil {
		return nil, err
	}
	var blocks []block
	var b []byte
	for blocksIt(&b) {
		var bl block
		if err := decodeGob(b, &bl); err != nil {
			return nil, err
		}
		blocks = append(blocks, bl)
	}
	d, err := dataset(sc, blocks)
	if err != nil {
		return nil, err
	}
	var cfg antecedent.Config
	if err := json.Unmarshal([]byte(j.Config), &cfg); err != nil {
		return nil, err
	}
	var o order.Order
	if err := json.Unmarshal([]byte(j.Order), &o); err != nil {
		return nil, err
	}
	tiles := map[string][]float64{}
	var k string
	for tilesIt(&k, &b) {
		tiles[k] = bytesToFloats(b)
	}
	job, err := antecedent.NewJob(ctx, d, &o, &cfg, &summed{shift: sc.shift(), tiles: tiles})
	if err != nil {
		return nil, err
	}
	j.job = job
	return job, nil
}

// summed is the engine of a job on a worker: its fold moments are those
// the pipeline summed, and its fits run one after another.
type summed struct {
	shift []float64
	tiles map[string][]float64
}

func (e *summed) FoldMoments(ctx context.Context, w *antecedent.MomentsWork) ([]*lasso.Moments, error) {
	if len(e.tiles) == 0 {
		return nil, errors.New("pipeline: the job needs shared moments and the pipeline formed none")
	}
	if len(e.shift) != len(w.Columns) {
		return nil, fmt.Errorf("pipeline: moments of %d columns for a table of %d design columns", len(e.shift), len(w.Columns))
	}
	return foldMoments(e.shift, w.Folds.K, e.tiles)
}

func (e *summed) Fit(ctx context.Context, w *antecedent.FitWork) error {
	for t := range w.Tasks {
		if err := w.Fit(ctx, t); err != nil {
			return err
		}
	}
	return nil
}

// planFn emits the nodes to fit.
type planFn struct{ jobSpec }

func (f *planFn) ProcessElement(ctx context.Context, _ []byte, schemaIt, blocksIt func(*[]byte) bool, tilesIt func(*string, *[]byte) bool, emit func(int)) error {
	job, err := f.jobOf(ctx, schemaIt, blocksIt, tilesIt)
	if err != nil {
		return err
	}
	for _, v := range job.Tasks() {
		emit(v)
	}
	return nil
}

// fitFn fits one node and emits its result as JSON.
type fitFn struct{ jobSpec }

func (f *fitFn) ProcessElement(ctx context.Context, v int, schemaIt, blocksIt func(*[]byte) bool, tilesIt func(*string, *[]byte) bool, emit func([]byte)) error {
	job, err := f.jobOf(ctx, schemaIt, blocksIt, tilesIt)
	if err != nil {
		return err
	}
	nr, err := job.FitNode(ctx, v)
	if err != nil {
		return err
	}
	b, err := json.Marshal(nr)
	if err != nil {
		return err
	}
	emit(b)
	return nil
}

// assembleFn assembles the result and writes it to Output.
type assembleFn struct {
	jobSpec
	Output string
}

func (f *assembleFn) ProcessElement(ctx context.Context, _ []byte, schemaIt, blocksIt func(*[]byte) bool, tilesIt func(*string, *[]byte) bool, resultsIt func(*[]byte) bool, emit func(string)) error {
	job, err := f.jobOf(ctx, schemaIt, blocksIt, tilesIt)
	if err != nil {
		return err
	}
	var outs []antecedent.NodeResult
	var b []byte
	for resultsIt(&b) {
		var nr antecedent.NodeResult
		if err := json.Unmarshal(b, &nr); err != nil {
			return err
		}
		outs = append(outs, nr)
	}
	res, err := job.Assemble(outs)
	if err != nil {
		return err
	}
	fs, err := filesystem.New(ctx, f.Output)
	if err != nil {
		return err
	}
	defer fs.Close()
	w, err := fs.OpenWrite(ctx, f.Output)
	if err != nil {
		return err
	}
	if err := res.WriteJSON(w); err != nil {
		w.Close()
		return err
	}
	if err := w.Close(); err != nil {
		return err
	}
	emit(f.Output)
	return nil
}
