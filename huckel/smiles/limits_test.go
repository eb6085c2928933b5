package smiles

import (
	"errors"
	"math"
	"runtime"
	"strconv"
	"strings"
	"testing"
	"unicode/utf8"
)

// TestLengthLimit: the reproducers of issue 14 at the reader. A SMILES over the limit
// fails with ErrTooLong at the first byte beyond it, naming both sizes and the flag that
// raises it; exactly the limit is accepted; ParseOptions raises and lowers it.
func TestLengthLimit(t *testing.T) {
	polyene := func(n int) string { return strings.Repeat("C=C", n) }
	for _, tc := range []struct {
		name string
		opts ParseOptions
		in   string
		ok   bool
	}{
		{"issue reproducer, 100,002 bytes", ParseOptions{}, polyene(33334), false},
		{"one byte over", ParseOptions{}, strings.Repeat("C", MaxLength+1), false},
		{"exactly the limit", ParseOptions{}, strings.Repeat("C", MaxLength), true},
		{"lowered", ParseOptions{MaxLength: 5}, "C=CC=C", false},
		{"raised", ParseOptions{MaxLength: 200000}, polyene(33334), true},
		{"lifted", ParseOptions{MaxLength: math.MaxInt}, polyene(2000), true},
		{"negative means the default", ParseOptions{MaxLength: -1}, polyene(2000), false},
	} {
		m, err := tc.opts.Parse(tc.in)
		if tc.ok {
			if err != nil {
				t.Errorf("%s: %v", tc.name, err)
			} else if len(m.Atoms) == 0 {
				t.Errorf("%s: no atoms", tc.name)
			}
			continue
		}
		var e *Error
		if !errors.As(err, &e) || !errors.Is(err, ErrTooLong) {
			t.Errorf("%s: got %v, want an *Error wrapping ErrTooLong", tc.name, err)
			continue
		}
		limit := tc.opts.MaxLength
		if limit <= 0 {
			limit = MaxLength
		}
		if e.Pos != limit {
			t.Errorf("%s: position %d, want %d (the first byte beyond the limit)", tc.name, e.Pos, limit)
		}
		for _, want := range []string{strconv.Itoa(len(tc.in)) + " bytes", "limit of " + strconv.Itoa(limit) + " bytes", "--max-smiles-length"} {
			if !strings.Contains(e.Error(), want) {
				t.Errorf("%s: %q lacks %q", tc.name, e.Error(), want)
			}
		}
		if len(e.Error()) > 200 {
			t.Errorf("%s: message of %d bytes", tc.name, len(e.Error()))
		}
	}
}

// TestLengthLimitAllocatesNothingThatScales: the length is checked before anything that
// grows with the input is allocated, so refusing 1 MB costs what refusing 5 kB does.
func TestLengthLimitAllocatesNothingThatScales(t *testing.T) {
	huge := strings.Repeat("C=C", 1<<18) // 786 kB: 524,288 atoms if it were read
	var before, after runtime.MemStats
	runtime.GC()
	runtime.ReadMemStats(&before)
	const calls = 20
	for range calls {
		if _, err := Parse(huge); !errors.Is(err, ErrTooLong) {
			t.Fatal(err)
		}
	}
	runtime.ReadMemStats(&after)
	// Reading it would allocate tens of megabytes (atoms, bonds, adjacency); the error
	// itself is a few hundred bytes. 64 kB per call leaves room for the runtime.
	if per := (after.TotalAlloc - before.TotalAlloc) / calls; per > 64<<10 {
		t.Errorf("refusing a %d-byte SMILES allocated %d bytes per call", len(huge), per)
	}
}

// TestExcerptOfHugeInput: an error deep inside a 200,000-character input quotes at most
// about 100 characters around the position, with the total length, and the caret still
// points at the offending character (issue 14: the whole input used to be printed).
func TestExcerptOfHugeInput(t *testing.T) {
	in := strings.Repeat("C", 100000) + "!" + strings.Repeat("C", 99999)
	_, err := ParseOptions{MaxLength: len(in)}.Parse(in)
	var e *Error
	if !errors.As(err, &e) || !errors.Is(err, ErrSyntax) {
		t.Fatalf("got %v", err)
	}
	lines := strings.Split(e.Excerpt(), "\n")
	if len(lines) != 2 {
		t.Fatalf("Excerpt = %q", e.Excerpt())
	}
	if n := utf8.RuneCountInString(lines[0]); n > 140 {
		t.Errorf("excerpt line of %d characters: %q", n, lines[0])
	}
	if !strings.Contains(lines[0], "(input of 200000 characters)") {
		t.Errorf("excerpt lacks the total length: %q", lines[0])
	}
	if c := len(lines[1]) - 1; lines[0][c] != '!' {
		t.Errorf("caret at %d is not under '!':\n%s", c, e.Excerpt())
	}
	if len(e.Error()) > 200 {
		t.Errorf("Error() of %d bytes", len(e.Error()))
	}
}

// TestExcerptEscapesControlBytes: escape, NUL and BEL bytes of the input reach the
// message as visible escapes, never as raw bytes that would drive a terminal.
func TestExcerptEscapesControlBytes(t *testing.T) {
	for _, in := range []string{"C\x1b[2JC", "CC\x00", "C\x07C", "C\x1b]0;title\x07C", "\u202eCC", "CC\x7f", "C\u0085C"} {
		_, err := Parse(in)
		var e *Error
		if !errors.As(err, &e) {
			t.Errorf("Parse(%q) = %v, want an *Error", in, err)
			continue
		}
		msg := e.Error() + "\n" + e.Excerpt()
		for _, r := range strings.ReplaceAll(msg, "\n", "") {
			if r < 0x20 || r == 0x7f || (r >= 0x80 && r < 0xa0) || r == '\u202e' {
				t.Errorf("Parse(%q): raw control character %U in %q", in, r, msg)
			}
		}
	}
}
