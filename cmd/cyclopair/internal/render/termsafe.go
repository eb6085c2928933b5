package render

import (
	"fmt"
	"io"
	"unicode/utf8"
)

// TerminalSafe returns a writer for text meant for a terminal (the table and markdown
// formats, messages on stderr) that writes control characters as visible escapes instead of
// passing them on: C0 controls other than newline and tab, DEL and the C1 controls
// U+0080–U+009F become \xNN (\u00NN for C1), and an invalid UTF-8 byte becomes \xNN. So an
// ESC, BEL or NUL in a name, a SMILES or a parameter-set name cannot move the cursor, ring,
// retitle the window or hide text. Newline and tab keep their layout role. Each Write is
// escaped on its own, so a multi-byte character must not be split across two writes (fmt and
// the renderers write whole strings).
func TerminalSafe(w io.Writer) io.Writer { return &termSafe{w: w} }

type termSafe struct {
	w   io.Writer
	buf []byte
}

func (t *termSafe) Write(p []byte) (int, error) {
	clean := true
	for _, c := range p {
		if c < 0x20 && c != '\n' && c != '\t' || c >= 0x7f {
			clean = false
			break
		}
	}
	if clean {
		return t.w.Write(p)
	}
	t.buf = AppendTerminalSafe(t.buf[:0], p)
	if _, err := t.w.Write(t.buf); err != nil {
		return 0, err
	}
	return len(p), nil
}

// AppendTerminalSafe appends p to dst with control characters escaped as TerminalSafe does.
func AppendTerminalSafe(dst, p []byte) []byte {
	for len(p) > 0 {
		c := p[0]
		if c < utf8.RuneSelf {
			if c < 0x20 && c != '\n' && c != '\t' || c == 0x7f {
				dst = fmt.Appendf(dst, `\x%02x`, c)
			} else {
				dst = append(dst, c)
			}
			p = p[1:]
			continue
		}
		r, n := utf8.DecodeRune(p)
		switch {
		case r == utf8.RuneError && n == 1:
			dst = fmt.Appendf(dst, `\x%02x`, c)
		case r >= 0x80 && r <= 0x9f:
			dst = fmt.Appendf(dst, `\u%04x`, r)
		default:
			dst = append(dst, p[:n]...)
		}
		p = p[n:]
	}
	return dst
}
