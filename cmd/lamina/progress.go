package main

import (
	"fmt"
	"io"
	"os"
	"time"
)

// progress prints "done/total" lines to a terminal while a long sweep runs; it stays silent
// for short runs and when stderr is not a terminal (batch logs), so scripts see no noise.
type progress struct {
	w     io.Writer
	what  string
	total int
	start time.Time
	last  time.Time
	on    bool
}

// minProgress is the smallest sweep that reports progress.
const minProgress = 20000

func newProgress(w io.Writer, what string, total int) *progress {
	p := &progress{w: w, what: what, total: total, start: time.Now()}
	if f, ok := w.(*os.File); ok && total >= minProgress {
		if st, err := f.Stat(); err == nil && st.Mode()&os.ModeCharDevice != 0 {
			p.on = true
		}
	}
	p.last = p.start
	return p
}

// step records that row i is done.
func (p *progress) step(i int) {
	if !p.on || i%1024 != 0 {
		return
	}
	if now := time.Now(); now.Sub(p.last) > time.Second {
		p.last = now
		fmt.Fprintf(p.w, "\rlamina: %s: %d/%d q-points (%.0f%%), %s", p.what, i, p.total, 100*float64(i)/float64(p.total), now.Sub(p.start).Round(time.Second))
	}
}

// done ends the progress line.
func (p *progress) done() {
	if p.on && p.last != p.start {
		fmt.Fprintf(p.w, "\rlamina: %s: %d q-points in %s\n", p.what, p.total, time.Since(p.start).Round(time.Millisecond))
	}
}
