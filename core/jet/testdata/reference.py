#!/usr/bin/env python3
"""Reference Taylor coefficients for the tests of package jet.

Library: mpmath 1.3.0 (python3), working precision 60 significant decimal
digits; every coefficient is computed twice (mp.dps = 60 and mp.dps = 80) and
the script stops unless both agree to 40 significant digits. Output: 25
significant digits.

Each output line is

    FUNC X0 P K COEFF

with COEFF = f^(K)(X0)/K! for K = 0..30, where f is exp, log, sin, cos, tanh,
erf, sqrt or pow (f(x) = x^P; P is 0 for the others). X0 and P are written
with Python's repr, so that they are the same binary64 numbers in Go; mpmath
converts a Python float to mpf exactly.

Run from this directory:  python3 reference.py > reference.txt
"""
import mpmath
from mpmath import mp, mpf

ORDER = 30

CASES = [
    ("exp", [-2.5, 0.3, 4.0], [0.0]),
    ("log", [0.2, 1.7, 25.0], [0.0]),
    ("sin", [0.7, 2.5, -4.2], [0.0]),
    ("cos", [0.7, 2.5, -4.2], [0.0]),
    ("tanh", [0.3, -1.2, 3.5], [0.0]),
    ("erf", [0.2, -0.9, 2.3], [0.0]),
    ("sqrt", [0.04, 2.0, 9.5], [0.0]),
    ("pow", [1.3, 0.8, 2.0, 3.0, 0.5], None),
]
POW = {1.3: [2.5], 0.8: [-1.5], 2.0: [1.0 / 3.0], 3.0: [-12.0], 0.5: [7.0, -0.75]}


def func(name, p):
    if name == "pow":
        return lambda x: mpmath.power(x, mpf(p))
    return getattr(mpmath, name)


def coeffs(name, x0, p, dps):
    with mp.workdps(dps):
        return mpmath.taylor(func(name, p), mpf(x0), ORDER)


def main():
    print("# f^(k)(x0)/k! by mpmath %s at 60 digits (checked at 80), 25 digits shown" % mpmath.__version__)
    print("# func x0 p k coeff")
    for name, xs, ps in CASES:
        for x0 in xs:
            for p in (ps if ps is not None else POW[x0]):
                lo = coeffs(name, x0, p, 60)
                hi = coeffs(name, x0, p, 80)
                for k in range(ORDER + 1):
                    with mp.workdps(80):
                        ref = hi[k]
                        err = abs(lo[k] - ref)
                        scale = abs(ref)
                        if err > mpf(10) ** -40 * max(scale, mpf(10) ** -300) and not (scale == 0 and err < mpf(10) ** -50):
                            raise SystemExit("disagreement %s %r %r %d" % (name, x0, p, k))
                    print("%s %r %r %d %s" % (name, x0, p, k, mpmath.nstr(lo[k], 25, min_fixed=1, max_fixed=0)))


if __name__ == "__main__":
    main()
