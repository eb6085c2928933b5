package fmo

import (
	"bufio"
	"flag"
	"os"
	"slices"
	"strings"
	"testing"

	"cyclopair/huckel/molecule"
	"cyclopair/huckel/smiles"
)

func canonOf(t *testing.T, smi string) string {
	t.Helper()
	m, err := smiles.Parse(smi)
	if err != nil {
		t.Fatalf("%s: %v", smi, err)
	}
	return smiles.Canonical(m)
}

func lostOf(steps []FollowUpStep) []string {
	var out []string
	for _, s := range steps {
		out = append(out, s.Kind+":"+s.Lost)
	}
	return out
}

// TestFollowUpSteps checks the isolated products of the inverse-demand and pyrone cases
// against the literature:
//   - dimethyl 1,2,4,5-tetrazine-3,6-dicarboxylate + an enol ether gives dimethyl
//     pyridazine-3,6-dicarboxylate after loss of N₂ and of the alcohol (J. Sauer et al.,
//     Eur. J. Org. Chem. 1998, 2885; D. L. Boger, Chem. Rev. 1986, 86, 781);
//   - the same tetrazine + a plain alkene stops at the 4,5-dihydropyridazine after N₂ loss
//     (Sauer et al. 1998, which also describe its tautomerisation and oxidation: in the note);
//   - 1,2,4-triazine + an enamine gives the pyridine after N₂ and amine loss (Boger 1986);
//   - 2-pyrone + an alkyne gives the arene after CO₂ loss; + an enol ether the arene after
//     CO₂ and alcohol loss (K. Afarinkia, V. Vinader, T. D. Nelson, G. H. Posner,
//     Tetrahedron 1992, 48, 9111);
//   - a plain Diels–Alder adduct (cyclopentadiene + maleic anhydride) has no follow-up step.
func TestFollowUpSteps(t *testing.T) {
	cases := []struct {
		diene, dienophile string
		steps             []string
		isolated          string
		note              string // a word the last step's note must contain
	}{
		{"COC(=O)c1nnc(C(=O)OC)nn1", "C=COCC", []string{"retro_diels_alder:N#N", "elimination:CCO"}, "COC(=O)c1ccc(C(=O)OC)nn1", ""},
		{"COC(=O)c1nnc(C(=O)OC)nn1", "C=CCCCC", []string{"retro_diels_alder:N#N"}, "CCCCC1CC(C(=O)OC)=NN=C1C(=O)OC", "tautomerises"},
		{"c1cnncn1", "CC(=C)N1CCCC1", nil, "", ""}, // filled below: the pyridine, with or without the methyl's position fixed
		{"O=c1cccco1", "C#CC(=O)OC", []string{"retro_diels_alder:O=C=O"}, "COC(=O)c1ccccc1", ""},
		{"O=c1cccco1", "C=COC", []string{"retro_diels_alder:O=C=O", "elimination:CO"}, "c1ccccc1", ""},
		{"C1=CC=CC1", "O=C1OC(=O)C=C1", []string{}, "", ""},
	}
	for _, c := range cases {
		p, _, _ := mustAnalyze(t, c.diene, c.dienophile)
		best := p.Orientations[0]
		got := lostOf(best.FollowUp)
		if c.diene == "c1cnncn1" {
			// The follow-up rule at the C3/C6 site (atoms 1 and 4 of c1cnncn1), where
			// 1,2,4-triazines react (Boger 1986): N₂ then pyrrolidine, giving a
			// methylpyridine (regiochemistry is not the point here). Which site the ranking
			// prefers is tested elsewhere; since the issue-9 site changes it is not C3/C6.
			best = Orientation{}
			for _, o := range p.Orientations {
				if ts := []int{o.Bonds[0][0], o.Bonds[1][0]}; slices.Contains(ts, 1) && slices.Contains(ts, 4) {
					best = o
					break
				}
			}
			got = lostOf(best.FollowUp)
			if !slices.Equal(got, []string{"retro_diels_alder:N#N", "elimination:C1CCNC1"}) {
				t.Errorf("%s + %s: steps %v; want N₂ then pyrrolidine", c.diene, c.dienophile, got)
			}
			iso, err := smiles.Parse(best.IsolatedProduct)
			if err != nil || iso.HeavyAtomCount() != 7 || countEl(iso, "N") != 1 {
				t.Errorf("%s + %s: isolated %s; want a methylpyridine", c.diene, c.dienophile, best.IsolatedProduct)
			}
			continue
		}
		if len(got) != len(c.steps) || (len(got) > 0 && !slices.Equal(got, c.steps)) {
			t.Errorf("%s + %s: steps %v; want %v", c.diene, c.dienophile, got, c.steps)
			continue
		}
		if len(c.steps) == 0 {
			if canonOf(t, best.IsolatedProduct) != best.Product {
				t.Errorf("%s + %s: isolated %s differs from the adduct %s without a step", c.diene, c.dienophile, best.IsolatedProduct, best.Product)
			}
			continue
		}
		if canonOf(t, best.IsolatedProduct) != canonOf(t, c.isolated) {
			t.Errorf("%s + %s: isolated %s; want %s", c.diene, c.dienophile, best.IsolatedProduct, c.isolated)
		}
		if last := best.FollowUp[len(best.FollowUp)-1]; c.note != "" && !strings.Contains(last.Note, c.note) {
			t.Errorf("%s + %s: note %q lacks %q", c.diene, c.dienophile, last.Note, c.note)
		}
		for _, s := range best.FollowUp {
			if s.Basis == "" || !strings.Contains(s.Basis, "19") {
				t.Errorf("%s + %s: step %s without a literature basis", c.diene, c.dienophile, s.Kind)
			}
		}
	}
}

func countEl(m *molecule.Molecule, el string) int {
	n := 0
	for _, a := range m.Atoms {
		if a.Element == el {
			n++
		}
	}
	return n
}

// TestTetrazineNoSecondAdditionWarning: the bridged N=N of a tetrazine adduct is lost as N₂
// at or below room temperature (Sauer et al., Eur. J. Org. Chem. 1998, 2885), so no row may
// warn of a second diene adding across it; the side channel looks at the isolated product.
func TestTetrazineNoSecondAdditionWarning(t *testing.T) {
	o := testOptions(t)
	for _, e := range []string{"C=COCC", "C=CCCCC", "C1=CCCC1"} {
		d := mustPartner(t, "COC(=O)c1nnc(C(=O)OC)nn1", RoleDiene, o)
		f := mustPartner(t, e, RoleDienophile, o)
		p, err := Analyze(d, f, o)
		if err != nil {
			t.Fatal(err)
		}
		p.AttachSideChannels(SideChannels(d, f, p, o))
		for _, w := range p.Warnings {
			if strings.Contains(w, "second equivalent") {
				t.Errorf("tetrazine + %s: %s", e, w)
			}
		}
		if pd := channel(p.SideChannels, SideProductDienophile); pd != nil && strings.Contains(pd.Note, "N=N") {
			t.Errorf("tetrazine + %s: product channel still on the bridged adduct: %s", e, pd.Note)
		}
	}
}

// TestOneRowPerProduct: symmetric partners list each compound once (cyclopentadiene +
// maleic anhydride: both orientations at the C=C give one adduct).
func TestOneRowPerProduct(t *testing.T) {
	for _, pr := range [][2]string{{"C1=CC=CC1", "O=C1OC(=O)C=C1"}, {"C=CC=C", "C=C"}, {"C1=CC=CC1", "O=C1C=CC(=O)C=C1"}} {
		p, _, _ := mustAnalyze(t, pr[0], pr[1])
		seen := map[string]bool{}
		for _, o := range p.Orientations {
			if seen[o.Product] {
				t.Errorf("%s + %s: %s listed twice", pr[0], pr[1], o.Product)
			}
			seen[o.Product] = true
		}
	}
}

// TestStereoProducts: endo and exo adducts are two different stereo SMILES where the
// dienophile has an endo/exo question, the endo one is marked preferred when the endo term
// favours it (cyclopentadiene + maleic anhydride: endo, K. Alder, G. Stein, Justus Liebigs
// Ann. Chem. 1937; any textbook; from memory), one compound where they coincide
// (butadiene + dimethyl maleate gives the meso cis diester either way; dimethyl fumarate the
// racemic trans diester either way: the stereospecific cis addition, from memory), and
// cis and trans dienophiles give different products.
func TestStereoProducts(t *testing.T) {
	p, _, _ := mustAnalyze(t, "C1=CC=CC1", "O=C1OC(=O)C=C1")
	sp := p.Orientations[0].StereoProducts
	if len(sp) != 2 || sp[0].Approach != ApproachEndo || !sp[0].Preferred || sp[1].Preferred || sp[0].SMILES == sp[1].SMILES {
		t.Fatalf("cyclopentadiene + maleic anhydride: %+v; want endo (preferred) and exo, different", sp)
	}
	if canonOf(t, sp[0].SMILES) != p.Orientations[0].Product {
		t.Errorf("endo SMILES %s is not the adduct %s", sp[0].SMILES, p.Orientations[0].Product)
	}
	cis, _, _ := mustAnalyze(t, "C=CC=C", `COC(=O)/C=C\C(=O)OC`)
	trans, _, _ := mustAnalyze(t, "C=CC=C", `COC(=O)/C=C/C(=O)OC`)
	c, tr := cis.Orientations[0].StereoProducts, trans.Orientations[0].StereoProducts
	if len(c) != 1 || c[0].Approach != ApproachSame || len(tr) != 1 || tr[0].Approach != ApproachSame {
		t.Fatalf("maleate %+v, fumarate %+v; want one compound each", c, tr)
	}
	if c[0].SMILES == tr[0].SMILES {
		t.Errorf("maleate and fumarate give the same stereo adduct %s", c[0].SMILES)
	}
}

var dumpStereo = flag.Bool("dumpstereo", false, "write testdata/stereo_ours.tsv for scripts/gen_stereo_fixture.py")

// stereoPairs are cyclic dienes with dienophiles that have an endo/exo question; the RDKit
// check decides endo/exo from a 3D embedding (see scripts/gen_stereo_fixture.py).
var stereoPairs = [][2]string{
	{"C1=CC=CC1", "O=C1OC(=O)C=C1"},
	{"C1=CC=CC1", "C=CC(=O)OC"},
	{"C1=CC=CC1", "C=CC=O"},
	{"C1=CC=CC1", "C=CC#N"},
	{"C1=CC=CC1", "O=C1C=CC(=O)C=C1"},
	{"C1=CC=CCC1", "O=C1OC(=O)C=C1"},
	{"C1=COC=C1", "O=C1OC(=O)C=C1"},
	{"C1=CC=CC1", "O=C1C=CC(=O)N1c1ccccc1"},
}

// stereoDump returns, per pair and approach, a line: diene, dienophile, approach, our
// stereo adduct written with atom maps (1 = interior atoms of the diene unit, 2 = diene
// atoms on the ring through both termini outside the unit (the bridge), 3 = the
// dienophile's atoms outside its 2π unit), and our canonical stereo SMILES.
func stereoDump(t *testing.T) []string {
	o := testOptions(t)
	var lines []string
	for _, pr := range stereoPairs {
		d := mustPartner(t, pr[0], RoleDiene, o)
		e := mustPartner(t, pr[1], RoleDienophile, o)
		p, err := Analyze(d, e, o)
		if err != nil {
			t.Fatal(err)
		}
		best := p.Orientations[0]
		di := slices.IndexFunc(d.Units, func(u Unit) bool { return slices.Equal(u.Atoms, best.DieneAtoms) })
		ei := slices.IndexFunc(e.Units, func(u Unit) bool { return sameAtoms(u.Atoms, best.DienophileAtoms) })
		if di < 0 || ei < 0 {
			t.Fatalf("%s + %s: units not found", pr[0], pr[1])
		}
		or := 0
		if e.Units[ei].Atoms[0] != best.DienophileAtoms[0] {
			or = 1
		}
		pm, bonds := buildProduct(d, e, di, ei, or)
		du, eu := d.Units[di], e.Units[ei]
		off := len(d.Mol.Atoms)
		for _, endo := range []bool{true, false} {
			m := stereoAdduct(d, e, du, eu, bonds, pm, endo)
			rel := relativeStereo(m)
			for _, a := range du.Atoms[1 : len(du.Atoms)-1] {
				m.Atoms[a].Map = 1
			}
			a0, a1 := du.Termini()
			for i := range d.Mol.Atoms {
				if !slices.Contains(du.Atoms, i) && (d.Mol.BondBetween(i, a0) >= 0 || d.Mol.BondBetween(i, a1) >= 0) &&
					ringPath(d.Mol, i, a0, a1, du.Atoms[1:len(du.Atoms)-1]) {
					for _, j := range sideOfRing(d.Mol, i, du.Atoms) {
						m.Atoms[j].Map = 2
					}
				}
			}
			for i := range e.Mol.Atoms {
				if !slices.Contains(eu.Atoms, i) {
					m.Atoms[i+off].Map = 3
				}
			}
			appr := ApproachExo
			if endo {
				appr = ApproachEndo
			}
			lines = append(lines, strings.Join([]string{pr[0], pr[1], appr, smiles.Write(m), rel}, "\t"))
		}
	}
	return lines
}

// sideOfRing returns the atoms reached from s without entering the unit atoms: the bridge.
func sideOfRing(m *molecule.Molecule, s int, unit []int) []int {
	seen := map[int]bool{s: true}
	for _, u := range unit {
		seen[u] = true
	}
	out := []int{s}
	for q := 0; q < len(out); q++ {
		for _, e := range m.Neighbors(out[q]) {
			if !seen[e.To] && m.Atoms[e.To].Element != "H" {
				// stay on the ring: only atoms with a path back to the unit count
				seen[e.To] = true
				out = append(out, e.To)
			}
		}
	}
	return out
}

// TestStereoAgainstRDKit reads fmo/testdata/stereo_rdkit.tsv (scripts/gen_stereo_fixture.py
// with RDKit; the script's header says how): for every dumped adduct RDKit embedded our
// stereo SMILES in 3D and called it endo when the dienophile's substituent atoms lie nearer
// the diene's former interior atoms (the new C=C) than its bridge — the definition of endo
// in bicyclo[2.2.1]/[2.2.2] adducts (IUPAC Gold Book, "endo, exo, syn, anti"; from memory) —
// and checked that our canonical stereo SMILES is the same compound (or its mirror image:
// relative configuration). The test fails if our output drifted from what RDKit checked,
// so a change means rerunning the dump and the script.
func TestStereoAgainstRDKit(t *testing.T) {
	lines := stereoDump(t)
	if *dumpStereo {
		body := "# diene\tdienophile\tapproach\tmapped stereo adduct (ours)\tcanonical relative stereo SMILES (ours)\n" + strings.Join(lines, "\n") + "\n"
		if err := os.WriteFile("testdata/stereo_ours.tsv", []byte(body), 0o644); err != nil {
			t.Fatal(err)
		}
		t.Skip("dumped testdata/stereo_ours.tsv; run /usr/bin/python3 scripts/gen_stereo_fixture.py")
	}
	f, err := os.Open("testdata/stereo_rdkit.tsv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	sc := bufio.NewScanner(f)
	n := 0
	for sc.Scan() {
		line := sc.Text()
		if line == "" || strings.HasPrefix(line, "#") {
			continue
		}
		cols := strings.Split(line, "\t")
		if len(cols) != 7 {
			t.Fatalf("bad fixture line %q", line)
		}
		ours := strings.Join(cols[:5], "\t")
		if n >= len(lines) || lines[n] != ours {
			t.Fatalf("fixture line %d is not our current output:\n fixture %s\n ours    %s", n+1, ours, lines[min(n, len(lines)-1)])
		}
		if cols[5] != cols[2] {
			t.Errorf("%s + %s: our %s adduct %s is %s to RDKit", cols[0], cols[1], cols[2], cols[3], cols[5])
		}
		if cols[6] != "same" {
			t.Errorf("%s + %s %s: canonical %s is not the compound written as %s (RDKit: %s)", cols[0], cols[1], cols[2], cols[4], cols[3], cols[6])
		}
		n++
	}
	if n != len(lines) {
		t.Errorf("fixture has %d lines, we dump %d", n, len(lines))
	}
}
