#!/usr/bin/python3
"""Build testdata/smiles/rdkit_fixture.json, the outside reference for the SMILES reader.

Run from the repository root, in this order (the second step reads what the first wrote):

    go test ./huckel/smiles -run TestDumpWrite -dumpwrite
    /usr/bin/python3 scripts/gen_smiles_fixture.py

Needs Debian's RDKit (apt-get update && apt-get install -y python3-rdkit) and the system
interpreter /usr/bin/python3. Go tests never run this script; they read the committed JSON.

Input:  testdata/smiles/inputs.txt      SMILES<TAB>name per line, '#' comments
        testdata/smiles/ours_write.tsv  input<TAB>our Write(Parse(input)) or input<TAB>!error
Output: testdata/smiles/rdkit_fixture.json

For every input the fixture records what RDKit (Chem.MolFromSmiles with removeHs=False, so
atoms keep the input order, including explicit [H] atoms) finds: per atom the element,
formal charge, isotope, atom-map number and total attached hydrogens not written as atoms
(GetTotalNumHs()), the number of ring bonds, and RDKit's canonical SMILES with
stereochemistry removed (our reader drops chirality on purpose), and three random SMILES of
the same molecule (RDKit MolToRandomSmilesVect, fixed seed; two aromatic, one Kekulé) for the
test of our Canonical. Inputs RDKit rejects are recorded with rdkit_ok=false and its message.

The second part checks our writer: RDKit reads our Kekulé output for each input and the
fixture records whether its canonical SMILES (stereo removed) equals the canonical SMILES
of the input ("write_ok"). The Go test then asserts that Write still produces exactly the
string that was checked, so a change to the writer forces a re-run of both steps.
"""

import json
import os
import re
import sys

from rdkit import Chem, RDLogger, rdBase

rdBase.WrapLogs()  # RDKit messages go to Python's sys.stderr, so they can be captured
RDLogger.DisableLog("rdApp.*")

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
INPUTS = os.path.join(ROOT, "testdata", "smiles", "inputs.txt")
OURS = os.path.join(ROOT, "testdata", "smiles", "ours_write.tsv")
OUT = os.path.join(ROOT, "testdata", "smiles", "rdkit_fixture.json")


def read_inputs():
    out = []
    with open(INPUTS, encoding="utf-8") as f:
        for line in f:
            line = line.rstrip("\n")
            if not line.strip() or line.startswith("#"):
                continue
            smi, _, name = line.partition("\t")
            out.append((smi, name))
    return out


def parse(smi):
    params = Chem.SmilesParserParams()
    params.removeHs = False
    return Chem.MolFromSmiles(smi, params)


def canonical(mol):
    mol = Chem.Mol(mol)
    Chem.RemoveStereochemistry(mol)
    return Chem.MolToSmiles(mol)


def rdkit_error(smi):
    """Re-parse with logging on to capture RDKit's message."""
    import io
    from contextlib import redirect_stderr

    RDLogger.EnableLog("rdApp.*")
    buf = io.StringIO()
    try:
        with redirect_stderr(buf):
            parse(smi)
    finally:
        RDLogger.DisableLog("rdApp.*")
    msg = " ".join(buf.getvalue().split())
    msg = re.sub(r"\[\d\d:\d\d:\d\d\] ?", "", msg)  # drop RDKit's time stamps
    return msg or "rejected"


def main():
    inputs = read_inputs()
    ours = {}
    if os.path.exists(OURS):
        with open(OURS, encoding="utf-8") as f:
            for line in f:
                line = line.rstrip("\n")
                if line:
                    smi, _, w = line.partition("\t")
                    ours[smi] = w
    mols = []
    n_ok = n_write_ok = n_write_checked = 0
    for smi, name in inputs:
        rec = {"smiles": smi, "name": name}
        mol = parse(smi)
        if mol is None:
            rec["rdkit_ok"] = False
            rec["rdkit_error"] = rdkit_error(smi)
            mols.append(rec)
            continue
        n_ok += 1
        rec["rdkit_ok"] = True
        rec["canonical"] = canonical(mol)
        # the same molecule written from random atom orders (two aromatic, one Kekulé), for
        # the Go test that Canonical gives one string per molecule
        flat = Chem.Mol(mol)
        Chem.RemoveStereochemistry(flat)
        rnd = list(Chem.MolToRandomSmilesVect(flat, 2, randomSeed=20261202))
        kek = Chem.Mol(flat)
        Chem.Kekulize(kek, clearAromaticFlags=True)
        rnd += list(Chem.MolToRandomSmilesVect(kek, 1, randomSeed=20261202, kekuleSmiles=True))
        rec["random"] = rnd
        rec["ring_bonds"] = sum(1 for b in mol.GetBonds() if b.IsInRing())
        # per atom: [element, formal charge, total H not written as atoms, isotope, map]
        rec["atoms"] = [
            [a.GetSymbol(), a.GetFormalCharge(), a.GetTotalNumHs(), a.GetIsotope(), a.GetAtomMapNum()]
            for a in mol.GetAtoms()
        ]
        if smi in ours:
            w = ours[smi]
            rec["write"] = w
            if w.startswith("!"):
                rec["write_ok"] = False
                rec["write_note"] = "our reader rejected the input"
            else:
                n_write_checked += 1
                wm = parse(w)
                if wm is None:
                    rec["write_ok"] = False
                    rec["write_note"] = "RDKit rejects our output: " + rdkit_error(w)
                else:
                    got = canonical(wm)
                    rec["write_ok"] = got == rec["canonical"]
                    if not rec["write_ok"]:
                        rec["write_note"] = "RDKit canonical of our output: " + got
                    else:
                        n_write_ok += 1
        mols.append(rec)
    with open(OUT, "w", encoding="utf-8") as f:
        f.write("{\n")
        f.write('"generator": "scripts/gen_smiles_fixture.py",\n')
        f.write('"rdkit_version": %s,\n' % json.dumps(rdBase.rdkitVersion))
        f.write('"molecules": [\n')
        f.write(",\n".join(json.dumps(m, ensure_ascii=False, sort_keys=True) for m in mols))
        f.write("\n]\n}\n")
    print(
        f"{len(mols)} inputs, RDKit accepted {n_ok}; our writer checked on {n_write_checked}, "
        f"RDKit agrees on {n_write_ok}",
        file=sys.stderr,
    )


if __name__ == "__main__":
    main()
