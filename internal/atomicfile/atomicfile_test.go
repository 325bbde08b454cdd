package atomicfile

import (
	"bytes"
	"context"
	"errors"
	"io"
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
)

// faulty passes writes through until limit bytes have gone, then fails
// with err, as a full disk (ENOSPC) or a failing device (EIO) does; a short
// write is what the kernel reports when the disk fills mid-buffer.
type faulty struct {
	w     io.Writer
	limit int
	err   error
}

func (f *faulty) Write(p []byte) (int, error) {
	if len(p) <= f.limit {
		f.limit -= len(p)
		return f.w.Write(p)
	}
	n, _ := f.w.Write(p[:f.limit])
	f.limit = 0
	return n, f.err
}

// chunks writes n lines of text, long enough to pass the buffer many times.
func chunks(n int) func(io.Writer) error {
	return func(w io.Writer) error {
		for range n {
			if _, err := io.WriteString(w, strings.Repeat("x", 100)+"\n"); err != nil {
				return err
			}
		}
		return nil
	}
}

// dirNames lists the folder, so tests can check no temporary is left.
func dirNames(t *testing.T, dir string) []string {
	t.Helper()
	es, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	var out []string
	for _, e := range es {
		out = append(out, e.Name())
	}
	return out
}

func TestWriteReplaces(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "out.json")
	if err := os.WriteFile(path, []byte("old\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := Write(context.Background(), path, 0o640, chunks(5000)); err != nil {
		t.Fatal(err)
	}
	b, err := os.ReadFile(path)
	if err != nil || len(b) != 5000*101 {
		t.Fatalf("new file: %d bytes, %v", len(b), err)
	}
	if fi, _ := os.Stat(path); fi.Mode().Perm()&^0o640 != 0 {
		t.Errorf("mode %v, want within 0640", fi.Mode().Perm())
	}
	if names := dirNames(t, dir); len(names) != 1 {
		t.Errorf("folder holds %v, want only out.json", names)
	}
}

// TestFaultsLeaveOldFile injects a fault at every stage a write can fail
// and checks the old file is unchanged and no temporary is left.
func TestFaultsLeaveOldFile(t *testing.T) {
	enospc := syscall.ENOSPC
	cancelled, cancel := context.WithCancel(context.Background())
	cancel()
	cases := []struct {
		name string
		ctx  context.Context
		fill func(io.Writer) error
		wrap func(io.Writer) io.Writer
		want error
	}{
		{"disk full at once", context.Background(), chunks(5000),
			func(w io.Writer) io.Writer { return &faulty{w, 0, enospc} }, enospc},
		{"disk full midway", context.Background(), chunks(5000),
			func(w io.Writer) io.Writer { return &faulty{w, 200_000, enospc} }, enospc},
		{"disk full at the last flush", context.Background(), chunks(5000),
			func(w io.Writer) io.Writer { return &faulty{w, 5000*101 - 1, enospc} }, enospc},
		{"device error", context.Background(), chunks(5000),
			func(w io.Writer) io.Writer { return &faulty{w, 70_000, syscall.EIO} }, syscall.EIO},
		{"producer fails", context.Background(), func(w io.Writer) error {
			chunks(3000)(w)
			return errMarker
		}, nil, errMarker},
		{"cancelled before", cancelled, chunks(10), nil, context.Canceled},
		{"cancelled while writing", nil, nil, nil, context.Canceled},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			dir := t.TempDir()
			path := filepath.Join(dir, "report.html")
			old := []byte("<p>the previous, complete report</p>\n")
			if err := os.WriteFile(path, old, 0o644); err != nil {
				t.Fatal(err)
			}
			ctx, fill := c.ctx, c.fill
			if ctx == nil {
				// Cancel from inside the producer, as a signal arriving
				// mid-write does; the next buffer flush must fail.
				var stop context.CancelFunc
				ctx, stop = context.WithCancel(context.Background())
				defer stop()
				fill = func(w io.Writer) error {
					chunks(1000)(w)
					stop()
					return chunks(4000)(w)
				}
			}
			err := write(ctx, path, 0o644, fill, c.wrap)
			if !errors.Is(err, c.want) {
				t.Fatalf("error %v, want %v", err, c.want)
			}
			if b, _ := os.ReadFile(path); !bytes.Equal(b, old) {
				t.Errorf("target changed to %d bytes", len(b))
			}
			if names := dirNames(t, dir); len(names) != 1 {
				t.Errorf("folder holds %v, want only report.html", names)
			}
		})
	}
}

var errMarker = errors.New("producer failed")

func TestMissingFolder(t *testing.T) {
	err := Write(context.Background(), filepath.Join(t.TempDir(), "no", "such", "x.csv"), 0o644, chunks(1))
	if !errors.Is(err, os.ErrNotExist) {
		t.Errorf("error %v, want not-exist", err)
	}
}

func TestIsTemp(t *testing.T) {
	dir := t.TempDir()
	var seen string
	Write(context.Background(), filepath.Join(dir, "a.dot"), 0o644, func(w io.Writer) error {
		names := dirNames(t, dir)
		if len(names) == 1 {
			seen = names[0]
		}
		return nil
	})
	if !IsTemp(seen) || IsTemp("a.dot") {
		t.Errorf("IsTemp(%q) false or IsTemp(a.dot) true", seen)
	}
}
