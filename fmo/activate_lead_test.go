package fmo

import (
	"errors"
	"testing"

	"cyclopair/huckel/smiles"
)

// Quinones and ene-1,4-diones take up secondary amines by conjugate addition (amino-quinones)
// rather than as iminium ions (common practice, no source), so the iminium variant must carry
// that caution; a plain enal must not.
func TestIminiumQuinoneCaution(t *testing.T) {
	tests := []struct {
		name, smiles string
		want         bool
	}{
		{"p-benzoquinone", "O=C1C=CC(=O)C=C1", true},
		{"1,4-naphthoquinone", "O=C1C=CC(=O)c2ccccc12", true},
		{"(E)-hex-3-ene-2,5-dione", "CC(=O)/C=C/C(C)=O", true},
		{"o-benzoquinone", "O=C1C=CC=CC1=O", true},
		{"crotonaldehyde", "C/C=C/C=O", false},
		{"cyclohexenone", "O=C1C=CCCC1", false},
	}
	// Quinones and ene-1,4-diones are refused (issue 10: iminium activation only where the
	// chemistry allows it; secondary amines add to them in conjugate fashion — common
	// practice, no source); enals and unhindered enones are accepted.
	for _, tt := range tests {
		m, err := smiles.Parse(tt.smiles)
		if err != nil {
			t.Fatalf("%s: %v", tt.name, err)
		}
		_, _, err = Activate(m, ActivateIminium, nil)
		if refused := errors.Is(err, ErrNothingToActivate); refused != tt.want {
			t.Errorf("%s: refused %v, want %v (err %v)", tt.name, refused, tt.want, err)
		}
	}
}
