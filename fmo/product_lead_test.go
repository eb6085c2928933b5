package fmo

import (
	"strings"
	"testing"
)

// A directional mark written on the diene's (E)-double bond must not survive into the
// adduct, where that double bond has moved (the mark would then sit on a bond next to no
// double bond, which RDKit warns about and which encodes nothing we computed).
func TestProductDropsDirectionalMarks(t *testing.T) {
	opts, err := DefaultOptions()
	if err != nil {
		t.Fatal(err)
	}
	// methyl (E)-2,4-pentadienoate + methyl acrylate
	d, err := NewPartner("dienoate", "C=C/C=C/C(=O)OC", RoleDiene, opts)
	if err != nil {
		t.Fatal(err)
	}
	e, err := NewPartner("acrylate", "C=CC(=O)OC", RoleDienophile, opts)
	if err != nil {
		t.Fatal(err)
	}
	p, err := Analyze(d, e, opts)
	if err != nil {
		t.Fatal(err)
	}
	for _, o := range p.Orientations {
		if strings.ContainsAny(o.Product, `/\`) {
			t.Errorf("product %s of %s keeps a directional bond mark", o.Product, o.Site)
		}
	}
}
