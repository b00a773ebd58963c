#!/usr/bin/env python3
"""Reference derivatives of the Varshni form for core/formula's tests.

V(r) = De*(1 - (re/r)*exp(-beta*(r^2 - re^2)))^2 - De
(Y. P. Varshni, Rev. Mod. Phys. 29, 664 (1957)), De = 4.6 eV, re = 1.27 A,
beta = 0.5 1/A^2.

Library: mpmath 1.3.0 (python3), mp.dps = 50 significant digits; the
derivatives d^n V/dr^n, n = 1..8, are mpmath.diff of the closed form,
checked against a second evaluation at mp.dps = 70 (agreement to 35 digits
required). Output: 25 significant digits, one line "R N VALUE" each.

Run from this directory:  python3 varshni.py > varshni.txt
"""
import mpmath
from mpmath import mp, mpf

RS = [0.9, 1.1, 1.27, 1.5, 2.0, 3.0]


def v(r):
    De, re, beta = mpf(4.6), mpf(1.27), mpf(0.5)
    return De * (1 - (re / r) * mpmath.exp(-beta * (r**2 - re**2)))**2 - De


def main():
    print("# d^n V/dr^n of the Varshni form by mpmath %s at 50 digits (checked at 70), 25 digits shown" % mpmath.__version__)
    print("# r n value (eV/A^n)")
    for r in RS:
        for n in range(1, 9):
            with mp.workdps(50):
                lo = mpmath.diff(v, mpf(r), n)
            with mp.workdps(70):
                hi = mpmath.diff(v, mpf(r), n)
                if abs(lo - hi) > mpf(10)**-35 * max(abs(hi), 1):
                    raise SystemExit("disagreement at r=%r n=%d" % (r, n))
            print("%r %d %s" % (r, n, mpmath.nstr(lo, 25, min_fixed=1, max_fixed=0)))


if __name__ == "__main__":
    main()
