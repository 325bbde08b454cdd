package main

import (
	"bufio"
	"bytes"
	"context"
	"errors"
	"os"
	"os/exec"
	"path/filepath"
	"runtime"
	"strings"
	"syscall"
	"testing"
	"time"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/internal/atomicfile"
)

// buildCommand compiles the command into a temporary folder.
func buildCommand(t *testing.T) string {
	t.Helper()
	bin := filepath.Join(t.TempDir(), "antecedent")
	goTool := filepath.Join(runtime.GOROOT(), "bin", "go")
	out, err := exec.Command(goTool, "build", "-o", bin, ".").CombinedOutput()
	if err != nil {
		t.Fatalf("go build: %v\n%s", err, out)
	}
	return bin
}

// oldOutputs fills dir with the files a previous demo run left, and
// returns their contents by name.
func oldOutputs(t *testing.T, dir string) map[string]string {
	t.Helper()
	old := map[string]string{
		"result.json": `{"previous": "complete result"}` + "\n",
		"network.dot": "digraph previous {}\n",
		"report.html": "<p>previous report</p>\n",
	}
	for name, body := range old {
		if err := os.WriteFile(filepath.Join(dir, name), []byte(body), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	return old
}

// checkUntouched fails unless dir holds exactly the old files, unchanged.
func checkUntouched(t *testing.T, dir string, old map[string]string) {
	t.Helper()
	es, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	for _, e := range es {
		if atomicfile.IsTemp(e.Name()) {
			t.Errorf("temporary file %s left behind", e.Name())
		} else if _, ok := old[e.Name()]; !ok {
			t.Errorf("unexpected file %s", e.Name())
		}
	}
	for name, body := range old {
		if b, err := os.ReadFile(filepath.Join(dir, name)); err != nil || string(b) != body {
			t.Errorf("%s changed: %q, %v", name, b, err)
		}
	}
}

// TestSignalStopsRun starts the built command on a long run (stability
// selection with many pairs takes minutes), sends it a signal once it has
// started work, and checks that it stops with the conventional status and a
// one-line message and leaves the previous outputs as they were.
func TestSignalStopsRun(t *testing.T) {
	if testing.Short() {
		t.Skip("builds the command")
	}
	bin := buildCommand(t)
	for _, c := range []struct {
		sig    syscall.Signal
		name   string
		status int
	}{
		{syscall.SIGINT, "SIGINT", 130},
		{syscall.SIGTERM, "SIGTERM", 143},
	} {
		t.Run(c.name, func(t *testing.T) {
			dir := t.TempDir()
			old := oldOutputs(t, dir)
			cmd := exec.Command(bin, "demo", "--out", dir, "--stability-pairs", "2000", "--workers", "1")
			var stderr bytes.Buffer
			cmd.Stderr = &stderr
			stdout, err := cmd.StdoutPipe()
			if err != nil {
				t.Fatal(err)
			}
			if err := cmd.Start(); err != nil {
				t.Fatal(err)
			}
			// The demo prints its introduction just before the discovery
			// starts, long after the signal handler is in place.
			first, err := bufio.NewReader(stdout).ReadString('\n')
			if err != nil || !strings.HasPrefix(first, "Demo:") {
				cmd.Process.Kill()
				cmd.Wait()
				t.Fatalf("first line %q, %v", first, err)
			}
			if err := cmd.Process.Signal(c.sig); err != nil {
				t.Fatal(err)
			}
			// A limit that stops a hung child, not a speed assertion.
			timer := time.AfterFunc(60*time.Second, func() { cmd.Process.Kill() })
			err = cmd.Wait()
			timer.Stop()
			var exit *exec.ExitError
			if !errors.As(err, &exit) {
				t.Fatalf("wait: %v (want a non-zero exit)", err)
			}
			if exit.ExitCode() != c.status {
				t.Errorf("exit status %d (%v), want %d", exit.ExitCode(), exit, c.status)
			}
			msg := stderr.String()
			if strings.Count(msg, "\n") != 1 || !strings.HasPrefix(msg, "antecedent demo: interrupted by "+c.name) {
				t.Errorf("stderr %q, want one line naming %s", msg, c.name)
			}
			checkUntouched(t, dir, old)
		})
	}
}

// TestInterruptedRun cancels a run the way the signal handler does and
// checks the one-line message, the status and that the old outputs stay;
// atomicfile.TestFaultsLeaveOldFile covers an interrupt in mid-write.
func TestInterruptedRun(t *testing.T) {
	dir := t.TempDir()
	data, ord := filepath.Join(dir, "d.csv"), filepath.Join(dir, "o.txt")
	if _, errs, code := runCLI(t, "simulate", "--variables", "6", "--tiers", "3", "--rows", "300", "--data", data, "--order", ord, "--truth", filepath.Join(dir, "t.csv")); code != 0 {
		t.Fatal(errs)
	}
	out := t.TempDir()
	old := oldOutputs(t, out)
	args := []string{"discover", "--data", data, "--order", ord, "--folds", "3", "--quiet",
		"--json", filepath.Join(out, "result.json"), "--dot", filepath.Join(out, "network.dot"),
		"--report", filepath.Join(out, "report.html")}
	ctx, cancel := context.WithCancelCause(context.Background())
	cancel(interruption{syscall.SIGTERM})
	var stdout, stderr bytes.Buffer
	code := run(ctx, args, &stdout, &stderr)
	if code != 143 || strings.Count(stderr.String(), "\n") != 1 || !strings.HasPrefix(stderr.String(), "antecedent discover: interrupted by SIGTERM") {
		t.Errorf("status %d, stderr %q", code, stderr.String())
	}
	checkUntouched(t, out, old)

	// The outputs alone, given a context the signal has cancelled.
	res := fitSmall(t, data, ord)
	s := settings{jsonOut: filepath.Join(out, "result.json"), report: filepath.Join(out, "report.html")}
	if err := s.outputs(ctx, res, nil); !errors.Is(err, context.Canceled) {
		t.Errorf("outputs under a cancelled context: %v", err)
	}
	checkUntouched(t, out, old)

	// Uncancelled, the same run replaces every file whole.
	if code := run(context.Background(), args, &stdout, &stderr); code != 0 {
		t.Fatalf("status %d: %s", code, stderr.String())
	}
	for name := range old {
		b, err := os.ReadFile(filepath.Join(out, name))
		if err != nil || string(b) == old[name] {
			t.Errorf("%s not replaced: %v", name, err)
		}
	}
}

// fitSmall runs a quick discovery on the files.
func fitSmall(t *testing.T, data, ord string) *antecedent.Result {
	t.Helper()
	d, err := readData(context.Background(), data, nil)
	if err != nil {
		t.Fatal(err)
	}
	o, err := readOrder(ord)
	if err != nil {
		t.Fatal(err)
	}
	res, err := antecedent.DiscoverContext(context.Background(), d, o, &antecedent.Config{Folds: 3})
	if err != nil {
		t.Fatal(err)
	}
	return res
}
