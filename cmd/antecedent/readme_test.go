package main

import (
	"flag"
	"os"
	"strings"
	"testing"
)

var update = flag.Bool("update", false, "rewrite the README's help blocks from the tool's help")

// readmePath is the README whose command-line section shows the help.
const readmePath = "../../README.md"

// helpBlocks renders the help of the tool and of each command as the
// README shows it: one fenced block per command, the general help first.
func helpBlocks(t *testing.T) string {
	t.Helper()
	var b strings.Builder
	show := func(title string, args ...string) {
		out, errs, code := runCLI(t, args...)
		if code != 0 || errs != "" {
			t.Fatalf("%v: exit %d, stderr %q", args, code, errs)
		}
		b.WriteString("<details><summary><code>" + title + "</code></summary>\n\n```text\n" + out + "```\n\n</details>\n")
	}
	show("antecedent help", "help")
	for _, c := range commands {
		show("antecedent help "+c.name, "help", c.name)
	}
	return b.String()
}

// TestREADMEHelp checks that the README's command-line section shows the
// help word for word; with -update it rewrites that part of the README.
func TestREADMEHelp(t *testing.T) {
	b, err := os.ReadFile(readmePath)
	if err != nil {
		t.Fatal(err)
	}
	const begin, end = "<!-- help -->\n", "<!-- end of help -->\n"
	s := string(b)
	i := strings.Index(s, begin)
	if i < 0 {
		t.Fatalf("README has no %q marker", strings.TrimSpace(begin))
	}
	j := strings.Index(s[i:], end)
	want := helpBlocks(t)
	if *update {
		rest := s[i+len(begin):]
		if j >= 0 {
			rest = s[i+j+len(end):]
		} else if k := strings.Index(rest, "\n### "); k >= 0 {
			rest = rest[k+1:]
		}
		s = s[:i] + begin + "\n" + want + "\n" + end + "\n" + strings.TrimLeft(rest, "\n")
		if err := os.WriteFile(readmePath, []byte(s), 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	if j < 0 {
		t.Fatalf("README has no %q marker", strings.TrimSpace(end))
	}
	got := strings.TrimSpace(s[i+len(begin) : i+j])
	if got != strings.TrimSpace(want) {
		gl, wl := strings.Split(got, "\n"), strings.Split(strings.TrimSpace(want), "\n")
		for k := range min(len(gl), len(wl)) {
			if gl[k] != wl[k] {
				t.Fatalf("README's help differs from the tool's at block line %d:\nREADME: %q\ntool:   %q\n(run go test ./cmd/antecedent -run TestREADMEHelp -update)", k+1, gl[k], wl[k])
			}
		}
		t.Fatalf("README's help has %d lines, the tool's %d (run go test ./cmd/antecedent -run TestREADMEHelp -update)", len(gl), len(wl))
	}
}
