#!/usr/bin/python3
"""Read cyclopair's SD output back with RDKit and record the verdict (issue 12).

Run from the repository root, in this order (the second step reads what the first wrote):

    go test ./cmd/cyclopair -run TestSDFOutput -update
    /usr/bin/python3 scripts/check_sdf_output.py

Needs Debian's RDKit (apt-get update && apt-get install -y python3-rdkit python3-numpy) and
the system interpreter /usr/bin/python3. Go tests never run this script: TestSDFOutput
checks that the committed samples are still what the writer produces and that the verdict
below says RDKit read every record.

Samples: testdata/sdf/screen_small.sdf ('cyclopair screen small.yaml --format sdf' in
testdata/screen) and testdata/sdf/pair_cp_ma.sdf ('cyclopair pair --diene cyclopentadiene
--dienophile maleic-anhydride --activate none,lewis --format sdf').

For each record RDKit's SDMolSupplier (sanitize=True) must return a molecule; the record
must carry 2D coordinates (a conformer, not all atoms at one point, z = 0); its canonical
SMILES must equal RDKit's canonical SMILES of the record's cyclopair_product item (or of
"diene.dienophile" for a partners record), i.e. the structure written is the structure
the row names; and every data item must read back with the name and value written.
Output: testdata/sdf/rdkit_readback.json, with the SHA-256 of each sample checked, so a
sample rewritten after the check is noticed by the Go test.
"""
import hashlib
import json
from rdkit import Chem

FILES = ["testdata/sdf/screen_small.sdf", "testdata/sdf/pair_cp_ma.sdf"]


def expected_props(path):
    """The data items as written, per record, parsed naively from the text."""
    recs, cur, name = [], {}, None
    with open(path) as f:
        lines = f.read().split("\n")
    i = 0
    while i < len(lines):
        l = lines[i]
        if l.startswith("$$$$"):
            recs.append(cur)
            cur = {}
        elif l.startswith(">  <"):
            name = l[4:l.index(">", 4)]
            i += 1
            val = []
            while i < len(lines) and lines[i] != "":
                val.append(lines[i])
                i += 1
            cur[name] = "\n".join(val)
        i += 1
    return recs


out = {"rdkit_version": Chem.rdBase.rdkitVersion, "files": []}
for path in FILES:
    props = expected_props(path)
    sup = Chem.SDMolSupplier(path, sanitize=True, removeHs=False)
    recs = []
    for idx, m in enumerate(sup):
        r = {"record": idx + 1, "parsed": m is not None}
        if m is not None:
            conf = m.GetConformer() if m.GetNumConformers() else None
            pts = [conf.GetAtomPosition(a) for a in range(m.GetNumAtoms())] if conf else []
            r["coords_2d"] = bool(pts) and len({(round(p.x, 3), round(p.y, 3)) for p in pts}) == len(pts) and all(p.z == 0 for p in pts)
            want = props[idx]
            smi = want.get("cyclopair_product") or (want.get("cyclopair_diene", "") + "." + want.get("cyclopair_dienophile", ""))
            ref = Chem.MolFromSmiles(smi)
            r["title"] = m.GetProp("_Name")
            r["canonical"] = Chem.MolToSmiles(m)
            r["structure_agrees"] = ref is not None and Chem.MolToSmiles(ref) == r["canonical"]
            got = {k: m.GetProp(k) for k in m.GetPropNames()}
            r["props_agree"] = got == want
            r["props"] = len(got)
        recs.append(r)
    ok = all(r["parsed"] and r["coords_2d"] and r["structure_agrees"] and r["props_agree"] for r in recs)
    with open(path, "rb") as f:
        digest = hashlib.sha256(f.read()).hexdigest()
    out["files"].append({"file": path, "sha256": digest, "records": len(recs), "all_ok": ok, "results": recs})

with open("testdata/sdf/rdkit_readback.json", "w") as f:
    json.dump(out, f, indent=1, sort_keys=True)
    f.write("\n")
for fe in out["files"]:
    print(fe["file"], fe["records"], "records, all ok:", fe["all_ok"])
