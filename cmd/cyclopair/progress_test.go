package main

import (
	"bytes"
	"strings"
	"testing"
	"time"
)

func TestProgressLine(t *testing.T) {
	p := &progress{label: "screen", total: 4_000_000}
	cases := []struct {
		done    int64
		elapsed time.Duration
		want    string
	}{
		{0, 0, "screen 0 / 4 000 000    0.0%"},
		{1_000_000, 2 * time.Second, "screen 1 000 000 / 4 000 000   25.0%  500.0k/s  eta 0:06"},
		{3_999_000, 4000 * time.Second, "screen 3 999 000 / 4 000 000  100.0%  1000/s  eta 0:01"},
		{2_000_000, 4 * time.Hour, "screen 2 000 000 / 4 000 000   50.0%  139/s  eta 4:00:00"},
	}
	for _, c := range cases {
		if got := p.line(c.done, c.elapsed); got != c.want {
			t.Errorf("line(%d, %v) = %q, want %q", c.done, c.elapsed, got, c.want)
		}
	}
	if got := siRate(12_345_678); got != "12.35M" {
		t.Errorf("siRate = %q", got)
	}
}

// Off a terminal the progress line is nil and writes nothing.
func TestProgressOffTerminal(t *testing.T) {
	var buf bytes.Buffer
	p := newProgress(&buf, false, "screen", 100)
	p.Add(50)
	p.Stop()
	if p != nil || buf.Len() != 0 {
		t.Errorf("progress drew %q off a terminal", buf.String())
	}
}

// On a "terminal" it draws and then erases its line.
func TestProgressDrawsAndErases(t *testing.T) {
	var buf bytes.Buffer // written only by the progress goroutine, read after Stop
	p := newProgressEvery(&buf, true, "screen", 100, time.Millisecond)
	p.Add(40)
	for i := 0; i < 5000 && p.draws.Load() == 0; i++ {
		time.Sleep(time.Millisecond)
	}
	p.Stop()
	out := buf.String()
	if !strings.Contains(out, "\rscreen 40 / 100") || !strings.HasSuffix(out, "\r") {
		t.Errorf("progress output %q", out)
	}
}
