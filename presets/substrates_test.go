package presets

import (
	"strings"
	"testing"

	"cyclopair/huckel/smiles"
)

// Every named substrate parses (structures are standard; the reader is checked elsewhere).
func TestSubstratesParse(t *testing.T) {
	subs := Substrates()
	if len(subs) < 30 {
		t.Fatalf("only %d named substrates", len(subs))
	}
	for _, s := range subs {
		if _, err := smiles.Parse(s.SMILES); err != nil {
			t.Errorf("%s: %q: %v", s.Name, s.SMILES, err)
		}
		if s.Name != normalizeName(s.Name) {
			t.Errorf("%s: name is not in normal form", s.Name)
		}
	}
}

func TestLookupSubstrate(t *testing.T) {
	for _, in := range []string{"maleic-anhydride", "Maleic anhydride", " MALEIC_ANHYDRIDE "} {
		if s, ok := LookupSubstrate(in); !ok || s.SMILES != "O=C1OC(=O)C=C1" {
			t.Errorf("LookupSubstrate(%q) = %+v, %v", in, s, ok)
		}
	}
	if _, ok := LookupSubstrate("unobtainium"); ok {
		t.Error("found a substrate that does not exist")
	}
	if got := SuggestSubstrates("maleic", 3); len(got) == 0 || got[0] != "maleic-anhydride" {
		t.Errorf("SuggestSubstrates(maleic) = %v", got)
	}
}

func TestDemoFileSaysInvented(t *testing.T) {
	_, data := DemoFile()
	if !strings.Contains(string(data), "INVENTED") || !strings.Contains(string(data), "fictional") {
		t.Error("demo file does not say its scenario is invented")
	}
}
