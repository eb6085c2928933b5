package fmo

import (
	"errors"
	"fmt"
	"strings"
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
)

// RankKeys lists the keys in the order help texts show them.
var RankKeys = []RankKey{RankNormalGap, RankGap, RankStabilization, RankRegioMargin, RankScore, RankNone}

// ErrRankKey is wrapped by ParseRankKey for an unknown key.
var ErrRankKey = errors.New("unknown ranking key")

// ParseRankKey reads a key name ("" is RankNormalGap).
func ParseRankKey(s string) (RankKey, error) {
	s = strings.ToLower(strings.TrimSpace(s))
	if s == "" {
		return RankNormalGap, nil
	}
	for _, k := range RankKeys {
		if string(k) == s {
			return k, nil
		}
	}
	names := make([]string, len(RankKeys))
	for i, k := range RankKeys {
		names[i] = string(k)
	}
	return "", fmt.Errorf("%w %q (choose %s)", ErrRankKey, s, strings.Join(names, ", "))
}
