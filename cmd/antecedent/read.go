package main

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"os"
	"path/filepath"
	"strings"

	"github.com/antecedent-lab/antecedent/table"
	"github.com/antecedent-lab/antecedent/table/parquetfile"
)

// reading holds the options of how a data file is read. It owns the
// reading flags: discover, effect and studysize all register them here, so
// that the data a result was discovered on are read again the same way.
type reading struct {
	separator    string
	decimalComma bool
	missingCodes string
	asIs         string
	reference    pairs
	codedOne     pairs
}

// pairs is a repeatable VARIABLE=LEVEL flag.
type pairs map[string]string

func (p *pairs) String() string {
	if p == nil || *p == nil {
		return ""
	}
	var parts []string
	for k, v := range *p {
		parts = append(parts, k+"="+v)
	}
	return strings.Join(parts, ",")
}

func (p *pairs) Set(s string) error {
	k, v, ok := strings.Cut(s, "=")
	k, v = strings.TrimSpace(k), strings.TrimSpace(v)
	if !ok || k == "" || v == "" {
		return fmt.Errorf("want VARIABLE=LEVEL, got %q", s)
	}
	if *p == nil {
		*p = pairs{}
	}
	if old, dup := (*p)[k]; dup && old != v {
		return fmt.Errorf("%q is given twice (%q and %q)", k, old, v)
	}
	(*p)[k] = v
	return nil
}

func (r *reading) register(fs *flag.FlagSet) {
	fs.StringVar(&r.separator, "separator", ",", `field separator: one character, or "tab"`)
	fs.BoolVar(&r.decimalComma, "decimal-comma", false, "numbers are written with a decimal comma (7,5)")
	fs.StringVar(&r.missingCodes, "missing-codes", "", `comma-separated cell values that mean missing, besides empty, NA, NaN, N/A and null (e.g. ".,-,999")`)
	fs.StringVar(&r.asIs, "as-is", "", "comma-separated columns read as they are, without the checks for odd cells")
	fs.Var(&r.reference, "reference", "VARIABLE=LEVEL: the reference level of a text variable (repeatable; default: a level that reads as an absence, else the most common)")
	fs.Var(&r.codedOne, "coded-1", "VARIABLE=LEVEL: the level coded 1 of a two-valued text variable (repeatable)")
}

// options maps the flags onto CSVOptions.
func (r *reading) options() (*table.CSVOptions, error) {
	o := &table.CSVOptions{DecimalComma: r.decimalComma, Reference: r.reference, CodedOne: r.codedOne}
	switch sep := r.separator; {
	case sep == "tab" || sep == `\t`:
		o.Comma = '\t'
	case len(sep) == 1:
		o.Comma = rune(sep[0])
	default:
		return nil, usageError{fmt.Sprintf(`--separator %q: want one character, or "tab"`, sep)}
	}
	o.MissingCodes = splitList(r.missingCodes)
	o.AsIs = splitList(r.asIs)
	return o, nil
}

func splitList(s string) []string {
	var out []string
	for _, f := range strings.Split(s, ",") {
		if f = strings.TrimSpace(f); f != "" {
			out = append(out, f)
		}
	}
	return out
}

// flagFix writes a table.Fix as the flag that applies it.
func flagFix(f table.Fix) string {
	switch f.Option {
	case "Comma":
		if f.Value == "\t" {
			return "use --separator tab"
		}
		return fmt.Sprintf("use --separator '%s'", f.Value)
	case "DecimalComma":
		return "use --decimal-comma"
	case "MissingCodes":
		return "use --missing-codes " + shellWord(f.Value)
	case "AsIs":
		return "use --as-is " + shellWord(f.Value)
	case "MaxLevels":
		return "leave the column out of the file"
	}
	return f.Option + " " + f.Value
}

// shellWord quotes s for a shell when it holds anything but letters,
// digits and _ . -.
func shellWord(s string) string {
	for _, r := range s {
		if !(r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z' || r >= '0' && r <= '9' || r == '_' || r == '.' || r == '-') || s == "-" {
			return "'" + strings.ReplaceAll(s, "'", `'\''`) + "'"
		}
	}
	return s
}

// readData reads the data at path: a Parquet file (named .parquet) or a
// directory of Parquet parts, else a CSV file. An error about a cell is
// written with the command's flags as fixes.
func readData(ctx context.Context, path string, o *table.CSVOptions) (*table.Dataset, error) {
	if st, err := os.Stat(path); err == nil && (st.IsDir() || strings.EqualFold(filepath.Ext(path), ".parquet")) {
		return readParquet(ctx, path, o)
	}
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	d, err := table.ReadCSV(f, o)
	if err != nil {
		var ce *table.CSVError
		if errors.As(err, &ce) {
			return nil, fmt.Errorf("%s: %s", path, ce.Describe(flagFix))
		}
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	return d, nil
}

// readParquet reads a Parquet file or directory of parts with the
// options that apply to it; the CSV-only options are refused.
func readParquet(ctx context.Context, path string, o *table.CSVOptions) (*table.Dataset, error) {
	var ro *table.ReadOptions
	if o != nil {
		if o.DecimalComma || o.Comma != 0 && o.Comma != ',' {
			return nil, usageError{"--separator and --decimal-comma apply to CSV files, not to Parquet"}
		}
		ro = &table.ReadOptions{MissingCodes: o.MissingCodes, Reference: o.Reference, CodedOne: o.CodedOne, AsIs: o.AsIs}
	}
	d, err := parquetfile.Read(ctx, path, ro)
	if err != nil {
		var se *table.SourceError
		if errors.As(err, &se) {
			return nil, fmt.Errorf("%s: %s", path, se.Describe(flagFix))
		}
		return nil, err
	}
	return d, nil
}

// missingHint rewrites a missing-value error with the --missing choices.
func missingHint(err error) error {
	var me *table.MissingError
	if !errors.As(err, &me) {
		return err
	}
	return errors.New("missing values: " + me.List() + "; rerun with --missing complete-case (use only the rows where every variable is present) or --missing available-case (fit each variable on the rows where it and its candidate parents are present)")
}
