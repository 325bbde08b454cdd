package main

import (
	"fmt"
	"io"
	"os"
	"strings"
	"sync"
	"time"

	"github.com/antecedent-lab/antecedent"
)

// progressBar draws "nodes 7/15 [#####-----] 12s elapsed, about 8s left" on
// a terminal, rewriting one line.
type progressBar struct {
	mu    sync.Mutex
	w     io.Writer
	start time.Time
	width int
	drawn bool
}

// isTerminal reports whether f is a character device (a terminal).
func isTerminal(w io.Writer) bool {
	f, ok := w.(*os.File)
	if !ok {
		return false
	}
	st, err := f.Stat()
	return err == nil && st.Mode()&os.ModeCharDevice != 0
}

func newProgressBar(w io.Writer) *progressBar {
	return &progressBar{w: w, start: time.Now(), width: 30}
}

func (p *progressBar) update(pr antecedent.Progress) {
	p.mu.Lock()
	defer p.mu.Unlock()
	if pr.Total <= 0 {
		return
	}
	filled := p.width * pr.Done / pr.Total
	elapsed := time.Since(p.start)
	left := ""
	if pr.Done > 0 && pr.Done < pr.Total {
		rest := time.Duration(float64(elapsed) * float64(pr.Total-pr.Done) / float64(pr.Done))
		left = fmt.Sprintf(", about %s left", rest.Round(time.Second))
	}
	fmt.Fprintf(p.w, "\r  %s %d/%d [%s%s] %s elapsed%s   ", pr.Stage, pr.Done, pr.Total,
		strings.Repeat("#", filled), strings.Repeat("-", p.width-filled), elapsed.Round(100*time.Millisecond), left)
	p.drawn = true
}

// finish clears the bar's line.
func (p *progressBar) finish() {
	p.mu.Lock()
	defer p.mu.Unlock()
	if p.drawn {
		fmt.Fprintf(p.w, "\r%s\r", strings.Repeat(" ", 100))
	}
}
