// Command antecedent discovers a sparse causal network from a table whose
// variables are ordered in time, for research pipelines.
//
//	antecedent demo                       run on the shipped synthetic demo data
//	antecedent discover --data d.csv --order o.txt --json result.json
//	antecedent simulate --variables 20 --rows 2000 --data d.csv --order o.txt --truth t.csv
//	antecedent compare --estimate result.json --truth t.csv
//	antecedent render --result result.json --report r.html --effect effect.json --studysize plan.json
//	antecedent effect --result result.json --data d.csv --cause X --if set:1 --versus set:0
//	antecedent studysize --result result.json --data d.csv --sizes 500,1000,2000 --edge "A->B"
//
// Run "antecedent help COMMAND" for a command's options. Errors are printed
// as one line on standard error with a non-zero exit status.
package main

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"runtime/debug"
	"slices"
	"strings"
)

// usageError marks errors in how the command was called (exit status 2).
type usageError struct{ msg string }

func (e usageError) Error() string { return e.msg }

type command struct {
	name, summary string
	run           func(ctx context.Context, args []string, stdout, stderr io.Writer) error
}

var commands = []command{
	{"demo", "run the whole job on the shipped synthetic demo data", runDemo},
	{"discover", "discover the network of a CSV file given a time order", runDiscover},
	{"simulate", "write data, order and true graph drawn from a random tiered network", runSimulate},
	{"compare", "score an estimated network against a true one", runCompare},
	{"render", "write the report and graph files of a saved result JSON", runRender},
	{"effect", "what an intervention would change, by g-computation over a result's network", runEffect},
	{"studysize", "rows a study needs to find each edge, by simulated studies", runStudySize},
}

func main() {
	ctx, stop := interruptContext()
	code := run(ctx, os.Args[1:], os.Stdout, os.Stderr)
	stop()
	os.Exit(code)
}

func run(ctx context.Context, args []string, stdout, stderr io.Writer) int {
	if len(args) == 0 {
		usage(stderr)
		return 2
	}
	if args[0] == "help" || args[0] == "-h" || args[0] == "--help" {
		if len(args) == 1 {
			usage(stdout)
			return 0
		}
		args = []string{args[1], "-h"}
	}
	if args[0] == "version" || args[0] == "--version" {
		fmt.Fprintln(stdout, version())
		return 0
	}
	for _, c := range commands {
		if c.name == args[0] {
			// Help asked for goes to standard output; usage after a
			// mistake goes to standard error.
			out := stderr
			if slices.ContainsFunc(args[1:], func(a string) bool { return a == "-h" || a == "--help" || a == "-help" }) {
				out = stdout
			}
			err := c.run(ctx, args[1:], stdout, out)
			switch {
			case err == nil:
				return 0
			case errors.Is(err, flag.ErrHelp):
				return 0
			}
			if i, ok := interrupted(ctx); ok {
				fmt.Fprintf(stderr, "antecedent %s: %v; stopped, no partly written file left\n", c.name, i)
				return i.status()
			}
			fmt.Fprintln(stderr, "antecedent "+c.name+": "+oneLine(plain(err.Error())))
			var ue usageError
			if errors.As(err, &ue) {
				return 2
			}
			return 1
		}
	}
	fmt.Fprintf(stderr, "antecedent: unknown command %q (run \"antecedent help\")\n", args[0])
	return 2
}

func usage(w io.Writer) {
	fmt.Fprintln(w, "antecedent discovers a sparse causal network from data ordered in time.")
	fmt.Fprintln(w, "\nUsage: antecedent COMMAND [options]\n\nCommands:")
	for _, c := range commands {
		fmt.Fprintf(w, "  %-9s %s\n", c.name, c.summary)
	}
	fmt.Fprintf(w, "  %-9s %s\n", "version", "print the version of the tool and the commit it was built from")
	fmt.Fprintln(w, "\nRun \"antecedent help COMMAND\" for a command's options.")
	fmt.Fprintln(w, "\nResults are hypotheses from observational data; see the README's cautions.")
}

// packagePrefixes are the prefixes the library's error messages start
// with; the command names itself once, so they are dropped from what it
// prints.
var packagePrefixes = []string{"antecedent: ", "table: ", "order: ", "cv: ", "lasso: ", "dag: ", "metrics: ", "intervention: ", "sizing: "}

// plain drops the library's package prefixes from an error message, where
// they start the message or follow a ": " or "; " separator.
func plain(msg string) string {
	for {
		changed := false
		for _, p := range packagePrefixes {
			if strings.HasPrefix(msg, p) {
				msg, changed = msg[len(p):], true
			}
			for _, sep := range []string{": ", "; "} {
				if strings.Contains(msg, sep+p) {
					msg, changed = strings.ReplaceAll(msg, sep+p, sep), true
				}
			}
		}
		if !changed {
			return msg
		}
	}
}

// oneLine folds an error message onto one line.
func oneLine(s string) string {
	out := []rune{}
	for _, r := range s {
		if r == '\n' || r == '\r' {
			r = ' '
		}
		out = append(out, r)
	}
	return string(out)
}

// newFlags returns a flag set that reports errors instead of exiting.
func newFlags(name, synopsis string, stderr io.Writer) *flag.FlagSet {
	fs := flag.NewFlagSet(name, flag.ContinueOnError)
	fs.SetOutput(stderr)
	fs.Usage = func() {
		w := fs.Output()
		fmt.Fprintf(w, "Usage: antecedent %s %s\n\nOptions:\n", name, synopsis)
		printOptions(w, fs)
	}
	return fs
}

// printOptions lists a flag set's options with two dashes, as the README
// writes them.
func printOptions(w io.Writer, fs *flag.FlagSet) {
	fs.VisitAll(func(f *flag.Flag) {
		kind, usage := flag.UnquoteUsage(f)
		line := "  --" + f.Name
		if kind != "" {
			line += " " + kind
		}
		fmt.Fprintf(w, "%s\n    \t%s", line, usage)
		if f.DefValue != "" && f.DefValue != "false" && f.DefValue != "0" {
			fmt.Fprintf(w, " (default %s)", f.DefValue)
		}
		fmt.Fprintln(w)
	})
}

// version returns the module version and, when built from a checkout, the
// commit and whether the tree had changes.
func version() string {
	v := "antecedent (unknown version)"
	info, ok := debug.ReadBuildInfo()
	if !ok {
		return v
	}
	v = "antecedent " + info.Main.Version
	var rev, modified string
	for _, s := range info.Settings {
		switch s.Key {
		case "vcs.revision":
			rev = s.Value
		case "vcs.modified":
			if s.Value == "true" {
				modified = " with uncommitted changes"
			}
		}
	}
	if rev != "" {
		v += ", commit " + rev + modified
	}
	return v + ", " + info.GoVersion
}

func parse(fs *flag.FlagSet, args []string) error {
	if err := fs.Parse(args); err != nil {
		if errors.Is(err, flag.ErrHelp) {
			return err
		}
		return usageError{err.Error()}
	}
	if fs.NArg() > 0 {
		return usageError{fmt.Sprintf("unexpected argument %q", fs.Arg(0))}
	}
	return nil
}
