# Reads lines "input<TAB>ours" from stdin; for each prints
# "ok<TAB>formula_ours<TAB>canon_input<TAB>canon_ours" or "err<TAB>message".
# Used by rdkit_test.go (RDKit cross-check of CanonicalSMILES).
import sys
from rdkit import Chem
from rdkit.Chem.rdMolDescriptors import CalcMolFormula
from rdkit import RDLogger
RDLogger.DisableLog("rdApp.*")
for line in sys.stdin:
    line = line.rstrip("\n")
    if not line:
        continue
    a, b = line.split("\t")
    ma = Chem.MolFromSmiles(a)
    mb = Chem.MolFromSmiles(b)
    if ma is None or mb is None:
        print("err\t%s" % ("input" if ma is None else "ours"))
        continue
    print("ok\t%s\t%s\t%s\t%s" % (CalcMolFormula(ma), CalcMolFormula(mb), Chem.MolToSmiles(ma), Chem.MolToSmiles(mb)))
