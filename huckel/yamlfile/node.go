package yamlfile

import (
	"fmt"
	"slices"
	"strings"

	"go.yaml.in/yaml/v3"
)

// At returns an Error positioned at n (no position when n is nil).
func At(file string, n *yaml.Node, msg string, sentinel error) *Error {
	e := &Error{File: file, Msg: msg, Err: sentinel}
	if n != nil {
		e.Line, e.Col = n.Line, n.Column
	}
	return e
}

// FirstAlias returns the first alias node of the tree under n in document order, or nil.
// The readers reject aliases outright: no file format of cyclopair needs one, and refusing
// them costs nothing against alias-expansion bombs.
func FirstAlias(n *yaml.Node) *yaml.Node {
	if n.Kind == yaml.AliasNode {
		return n
	}
	for _, c := range n.Content {
		if a := FirstAlias(c); a != nil {
			return a
		}
	}
	return nil
}

// CheckKeys rejects the first mapping key under root (a document or any node) that schema
// does not allow, with its line and column (yaml.v3's strict decoder reports only a line).
// schema maps a path shape to the keys allowed there: "" is the top level, "cases[]" the
// items of the list under cases, "cases[].diene" a mapping inside those items. Mappings at
// paths the schema does not name are not checked. The error says "unknown key "x" (known
// here: a, b)" with hint and wraps sentinel; nil when every key is known.
func CheckKeys(root *yaml.Node, schema map[string][]string, file, hint string, sentinel error) error {
	var walk func(n *yaml.Node, path string) error
	walk = func(n *yaml.Node, path string) error {
		switch n.Kind {
		case yaml.DocumentNode:
			for _, c := range n.Content {
				if err := walk(c, path); err != nil {
					return err
				}
			}
		case yaml.SequenceNode:
			for _, c := range n.Content {
				if err := walk(c, path+"[]"); err != nil {
					return err
				}
			}
		case yaml.MappingNode:
			allowed, known := schema[path]
			for i := 0; i+1 < len(n.Content); i += 2 {
				k := n.Content[i]
				if known && !slices.Contains(allowed, k.Value) {
					e := At(file, k, fmt.Sprintf("unknown key %q (known here: %s)", k.Value, strings.Join(allowed, ", ")), sentinel)
					e.Hint = hint
					return e
				}
				sub := k.Value
				if path != "" {
					sub = path + "." + k.Value
				}
				if err := walk(n.Content[i+1], sub); err != nil {
					return err
				}
			}
		}
		return nil
	}
	return walk(root, "")
}

// FieldPos returns the line and column of the value at the key path under mapping node n,
// as deep as the path exists (n itself when its first key is missing); 0, 0 for a nil n.
func FieldPos(n *yaml.Node, key ...string) (line, col int) {
	if n == nil {
		return 0, 0
	}
	cur := n
	for _, k := range key {
		if cur.Kind != yaml.MappingNode {
			break
		}
		found := false
		for i := 0; i+1 < len(cur.Content); i += 2 {
			if cur.Content[i].Value == k {
				cur, found = cur.Content[i+1], true
				break
			}
		}
		if !found {
			break
		}
	}
	return cur.Line, cur.Column
}
