package fmo

import (
	"fmt"
	"slices"
	"strings"
	"sync"
)

// Honest confidence: every verdict of a Pair carries how often the method got verdicts of
// the same class right in the bundled literature check set (presets/literature/cases.yaml),
// the measured hit rate of the confidence word it printed, and a caution where the class is
// one the method is known to miss. The figures are not typed by hand: fmo/check runs the
// check set with DefaultOptions for each π method and writes confidence_table.go
// (`go test ./fmo/check -run TestConfidenceTable -update`); the same test fails when the
// file no longer matches the check set, so the table cannot go stale. This package cannot
// import fmo/check (it imports fmo), hence the generated file.

// Verdicts a ConfidenceNote can be about (the check-set categories).
const (
	VerdictRegio  = "regio"
	VerdictSite   = "site"
	VerdictEndo   = "endo"
	VerdictDemand = "demand"
)

// Verdict classes. A class is decided from the pair itself (the preferred orientation's
// reacting units and the demand), never from names:
//   - regio: "1,3-dipole" for a [3+2] orientation; else "azadiene" when the 4π unit holds
//     a nitrogen (1,2,4,5-tetrazines, 1,2,4-triazines, 1- and 2-azadienes); else
//     "hetero-Diels-Alder" when either reacting unit holds a heteroatom (C=O, C=N
//     dienophiles, α,β-unsaturated carbonyls as 4π units); else "all-carbon Diels-Alder,
//     normal demand" when the demand is normal and "all-carbon Diels-Alder, inverse or
//     neutral demand" otherwise.
//   - site: "site, activated 2π partner" when the dienophile carries an activation
//     (proton, Lewis acid, iminium), else "site".
//   - endo: "endo" (only pairs that have an endo/exo question: Pair.EndoNote empty).
//   - demand: "demand".
const (
	ClassDipole          = "1,3-dipole"
	ClassAzadiene        = "azadiene"
	ClassHeteroDA        = "hetero-Diels-Alder"
	ClassCarbonNormal    = "all-carbon Diels-Alder, normal demand"
	ClassCarbonOther     = "all-carbon Diels-Alder, inverse or neutral demand"
	ClassSite            = "site"
	ClassSiteActivated   = "site, activated 2π partner"
	ClassEndo            = "endo"
	ClassDemand          = "demand"
	confidenceMinCases   = 3
	confidenceCautionHit = 0.8
)

// ClassRecord is one verdict class's score on the check set.
type ClassRecord struct {
	Verdict     string   // VerdictRegio, …
	Class       string   // Class… constant
	Hits, Cases int      // cases of this class the method gets right, and all of them
	KnownMisses []string // ids of the check-set cases of this class the method misses
}

// WordRecord is one confidence word's score on the check set: the regio words ("clear",
// "slight", "no preference") over the regio cases and the endo words ("yes", "weak", "no")
// over the endo cases.
type WordRecord struct {
	Verdict, Word string
	Hits, Cases   int
}

// ConfidenceTable is the check set's score by class and by word for one π method, run with
// DefaultOptions (other option values change the verdicts; the table still describes the
// defaults).
type ConfidenceTable struct {
	Method   string // "huckel" or "ppp"
	CheckSet string // the check-set file it was measured on
	Classes  []ClassRecord
	Words    []WordRecord
}

// CheckSetConfidence returns the generated table for a π method ("huckel", "ppp").
func CheckSetConfidence(method string) (ConfidenceTable, bool) {
	for _, t := range checkSetConfidence {
		if t.Method == method {
			return t, true
		}
	}
	return ConfidenceTable{}, false
}

// ConfidenceNote is the check-set record of one verdict of a Pair (JSON key "confidence").
type ConfidenceNote struct {
	Verdict string `json:"verdict"` // regio | site | endo | demand
	Class   string `json:"class"`   // the verdict class (see the Class… constants)
	Hits    int    `json:"hits"`    // check-set cases of this class the method gets right (0 with Cases 0)
	Cases   int    `json:"cases"`   // check-set cases of this class (0: the class is not in the check set)
	// Word is the confidence word printed for the verdict ("clear", "yes", …) and WordHits
	// of WordCases check-set cases with that word were right; empty for verdicts without
	// words (site, demand).
	Word      string `json:"word,omitempty"`
	WordHits  int    `json:"word_hits,omitempty"`
	WordCases int    `json:"word_cases,omitempty"`
	// KnownMisses lists the check-set cases of this class the method is recorded to miss.
	KnownMisses []string `json:"known_misses,omitempty"`
	Text        string   `json:"text"` // one line for people
}

// classCaution says why the method misses a class; it is printed with the check-set figures
// when the class is cautioned (see cautionFor). The reasons are those recorded with the
// known misses in presets/literature/cases.yaml.
var classCaution = map[string]string{
	ClassDipole:        "the Hückel HOMO of a charge-separated 1,3-dipole sits on its anionic terminus, where SCF descriptions put it on the other end (Houk et al., J. Am. Chem. Soc. 1973, 95, 7287 and 7301, from memory), so the predicted regiochemistry is often reversed",
	ClassSiteActivated: "with a Lewis or Brønsted acid on one carbonyl O the LUMO of the complex grows at the free C=O, and the Hückel model has no term for the strong C=O π bond beyond h_O, so site choices of activated quinones and enones can go to the C=O",
	ClassSite:          "site choices between similar C=C bonds (substituted quinones) turn on differences of a few thousandths of |β| in the LUMO and the localisation, below what Hückel theory resolves; in azadienes the site-specific frontier level can pick the wrong unit (1,2,4-triazine: C5/N2 instead of C3/C6)",
	ClassEndo:          "the endo verdict is the secondary-orbital term only: steric and dispersive effects (α-substituted dienophiles, bulky catalysts) and thermodynamic control (reversible adducts) are outside the model",
	ClassDemand:        "σ-withdrawing substituents (halogens) act only as π donors in Hückel theory, so demand calls for polyhalogenated partners can come out neutral",
}

// cautionFor reports whether a class needs a caution: it is in the check set with known
// misses and a hit rate below confidenceCautionHit (80 %), or has fewer than
// confidenceMinCases (3) cases. The cut-offs are a judgement (no source): one miss in five
// is what a planning chemist would want to be told about, and fewer than three cases say
// nothing about a rate.
func cautionFor(r ClassRecord) bool {
	if r.Cases < confidenceMinCases {
		return true
	}
	return len(r.KnownMisses) > 0 && float64(r.Hits) < confidenceCautionHit*float64(r.Cases)
}

// wordSupported reports whether the check set supports word as stronger than the words
// after it in order: its hit rate must exceed theirs. Words are ordered strongest first.
// A word with fewer than confidenceMinCases cases is not calibrated; the weakest word ("no
// preference", "no") is a statement of no preference and needs no support.
func wordSupported(t ConfidenceTable, verdict string, order []string, word string) (bool, string) {
	rate := func(w string) (float64, int) {
		for _, r := range t.Words {
			if r.Verdict == verdict && r.Word == w && r.Cases > 0 {
				return float64(r.Hits) / float64(r.Cases), r.Cases
			}
		}
		return -1, 0
	}
	i := slices.Index(order, word)
	if i < 0 || i == len(order)-1 {
		return true, ""
	}
	rw, nw := rate(word)
	if nw < confidenceMinCases {
		return false, fmt.Sprintf("only %d check-set %s case(s) called %q, too few to calibrate the word's threshold", nw, verdict, word)
	}
	for _, weaker := range order[i+1:] {
		if rv, nv := rate(weaker); nv > 0 && rv >= rw {
			return false, fmt.Sprintf("the check set does not support %q over %q (%q right in %.0f%% of its cases, %q in %.0f%%)",
				word, weaker, word, 100*rw, weaker, 100*rv)
		}
	}
	return true, ""
}

// regioWords and endoWords are the confidence words strongest first.
var (
	regioWords = []string{"clear", "slight", "no preference"}
	endoWords  = []string{"yes", "weak", "no"}
)

// addConfidence fills Pair.Confidence from the generated table and adds a caution warning
// for each cautioned class.
// regioMoot is set when both regio-orientations give the same adduct (no regio question):
// the regio figures are still given, without a caution.
func addConfidence(p *Pair, regioClass, siteClass string, regioMoot bool, warn func(string)) {
	note := func(verdict, class, word string, words []string, moot bool) {
		k := confidenceKey{method: p.Method, verdict: verdict, class: class, word: word, moot: moot}
		c, ok := confidenceNotes.Load(k)
		if !ok {
			c, _ = confidenceNotes.LoadOrStore(k, confidenceNote(p.Method, verdict, class, word, words, moot))
		}
		cn := c.(confidenceEntry)
		p.Confidence = append(p.Confidence, cn.note)
		if cn.caution != "" {
			warn(cn.caution)
		}
	}
	note(VerdictRegio, regioClass, p.RegioConfidence, regioWords, regioMoot)
	if siteClass != "" {
		note(VerdictSite, siteClass, "", nil, false)
	}
	if p.EndoNote == "" {
		note(VerdictEndo, ClassEndo, p.Endo, endoWords, false)
	}
	note(VerdictDemand, ClassDemand, "", nil, false)
}

// confidenceNotes memoises confidenceNote: a screen's rows fall into a few dozen
// (verdict, class, word) combinations, each formatted once. The notes' KnownMisses slices
// are shared between pairs (read-only).
var confidenceNotes sync.Map // confidenceKey → confidenceEntry

type confidenceKey struct {
	method, verdict, class, word string
	moot                         bool
}

type confidenceEntry struct {
	note    ConfidenceNote
	caution string // the caution warning, "" for none
}

// confidenceNote is one verdict's note from the generated table of method, and its caution
// warning when the class is cautioned (not when moot).
func confidenceNote(method, verdict, class, word string, words []string, moot bool) confidenceEntry {
	t, ok := CheckSetConfidence(method)
	if !ok {
		t = ConfidenceTable{Method: method}
	}
	var out confidenceEntry
	n := ConfidenceNote{Verdict: verdict, Class: class, Word: word}
	var rec ClassRecord
	for _, r := range t.Classes {
		if r.Verdict == verdict && r.Class == class {
			rec = r
		}
	}
	rec.Verdict, rec.Class = verdict, class
	n.Hits, n.Cases, n.KnownMisses = rec.Hits, rec.Cases, slices.Clone(rec.KnownMisses)
	var b strings.Builder
	b.WriteString(verdict)
	if class != verdict {
		b.WriteString(" (" + class + ")")
	}
	if n.Cases == 0 {
		fmt.Fprintf(&b, ": no case of this class in the check set (%s)", t.Method)
	} else {
		fmt.Fprintf(&b, ": right in %d of %d literature cases", n.Hits, n.Cases)
	}
	if word != "" {
		for _, r := range t.Words {
			if r.Verdict == verdict && r.Word == word {
				n.WordHits, n.WordCases = r.Hits, r.Cases
			}
		}
		if n.WordCases > 0 {
			fmt.Fprintf(&b, "; %q right in %d of %d", word, n.WordHits, n.WordCases)
		}
		if ok, why := wordSupported(t, verdict, words, word); !ok {
			b.WriteString("; " + why)
		}
	}
	n.Text = b.String()
	out.note = n
	if !moot && cautionFor(rec) {
		msg := "caution, " + verdict
		if class != verdict {
			msg += " (" + class + ")"
		}
		msg += ": "
		switch {
		case rec.Cases == 0:
			msg += "no literature case of this class in the check set: the verdict is untested"
		case rec.Cases < confidenceMinCases:
			msg += fmt.Sprintf("only %d literature case(s) of this class in the check set, too few to know the hit rate", rec.Cases)
		default:
			msg += fmt.Sprintf("the method is right in only %d of %d literature cases of this class (known misses %s)",
				rec.Hits, rec.Cases, strings.Join(rec.KnownMisses, ", "))
		}
		if why := classCaution[class]; why != "" && rec.Cases > 0 && len(rec.KnownMisses) > 0 {
			msg += ": " + why
		}
		out.caution = msg
	}

	return out
}

// regioClassOf decides the regio class of the preferred orientation (see the Class…
// constants).
func regioClassOf(diene *Partner, du Unit, dienophile *Partner, eu Unit, demand string) string {
	if du.Kind == UnitDipole {
		return ClassDipole
	}
	hetero := false
	for _, a := range du.Atoms {
		switch diene.Mol.Atoms[a].Element {
		case "C":
		case "N":
			return ClassAzadiene
		default:
			hetero = true
		}
	}
	for _, a := range eu.Atoms {
		if dienophile.Mol.Atoms[a].Element != "C" {
			hetero = true
		}
	}
	switch {
	case hetero:
		return ClassHeteroDA
	case demand == "normal":
		return ClassCarbonNormal
	}
	return ClassCarbonOther
}

// siteClassOf is the site class of a pair whose dienophile has the given activation.
func siteClassOf(activation string) string {
	if activation != "" && activation != ActivateNone {
		return ClassSiteActivated
	}
	return ClassSite
}
