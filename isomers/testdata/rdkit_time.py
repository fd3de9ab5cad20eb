# Reads SMILES, one per line, on stdin; parses and canonicalises each with
# RDKit and prints the seconds that took (excluding reading the input and
# starting Python) and the number of molecules. Used by
# BenchmarkAgainstRDKit in the isomers package.
import sys
import time

from rdkit import Chem, RDLogger

RDLogger.DisableLog("rdApp.*")
lines = sys.stdin.read().split("\n")
lines = [l for l in lines if l]
t0 = time.perf_counter()
for smi in lines:
    m = Chem.MolFromSmiles(smi)
    if m is not None:
        Chem.MolToSmiles(m)
t1 = time.perf_counter()
print("%.6f %d" % (t1 - t0, len(lines)))
