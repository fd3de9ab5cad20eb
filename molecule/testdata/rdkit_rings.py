# Reads one SMILES per line; prints "sssr_sizes<TAB>atom_min_ring_sizes"
# (comma-separated; sizes sorted; 0 for atoms in no ring) or "err".
# Used by rings_test.go (RDKit cross-check of Rings).
import sys
from rdkit import Chem
from rdkit import RDLogger
RDLogger.DisableLog("rdApp.*")
for line in sys.stdin:
    s = line.strip()
    if not s:
        continue
    m = Chem.MolFromSmiles(s)
    if m is None:
        print("err")
        continue
    ri = m.GetRingInfo()
    sizes = sorted(len(r) for r in Chem.GetSymmSSSR(m))
    mins = [ri.MinAtomRingSize(a.GetIdx()) for a in m.GetAtoms()]
    print("%s\t%s" % (",".join(map(str, sizes)), ",".join(map(str, mins))))
