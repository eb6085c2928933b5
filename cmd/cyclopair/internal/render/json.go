package render

import (
	"bufio"
	"encoding/json"
	"io"

	"cyclopair/fmo"
)

// jsonRow is one JSON Lines object: the Pair contract (DEVELOPERS.md "Output contracts", keys
// stable) with the rank in front and the Caution at the end.
type jsonRow struct {
	Rank       int   `json:"rank"`
	PairNumber int64 `json:"pair_number,omitempty"` // 1-based position in the pair space
	*fmo.Pair
	Caution string `json:"caution"`
}

type jsonWriter struct {
	bw  *bufio.Writer
	enc *json.Encoder
	rep Report
}

func newJSON(w io.Writer, rep Report) *jsonWriter {
	bw := bufio.NewWriter(w)
	enc := json.NewEncoder(bw)
	enc.SetEscapeHTML(false)
	return &jsonWriter{bw: bw, enc: enc, rep: rep}
}

// WriteRow writes one line. The Pair's own params and calibration keys name the parameter
// set and calibration; when the analysis left them empty the Report's values are filled in.
func (j *jsonWriter) WriteRow(r Row) error {
	p := r.Pair
	if p.Params == "" || p.Calibration == "" {
		cp := *p
		if cp.Params == "" {
			cp.Params = j.rep.Params
		}
		if cp.Calibration == "" {
			cp.Calibration = j.rep.Calibration
		}
		p = &cp
	}
	return j.enc.Encode(jsonRow{Rank: r.Rank, PairNumber: r.Number, Pair: p, Caution: Caution})
}

// Flush pushes buffered lines out (the screen calls it on cancellation).
func (j *jsonWriter) Flush() error { return j.bw.Flush() }

func (j *jsonWriter) Close(Summary) error { return j.bw.Flush() }
