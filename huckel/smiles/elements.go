package smiles

// symbols lists the elements by atomic number (index 0 is unused).
var symbols = [...]string{"",
	"H", "He",
	"Li", "Be", "B", "C", "N", "O", "F", "Ne",
	"Na", "Mg", "Al", "Si", "P", "S", "Cl", "Ar",
	"K", "Ca", "Sc", "Ti", "V", "Cr", "Mn", "Fe", "Co", "Ni", "Cu", "Zn", "Ga", "Ge", "As", "Se", "Br", "Kr",
	"Rb", "Sr", "Y", "Zr", "Nb", "Mo", "Tc", "Ru", "Rh", "Pd", "Ag", "Cd", "In", "Sn", "Sb", "Te", "I", "Xe",
	"Cs", "Ba", "La", "Ce", "Pr", "Nd", "Pm", "Sm", "Eu", "Gd", "Tb", "Dy", "Ho", "Er", "Tm", "Yb", "Lu",
	"Hf", "Ta", "W", "Re", "Os", "Ir", "Pt", "Au", "Hg", "Tl", "Pb", "Bi", "Po", "At", "Rn",
	"Fr", "Ra", "Ac", "Th", "Pa", "U", "Np", "Pu", "Am", "Cm", "Bk", "Cf", "Es", "Fm", "Md", "No", "Lr",
	"Rf", "Db", "Sg", "Bh", "Hs", "Mt", "Ds", "Rg", "Cn", "Nh", "Fl", "Mc", "Lv", "Ts", "Og",
}

// elementIndex maps a symbol to its atomic number.
var elementIndex = func() map[string]int {
	m := make(map[string]int, len(symbols))
	for z, s := range symbols {
		if z > 0 {
			m[s] = z
		}
	}
	return m
}()

// lookupElement returns the atomic number and canonical symbol string for the symbol
// spelled by b (one or two bytes), without allocating.
func lookupElement(b string) (int, string) {
	z, ok := elementIndex[b]
	if !ok {
		return 0, ""
	}
	return z, symbols[z]
}

// AtomicNumber returns the atomic number of an element symbol ("C" → 6), or 0 if the
// symbol is not an element.
func AtomicNumber(symbol string) int { return elementIndex[symbol] }

// mainGroup holds, for the main-group elements whose bonding this reader checks, the
// number of valence electrons and whether the element is limited to an octet (period 2).
// Elements absent from the table (metals, noble gases) are accepted as written.
type groupInfo struct {
	valenceElectrons int
	octet            bool // period 1–2: no expanded valences
}

var mainGroup = map[string]groupInfo{
	"H": {1, true},
	"B": {3, true}, "C": {4, true}, "N": {5, true}, "O": {6, true}, "F": {7, true},
	"Si": {4, false}, "P": {5, false}, "S": {6, false}, "Cl": {7, false},
	"Ge": {4, false}, "As": {5, false}, "Se": {6, false}, "Br": {7, false},
	"Sb": {5, false}, "Te": {6, false}, "I": {7, false},
}

// Valence lists, smallest first. A list is indexed by effective valence electrons
// (valence electrons minus formal charge), following the isoelectronic principle: N+ bonds
// like C, O+ like N, C- like N, B- like C.
var (
	octetValences = [9][]int{
		0: {0}, 1: {1}, 2: {2}, 3: {3}, 4: {4}, 5: {3}, 6: {2}, 7: {1}, 8: {0},
	}
	expandedValences = [9][]int{
		0: {0}, 1: {1}, 2: {2}, 3: {3}, 4: {4}, 5: {3, 5}, 6: {2, 4, 6}, 7: {1, 3, 5, 7}, 8: {0},
	}
	nitrogenValences = []int{3, 5} // neutral N: OpenSMILES allows the nitro-style valence 5
	hydrogenValence  = []int{1}
	hydrideValence   = []int{0}
)

// allowedValences returns the bonding valences an atom of the given element and charge may
// have, and checked=false for elements this reader does not check (metals, noble gases).
// ok=false means the charge is impossible for the element (for example C+5).
func allowedValences(element string, charge int) (vals []int, checked, ok bool) {
	g, found := mainGroup[element]
	if !found {
		return nil, false, true
	}
	if element == "H" {
		switch charge {
		case 0:
			return hydrogenValence, true, true
		case 1, -1:
			return hydrideValence, true, true
		}
		return nil, true, false
	}
	ve := g.valenceElectrons - charge
	if ve < 0 || ve > 8 {
		return nil, true, false
	}
	if element == "N" && charge == 0 {
		return nitrogenValences, true, true
	}
	if g.octet {
		return octetValences[ve], true, true
	}
	return expandedValences[ve], true, true
}

// Default valences of the OpenSMILES organic subset, used for the implicit hydrogens of
// atoms written without brackets. Source: OpenSMILES specification, section 3.1.5
// "Organic subset" (Craig A. James et al., opensmiles.org, 2007–2016). One extension: I
// also takes 3 and 5, as RDKit does (its periodic table, checked with RDKit 2022.09.3), so
// hypervalent iodine written as RDKit writes it, CC(=O)OI(OC(C)=O)c1ccccc1, reads.
var (
	valB   = []int{3}
	valC   = []int{4}
	valNP  = []int{3, 5}
	valO   = []int{2}
	valS   = []int{2, 4, 6}
	valHal = []int{1}
	valI   = []int{1, 3, 5}
)

// organicVals returns the default valences of an organic-subset element, nil otherwise.
func organicVals(element string) []int {
	switch element {
	case "C":
		return valC
	case "N", "P":
		return valNP
	case "O":
		return valO
	case "S":
		return valS
	case "B":
		return valB
	case "F", "Cl", "Br":
		return valHal
	case "I":
		return valI
	}
	return nil
}

// nextValence returns the smallest value in vals that is ≥ s, or -1.
func nextValence(vals []int, s int) int {
	for _, v := range vals {
		if v >= s {
			return v
		}
	}
	return -1
}
