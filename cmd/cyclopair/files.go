package main

import (
	"bytes"
	"errors"
	"fmt"
	"io/fs"
	"os"

	"go.yaml.in/yaml/v3"

	"cyclopair/huckel/errtext"
)

// errNotRegular marks a parameter or calibration path that is not a regular file.
var errNotRegular = errors.New("not a regular file")

// openRegular opens path for reading only if it is a regular file (a symbolic link to one
// is fine): a FIFO would block the open forever, a device never ends, a directory is no
// file. The type is checked with os.Stat before opening and again on the open file.
// what names the file in the error ("parameter file", "calibration").
func openRegular(path, what string) (*os.File, error) {
	st, err := os.Stat(path)
	if err != nil {
		return nil, err
	}
	if !st.Mode().IsRegular() {
		return nil, &inputError{fmt.Errorf("%s: cannot use as %s: %w, it is %s (give the path of a YAML file)", errtext.Clip(path), what, errNotRegular, fileKind(st.Mode()))}
	}
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	if st, err = f.Stat(); err != nil || !st.Mode().IsRegular() {
		f.Close()
		return nil, &inputError{fmt.Errorf("%s: cannot use as %s: %w (give the path of a YAML file)", errtext.Clip(path), what, errNotRegular)}
	}
	return f, nil
}

// fileKind names a non-regular file type for an error message.
func fileKind(m fs.FileMode) string {
	switch {
	case m.IsDir():
		return "a directory"
	case m&fs.ModeNamedPipe != 0:
		return "a named pipe (FIFO)"
	case m&fs.ModeSocket != 0:
		return "a socket"
	case m&fs.ModeCharDevice != 0:
		return "a character device"
	case m&fs.ModeDevice != 0:
		return "a block device"
	}
	return "not a regular file"
}

// yamlMappingCheck reports, without quoting any of its content, when data is not a YAML
// document whose top level is a mapping: a path that points at some other file (a system
// file, a picture) is refused before the format's own decoder could quote a piece of it.
func yamlMappingCheck(data []byte, path, what string) error {
	data = bytes.TrimPrefix(data, []byte("\uFEFF"))
	var n yaml.Node
	if err := yaml.Unmarshal(data, &n); err != nil {
		return nil // a syntax error: the format's reader gives it with its position
	}
	if len(n.Content) == 0 || n.Content[0].Kind != yaml.MappingNode {
		return &inputError{fmt.Errorf("%s: 1:1: not a %s: the top level is not a YAML mapping (check the path)", path, what)}
	}
	return nil
}
