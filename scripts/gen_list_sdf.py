#!/usr/bin/python3
"""Write testdata/lists/*.sdf from the SMILES lists beside them, with RDKit.

Run from the repository root:

    /usr/bin/python3 scripts/gen_list_sdf.py

Needs Debian's RDKit (apt-get update && apt-get install -y python3-rdkit python3-numpy) and
the system interpreter /usr/bin/python3. Go tests never run this script; they read the
committed files.

For each line "SMILES name" of dienes.smi and dienophiles.smi, RDKit parses the SMILES (atom
order kept), computes 2D coordinates and writes one SD record: the title line is a
registry-style number ("CP-0001", ...), the data item <name> holds the name and <supplier>
an invented catalogue column (so a screen of the SD file with --name-field name must equal
the screen of the SMILES file, and other data items become notes). dienes.sdf is V2000,
dienophiles.sdf V3000 (SetForceV3000), so both connection-table versions are exercised.
"""
from rdkit import Chem
from rdkit.Chem import AllChem

DIR = "testdata/lists/"


def convert(src, dst, v3000, start):
    w = Chem.SDWriter(DIR + dst)
    w.SetForceV3000(v3000)
    n = start
    with open(DIR + src) as f:
        for line in f:
            line = line.strip()
            if not line or line.startswith("#"):
                continue
            smi, _, name = line.partition(" ")
            m = Chem.MolFromSmiles(smi)
            assert m is not None, smi
            AllChem.Compute2DCoords(m)
            m.SetProp("_Name", "CP-%04d" % n)
            m.SetProp("name", name.strip())
            m.SetProp("supplier", "example catalogue (invented)")
            w.write(m)
            n += 1
    w.close()
    return n


n = convert("dienes.smi", "dienes.sdf", False, 1)
convert("dienophiles.smi", "dienophiles.sdf", True, n)
