package molfile

// mostCommonIsotopes holds the mass number of the most abundant isotope of each element
// with stable isotopes (and of Th and U), the reference a V2000 mass-difference field
// ("dd", -3..+4) is added to. The CTfile specification says only "difference from mass in
// periodic table"; readers differ on which mass that is, so this follows RDKit, which adds
// the field to the most common isotope (checked for every entry by TestMassDifference
// against the RDKit fixture, testdata/molfile). Values from the IUPAC table of isotopic
// compositions (CIAAW, Isotopic compositions of the elements 2013, Pure Appl. Chem. 88,
// 293-306, 2016), from memory. Writers should use "M  ISO" instead, which gives the mass
// number itself; the writer of this package does.
var mostCommonIsotopes = map[string]int{
	"H": 1, "He": 4, "Li": 7, "Be": 9, "B": 11, "C": 12, "N": 14, "O": 16, "F": 19, "Ne": 20,
	"Na": 23, "Mg": 24, "Al": 27, "Si": 28, "P": 31, "S": 32, "Cl": 35, "Ar": 40,
	"K": 39, "Ca": 40, "Sc": 45, "Ti": 48, "V": 51, "Cr": 52, "Mn": 55, "Fe": 56, "Co": 59,
	"Ni": 58, "Cu": 63, "Zn": 64, "Ga": 69, "Ge": 74, "As": 75, "Se": 80, "Br": 79, "Kr": 84,
	"Rb": 85, "Sr": 88, "Y": 89, "Zr": 90, "Nb": 93, "Mo": 98, "Ru": 102, "Rh": 103,
	"Pd": 106, "Ag": 107, "Cd": 114, "In": 115, "Sn": 120, "Sb": 121, "Te": 130, "I": 127,
	"Xe": 132, "Cs": 133, "Ba": 138, "La": 139, "Ce": 140, "Pr": 141, "Nd": 142, "Sm": 152,
	"Eu": 153, "Gd": 158, "Tb": 159, "Dy": 164, "Ho": 165, "Er": 166, "Tm": 169, "Yb": 174,
	"Lu": 175, "Hf": 180, "Ta": 181, "W": 184, "Re": 187, "Os": 192, "Ir": 193, "Pt": 195,
	"Au": 197, "Hg": 202, "Tl": 205, "Pb": 208, "Bi": 209, "Th": 232, "U": 238,
}

// mostCommonIsotope returns the reference mass number for a mass difference, 0 when the
// element has none here.
func mostCommonIsotope(el string) int { return mostCommonIsotopes[el] }
