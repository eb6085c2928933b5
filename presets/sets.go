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

// builtinSets is a family of named parameter sets embedded as dir/*.yaml; each file's
// name: must match its file name. A set is parsed on first use, alone (and its base, if it
// has one): a command that uses the default set does not parse the others, and listing the
// names reads only the file names.
type builtinSets[P mergeable[P]] struct {
	fsys  embed.FS
	dir   string                                    // directory inside fsys
	kind  string                                    // "parameter set", for messages
	def   string                                    // set a user file overrides when it names no base
	parse func(data []byte, file string) (P, error) // file is the name used in messages
	name  func(P) string
	// finish, when set, turns a parsed file into its set (e.g. merging it onto its base,
	// which raw returns as parsed); otherwise every file is a set as parsed.
	finish func(name string, p P, raw func(string) (P, error)) (P, error)

	namesOnce sync.Once
	files     []string // set names, sorted
	globErr   error

	mu         sync.Mutex
	raw, final map[string]*setEntry[P]
}

type setEntry[P any] struct {
	once sync.Once
	p    P
	err  error
}

// entry returns the memo of name in m (created under b.mu).
func (b *builtinSets[P]) entry(m *map[string]*setEntry[P], name string) *setEntry[P] {
	b.mu.Lock()
	defer b.mu.Unlock()
	if *m == nil {
		*m = map[string]*setEntry[P]{}
	}
	e := (*m)[name]
	if e == nil {
		e = &setEntry[P]{}
		(*m)[name] = e
	}
	return e
}

// rawSet parses dir/name.yaml once.
func (b *builtinSets[P]) rawSet(name string) (P, error) {
	e := b.entry(&b.raw, name)
	e.once.Do(func() {
		f := b.dir + "/" + name + ".yaml"
		data, err := b.fsys.ReadFile(f)
		if err != nil {
			e.err = err
			return
		}
		p, err := b.parse(data, "presets/"+f)
		if err != nil {
			e.err = err
			return
		}
		if b.name(p) != name {
			e.err = fmt.Errorf("presets/%s: name %q does not match the file name", f, b.name(p))
			return
		}
		e.p = p
	})
	return e.p, e.err
}

// get returns a built-in set by name (shared: callers must not modify it); an unknown name
// gives an error that lists the known ones.
func (b *builtinSets[P]) get(name string) (P, error) {
	var zero P
	names := b.names()
	if b.globErr != nil {
		return zero, b.globErr
	}
	if !slices.Contains(names, name) {
		return zero, fmt.Errorf("unknown %s %q (known sets: %s; or pass a YAML file)",
			b.kind, name, strings.Join(names, ", "))
	}
	e := b.entry(&b.final, name)
	e.once.Do(func() {
		p, err := b.rawSet(name)
		if err == nil && b.finish != nil {
			p, err = b.finish(name, p, b.rawSet)
		}
		e.p, e.err = p, err
	})
	return e.p, e.err
}

// names lists the built-in sets in sorted order (from the file names).
func (b *builtinSets[P]) names() []string {
	b.namesOnce.Do(func() {
		files, err := fs.Glob(b.fsys, b.dir+"/*.yaml")
		if err != nil {
			b.globErr = err
			return
		}
		for _, f := range files {
			b.files = append(b.files, strings.TrimSuffix(path.Base(f), ".yaml"))
		}
		slices.Sort(b.files)
	})
	return slices.Clone(b.files)
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
