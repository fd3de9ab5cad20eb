# Reads "key<TAB>SMILES" lines on stdin and writes, per line,
# "key<TAB>canonical<TAB>exo<TAB>variants": RDKit's canonical SMILES of the
# input; exo = 1 if RDKit perceives an aromatic atom that carries an
# exocyclic (non-ring) double bond (RDKit counts such a ring carbon as a
# π donor: 1 electron for C=C, 0 for C=O, C=N); variants = the canonical
# SMILES after N random renumberings of the input's atoms (argument
# --orders N, default 0), comma-separated, the first being the canonical
# SMILES of the input order. An unreadable SMILES gives
# "key<TAB>!<TAB>message". Used by the isomers package tests (run with
# /usr/bin/python3, which has Debian's python3-rdkit).
import random
import sys

from rdkit import Chem, RDLogger

RDLogger.DisableLog("rdApp.*")
orders = 0
if len(sys.argv) == 3 and sys.argv[1] == "--orders":
    orders = int(sys.argv[2])


def exocyclic_donor(mol):
    for b in mol.GetBonds():
        if b.GetBondType() != Chem.BondType.DOUBLE or b.IsInRing():
            continue
        if b.GetBeginAtom().GetIsAromatic() or b.GetEndAtom().GetIsAromatic():
            return True
    return False


out = []
for line in sys.stdin:
    line = line.rstrip("\n")
    if not line:
        continue
    key, smi = line.split("\t", 1)
    mol = Chem.MolFromSmiles(smi)
    if mol is None:
        out.append(key + "\t!\tcannot parse " + smi)
        continue
    canon = Chem.MolToSmiles(mol)
    variants = [canon]
    rng = random.Random(smi)  # seeded by the input, so the result does not depend on the order of the inputs
    for _ in range(orders):
        raw = Chem.MolFromSmiles(smi, sanitize=False)
        perm = list(range(raw.GetNumAtoms()))
        rng.shuffle(perm)
        raw = Chem.RenumberAtoms(raw, perm)
        Chem.SanitizeMol(raw)
        variants.append(Chem.MolToSmiles(raw))
    out.append("\t".join([key, canon, "1" if exocyclic_donor(mol) else "0", ",".join(variants)]))
sys.stdout.write("\n".join(out) + ("\n" if out else ""))
