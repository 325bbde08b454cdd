package atomicfile

import (
	"bufio"
	"context"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"
)

// TempPrefix begins the name of every temporary file Write creates, so
// that one left by a crash (the only case Write cannot clean up) is easy to
// recognise: ".NAME.tmp-RANDOM" beside the target NAME.
const TempPrefix = "."

// tempMark sits between the target's name and the random part.
const tempMark = ".tmp-"

// IsTemp reports whether name (a base name) looks like a temporary file of
// Write.
func IsTemp(name string) bool {
	return strings.HasPrefix(name, TempPrefix) && strings.Contains(name, tempMark)
}

// Write calls fill with a buffered writer onto a temporary file beside
// path and, when fill returns nil, flushes, syncs and renames it over path
// with permissions perm (before the umask). It returns fill's error, an
// I/O error, or ctx's error when ctx is done before the rename; in each
// case the temporary file is removed and path is unchanged. Writes made by
// fill after ctx is done fail with ctx's error, so a long fill stops early.
func Write(ctx context.Context, path string, perm os.FileMode, fill func(io.Writer) error) error {
	return write(ctx, path, perm, fill, nil)
}

// write is Write with an optional wrapper around the file, through which
// tests inject faults (a full disk, a failing device).
func write(ctx context.Context, path string, perm os.FileMode, fill func(io.Writer) error, wrap func(io.Writer) io.Writer) (err error) {
	if err := ctx.Err(); err != nil {
		return err
	}
	dir, base := filepath.Split(path)
	if dir == "" {
		dir = "."
	}
	f, err := os.CreateTemp(dir, TempPrefix+base+tempMark+"*")
	if err != nil {
		return err
	}
	tmp := f.Name()
	defer func() {
		if err != nil {
			f.Close()
			os.Remove(tmp)
		}
	}()
	var w io.Writer = f
	if wrap != nil {
		w = wrap(w)
	}
	bw := bufio.NewWriterSize(ctxWriter{ctx, w}, 64<<10)
	if err := fill(bw); err != nil {
		return err
	}
	if err := bw.Flush(); err != nil {
		return err
	}
	if err := f.Chmod(perm); err != nil {
		return err
	}
	if err := f.Sync(); err != nil {
		return fmt.Errorf("atomicfile: sync %s: %w", tmp, err)
	}
	if err := f.Close(); err != nil {
		return err
	}
	if err := ctx.Err(); err != nil {
		return err
	}
	if err := os.Rename(tmp, path); err != nil {
		return err
	}
	// The new file is in place; a failure to sync the folder only weakens
	// durability after a power cut and is not reported as a failed write.
	if d, derr := os.Open(dir); derr == nil {
		d.Sync()
		d.Close()
	}
	return nil
}

// ctxWriter fails every write once its context is done.
type ctxWriter struct {
	ctx context.Context
	w   io.Writer
}

func (c ctxWriter) Write(p []byte) (int, error) {
	if err := c.ctx.Err(); err != nil {
		return 0, err
	}
	n, err := c.w.Write(p)
	if err == nil && n < len(p) {
		err = io.ErrShortWrite
	}
	return n, err
}
