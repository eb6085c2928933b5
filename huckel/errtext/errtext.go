// Package errtext turns user input into text that is safe to put in an error message or a
// warning: control characters are made visible and long inputs are shortened, so that a
// message stays one readable line whatever was typed, piped or read from a file.
//
// Every positioned error of the SMILES reader and the parameter-file loader quotes its
// input through this package, and the CLI uses it for the "<input>:" prefix of its
// one-line errors. Three failure modes it exists for:
//
//   - escape (ESC, 0x1b), NUL, BEL and other C0/C1 control bytes, DEL, bidirectional
//     overrides and a byte-order mark echoed to a terminal can move the cursor, clear the
//     screen, ring the bell or hide text; they are shown as \x1b, \x00, \u202e, \ufeff …;
//   - a 200,000-character input echoed in full floods the terminal: at most Width
//     characters are shown, around the position of the problem, with the total length;
//   - bytes that are not UTF-8 are shown as \xNN, so the message itself is valid UTF-8.
//
// Backslashes are kept as typed (they are SMILES bond symbols), so Escape is not
// reversible; it is meant for people, not for parsing.
package errtext

import (
	"fmt"
	"strconv"
	"strings"
	"unicode"
	"unicode/utf8"
)

// Width is the largest number of characters of an input that Clip, Quote and Excerpt show.
// A message with a 100-character excerpt still fits two lines of a terminal.
const Width = 100

// ellipsis marks where Clip and Excerpt cut the input (three ASCII dots, as in the
// SMILES reader's excerpts since the start).
const ellipsis = "..."

// Escape returns s with every character that is not printable made visible: tab, line
// feed and carriage return as \t \n \r, other ASCII controls and DEL as \xNN, other
// non-printable runes (C1 controls, bidirectional marks, U+FEFF, separators) as \uNNNN,
// and each byte of an invalid UTF-8 sequence as \xNN. Printable text, including non-ASCII
// letters and backslashes, is unchanged, so Escape of an already escaped string is the
// same string.
func Escape(s string) string {
	if isSafe(s) {
		return s
	}
	var b strings.Builder
	b.Grow(len(s) + 8)
	for i := 0; i < len(s); {
		r, n := utf8.DecodeRuneInString(s[i:])
		appendRune(&b, r, n, s[i])
		i += n
	}
	return b.String()
}

// isSafe reports whether Escape would return s unchanged.
func isSafe(s string) bool {
	for i := 0; i < len(s); {
		if c := s[i]; c >= 0x20 && c < 0x7f {
			i++
			continue
		}
		r, n := utf8.DecodeRuneInString(s[i:])
		if r == utf8.RuneError && n <= 1 || !printable(r) {
			return false
		}
		i += n
	}
	return true
}

func printable(r rune) bool { return r == ' ' || unicode.IsPrint(r) }

// appendRune writes the visible form of rune r, decoded from n bytes starting with first.
func appendRune(b *strings.Builder, r rune, n int, first byte) {
	switch {
	case r == utf8.RuneError && n <= 1:
		fmt.Fprintf(b, `\x%02x`, first)
	case printable(r):
		b.WriteRune(r)
	case r == '\t':
		b.WriteString(`\t`)
	case r == '\n':
		b.WriteString(`\n`)
	case r == '\r':
		b.WriteString(`\r`)
	case r < 0x80:
		fmt.Fprintf(b, `\x%02x`, r)
	case r <= 0xffff:
		fmt.Fprintf(b, `\u%04x`, r)
	default:
		fmt.Fprintf(b, `\U%08x`, r)
	}
}

// unit is one input character as it will be shown: its byte offset and its visible form.
type unit struct {
	off  int
	text string
}

// units splits s[lo:hi] into shown characters (lo and hi are byte offsets).
func units(s string, lo, hi int) []unit {
	var out []unit
	for i := lo; i < hi; {
		r, n := utf8.DecodeRuneInString(s[i:hi])
		var b strings.Builder
		appendRune(&b, r, n, s[i])
		out = append(out, unit{off: i, text: b.String()})
		i += n
	}
	return out
}

// Len is the length of s as the notes of Clip, Quote and Excerpt count it: characters
// (runes), with each byte of an invalid UTF-8 sequence counted as one.
func Len(s string) int { return utf8.RuneCountInString(s) }

// lengthNote is appended when the input was shortened.
func lengthNote(s string) string { return fmt.Sprintf(" (input of %d characters)", Len(s)) }

// head returns the byte offset after the first k characters of s.
func head(s string, k int) int {
	i := 0
	for ; k > 0 && i < len(s); k-- {
		_, n := utf8.DecodeRuneInString(s[i:])
		i += n
	}
	return i
}

// tail returns the byte offset of the start of the last k characters of s.
func tail(s string, k int) int {
	i := len(s)
	for ; k > 0 && i > 0; k-- {
		_, n := utf8.DecodeLastRuneInString(s[:i])
		i -= n
	}
	return i
}

// Clip returns s as a message may show it: escaped, and when it is longer than Width
// characters, its beginning and end around "..." followed by the total length, as in
// "C=CC=CC=C...C=CC=C (input of 200000 characters)". Use it for the "<input>:" prefix of
// an error line.
func Clip(s string) string {
	if Len(s) <= Width {
		return Escape(s)
	}
	front := Width*3/4 - len(ellipsis)
	back := Width - front - len(ellipsis)
	return Escape(s[:head(s, front)]) + ellipsis + Escape(s[tail(s, back):]) + lengthNote(s)
}

// Quote is Clip for a value inside a message: the shortened text in double quotes with Go
// escapes (as %q writes it), then the total length when it was shortened:
// "AAAA...AAAA" (input of 5000 characters).
func Quote(s string) string {
	if Len(s) <= Width {
		return strconv.Quote(s)
	}
	front := Width*3/4 - len(ellipsis)
	back := Width - front - len(ellipsis)
	return strconv.Quote(s[:head(s, front)]+ellipsis+s[tail(s, back):]) + lengthNote(s)
}

// Excerpt returns two lines without a trailing newline: the input around byte offset pos
// (escaped; cut to a window of at most Width characters marked with "..." and followed by
// the total length when the input is longer) and a caret under the character at pos. pos
// may equal len(s) ("missing something at the end"); it is clamped to [0, len(s)], and an
// offset inside a multi-byte character points at that character.
func Excerpt(s string, pos int) string {
	pos = min(max(pos, 0), len(s))
	for pos > 0 && pos < len(s) && !utf8.RuneStart(s[pos]) {
		pos-- // inside a UTF-8 sequence: point at its first byte
	}
	start, end := 0, len(s)
	prefix, suffix := "", ""
	if Len(s) > Width {
		// A window of Width characters, the position about a third of the way in so that
		// what led up to the problem is visible.
		before := Width / 3
		start = tail(s[:pos], before)
		end = start + head(s[start:], Width)
		if end == len(s) { // near the end: slide the window back to full width
			start = tail(s, Width)
		}
		if start > 0 {
			prefix = ellipsis
		}
		if end < len(s) {
			suffix = ellipsis
		}
	}
	us := units(s, start, end)
	var line, pad strings.Builder
	line.WriteString(prefix)
	pad.WriteString(strings.Repeat(" ", len(prefix)))
	for _, u := range us {
		line.WriteString(u.text)
		if u.off < pos {
			pad.WriteString(strings.Repeat(" ", utf8.RuneCountInString(u.text)))
		}
	}
	line.WriteString(suffix)
	if prefix != "" || suffix != "" {
		line.WriteString(lengthNote(s))
	}
	return line.String() + "\n" + pad.String() + "^"
}
