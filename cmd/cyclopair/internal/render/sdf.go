package render

import (
	"io"

	"cyclopair/huckel/molfile"
	"cyclopair/huckel/smiles"
)

// SDPrefix starts the name of every SD data item the SDF format writes (molfile's rule for
// names of our own). The items are the CSV columns, in the CSV order, each name prefixed:
// cyclopair_rank, cyclopair_pair_number, cyclopair_diene_name, cyclopair_diene, ...,
// cyclopair_label, cyclopair_product, ..., cyclopair_params, cyclopair_calibration,
// cyclopair_caution. Energies are in |β| (…_beta) and eV (…_ev) as in the CSV.
const SDPrefix = "cyclopair_"

// SDKind names what the molecule of a record is: the product of the best orientation, or,
// for a pair without one, the two partners as one disconnected molecule.
const (
	SDKindProduct  = "product"
	SDKindPartners = "partners (no product: no reacting orientation found)"
)

// sdfWriter writes one SD record per row: the molecule is the cycloadduct of the best
// orientation (the CSV's product SMILES) with 2D coordinates from huckel/depict (the
// pictures' layout), the title "diene + dienophile (activation)", and the row's figures
// as data items (SDPrefix). The output depends only on the rows: no date stamp.
type sdfWriter struct {
	w   *molfile.Writer
	rep Report
}

func newSDF(w io.Writer, rep Report) *sdfWriter { return &sdfWriter{w: molfile.NewWriter(w), rep: rep} }

// productParse reads adduct SMILES, which are longer than either partner.
var productParse = smiles.ParseOptions{MaxLength: 1 << 20}

func (s *sdfWriter) WriteRow(r Row) error {
	p := r.Pair
	kind, smi := SDKindProduct, ""
	if o := best(p); o != nil && o.Product != "" {
		smi = o.Product
	} else {
		kind, smi = SDKindPartners, p.Diene+"."+p.Dienophile
	}
	m, err := productParse.Parse(smi)
	if err != nil {
		return err
	}
	m.Name = orDash(p.DieneName) + " + " + orDash(p.DienophileName) + " (" + p.Activation + ")"
	rec := csvRecord(r)
	props := make([]molfile.Prop, 0, len(rec)+2)
	props = append(props, molfile.Prop{Name: SDPrefix + "record", Value: kind})
	for i, v := range rec {
		props = append(props, molfile.Prop{Name: SDPrefix + csvHeader[i], Value: orControl(v)})
	}
	return s.w.Write(m, nil, props)
}

// orControl makes a value one line (a name read from a file may not hold a line break,
// but a warning might): control characters become spaces.
func orControl(v string) string {
	if v == "" {
		return ""
	}
	return orDash(v)
}

func (s *sdfWriter) Close(Summary) error { return nil }
