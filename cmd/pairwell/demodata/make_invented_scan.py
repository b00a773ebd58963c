#!/usr/bin/env python3
"""Writes invented-scan.csv, the INVENTED energy scan of pairwell's demo.

No real molecule and no quantum-chemistry program is behind it: the curve is
an extended-Rydberg function V(r) = -De (1 + a1 p + a2 p^2 + a3 p^3) exp(-a1 p),
p = r - re, with the demo bond's re = 1.20 A, De = 4.00 eV and k = 30 eV/A^2
(k = De (a1^2 - 2 a2) with a1 = 3.0 /A, a2 = 0.75 /A^2) and an invented cubic
a3 = 0.40 /A^3, plus an invented constant E_atoms = -460.80 hartree, written in
bohr and hartree rounded to 1e-8 hartree as a scan printout would be.
CODATA 2018: a0 = 0.529177210903 A, Eh = 27.211386245988 eV.
Run: python3 make_invented_scan.py > invented-scan.csv
"""
import math

A0, EH = 0.529177210903, 27.211386245988
RE, DE, A1, A2, A3 = 1.20, 4.00, 3.0, 0.75, 0.40
E_ATOMS = -460.80

def v(r):
    p = r - RE
    return -DE * (1 + A1 * p + A2 * p * p + A3 * p ** 3) * math.exp(-A1 * p)

rs = [0.85 + 0.025 * i for i in range(22)] + [1.40 + 0.1 * i for i in range(16)] + [3.2, 3.6, 4.0, 5.0, 6.0, 8.0]
print("# INVENTED energy scan for the pairwell demo: not a real molecule, not computed by any")
print("# electronic-structure program. An extended-Rydberg curve (re = 1.20 A, De = 4.00 eV,")
print("# k = 30 eV/A^2) on an invented absolute scale; see make_invented_scan.py.")
print("r_bohr,energy_hartree")
for r in rs:
    print(f"{r / A0:.6f},{E_ATOMS + v(r) / EH:.8f}")
