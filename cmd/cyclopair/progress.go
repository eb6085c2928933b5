package main

import (
	"fmt"
	"io"
	"sync"
	"sync/atomic"
	"time"
)

// progress draws one self-overwriting status line on stderr while a batch runs:
//
//	screen  1 234 567 / 4 000 000 pairs  30.9%  812k pairs/s  eta 0:03
//
// It draws only when stderr is a terminal (streams.errIsTerminal), so pipes, files and CI
// logs never see it. Add is safe for concurrent use from worker goroutines; drawing happens on
// the progress goroutine at most every interval. Stop erases the line.
type progress struct {
	w        io.Writer
	label    string
	total    int64
	done     atomic.Int64
	start    time.Time
	now      func() time.Time // injectable clock for tests
	interval time.Duration
	stop     chan struct{}
	wg       sync.WaitGroup
	width    int // width of the last drawn line, to erase it
	draws    atomic.Int64
}

// newProgress returns a running progress line, or nil when enabled is false (a nil
// *progress is a valid no-op receiver for Add and Stop).
func newProgress(w io.Writer, enabled bool, label string, total int64) *progress {
	return newProgressEvery(w, enabled, label, total, 200*time.Millisecond)
}

func newProgressEvery(w io.Writer, enabled bool, label string, total int64, every time.Duration) *progress {
	if !enabled || total <= 0 {
		return nil
	}
	p := &progress{w: w, label: label, total: total, now: time.Now, interval: every,
		stop: make(chan struct{})}
	p.start = p.now()
	p.wg.Add(1)
	go p.loop()
	return p
}

// Add records n more items done.
func (p *progress) Add(n int64) {
	if p != nil {
		p.done.Add(n)
	}
}

// Stop ends the line and erases it.
func (p *progress) Stop() {
	if p == nil {
		return
	}
	close(p.stop)
	p.wg.Wait()
	if p.width > 0 {
		fmt.Fprintf(p.w, "\r%*s\r", p.width, "")
	}
}

func (p *progress) loop() {
	defer p.wg.Done()
	t := time.NewTicker(p.interval)
	defer t.Stop()
	for {
		select {
		case <-p.stop:
			return
		case <-t.C:
			s := p.line(p.done.Load(), p.now().Sub(p.start))
			pad := max(p.width-len(s), 0)
			fmt.Fprintf(p.w, "\r%s%*s", s, pad, "")
			p.width = len(s)
			p.draws.Add(1)
		}
	}
}

// line formats the status for done items after elapsed time.
func (p *progress) line(done int64, elapsed time.Duration) string {
	pct := 100 * float64(done) / float64(p.total)
	s := fmt.Sprintf("%s %s / %s  %5.1f%%", p.label, groupDigits(done), groupDigits(p.total), pct)
	if sec := elapsed.Seconds(); sec > 0 && done > 0 {
		rate := float64(done) / sec
		s += "  " + siRate(rate) + "/s"
		left := time.Duration(float64(p.total-done) / rate * float64(time.Second))
		s += "  eta " + clock(left)
	}
	return s
}

// groupDigits writes 1234567 as "1 234 567" (thin grouping that reads in any locale).
func groupDigits(n int64) string {
	s := fmt.Sprint(n)
	var out []byte
	for i := range len(s) {
		if i > 0 && (len(s)-i)%3 == 0 && s[i-1] != '-' {
			out = append(out, ' ')
		}
		out = append(out, s[i])
	}
	return string(out)
}

// siRate writes a rate as 950, 12.3k, 4.56M.
func siRate(r float64) string {
	switch {
	case r >= 1e6:
		return fmt.Sprintf("%.2fM", r/1e6)
	case r >= 1e3:
		return fmt.Sprintf("%.1fk", r/1e3)
	}
	return fmt.Sprintf("%.0f", r)
}

// clock writes a duration as m:ss or h:mm:ss.
func clock(d time.Duration) string {
	if d < 0 {
		d = 0
	}
	s := int64(d.Round(time.Second) / time.Second)
	if s >= 3600 {
		return fmt.Sprintf("%d:%02d:%02d", s/3600, s/60%60, s%60)
	}
	return fmt.Sprintf("%d:%02d", s/60, s%60)
}
