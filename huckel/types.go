package huckel

import "cyclopair/huckel/molecule"

// CentreType names the kind of π centre an atom is, chosen from the Kekulé structure,
// formal charge and neighbours. Parameter sets give h (Coulomb) values per CentreType and
// k (resonance) values per pair of CentreTypes. The string values appear in parameter files
// and in JSON output: keep them stable.
type CentreType string

// The π centre types the perception step can assign. Electrons is the number of π
// electrons the centre contributes.
const (
	CSp2      CentreType = "C"       // neutral sp2 carbon, 1 e
	CCation   CentreType = "C+"      // carbocation, 0 e
	CAnion    CentreType = "C-"      // carbanion, 2 e
	CSp       CentreType = "C#"      // sp carbon, one π set in conjugation, 1 e
	NPyridine CentreType = "N="      // pyridine/imine/azo-type N, 1 e
	NPyrrole  CentreType = "N:"      // amine/pyrrole/amide-type N, 2 e
	NIminium  CentreType = "N+="     // iminium or pyridinium N+, 1 e
	NNitro    CentreType = "N+nitro" // nitro N+, 1 e
	NNitrile  CentreType = "N#"      // nitrile N (and other sp N), 1 e
	NAmmonioA CentreType = "N+:"     // N+ with a lone-pair-like π pair (e.g. azide/diazo middle N written with charge), 2 e — used only where the Kekulé form demands it
	OCarbonyl CentreType = "O="      // carbonyl O, 1 e
	OEther    CentreType = "O:"      // ether/ester/hydroxyl/furan O, 2 e
	OOxonium  CentreType = "O+="     // protonated carbonyl or pyrylium-type O+, 1 e
	OLewis    CentreType = "O=LA"    // carbonyl O bound to a Lewis acid, 1 e
	OAnion    CentreType = "O-"      // O−, 2 e
	SThio     CentreType = "S:"      // thioether/thiophene S, 2 e
	SThione   CentreType = "S="      // thione S, 1 e
	Fluoro    CentreType = "F"       // 2 e
	Chloro    CentreType = "Cl"      // 2 e
	Bromo     CentreType = "Br"      // 2 e
	Iodo      CentreType = "I"       // 2 e
	Boron     CentreType = "B"       // trigonal boron, 0 e
	Alkyl     CentreType = "Me"      // sp3 carbon treated by the hyperconjugative heteroatom model, 2 e

	// Added by the perception step (see perceive.go for the rules).
	NSpCation CentreType = "N+#"    // sp N+: azide/diazo middle N, nitrile-oxide/diazonium N+, 1 e
	NAnion    CentreType = "N-"     // N− lone pair, 2 e (azide/diazo terminal N, amide anions)
	ONitro    CentreType = "Onitro" // nitro-group O (both O share one h; 1 e for =O, 2 e for O−)
)

// AllCentreTypes lists every CentreType in a fixed order (the order of parameter tables).
var AllCentreTypes = []CentreType{
	CSp2, CCation, CAnion, CSp, NPyridine, NPyrrole, NIminium, NNitro, NNitrile, NAmmonioA,
	NSpCation, NAnion, OCarbonyl, OEther, OOxonium, OLewis, OAnion, ONitro, SThio, SThione,
	Fluoro, Chloro, Bromo, Iodo, Boron, Alkyl,
}

// typeIndex maps a CentreType to its position in AllCentreTypes, -1 if unknown.
func typeIndex(t CentreType) int {
	switch t {
	case CSp2:
		return 0
	case CCation:
		return 1
	case CAnion:
		return 2
	case CSp:
		return 3
	case NPyridine:
		return 4
	case NPyrrole:
		return 5
	case NIminium:
		return 6
	case NNitro:
		return 7
	case NNitrile:
		return 8
	case NAmmonioA:
		return 9
	case NSpCation:
		return 10
	case NAnion:
		return 11
	case OCarbonyl:
		return 12
	case OEther:
		return 13
	case OOxonium:
		return 14
	case OLewis:
		return 15
	case OAnion:
		return 16
	case ONitro:
		return 17
	case SThio:
		return 18
	case SThione:
		return 19
	case Fluoro:
		return 20
	case Chloro:
		return 21
	case Bromo:
		return 22
	case Iodo:
		return 23
	case Boron:
		return 24
	case Alkyl:
		return 25
	}
	return -1
}

const numTypes = 26

// Centre is one π centre.
type Centre struct {
	Atom      int        // 0-based atom index in the input molecule
	Element   string     // element symbol of that atom
	Type      CentreType // centre type
	H         float64    // Coulomb parameter h: α_X = α + h·β
	Electrons int        // π electrons contributed (0, 1 or 2)
	Fragment  int        // which separate π system (0-based) the centre belongs to
	// FormalCharge is the atom's formal charge in the input. π charges are computed as
	// Electrons + FormalCharge − π population: the net charge of the centre over its σ
	// framework, so that the Kekulé form chosen does not matter (both nitro oxygens, both
	// ends of an allyl cation get the same charge).
	FormalCharge int
}

// PiBond is a resonance integral between two π centres: β_XY = k·β.
type PiBond struct {
	I, J int     // centre indices (I < J)
	K    float64 // resonance parameter k
	Bond int     // index of the molecular bond it stands for
}

// PiSystem is the perceived π system of a molecule, in the form the solver needs.
type PiSystem struct {
	Mol        *molecule.Molecule
	Params     *Params
	Centres    []Centre
	Bonds      []PiBond
	AtomCentre []int    // atom index -> centre index, -1 for atoms outside every π system
	Fragments  [][]int  // centre indices of each separate π system, in centre order
	Warnings   []string // e.g. "312 π centres: dense diagonalisation is O(n³)"
	// Omega is the ω-technique constant used by Solve (0 = off); Perceive copies it from
	// Params.Omega. With ω ≠ 0 Solve iterates h_i = h_i⁰ + ω·q_i to self-consistency.
	Omega float64
	// MaxCentres is the centre limit Solve enforces (0 means DefaultMaxCentres). Perceive
	// sets it to the limit it was given, so a system it accepted is solved.
	MaxCentres int

	scratch []int // WithoutInto's index map and fragment storage, reused across calls
}

// Level is one molecular orbital, E = α + X·β (β < 0, so bonding levels have X > 0).
type Level struct {
	X          float64   // energy in units of β relative to α
	Occupancy  float64   // electrons in this level (0, 1 or 2; fractional in a partly filled degenerate shell)
	Coeffs     []float64 // one coefficient per π centre (zero outside the level's fragment)
	Fragment   int       // the separate π system this level belongs to
	Degenerate int       // number of levels in its degenerate set (1 when not degenerate)
	// EV is the orbital energy in eV when the method gives it directly (Orbitals.EVDirect,
	// e.g. PPP-SCF: Koopmans' theorem, E_HOMO ≈ −IE); 0 for Hückel levels, whose eV come
	// from a Calibration (use Orbitals.LevelEV to get either).
	EV float64
}

// Orbitals is the solved π system.
type Orbitals struct {
	Pi         *PiSystem
	Levels     []Level   // sorted by X descending: most bonding first
	HOMO       int       // index into Levels of the highest occupied level, -1 if none
	LUMO       int       // index into Levels of the lowest unoccupied level, -1 if none
	SOMO       int       // index of a singly occupied level for odd electron counts, -1 otherwise
	Electrons  int       // total π electrons
	Charges    []float64 // π charge per centre: Electrons + FormalCharge − π population
	BondOrders []float64 // Coulson π bond orders, n×n row-major over centres
	PiEnergy   float64   // total π energy Σ n_j·X_j, in units of β (E_π = Nα + PiEnergy·β)
	Warnings   []string
	// Partial is true when a frontier shell is partly filled: an odd electron count (SOMO)
	// or a degenerate set holding fewer than 2·d electrons (equal fractional occupancy).
	Partial bool
	// H holds the Coulomb parameters actually used, one per centre: the perceived h, or
	// the self-consistent values when the ω-technique is on.
	H []float64
	// Iterations is the number of ω-technique cycles (0 when ω is off), or of SCF cycles
	// for a self-consistent method.
	Iterations int

	// Method names the π method that produced these orbitals: MethodHuckel or MethodPPP.
	Method string
	// EVDirect is true when Levels[*].EV hold orbital energies in eV computed by the method
	// itself (PPP-SCF), false when eV must come from a Calibration of X (Hückel).
	EVDirect bool
	// AlphaEV and BetaEV (eV) define the x scale of a method that works in eV: its levels
	// carry X = (EV − AlphaEV)/BetaEV, so gaps in |β| and the sorting by X mean the same as
	// for Hückel levels. Both are 0 for Hückel orbitals (x is the native unit there).
	AlphaEV, BetaEV float64

	coef []float64 // backing store of Levels[*].Coeffs, reused by Solver
}
