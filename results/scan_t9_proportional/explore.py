#!/usr/bin/env python3
"""Certify c_9(An+B) against sc_17(A'n+B') on progression pairs where the
proportional CONSTANT route can apply (src/progression/certify.hpp, route 1'):
X_G = lam*X_F exactly, i.e. A' = lam*A and B' = lam*(B + 10/3) - 12, for
A in {34, 68, 102, 136} (17 | A so that v_17(X) can be fixed), every B < A, and
lam = a/b with 1 <= a, b <= 12, A' <= 1000. Writes constants.csv (one row per pair).
Usage: explore.py PATH/TO/circlet > constants.csv"""
import fractions, json, subprocess, sys

F = fractions.Fraction
circlet = sys.argv[1] if len(sys.argv) > 1 else "build/circlet"
version = subprocess.run([circlet, "--version"], capture_output=True, text=True).stdout.strip()
print("# %s | results/scan_t9_proportional/explore.py %s | each row: circlet certify c9 sc17 --ap A,B --ap2 A2,B2" % (version, circlet))
print("A,B,A2,B2,verdict,constant,integer,reason")
lams = sorted(set(F(a, b) for a in range(1, 13) for b in range(1, 13)))
for A in [34, 68, 102, 136]:
    for B in range(A):
        bF = F(B) + F(10, 3)
        for lam in lams:
            A2 = lam * A
            B2 = lam * bF - 12
            if A2.denominator != 1 or A2 > 1000 or B2.denominator != 1 or B2 < 0:
                continue
            out = subprocess.run([circlet, "certify", "c9", "sc17", "--ap", "%d,%d" % (A, B),
                                  "--ap2", "%d,%d" % (A2, B2)], capture_output=True, text=True, check=True).stdout
            j = json.loads(out)
            const = j.get("constant", {})
            print("%d,%d,%d,%d,%s,%s,%s,\"%s\"" % (A, B, A2, B2, j["verdict"], const.get("value", ""),
                  const.get("contains_integer", ""), j["reason"].replace('"', "'")))
