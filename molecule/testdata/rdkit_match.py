# Reads lines "query<TAB>target"; prints "match<TAB>aromatic_flags" where
# match is 1 if RDKit finds the query (read as SMARTS) in the target and
# aromatic_flags has one 0/1 per target atom (RDKit aromaticity), or "err".
# Used by fragment_test.go (RDKit cross-check of Fragment.Matches).
import sys
from rdkit import Chem
from rdkit import RDLogger
RDLogger.DisableLog("rdApp.*")
for line in sys.stdin:
    line = line.rstrip("\n")
    if not line:
        continue
    q, t = line.split("\t")
    mq = Chem.MolFromSmarts(q)
    mt = Chem.MolFromSmiles(t)
    if mq is None or mt is None:
        print("err")
        continue
    flags = "".join("1" if a.GetIsAromatic() else "0" for a in mt.GetAtoms())
    print("%d\t%s" % (1 if mt.HasSubstructMatch(mq) else 0, flags))
