package substrates

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"unicode/utf8"

	"go.yaml.in/yaml/v3"

	"cyclopair/huckel/yamlfile"
)

// kindName describes a node's kind for "wrong type" messages.
func kindName(n *yaml.Node) string {
	switch n.Kind {
	case yaml.MappingNode:
		return "a mapping"
	case yaml.SequenceNode:
		return "a list"
	case yaml.AliasNode:
		return "an alias"
	case yaml.ScalarNode:
		if n.Tag == "!!null" {
			return "nothing (null)"
		}
		return "a single value"
	}
	return "something else"
}

// suggest returns ` (did you mean "x"?)` for a close known key, or "".
func suggest(got string, known []string) string {
	best, bestD := "", 3
	for _, k := range known {
		if d := editDistance(got, k); d < bestD {
			best, bestD = k, d
		}
	}
	if best == "" {
		return ""
	}
	return fmt.Sprintf("; did you mean %q?", best)
}

func editDistance(a, b string) int {
	ra, rb := []rune(a), []rune(b)
	if len(ra) > 64 || len(rb) > 64 {
		return 99
	}
	prev := make([]int, len(rb)+1)
	cur := make([]int, len(rb)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(ra); i++ {
		cur[0] = i
		for j := 1; j <= len(rb); j++ {
			c := 1
			if ra[i-1] == rb[j-1] {
				c = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+c)
		}
		prev, cur = cur, prev
	}
	return prev[len(rb)]
}

// str reads a scalar as text (numbers are accepted as their text), at most maxLen bytes.
func (w *walker) str(n *yaml.Node, path string, errs *yamlfile.ErrorList, maxLen int) (string, bool) {
	if !w.noAlias(n, path, errs) {
		return "", false
	}
	if n.Kind != yaml.ScalarNode || n.Tag == "!!null" {
		*errs = append(*errs, w.errAt(n, path, ErrWrongType, "is "+kindName(n)+", want text", ""))
		return "", false
	}
	if len(n.Value) > maxLen {
		*errs = append(*errs, w.errAt(n, path, ErrBadValue, fmt.Sprintf("%d bytes long, the limit is %d", len(n.Value), maxLen), ""))
		return "", false
	}
	return n.Value, true
}

func (w *walker) int(n *yaml.Node, path string, errs *yamlfile.ErrorList) (int, bool) {
	if !w.noAlias(n, path, errs) {
		return 0, false
	}
	if n.Kind != yaml.ScalarNode || n.Tag != "!!int" {
		*errs = append(*errs, w.errAt(n, path, ErrWrongType, fmt.Sprintf("is %s %q, want a whole number", kindName(n), short(n.Value)), ""))
		return 0, false
	}
	v, err := strconv.ParseInt(strings.ReplaceAll(n.Value, "_", ""), 0, 32)
	if err != nil {
		*errs = append(*errs, w.errAt(n, path, ErrBadValue, fmt.Sprintf("%q is out of range", short(n.Value)), ""))
		return 0, false
	}
	return int(v), true
}

func (w *walker) float(n *yaml.Node, path string, errs *yamlfile.ErrorList) (float64, bool) {
	if !w.noAlias(n, path, errs) {
		return 0, false
	}
	if n.Kind != yaml.ScalarNode || (n.Tag != "!!int" && n.Tag != "!!float") {
		*errs = append(*errs, w.errAt(n, path, ErrWrongType, fmt.Sprintf("is %s %q, want a number", kindName(n), short(n.Value)), ""))
		return 0, false
	}
	v, err := strconv.ParseFloat(strings.ReplaceAll(n.Value, "_", ""), 64)
	if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
		*errs = append(*errs, w.errAt(n, path, ErrBadValue, fmt.Sprintf("%q is not a finite number", short(n.Value)), ""))
		return 0, false
	}
	return v, true
}

func (w *walker) bool(n *yaml.Node, path string, errs *yamlfile.ErrorList) (bool, bool) {
	if !w.noAlias(n, path, errs) {
		return false, false
	}
	if n.Kind != yaml.ScalarNode || n.Tag != "!!bool" {
		*errs = append(*errs, w.errAt(n, path, ErrWrongType, fmt.Sprintf("is %s %q, want true or false", kindName(n), short(n.Value)), ""))
		return false, false
	}
	return n.Value == "true" || n.Value == "True" || n.Value == "TRUE", true
}

// short cuts a value for messages.
func short(s string) string {
	if len(s) <= 40 {
		return s
	}
	cut := 40
	for cut > 0 && !utf8.RuneStart(s[cut]) {
		cut--
	}
	return s[:cut] + "…"
}
