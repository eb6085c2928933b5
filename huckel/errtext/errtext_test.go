package errtext

import (
	"strings"
	"testing"
	"unicode/utf8"
)

func TestEscape(t *testing.T) {
	for _, tc := range []struct{ in, want string }{
		{"C=CC=C", "C=CC=C"},
		{`C/C=C\C`, `C/C=C\C`}, // backslash is a SMILES bond: kept
		{"C\x1b[31mC", `C\x1b[31mC`},
		{"a\x00b\x07c", `a\x00b\x07c`},
		{"tab\there\nline\r", `tab\there\nline\r`},
		{"del\x7f", `del\x7f`},
		{"c1\u0085c", `c1\u0085c`},         // C1 control NEL
		{"\ufeffC=C", `\ufeffC=C`},         // byte-order mark
		{"abc\u202edcba", `abc\u202edcba`}, // right-to-left override
		{"bad\xc3(", `bad\xc3(`},           // invalid UTF-8
		{"Brønsted α β", "Brønsted α β"},   // printable non-ASCII stays
		{"", ""},
	} {
		got := Escape(tc.in)
		if got != tc.want {
			t.Errorf("Escape(%q) = %q, want %q", tc.in, got, tc.want)
		}
		if again := Escape(got); again != got {
			t.Errorf("Escape is not idempotent on %q: %q", got, again)
		}
		if !utf8.ValidString(got) {
			t.Errorf("Escape(%q) = %q is not UTF-8", tc.in, got)
		}
	}
}

func TestClipAndQuote(t *testing.T) {
	if got := Clip("C=C\x1b"); got != `C=C\x1b` {
		t.Errorf("short Clip = %q", got)
	}
	long := strings.Repeat("C=C", 66667) // 200,001 characters
	got := Clip(long)
	if !strings.HasSuffix(got, " (input of 200001 characters)") || !strings.Contains(got, "...") {
		t.Errorf("Clip(long) = %q", got)
	}
	shown := strings.TrimSuffix(got, " (input of 200001 characters)")
	if n := utf8.RuneCountInString(shown); n != Width {
		t.Errorf("Clip(long) shows %d characters, want %d", n, Width)
	}
	if !strings.HasPrefix(got, "C=CC=C") || !strings.HasSuffix(shown, "C=CC=C") {
		t.Errorf("Clip(long) does not keep both ends: %q", got)
	}
	// Control characters in a long input are escaped in the kept ends.
	if got := Clip("\x1b" + long + "\x07"); !strings.HasPrefix(got, `\x1b`) || !strings.Contains(got, `\x07 (input of`) {
		t.Errorf("Clip keeps raw control characters: %q", got)
	}
	if got, want := Quote("Q\x1b"), `"Q\x1b"`; got != want {
		t.Errorf("Quote = %q, want %q", got, want)
	}
	q := Quote(strings.Repeat("A", 5000))
	if !strings.HasPrefix(q, `"AAA`) || !strings.HasSuffix(q, `AAA" (input of 5000 characters)`) || len(q) > Width+40 {
		t.Errorf("Quote(long) = %q", q)
	}
}

// TestExcerptCaret checks the caret under the problem character for short, long, escaped
// and multi-byte inputs, at the start, middle and end.
func TestExcerptCaret(t *testing.T) {
	long := strings.Repeat("C", 100000) + "X" + strings.Repeat("C", 99999)
	for _, tc := range []struct {
		name, in string
		pos      int
		mark     string // the shown text the caret must stand under
	}{
		{"short", "C1CC", 1, "1"},
		{"end", "C(C", 3, ""},
		{"escape before", "C\x1bCX", 3, "X"},
		{"escape at", "C\x1bC", 1, `\`},
		{"multi-byte before", "CCé!", 4, "!"},
		{"inside multi-byte", "CCé", 3, "é"},
		{"long middle", long, 100000, "X"},
		{"long start", "X" + long, 0, "X"},
		{"long end", long + "X", len(long), "X"},
		{"long past end", long, len(long), ""},
		{"negative", "CC", -5, "C"},
	} {
		ex := Excerpt(tc.in, tc.pos)
		lines := strings.Split(ex, "\n")
		if len(lines) != 2 || !strings.HasSuffix(lines[1], "^") || strings.TrimLeft(lines[1], " ") != "^" {
			t.Errorf("%s: Excerpt = %q", tc.name, ex)
			continue
		}
		caret := utf8.RuneCountInString(lines[1]) - 1
		shown := []rune(lines[0])
		if caret > len(shown) {
			t.Errorf("%s: caret beyond the line:\n%s", tc.name, ex)
			continue
		}
		if tc.mark == "" {
			// end of input: the caret stands just after the input (or on the "..." / note)
			if in := []rune(Escape(tc.in)); len(tc.in) <= Width && caret != len(in) {
				t.Errorf("%s: caret at %d, want %d:\n%s", tc.name, caret, len(in), ex)
			}
			continue
		}
		if !strings.HasPrefix(string(shown[caret:]), tc.mark) {
			t.Errorf("%s: caret not under %q:\n%s", tc.name, tc.mark, ex)
		}
		if len(tc.in) > Width {
			note := " (input of " // the total length follows a shortened excerpt
			if !strings.Contains(lines[0], note) {
				t.Errorf("%s: shortened excerpt has no length note: %q", tc.name, lines[0])
			}
			body, _, _ := strings.Cut(lines[0], note)
			if n := utf8.RuneCountInString(strings.Trim(body, ".")); n > Width {
				t.Errorf("%s: excerpt shows %d characters, want at most %d", tc.name, n, Width)
			}
		}
	}
}

func TestExcerptEscapes(t *testing.T) {
	ex := Excerpt("C\x00C\x07C\x1b[2J", 5)
	if strings.ContainsAny(ex, "\x00\x07\x1b") {
		t.Errorf("raw control bytes in %q", ex)
	}
	if want := "C\\x00C\\x07C\\x1b[2J\n" + strings.Repeat(" ", 11) + "^"; ex != want {
		t.Errorf("Excerpt = %q, want %q", ex, want)
	}
}

// FuzzExcerpt: for any input and position, Excerpt gives two lines, valid UTF-8 without
// raw control characters, at most Width characters of input (plus the marks and the
// length note), and a caret line of spaces ending in '^'.
func FuzzExcerpt(f *testing.F) {
	for _, s := range []string{"", "C1CC", "C\x1b[2JC", "CCé", "\xff\xfe", strings.Repeat("C=C", 100)} {
		f.Add(s, 3)
	}
	f.Fuzz(func(t *testing.T, s string, pos int) {
		ex := Excerpt(s, pos)
		lines := strings.Split(ex, "\n")
		if len(lines) != 2 || strings.TrimLeft(lines[1], " ") != "^" {
			t.Fatalf("Excerpt(%q, %d) = %q", s, pos, ex)
		}
		if !utf8.ValidString(ex) {
			t.Fatalf("Excerpt(%q, %d) is not UTF-8: %q", s, pos, ex)
		}
		for _, r := range lines[0] {
			if r < 0x20 || r == 0x7f || r >= 0x80 && r < 0xa0 {
				t.Fatalf("Excerpt(%q, %d): raw %U", s, pos, r)
			}
		}
		body, _, _ := strings.Cut(lines[0], " (input of ")
		if n := utf8.RuneCountInString(strings.TrimSuffix(strings.TrimPrefix(body, ellipsis), ellipsis)); n > Width*10 {
			t.Fatalf("Excerpt(%q, %d): %d characters shown", s, pos, n)
		}
		if c := Clip(s); strings.ContainsAny(c, "\x00\x07\x1b") {
			t.Fatalf("Clip(%q) = %q", s, c)
		}
	})
}
