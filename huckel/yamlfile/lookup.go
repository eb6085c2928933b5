package yamlfile

import "go.yaml.in/yaml/v3"

// The lookups below serve error positions: when the key or item is missing (or n is not a
// mapping / sequence) they return n itself, so an error still points as close as possible.

// Key returns the key node of key in mapping node m, or m when there is none.
func Key(m *yaml.Node, key string) *yaml.Node {
	if i := keyIndex(m, key); i >= 0 {
		return m.Content[i]
	}
	return m
}

// Value returns the value node of key in mapping node m, or m when there is none.
func Value(m *yaml.Node, key string) *yaml.Node {
	if i := keyIndex(m, key); i >= 0 {
		return m.Content[i+1]
	}
	return m
}

// Item returns item i of sequence node s, or s when there is none.
func Item(s *yaml.Node, i int) *yaml.Node {
	if s == nil || s.Kind != yaml.SequenceNode || i >= len(s.Content) {
		return s
	}
	return s.Content[i]
}

func keyIndex(m *yaml.Node, key string) int {
	if m == nil || m.Kind != yaml.MappingNode {
		return -1
	}
	for i := 0; i+1 < len(m.Content); i += 2 {
		if m.Content[i].Value == key {
			return i
		}
	}
	return -1
}
