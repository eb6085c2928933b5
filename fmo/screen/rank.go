package screen

import (
	"errors"
	"fmt"
	"math"
	"strings"

	"cyclopair/fmo"
	"cyclopair/fmo/rate"
	"cyclopair/fmo/substrates"
)

// RankKey names the quantity a screen ranks pairs by. Every key has a direction (gaps:
// smallest first; stabilisation, margins, score: largest first); ties are broken by the
// pair's position in the pair space (diene, then dienophile, then activation, in file
// order), so rankings are deterministic.
type RankKey string

// The ranking keys.
const (
	// RankNone keeps the pair order of the input (diene-major) and streams.
	RankNone RankKey = "none"
	// RankGap: the controlling frontier gap (the smaller of the normal and inverse gaps),
	// smallest first.
	RankGap RankKey = "gap"
	// RankNormalGap: LUMO(dienophile) − HOMO(diene), smallest first — the classical measure
	// of normal-demand reactivity.
	RankNormalGap RankKey = "normal_gap"
	// RankStabilization: the perturbation energy of the best orientation, largest first.
	RankStabilization RankKey = "stabilization"
	// RankRegioMargin: the stabilisation margin of the best regio-orientation over the
	// other one, largest first (the clearest regiochemistry first).
	RankRegioMargin RankKey = "regio_margin"
	// RankScore: the screening score of QuickScore (see Quick), largest first.
	RankScore RankKey = "score"
	// RankRate: the predicted log10 k_rel of the fitted rate model (fmo/rate), fastest
	// first. The default.
	RankRate RankKey = "rate"
)

// RankKeys lists the keys in the order help texts show them.
var RankKeys = []RankKey{RankRate, RankNormalGap, RankGap, RankStabilization, RankRegioMargin, RankScore, RankNone}

// ErrRankKey is wrapped by ParseRankKey for an unknown key.
var ErrRankKey = errors.New("unknown ranking key")

// RankKeyNames lists the key names in the order of RankKeys (the vocabulary substrate files
// are checked against).
func RankKeyNames() []string {
	names := make([]string, len(RankKeys))
	for i, k := range RankKeys {
		names[i] = string(k)
	}
	return names
}

// ParseRankKey reads a key name ("" is RankRate, the default).
func ParseRankKey(s string) (RankKey, error) {
	s = strings.ToLower(strings.TrimSpace(s))
	if s == "" {
		return RankRate, nil
	}
	for _, k := range RankKeys {
		if string(k) == s {
			return k, nil
		}
	}
	return "", fmt.Errorf("%w %q (choose %s)", ErrRankKey, s, strings.Join(RankKeyNames(), ", "))
}

// rankValue is the ranking key of a QuickScore result, lower is better.
func rankValue(key RankKey, q *fmo.Quick) float64 {
	switch key {
	case RankGap:
		return math.Min(q.GapNormal, q.GapInverse)
	case RankStabilization:
		return -q.Stabilization
	case RankRegioMargin:
		return -q.RegioMargin
	case RankScore:
		return -q.Best
	}
	return q.GapNormal
}

// passes applies the QuickScore filters to pair q of diene d and, with the in_domain filter,
// the rate model's applicability domain (rate.Model.Inside on the pair's QuickScore
// descriptors: the same verdict the printed row's rate carries).
func (j *preparedJob) passes(d int, q *fmo.Quick) bool {
	if !passes(&j.flt, q) {
		return false
	}
	if !j.flt.InDomain {
		return true
	}
	fd := rate.FromQuick(q, j.p.dieneConf[d][q.DieneUnit], q.Activation)
	return j.p.rate.Inside(&fd)
}

// passes applies the filters that QuickScore can decide.
func passes(f *substrates.Filter, q *fmo.Quick) bool {
	if !q.OK {
		return false
	}
	switch f.Demand {
	case "normal":
		if q.Demand != 1 {
			return false
		}
	case "inverse":
		if q.Demand != -1 {
			return false
		}
	case "neutral":
		if q.Demand != 0 {
			return false
		}
	}
	if f.MinRegioMargin > 0 && !(q.RegioMargin >= f.MinRegioMargin) {
		return false
	}
	if f.MaxGap > 0 && !(math.Min(q.GapNormal, q.GapInverse) <= f.MaxGap) {
		return false
	}
	return true
}

// FileOptions are the options a screen reads substrate files with: the file name for
// messages and the screen's vocabularies (fmo.Modes() for activations, RankKeyNames for
// rank_by).
func FileOptions(name string) substrates.LoadOptions {
	return substrates.LoadOptions{Name: name, Modes: fmo.Modes(), RankKeys: RankKeyNames()}
}
