package screen

import (
	"bufio"
	"bytes"
	"encoding/csv"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"slices"
	"strconv"

	"cyclopair/fmo"
	"cyclopair/fmo/rate"
)

// Merging ranked shard outputs. `screen --shard i/n --top K` ranks the pairs of one slice of
// the pair space; the global top K is among the union of the shards' top K (a pair of the
// global top K is in the top K of its own shard). MergeShards reads the shards' rows (JSON
// Lines or CSV as the screen writes them), orders them by (key, pair number) — the screen's
// own total order — and writes the first K with their ranks renumbered, every other byte of
// a row as the shard wrote it. The printed numbers are rounded (CSV) or may differ from the
// ranking kernel in the last bit (the stabilisation), so the key of each row is recomputed
// from its SMILES and activation with the kernel the screen ranks with; that needs the same
// options (parameter set, amine) the shards were run with.
//
// Not exact with the allowed_only filter, which the screen applies after the cut to K: a shard
// row left out for being forbidden leaves no trace from which the global cut could be found.

// MergeFormat is the format of shard outputs.
type MergeFormat int

const (
	MergeJSON MergeFormat = iota + 1 // JSON Lines
	MergeCSV
)

// MergeRow is one row of a shard output.
type MergeRow struct {
	Number     int64 // pair_number (1-based position in the whole pair space)
	Diene      string
	Dienophile string
	Activation string
	json       []byte   // the line without the rank prefix (from the first ',')
	csv        []string // the record
	key        float64
}

// ErrMerge is wrapped by errors of MergeShards about its inputs.
var ErrMerge = errors.New("cannot merge")

// ReadShard reads one shard output; name is for messages. The format is told from the first
// line: a CSV header starting "rank,pair_number," or a JSON object.
func ReadShard(r io.Reader, name string) (MergeFormat, []string, []MergeRow, error) {
	br := bufio.NewReaderSize(r, 1<<16)
	head, err := br.Peek(1)
	if err == io.EOF || len(head) == 0 {
		return 0, nil, nil, nil // empty shard: no rows
	}
	if head[0] == '{' {
		var rows []MergeRow
		line := 0
		for {
			b, err := br.ReadBytes('\n')
			if len(b) > 0 {
				line++
				row, perr := jsonRow(b)
				if perr != nil {
					return 0, nil, nil, fmt.Errorf("%w: %s: line %d: %v", ErrMerge, name, line, perr)
				}
				rows = append(rows, row)
			}
			if err == io.EOF {
				return MergeJSON, nil, rows, nil
			}
			if err != nil {
				return 0, nil, nil, fmt.Errorf("%w: %s: %v", ErrMerge, name, err)
			}
		}
	}
	cr := csv.NewReader(br)
	cr.FieldsPerRecord = -1
	header, err := cr.Read()
	if err != nil || len(header) < 7 || header[0] != "rank" || header[1] != "pair_number" {
		return 0, nil, nil, fmt.Errorf("%w: %s: neither JSON Lines nor the screen's CSV (write the shards with --format json or csv)", ErrMerge, name)
	}
	col := map[string]int{}
	for i, h := range header {
		col[h] = i
	}
	var rows []MergeRow
	for line := 2; ; line++ {
		rec, err := cr.Read()
		if err == io.EOF {
			return MergeCSV, header, rows, nil
		}
		if err != nil {
			return 0, nil, nil, fmt.Errorf("%w: %s: %v", ErrMerge, name, err)
		}
		if len(rec) != len(header) {
			return 0, nil, nil, fmt.Errorf("%w: %s: line %d: %d fields, want %d", ErrMerge, name, line, len(rec), len(header))
		}
		n, err := strconv.ParseInt(rec[1], 10, 64)
		if err != nil || n <= 0 {
			return 0, nil, nil, fmt.Errorf("%w: %s: line %d: pair_number %q (merge needs ranked shard outputs of screen)", ErrMerge, name, line, rec[1])
		}
		rows = append(rows, MergeRow{Number: n, Diene: rec[col["diene"]], Dienophile: rec[col["dienophile"]],
			Activation: rec[col["activation"]], csv: rec})
	}
}

func jsonRow(b []byte) (MergeRow, error) {
	b = bytes.TrimRight(b, "\r\n")
	var v struct {
		Rank       *int   `json:"rank"`
		PairNumber int64  `json:"pair_number"`
		Diene      string `json:"diene"`
		Dienophile string `json:"dienophile"`
		Activation string `json:"activation"`
	}
	if err := json.Unmarshal(b, &v); err != nil {
		return MergeRow{}, err
	}
	if v.Rank == nil || v.PairNumber <= 0 || !bytes.HasPrefix(b, []byte(`{"rank":`)) {
		return MergeRow{}, errors.New("not a ranked screen row (rank and pair_number first)")
	}
	i := bytes.IndexByte(b, ',')
	if i < 0 {
		return MergeRow{}, errors.New("not a screen row")
	}
	return MergeRow{Number: v.PairNumber, Diene: v.Diene, Dienophile: v.Dienophile, Activation: v.Activation, json: b[i:]}, nil
}

// MergeShards orders rows by key and writes the first top (0: all) in format f to w.
// Partners are built once per distinct SMILES with opts (and act for activations).
// The rate key is recomputed with the bundled rate model (MergeShardsModel takes another).
func MergeShards(w io.Writer, f MergeFormat, header []string, rows []MergeRow, key RankKey, top int,
	opts *fmo.Options, act *fmo.ActivateOptions) error {
	return MergeShardsModel(w, f, header, rows, key, top, opts, act, nil)
}

// MergeShardsModel is MergeShards with the rate model the shards ranked by (nil: the bundled
// fit, rate.Default). The rate key does not depend on the temperature (only the isomer
// shares do), so merge needs no temperature.
func MergeShardsModel(w io.Writer, f MergeFormat, header []string, rows []MergeRow, key RankKey, top int,
	opts *fmo.Options, act *fmo.ActivateOptions, model *rate.Model) error {
	if key == RankNone || key == "" {
		return fmt.Errorf("%w: rank key none: unranked shard outputs concatenate (cat part*.csv)", ErrMerge)
	}
	var confs map[*fmo.Partner][]rate.Conformation
	if key == RankRate {
		if model == nil {
			m, err := rate.Default()
			if err != nil {
				return err
			}
			model = m
		}
		confs = map[*fmo.Partner][]rate.Conformation{}
	}
	dienes := map[string]*fmo.Partner{}
	variants := map[[2]string]*fmo.Partner{}
	quick := fmo.NewQuickKernel(opts)
	seen := map[int64]bool{}
	for i := range rows {
		r := &rows[i]
		if seen[r.Number] {
			return fmt.Errorf("%w: pair %d is in more than one input (shards of one screen do not overlap)", ErrMerge, r.Number)
		}
		seen[r.Number] = true
		d := dienes[r.Diene]
		if d == nil {
			p, err := fmo.NewPartner(r.Diene, r.Diene, fmo.RoleDiene, opts)
			if err != nil {
				return fmt.Errorf("%w: pair %d: diene: %v", ErrMerge, r.Number, err)
			}
			d, dienes[r.Diene] = p, p
		}
		vk := [2]string{r.Dienophile, r.Activation}
		v := variants[vk]
		if v == nil {
			p, err := fmo.NewPartner(r.Dienophile, r.Dienophile, fmo.RoleDienophile, opts)
			if err == nil && r.Activation != fmo.ActivateNone {
				p, err = p.WithActivation(r.Activation, act, opts)
			}
			if err != nil {
				return fmt.Errorf("%w: pair %d: dienophile (%s): %v", ErrMerge, r.Number, r.Activation, err)
			}
			v, variants[vk] = p, p
		}
		q := quick.Score(d, v)
		switch {
		case key != RankRate:
			r.key = rankValue(key, &q)
		case q.OK: // as preparedJob.scoreChunk: −log10 k_rel at the preferred diene unit
			c, ok := confs[d]
			if !ok {
				c = rate.PartnerConformations(d)
				confs[d] = c
			}
			r.key = -model.Quick(&q, &c[q.DieneUnit])
		default:
			r.key = 0
		}
	}
	slices.SortFunc(rows, func(a, b MergeRow) int {
		return compareScored(scored{a.key, a.Number}, scored{b.key, b.Number})
	})
	if top > 0 && len(rows) > top {
		rows = rows[:top]
	}
	bw := bufio.NewWriterSize(w, 1<<16)
	switch f {
	case MergeJSON:
		for i, r := range rows {
			bw.WriteString(`{"rank":`)
			bw.WriteString(strconv.Itoa(i + 1))
			bw.Write(r.json)
			bw.WriteByte('\n')
		}
	case MergeCSV:
		cw := csv.NewWriter(bw)
		cw.Write(header)
		for i, r := range rows {
			r.csv[0] = strconv.Itoa(i + 1)
			cw.Write(r.csv)
		}
		cw.Flush()
		if err := cw.Error(); err != nil {
			return err
		}
	}
	return bw.Flush()
}
