package substrates

import (
	"errors"
	"fmt"
	"slices"
	"strings"
	"unicode"
	"unicode/utf8"

	"go.yaml.in/yaml/v3"

	"cyclopair/huckel/molecule"
	"cyclopair/huckel/smiles"
	"cyclopair/huckel/yamlfile"
	"cyclopair/presets"
)

// list reads a substrate list. Problems inside one entry make that entry bad; a list that is
// not a list is a whole-file problem.
func (w *walker) list(n *yaml.Node, key string, pinMax int) []Substrate {
	if !w.noAlias(n, key, &w.fatal) {
		return nil
	}
	if n.Kind != yaml.SequenceNode {
		w.fail(n, key, ErrWrongType, "is "+kindName(n)+", want a list of {name, smiles} entries",
			"write each entry on a line starting with '- '")
		return nil
	}
	if len(n.Content) > maxRows {
		w.fail(n, key, ErrBadValue, fmt.Sprintf("%d entries, the limit is %d", len(n.Content), maxRows), "split the screen")
		return nil
	}
	out := make([]Substrate, 0, len(n.Content))
	names := make(map[string]int, len(n.Content))
	for i, it := range n.Content {
		path := fmt.Sprintf("%s[%d]", key, i)
		s, ok := w.entry(it, path, pinMax)
		// The entry's node subtree is not needed any more (errors keep their positions):
		// let it go while the rows are built, so the tree and the molecules do not peak
		// together.
		n.Content[i] = nil
		if !ok {
			continue
		}
		if first, dup := names[s.Name]; dup {
			w.bad = append(w.bad, w.errAt(it, path, ErrDuplicateName,
				fmt.Sprintf("name %q already used by %s[%d]", short(s.Name), key, first), "names identify rows in the report: make them unique"))
			continue
		}
		names[s.Name] = i
		out = append(out, s)
	}
	return out
}

func (w *walker) entry(n *yaml.Node, path string, pinMax int) (Substrate, bool) {
	s := Substrate{File: w.file, Line: n.Line, Col: n.Column}
	var errs yamlfile.ErrorList
	defer func() { w.bad = append(w.bad, errs...) }()
	if !w.noAlias(n, path, &errs) {
		return s, false
	}
	if n.Kind != yaml.MappingNode {
		errs = append(errs, w.errAt(n, path, ErrWrongType, "is "+kindName(n)+", want a mapping such as {name: x, smiles: C=C}",
			"or {preset: name} for a named common substrate"))
		return s, false
	}
	var smilesNode, pinNode, nameNode *yaml.Node
	keys := map[string]bool{}
	for i := 0; i+1 < len(n.Content); i += 2 {
		k, v := n.Content[i], n.Content[i+1]
		if !w.noAlias(k, path, &errs) {
			continue
		}
		kp := path + "." + k.Value
		if keys[k.Value] {
			errs = append(errs, w.errAt(k, path, ErrBadValue, fmt.Sprintf("key %q given twice", short(k.Value)), "keep one"))
			continue
		}
		keys[k.Value] = true
		switch k.Value {
		case "name":
			nameNode = v
			s.Name, _ = w.str(v, kp, &errs, 4*maxNameRunes)
		case "smiles":
			smilesNode = v
			s.SMILES, _ = w.str(v, kp, &errs, maxSMILESBytes)
		case "notes":
			s.Notes, _ = w.str(v, kp, &errs, maxNotesBytes)
		case "preset":
			if p, ok := w.str(v, kp, &errs, 200); ok {
				s.Preset = p
				if sub, ok := presets.LookupSubstrate(p); ok {
					s.Preset = sub.Name
				} else {
					hint := "run 'cyclopair screen --list-presets' for the list"
					if sg := presets.SuggestSubstrates(p, 3); len(sg) > 0 {
						hint = "did you mean " + strings.Join(sg, " or ") + "?"
					}
					errs = append(errs, w.errAt(v, kp, ErrUnknownPreset, fmt.Sprintf("unknown substrate preset %q", short(p)), hint))
				}
			}
		case "pin":
			pinNode = v
			s.Pin = w.pins(v, kp, &errs)
		default:
			errs = append(errs, w.errAt(k, path, ErrUnknownKey, fmt.Sprintf("unknown key %q", short(k.Value)),
				"known keys: "+strings.Join(entryKeys, ", ")+suggest(k.Value, entryKeys)))
		}
	}
	if len(errs) > 0 {
		return s, false
	}
	if s.Preset != "" {
		sub, _ := presets.LookupSubstrate(s.Preset)
		if smilesNode != nil {
			errs = append(errs, w.errAt(smilesNode, path, ErrBadValue, "both preset and smiles given", "keep one"))
			return s, false
		}
		s.SMILES = sub.SMILES
		if s.Name == "" {
			s.Name = sub.Name
		}
		if s.Notes == "" {
			s.Notes = sub.Notes
		}
	}
	if s.SMILES == "" {
		errs = append(errs, w.errAt(n, path, ErrMissing, "no smiles", "add smiles: <SMILES>, or preset: <name>"))
		return s, false
	}
	if s.Name == "" {
		if nameNode != nil {
			errs = append(errs, w.errAt(nameNode, path+".name", ErrMissing, "empty name", ""))
			return s, false
		}
		s.Name = s.SMILES // a row without a name is named by its SMILES
	}
	if err := checkName(s.Name); err != "" {
		at := nameNode
		if at == nil {
			at = n
		}
		errs = append(errs, w.errAt(at, path+".name", ErrBadValue, err, ""))
		return s, false
	}
	m, err := smiles.Parse(s.SMILES)
	if err != nil {
		errs = append(errs, w.smilesError(smilesNode, n, path, s, err))
		return s, false
	}
	m.Name = s.Name
	if s.Pin != nil {
		if e, at := applyPin(m, s.Pin, pinMax); e != "" {
			where, wpath := pinNode, path+".pin"
			if at >= 0 && at < len(pinNode.Content) {
				where, wpath = pinNode.Content[at], fmt.Sprintf("%s.pin[%d]", path, at)
			}
			errs = append(errs, w.errAt(where, wpath, ErrBadValue, e,
				"pin lists the atom-map numbers (the :n in [CH2:1]) of the reacting atoms"))
			return s, false
		}
	}
	s.Mol = m
	return s, true
}

// checkName rejects names that would break a report line.
func checkName(name string) string {
	if utf8.RuneCountInString(name) > maxNameRunes {
		return fmt.Sprintf("name longer than %d characters", maxNameRunes)
	}
	for _, r := range name {
		if unicode.IsControl(r) {
			return "name contains a control character (line break or tab)"
		}
	}
	return ""
}

func (w *walker) pins(n *yaml.Node, path string, errs *yamlfile.ErrorList) []int {
	if !w.noAlias(n, path, errs) {
		return nil
	}
	if n.Kind != yaml.SequenceNode {
		*errs = append(*errs, w.errAt(n, path, ErrWrongType, "is "+kindName(n)+", want a list of atom-map numbers", "e.g. pin: [1, 2]"))
		return nil
	}
	out := []int{}
	for i, it := range n.Content {
		v, ok := w.int(it, fmt.Sprintf("%s[%d]", path, i), errs)
		if !ok {
			return nil
		}
		if v < 1 {
			*errs = append(*errs, w.errAt(it, path, ErrBadValue, "atom-map numbers start at 1", ""))
			return nil
		}
		out = append(out, v)
	}
	return out
}

// applyPin keeps the atom maps listed in pin and clears the others, so site perception sees
// exactly the pinned atoms. It returns a message when a number is missing, repeated, or the
// count does not fit the list (at most pinMax atoms), with the index of the offending pin
// entry (-1 when the count is wrong).
func applyPin(m *molecule.Molecule, pin []int, pinMax int) (string, int) {
	if len(pin) < 2 || len(pin) > pinMax {
		return fmt.Sprintf("%d atoms pinned, want 2 to %d (the two termini, or the whole reacting unit)", len(pin), pinMax), -1
	}
	for i, p := range pin {
		if slices.Contains(pin[:i], p) {
			return fmt.Sprintf("atom map %d pinned twice", p), i
		}
		switch got := len(m.AtomByMap(p)); {
		case got == 0:
			return fmt.Sprintf("no atom carries map number %d in the SMILES", p), i
		case got > 1:
			return fmt.Sprintf("map number %d is on %d atoms", p, got), i
		}
	}
	for i := range m.Atoms {
		if !slices.Contains(pin, m.Atoms[i].Map) {
			m.Atoms[i].Map = 0
		}
	}
	return "", -1
}

// smilesError places a SMILES error at its column inside the YAML scalar.
func (w *walker) smilesError(sn, entry *yaml.Node, path string, s Substrate, err error) *yamlfile.Error {
	fe := badSMILES(w.file, 0, 0, fmt.Sprintf("%s %q", path, short(s.Name)), s.SMILES, err)
	se := smilesErr(err)
	var el smiles.ErrorList
	if se != nil && errors.As(err, &el) && len(el) > 1 {
		fe.Msg += fmt.Sprintf(" (and %d more problems)", len(el)-1)
	}
	switch {
	case sn == nil: // from a preset: point at the entry
		fe.Line, fe.Col = entry.Line, entry.Column
		fe.Msg = "preset " + fe.Msg
	default:
		fe.Line, fe.Col = sn.Line, sn.Column
		if se != nil {
			fe.Col += scalarOffset(sn, se.Pos)
		}
	}
	return fe
}

// badSMILES is the error for a SMILES that does not parse, at line:col (the start of the
// SMILES; callers move the column to the problem with smilesErr(err).Pos), wrapping
// ErrBadSMILES and the parser's error.
func badSMILES(file string, line, col int, path, smi string, err error) *yamlfile.Error {
	fe := &yamlfile.Error{File: file, Line: line, Col: col, Path: path, Err: ErrBadSMILES, Cause: err,
		Msg: fmt.Sprintf("SMILES %q: %v", short(smi), err)}
	if se := smilesErr(err); se != nil {
		fe.Msg = fmt.Sprintf("SMILES %q column %d: %s", short(smi), se.Column(), se.Msg)
		fe.Hint = se.Hint
	}
	return fe
}

// smilesErr is the first *smiles.Error in err, or nil.
func smilesErr(err error) *smiles.Error {
	var se *smiles.Error
	if errors.As(err, &se) {
		return se
	}
	return nil
}

// scalarOffset is the column offset of byte pos of a scalar's value from the scalar's start:
// past the opening quote, counting the escapes needed before pos. Block scalars (| and >)
// start on the next line, so their offset is not computed.
func scalarOffset(n *yaml.Node, pos int) int {
	v := n.Value
	pos = min(max(pos, 0), len(v))
	switch n.Style {
	case yaml.DoubleQuotedStyle:
		extra := strings.Count(v[:pos], `\`) + strings.Count(v[:pos], `"`)
		return 1 + utf8.RuneCountInString(v[:pos]) + extra
	case yaml.SingleQuotedStyle:
		return 1 + utf8.RuneCountInString(v[:pos]) + strings.Count(v[:pos], "'")
	case yaml.LiteralStyle, yaml.FoldedStyle:
		return 0
	}
	return utf8.RuneCountInString(v[:pos])
}
