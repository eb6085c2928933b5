package yamlfile

import (
	"bytes"
	"fmt"
	"io"
	"unicode/utf8"
)

// ReadLimited reads all of r but at most max+1 bytes; tooLarge reports that r held more
// than max bytes (data is then incomplete and must not be parsed).
func ReadLimited(r io.Reader, max int64) (data []byte, tooLarge bool, err error) {
	data, err = io.ReadAll(io.LimitReader(r, max+1))
	if err != nil {
		return nil, false, err
	}
	return data, int64(len(data)) > max, nil
}

// CheckUTF8 rejects text that is not UTF-8 or holds a NUL byte, naming the line and column
// of the first bad byte; UTF-16 (a byte-order mark or NUL bytes at the start) gets its own
// hint. The error wraps sentinel. It returns nil for good text.
func CheckUTF8(data []byte, file string, sentinel error) *Error {
	if bytes.HasPrefix(data, []byte{0xFF, 0xFE}) || bytes.HasPrefix(data, []byte{0xFE, 0xFF}) ||
		(len(data) > 1 && (data[0] == 0 || data[1] == 0)) {
		return &Error{File: file, Line: 1, Col: 1, Msg: "text is UTF-16, not UTF-8",
			Hint: "save the file as UTF-8", Err: sentinel}
	}
	if utf8.Valid(data) {
		if i := bytes.IndexByte(data, 0); i >= 0 {
			l, c := LineCol(data, i)
			return &Error{File: file, Line: l, Col: c, Msg: "NUL byte in text",
				Hint: "is this a binary file?", Err: sentinel}
		}
		return nil
	}
	for i := 0; i < len(data); {
		r, n := utf8.DecodeRune(data[i:])
		if r == utf8.RuneError && n == 1 {
			l, c := LineCol(data, i)
			return &Error{File: file, Line: l, Col: c,
				Msg:  fmt.Sprintf("byte 0x%02X is not valid UTF-8", data[i]),
				Hint: "save the file as UTF-8 (it may be Latin-1 or Windows-1252)", Err: sentinel}
		}
		i += n
	}
	return nil
}

// LineCol converts a byte offset into a 1-based line and column (columns count runes).
func LineCol(data []byte, off int) (line, col int) {
	line = 1 + bytes.Count(data[:off], []byte{'\n'})
	start := bytes.LastIndexByte(data[:off], '\n') + 1
	return line, 1 + utf8.RuneCount(data[start:off])
}
