package molfile_test

import (
	"errors"
	"fmt"
	"io"
	"os"
	"strings"

	"cyclopair/huckel/molfile"
	"cyclopair/huckel/smiles"
)

// Read an SD file record by record: a bad record is reported with its line and the
// reader goes on.
func ExampleReader() {
	sd := `acrolein
  example

  4  3  0  0  0  0  0  0  0  0999 V2000
    0.0000    0.0000    0.0000 C   0  0  0  0  0  0  0  0  0  0  0  0
    1.2990    0.7500    0.0000 C   0  0  0  0  0  0  0  0  0  0  0  0
    2.5981    0.0000    0.0000 C   0  0  0  0  0  0  0  0  0  0  0  0
    3.8971    0.7500    0.0000 O   0  0  0  0  0  0  0  0  0  0  0  0
  1  2  2  0
  2  3  1  0
  3  4  2  0
M  END
> <id>
D-7

$$$$
broken
  example

  1  0  0  0  0  0  0  0  0  0999 V2000
    0.0000    0.0000    0.0000 Xy  0  0  0  0  0  0  0  0  0  0  0  0
M  END
$$$$
`
	rd := molfile.NewReader(strings.NewReader(sd), &molfile.Options{NameProp: "id"})
	for {
		rec, err := rd.Read()
		if err == io.EOF {
			break
		}
		var e *molfile.Error
		if errors.As(err, &e) {
			fmt.Fprintln(os.Stdout, "example.sdf:", err)
			continue
		}
		fmt.Println(rec.Index, rec.Mol.Name, rec.Mol.Source, rec.Title)
	}
	// Output:
	// 1 D-7 C=CC=O acrolein
	// example.sdf: 21:32: record 2 (broken): atom 1: unknown element "Xy" (check the element symbol)
}

// Write a molecule as an SD record; nil coordinates lay it out with package depict.
func ExampleAppendSD() {
	m, err := smiles.Parse("C=C[O-].[Na+]")
	if err != nil {
		panic(err)
	}
	m.Name = "sodium ethenolate"
	b, err := molfile.AppendSD(nil, m, nil, []molfile.Prop{{Name: molfile.PropSMILES, Value: smiles.Write(m)}})
	if err != nil {
		panic(err)
	}
	fmt.Print(string(b))
	// Output:
	// sodium ethenolate
	//   cyclopr           2D
	//
	//   4  2  0  0  0  0  0  0  0  0999 V2000
	//     0.0000    0.3750    0.0000 C   0  0  0  0  0  0  0  0  0  0  0  0
	//     1.2990   -0.3750    0.0000 C   0  0  0  0  0  0  0  0  0  0  0  0
	//     2.5981    0.3750    0.0000 O   0  5  0  0  0  0  0  0  0  0  0  0
	//     4.8481    0.0000    0.0000 Na  0  3  0  0  0 15  0  0  0  0  0  0
	//   1  2  2  0
	//   2  3  1  0
	// M  CHG  2   3  -1   4   1
	// M  END
	// >  <cyclopair_smiles>
	// C=C[O-].[Na+]
	//
	// $$$$
}
