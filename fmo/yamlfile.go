package fmo

import (
	"io"

	"go.yaml.in/yaml/v3"
)

// Shared pieces of the three YAML readers of this package (substrate files, calibration
// files, the literature check set). Each reader wraps the findings into its own positioned
// error type, because the three report to different audiences (a screen's bad rows, a
// calibration's bad points, a check-set author); the detection is the same.

// firstAlias returns the first alias node of the tree under n in document order, or nil.
// Substrate, calibration and check-set files reject aliases outright: none of them needs
// one, and refusing them costs nothing against alias-expansion bombs.
func firstAlias(n *yaml.Node) *yaml.Node {
	if n.Kind == yaml.AliasNode {
		return n
	}
	for _, c := range n.Content {
		if a := firstAlias(c); a != nil {
			return a
		}
	}
	return nil
}

// readLimited reads all of r but at most max+1 bytes; tooLarge reports that r held more
// than max bytes (data is then incomplete and must not be parsed).
func readLimited(r io.Reader, max int64) (data []byte, tooLarge bool, err error) {
	data, err = io.ReadAll(io.LimitReader(r, max+1))
	if err != nil {
		return nil, false, err
	}
	return data, int64(len(data)) > max, nil
}
