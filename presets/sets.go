package presets

import (
	"embed"
	"fmt"
	"io/fs"
	"path"
	"slices"
	"strings"
	"sync"
)

// mergeable is a parameter set that a user file can override entry by entry.
type mergeable[P any] interface {
	Merge(over P) P
}

// builtinSets is a family of named parameter sets embedded as dir/*.yaml, parsed once on
// first use; each file's name: must match its file name.
type builtinSets[P mergeable[P]] struct {
	fsys  embed.FS
	dir   string                                    // directory inside fsys
	kind  string                                    // "parameter set", for messages
	def   string                                    // set a user file overrides when it names no base
	parse func(data []byte, file string) (P, error) // file is the name used in messages
	name  func(P) string
	// finish, when set, turns the parsed files into the sets (e.g. merging each onto its
	// base); otherwise every file is a set as parsed.
	finish func(raw, sets map[string]P) error

	once sync.Once
	sets map[string]P
	err  error
}

func (b *builtinSets[P]) load() {
	b.sets = map[string]P{}
	files, err := fs.Glob(b.fsys, b.dir+"/*.yaml")
	if err != nil {
		b.err = err
		return
	}
	raw := b.sets
	if b.finish != nil {
		raw = map[string]P{}
	}
	for _, f := range files {
		data, err := b.fsys.ReadFile(f)
		if err != nil {
			b.err = err
			return
		}
		p, err := b.parse(data, "presets/"+f)
		if err != nil {
			b.err = err
			return
		}
		if want := strings.TrimSuffix(path.Base(f), ".yaml"); b.name(p) != want {
			b.err = fmt.Errorf("presets/%s: name %q does not match the file name", f, b.name(p))
			return
		}
		raw[b.name(p)] = p
	}
	if b.finish != nil {
		b.err = b.finish(raw, b.sets)
	}
}

// get returns a built-in set by name (shared: callers must not modify it); an unknown name
// gives an error that lists the known ones.
func (b *builtinSets[P]) get(name string) (P, error) {
	b.once.Do(b.load)
	if b.err != nil {
		var zero P
		return zero, b.err
	}
	p, ok := b.sets[name]
	if !ok {
		var zero P
		return zero, fmt.Errorf("unknown %s %q (known sets: %s; or pass a YAML file)",
			b.kind, name, strings.Join(b.names(), ", "))
	}
	return p, nil
}

// names lists the built-in sets in sorted order.
func (b *builtinSets[P]) names() []string {
	b.once.Do(b.load)
	names := make([]string, 0, len(b.sets))
	for n := range b.sets {
		names = append(names, n)
	}
	slices.Sort(names)
	return names
}

// resolve turns a user file into the set to use: with replace it stands alone (merged onto
// empty); otherwise it overrides its base set (b.def when base is empty), and setBase records
// the base used on the result.
func (b *builtinSets[P]) resolve(user P, replace bool, base string, empty P, setBase func(P, string)) (P, error) {
	if replace {
		return empty.Merge(user), nil
	}
	if base == "" {
		base = b.def
	}
	s, err := b.get(base)
	if err != nil {
		var zero P
		return zero, err
	}
	m := s.Merge(user)
	setBase(m, base)
	return m, nil
}
