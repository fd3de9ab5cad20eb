# Reads "key<TAB>SMILES" lines on stdin and writes
# "key<TAB>RDKit canonical SMILES<TAB>RDKit formula" per line, or
# "key<TAB>!<TAB>error message" when RDKit cannot read the SMILES.
# Used by the isomers package tests (run with /usr/bin/python3, which has
# Debian's python3-rdkit).
import sys

from rdkit import Chem, RDLogger
from rdkit.Chem import rdMolDescriptors

RDLogger.DisableLog("rdApp.*")
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
    out.append(key + "\t" + Chem.MolToSmiles(mol) + "\t" + rdMolDescriptors.CalcMolFormula(mol))
sys.stdout.write("\n".join(out) + ("\n" if out else ""))
