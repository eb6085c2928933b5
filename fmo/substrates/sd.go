package substrates

import (
	"io"

	"cyclopair/huckel/yamlfile"
)

// loadSD reads an SD file (wired to huckel/molfile once it lands).
func loadSD(r io.Reader, name string, o ListOptions) ([]Substrate, yamlfile.ErrorList, error) {
	return nil, nil, &yamlfile.Error{File: name, Msg: "SD files are not read yet", Err: ErrUnknownFormat}
}
