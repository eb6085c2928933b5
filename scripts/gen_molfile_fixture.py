#!/usr/bin/python3
"""Build testdata/molfile/, the outside reference for the molfile/SD reader and writer.

Run from the repository root, in this order (the second step reads what the first wrote):

    go test ./huckel/molfile -run TestDumpWrite -dumpwrite
    /usr/bin/python3 scripts/gen_molfile_fixture.py

Needs Debian's RDKit (apt-get update && apt-get install -y python3-rdkit python3-numpy) and
the system interpreter /usr/bin/python3. Go tests never run this script; they read the
committed files. (The first step needs the molecule list this script wrote before; on a
fresh checkout with no fixture yet, run the script, the dump, then the script again.)

Molecules: the SMILES of testdata/smiles/rdkit_fixture.json that RDKit accepts (all the
charged, isotopic, atom-mapped and explicit-hydrogen ones, and every other one of the
rest, to keep the files small), plus the charged, isotopic and explicit-hydrogen SMILES in
EXTRA below. Each is parsed by RDKit (removeHs=False, so atoms keep the SMILES order and
explicit [H] atoms stay atoms) and written once by RDKit's Chem.SDWriter:

  rdkit_v2000.sdf   molecules with an even index, V2000
  rdkit_v3000.sdf   molecules with an odd index, V3000 (SetForceV3000)

In each file the records alternate between Kekulé bonds and aromatic bonds (type 4,
SetKekulize(False)): molecule i is written Kekulé when i//2 is even. The title line is the
name; one data item <id> holds "mol" + the index.

  rdkit_extra.sdf   hand-built V2000 records RDKit writers never produce: atoms without
                    the valence field across elements, charges -1..+1 and 0-4 single bonds
                    (the implicit-hydrogen model), mass differences for every element in
                    the reader's table, the D and T symbols, atom-block charge codes, and
                    radicals given four ways (RDKit must find the radical; our reader
                    rejects them)

rdkit_fixture.json records what RDKit reads from each record:
  molecules[i]: smiles, name, file and variant (kekule or aromatic), RDKit's canonical
    SMILES of the input (stereo removed), atoms (one token per atom: [isotope]Element
    hydrogens [charge] [:map], hydrogens = GetTotalNumHs(), not counting hydrogen atoms),
    bonds (one digit per bond: the orders of a Kekulé record of the molecule, read with
    sanitize=False, i.e. as RDKit wrote them), whether RDKit reads its own record back
    (MolFromMolBlock, sanitize=True) to the input's canonical SMILES ("rdkit_reads"), and
    what it gives or says when not ("rdkit_note"). atoms come from the Kekulé record, which
    RDKit always reads back;
  extra[k]: per atom the same token, or "x" where RDKit finds an impossible valence
    (read with sanitize=False, then Atom.UpdatePropertyCache(strict=True) per atom), and
    the atoms RDKit gives radical electrons;
  write[i]: our writer's record for molecule i (testdata/molfile/ours_write.sdf, dumped by
    the Go test, not committed): the first 16 hex digits of its SHA-256, and whether RDKit reads it back to the
    input's canonical SMILES (stereo removed) with the data items intact. The Go test
    fails when the writer no longer produces the bytes RDKit checked.
"""

import hashlib
import json
import os
import re
import sys

from rdkit import Chem, RDLogger, rdBase

rdBase.WrapLogs()
RDLogger.DisableLog("rdApp.*")

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
SMILES_FIXTURE = os.path.join(ROOT, "testdata", "smiles", "rdkit_fixture.json")
DIR = os.path.join(ROOT, "testdata", "molfile")
V2000 = os.path.join(DIR, "rdkit_v2000.sdf")
V3000 = os.path.join(DIR, "rdkit_v3000.sdf")
EXTRA_SDF = os.path.join(DIR, "rdkit_extra.sdf")
OURS = os.path.join(DIR, "ours_write.sdf")
OUT = os.path.join(DIR, "rdkit_fixture.json")

# charged, isotopic and explicit-hydrogen molecules beyond the SMILES fixture (names from
# memory)
EXTRA = [
    ("[NH4+].[Cl-]", "ammonium chloride"),
    ("C[N+](C)(C)C.[Br-]", "tetramethylammonium bromide"),
    ("[O-][n+]1ccccc1", "pyridine N-oxide"),
    ("C[n+]1ccccc1.[I-]", "N-methylpyridinium iodide"),
    ("[NH3+]CC(=O)[O-]", "glycine zwitterion"),
    ("F[B-](F)(F)F.CC[O+](CC)CC", "triethyloxonium tetrafluoroborate"),
    ("[BH4-].[Na+]", "sodium borohydride"),
    ("[S-]C#N.[K+]", "potassium thiocyanate"),
    ("C[S+](C)C.[I-]", "trimethylsulfonium iodide"),
    ("[O-][N+](=O)c1ccc(cc1)[N+](=O)[O-]", "1,4-dinitrobenzene"),
    ("C[C-](C#N)C#N.[Li+]", "lithiated methylmalononitrile"),
    ("[2H]C([2H])([2H])O", "methanol-d3"),
    ("[2H]c1c([2H])c([2H])c([2H])c([2H])c1[2H]", "benzene-d6"),
    ("[3H]O[3H]", "tritiated water"),
    ("[13CH3]C(=O)O", "acetic acid-2-13C"),
    ("C[13C](=O)O", "acetic acid-1-13C"),
    ("[15nH]1cccc1", "pyrrole-15N"),
    ("[18OH2]", "water-18O"),
    ("[H]n1cccc1", "pyrrole with explicit N-H"),
    ("[H]n1cnc2ccccc12", "benzimidazole with explicit N-H"),
    ("[H]C([H])=C([H])C=O", "acrolein with explicit hydrogens"),
    ("[CH2:1]=[CH:2][CH:3]=[CH2:4].[CH2:5]=[CH:6]C=O", "mapped butadiene and acrolein"),
]

# elements for the implicit-hydrogen grid and the mass-difference record
GRID = ["B", "C", "N", "O", "F", "Si", "P", "S", "Cl", "Ge", "As", "Se", "Br", "Sb", "Te", "I"]
MASS_DIFF = [
    "H", "He", "Li", "Be", "B", "C", "N", "O", "F", "Ne", "Na", "Mg", "Al", "Si", "P", "S", "Cl",
    "Ar", "K", "Ca", "Sc", "Ti", "V", "Cr", "Mn", "Fe", "Co", "Ni", "Cu", "Zn", "Ga", "Ge",
    "As", "Se", "Br", "Kr", "Rb", "Sr", "Y", "Zr", "Nb", "Mo", "Ru", "Rh", "Pd", "Ag", "Cd",
    "In", "Sn", "Sb", "Te", "I", "Xe", "Cs", "Ba", "La", "Ce", "Pr", "Nd", "Sm", "Eu", "Gd",
    "Tb", "Dy", "Ho", "Er", "Tm", "Yb", "Lu", "Hf", "Ta", "W", "Re", "Os", "Ir", "Pt", "Au",
    "Hg", "Tl", "Pb", "Bi", "Th", "U",
]


def smiles_params():
    p = Chem.SmilesParserParams()
    p.removeHs = False
    return p


def canonical(mol):
    mol = Chem.Mol(mol)
    Chem.RemoveStereochemistry(mol)
    return Chem.MolToSmiles(mol)


def token(a, h=None):
    """[isotope]Element hydrogens [charge] [:map] for one atom."""
    if h is None:
        h = a.GetTotalNumHs()
    t = ""
    if a.GetIsotope():
        t += str(a.GetIsotope())
    t += a.GetSymbol() + str(h)
    if a.GetFormalCharge():
        t += "%+d" % a.GetFormalCharge()
    if a.GetAtomMapNum():
        t += ":%d" % a.GetAtomMapNum()
    return t


def rdkit_message(fn):
    """Run fn with RDKit logging on; return its result and the message it logged."""
    import io
    from contextlib import redirect_stderr

    RDLogger.EnableLog("rdApp.*")
    buf = io.StringIO()
    try:
        with redirect_stderr(buf):
            res = fn()
    finally:
        RDLogger.DisableLog("rdApp.*")
    msg = " ".join(buf.getvalue().split())
    msg = re.sub(r"\[\d\d:\d\d:\d\d\] ?", "", msg)
    return res, msg


def split_records(text):
    recs = text.split("$$$$\n")
    return [r + "$$$$\n" for r in recs if r.strip()]


def molecules():
    with open(SMILES_FIXTURE, encoding="utf-8") as f:
        fx = json.load(f)
    out = []
    rest = 0
    for m in fx["molecules"]:
        if not m["rdkit_ok"]:
            continue
        special = any(a[1] or a[3] or a[4] or a[0] == "H" for a in m["atoms"])
        if not special:
            rest += 1
            if rest % 2 == 0:
                continue
        out.append((m["smiles"], m["name"]))
    return out + EXTRA


def kekule_variant(i):
    return (i // 2) % 2 == 0


def write_files(mols):
    """Write the two RDKit SD files; return every molecule's record text in index order."""
    texts = {}
    for path, parity, v3 in ((V2000, 0, False), (V3000, 1, True)):
        w = Chem.SDWriter(path)
        w.SetForceV3000(v3)
        idx = [i for i in range(len(mols)) if i % 2 == parity]
        for i in idx:
            smi, name, mol = mols[i]
            w.SetKekulize(kekule_variant(i))
            m = Chem.Mol(mol)
            m.SetProp("_Name", name)
            m.SetProp("id", "mol%d" % i)
            w.write(m)
        w.close()
        with open(path, encoding="utf-8") as f:
            recs = split_records(f.read())
        assert len(recs) == len(idx)
        texts.update(zip(idx, recs))
    return [texts[i] for i in range(len(mols))]


def extra_records():
    """Hand-built V2000 records: (title, molblock)."""
    recs = []

    def block(title, atoms, bonds, props=()):
        lines = [title, "  handmade", "", "%3d%3d  0  0  0  0  0  0  0  0999 V2000" % (len(atoms), len(bonds))]
        for el, dd, ccc, vvv in atoms:
            # atom lines end after the valence field (column 51), as some writers do
            lines.append("%10.4f%10.4f%10.4f %-3s%2d%3d  0  0  0%3d" % (0, 0, 0, el, dd, ccc, vvv))
        for a, b, t in bonds:
            lines.append("%3d%3d%3d  0" % (a, b, t))
        lines += list(props)
        lines.append("M  END")
        return "\n".join(lines) + "\n"

    # implicit hydrogens: element X with charge q and d single bonds to methyl carbons
    for el in GRID:
        atoms, bonds, chg = [], [], []
        for q in (-1, 0, 1):
            for d in range(5):
                atoms.append((el, 0, 0, 0))
                c = len(atoms)
                if q:
                    chg.append((c, q))
                for _ in range(d):
                    atoms.append(("C", 0, 0, 0))
                    bonds.append((c, len(atoms), 1))
        props = []
        for k in range(0, len(chg), 8):
            part = chg[k:k + 8]
            props.append("M  CHG%3d" % len(part) + "".join(" %3d %3d" % e for e in part))
        recs.append(("valence grid %s" % el, block("valence grid %s" % el, atoms, bonds, props)))
    # mass differences: +1 on even positions, -1 on odd ones
    atoms = [(el, -1 if k % 2 else 1, 0, 0) for k, el in enumerate(MASS_DIFF)]
    recs.append(("mass differences", block("mass differences", atoms, [])))
    # D and T symbols on one carbon, and an M  ISO line overriding a D
    recs.append(("D and T", block("D and T", [("C", 0, 0, 0), ("D", 0, 0, 0), ("T", 0, 0, 0), ("H", 0, 0, 0), ("D", 0, 0, 0)],
                                  [(1, 2, 1), (1, 3, 1), (1, 4, 1), (1, 5, 1)], ["M  ISO  1   5   1"])))
    # atom-block charge codes: N+ (3), O- (5), S2- (6), Fe3+ (1), Ca2+ (2), P3- (7)
    recs.append(("charge codes", block("charge codes",
                                       [("N", 0, 3, 0), ("C", 0, 0, 0), ("C", 0, 0, 0), ("C", 0, 0, 0), ("C", 0, 0, 0),
                                        ("O", 0, 5, 0), ("C", 0, 0, 0), ("S", 0, 6, 0), ("Fe", 0, 1, 0), ("Ca", 0, 2, 0), ("P", 0, 7, 0)],
                                       [(1, 2, 1), (1, 3, 1), (1, 4, 1), (1, 5, 1), (6, 7, 1)])))
    # M  CHG supersedes every atom-block charge: atom 1's code 3 is ignored
    recs.append(("M  CHG supersedes codes", block("M  CHG supersedes codes", [("N", 0, 3, 0), ("N", 0, 0, 0)], [], ["M  CHG  1   2   1"])))
    # radicals
    recs.append(("radical M  RAD", block("radical M  RAD", [("C", 0, 0, 0), ("C", 0, 0, 0)], [(1, 2, 1)], ["M  RAD  1   1   2"])))
    recs.append(("radical charge code 4", block("radical charge code 4", [("C", 0, 4, 0), ("C", 0, 0, 0)], [(1, 2, 1)])))
    recs.append(("radical by valence field", block("radical by valence field", [("C", 0, 0, 3), ("C", 0, 0, 0)], [(1, 2, 1)])))
    recs.append(("carbene M  RAD", block("carbene M  RAD", [("C", 0, 0, 0), ("C", 0, 0, 0)], [(1, 2, 1)], ["M  RAD  1   1   3"])))
    return recs


def read_extra(text):
    """RDKit's reading of a hand-built record: per-atom tokens ("x" for a bad valence) and
    the atoms with radical electrons (from the sanitised molecule, where RDKit assigns
    them)."""
    mol = Chem.MolFromMolBlock(text, sanitize=False, removeHs=False)
    toks = []
    for a in mol.GetAtoms():
        try:
            a.UpdatePropertyCache(strict=True)
            toks.append(token(a))
        except Exception:
            toks.append("x")
    radicals = []
    san = Chem.MolFromMolBlock(text, sanitize=True, removeHs=False)
    if san is not None:
        radicals = [a.GetIdx() for a in san.GetAtoms() if a.GetNumRadicalElectrons()]
    return toks, radicals


def main():
    mols = []
    for smi, name in molecules():
        mol = Chem.MolFromSmiles(smi, smiles_params())
        if mol is None:
            sys.exit("RDKit rejects " + smi)
        mols.append((smi, name, mol))
    texts = write_files(mols)
    out = []
    n_read = 0
    for i, (smi, name, mol) in enumerate(mols):
        kek = kekule_variant(i)
        rec = {"i": i, "smiles": smi, "name": name, "canonical": canonical(mol),
               "file": "v2000" if i % 2 == 0 else "v3000", "variant": "kekule" if kek else "aromatic"}
        block = texts[i]
        kek_block = block if kek else Chem.MolToMolBlock(mol, kekulize=True)
        raw = Chem.MolFromMolBlock(kek_block, sanitize=False, removeHs=False)
        rec["bonds"] = "".join(str(int(b.GetBondTypeAsDouble())) for b in raw.GetBonds())
        km = Chem.MolFromMolBlock(kek_block, sanitize=True, removeHs=False)
        if km is None or canonical(km) != rec["canonical"]:
            sys.exit("RDKit does not read its own Kekulé record of %s back" % smi)
        rec["atoms"] = " ".join(token(a) for a in km.GetAtoms())
        m, msg = rdkit_message(lambda: Chem.MolFromMolBlock(block, sanitize=True, removeHs=False))
        rec["rdkit_reads"] = m is not None and canonical(m) == rec["canonical"]
        if m is None:
            rec["rdkit_note"] = msg or "rejected"
        elif not rec["rdkit_reads"]:
            rec["rdkit_note"] = "reads another structure: " + canonical(m)
        else:
            n_read += 1
        out.append(rec)

    extra = extra_records()
    with open(EXTRA_SDF, "w", encoding="utf-8") as f:
        for _, text in extra:
            f.write(text + "$$$$\n")
    extra_out = []
    for title, text in extra:
        toks, radicals = read_extra(text)
        extra_out.append({"title": title, "atoms": " ".join(toks), "radicals": radicals})

    write_out = []
    n_write_ok = 0
    if os.path.exists(OURS):
        with open(OURS, encoding="utf-8") as f:
            ours = split_records(f.read())
        for text in ours:
            m, msg = rdkit_message(lambda: Chem.MolFromMolBlock(text, sanitize=True, removeHs=False))
            idx = re.search(r"^>  <fixture_index>\n(\d+)\n", text, re.M)
            i = int(idx.group(1)) if idx else -1
            entry = {"i": i, "sha256": hashlib.sha256(text.encode("utf-8")).hexdigest()[:16], "ok": False}
            if not 0 <= i < len(out):
                entry["note"] = "no fixture_index data item"
            elif m is None:
                entry["note"] = "RDKit rejects our record: " + (msg or "rejected")
            else:
                got = canonical(m)
                sup = Chem.SDMolSupplier()
                sup.SetData(text, sanitize=False, removeHs=False)
                pm = sup[0]
                ours_smiles = re.search(r"^>  <cyclopair_smiles>\n(.*)\n", text, re.M)
                props_ok = (pm is not None and ours_smiles is not None
                            and pm.HasProp("cyclopair_smiles") and pm.GetProp("cyclopair_smiles") == ours_smiles.group(1)
                            and pm.HasProp("fixture_index") and pm.GetProp("fixture_index") == str(i))
                if got != out[i]["canonical"]:
                    entry["note"] = "RDKit canonical of our record: " + got
                elif not props_ok or m.GetProp("_Name") != out[i]["name"][:80].rstrip():
                    entry["note"] = "title or data items not read back"
                else:
                    entry["ok"] = True
                    n_write_ok += 1
            write_out.append(entry)

    with open(OUT, "w", encoding="utf-8") as f:
        f.write("{\n")
        f.write('"generator": "scripts/gen_molfile_fixture.py",\n')
        f.write('"rdkit_version": %s,\n' % json.dumps(rdBase.rdkitVersion))
        f.write('"molecules": [\n')
        f.write(",\n".join(json.dumps(m, ensure_ascii=False, sort_keys=True) for m in out))
        f.write("\n],\n")
        f.write('"extra": [\n')
        f.write(",\n".join(json.dumps(m, ensure_ascii=False, sort_keys=True) for m in extra_out))
        f.write("\n],\n")
        f.write('"write": [\n')
        f.write(",\n".join(json.dumps(m, ensure_ascii=False, sort_keys=True) for m in write_out))
        f.write("\n]\n}\n")
    print("%d molecules (RDKit reads %d of its records back), %d hand-built records; our writer: %d records, RDKit agrees on %d"
          % (len(out), n_read, len(extra_out), len(write_out), n_write_ok), file=sys.stderr)


if __name__ == "__main__":
    main()
