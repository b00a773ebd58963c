#!/usr/bin/env python3
"""Reference periods near the top of the well, for core/period's tests.

Computed with mpmath 1.3.0 (a general-purpose arbitrary-precision library) at
mp.dps = 40 significant digits; every value is checked by recomputing it at
50 digits, and the script stops if the two differ by more than 1e-18 (far below the 1e-16 of float64)
relative. The forms are evaluated in exact arithmetic from the float64
parameters (mpf(float) is exact), so the reference is the period of the
float64 parameter set, free of rounding.

For each well (Morse, Lennard-Jones 12-6, Buckingham exp-6; invented,
illustrative parameter sets, one Buckingham with a low inner barrier) the
script finds re (root of V'), V(re), the top of the well (the depth, or the
inner barrier when lower) and, for energies E = f * top rounded to float64
at the fractions f below, the turning points and

    I(E) = integral from r- to r+ of dr / sqrt(E - V(r) + V(re))   [A/sqrt(eV)],

so that T(E) = sqrt(2 mu) * I(E) in the time unit sqrt(u A^2/eV). The
integral is taken by tanh-sinh quadrature (mp.quad) over sub-intervals
that shrink geometrically towards both turning points (10^-k of the
distance to re, k = 1..30), which resolves the inverse square roots at the
ends and the near-double turning point next to an inner barrier.

Output: reference.json beside this script (CI does not run the script;
its output is committed). Run:  python3 make_reference.py
"""
import json
import os

from mpmath import mp, mpf, exp, sqrt, findroot, quad, diff

FRACTIONS = ["0.01", "0.1", "0.5", "0.9", "0.99", "0.999", "0.9999", "0.99999", "0.999999"]

FORMS = [
    # key, spec, parameters (float64)
    ("morse", "morse:De=4.7,a=2.0,re=0.74", [4.7, 2.0, 0.74]),
    ("lennard-jones", "lj:epsilon=0.0104,sigma=3.4", [0.0104, 3.4]),
    ("buckingham-low", "buckingham:A=1500,rho=0.3,C=136.86", [1500.0, 0.3, 136.86]),
    ("buckingham", "buckingham:A=1500,rho=0.3,C=25", [1500.0, 0.3, 25.0]),
]


def potential(key, p):
    p = [mpf(x) for x in p]
    if key == "morse":
        de, a, re = p
        return lambda r: de * ((1 - exp(-a * (r - re))) ** 2 - 1)
    if key == "lennard-jones":
        eps, sig = p
        return lambda r: 4 * eps * ((sig / r) ** 12 - (sig / r) ** 6)
    A, rho, C = p
    return lambda r: A * exp(-r / rho) - C / r ** 6


def dV(V, r):
    return diff(V, r)


def well(key, p, V):
    if key == "morse":
        re = mpf(p[2])
    elif key == "lennard-jones":
        re = mpf(2) ** (mpf(1) / 6) * mpf(p[1])
    else:
        re = findroot(lambda r: dV(V, r), mpf("2.1") if p[2] > 100 else mpf("1.5"))
    vre = V(re)
    top = -vre  # depth: V -> 0 at infinity for these forms
    rb = None
    if key.startswith("buckingham"):
        # inner maximum: root of V' below re, found from a scan
        lo = re * mpf("0.5")
        rs = [lo + (re - lo) * k / 400 for k in range(400)]
        for a, b in zip(rs, rs[1:]):
            if dV(V, a) > 0 and dV(V, b) < 0:
                rb = findroot(lambda r: dV(V, r), (a, b), solver="anderson")
                break
        if rb is not None:
            top = min(top, V(rb) - vre)
    return re, vre, top, rb


def turning(V, vre, E, lo, hi):
    f = lambda r: V(r) - vre - E
    return findroot(f, (lo, hi), solver="anderson")


def integral(V, vre, E, rm, rp, re):
    # r = r- + t^2 on [r-, re] and r = r+ - t^2 on [re, r+]: dr/sqrt(E - U)
    # becomes 2 dt / sqrt((E - U)/t^2), bounded at t = 0. The difference
    # E - U is taken with 60 extra digits, since tanh-sinh samples t down
    # to far below 1e-20.
    def side(r0, sgn, span):
        def g(t):
            t = max(t, mpf(10) ** (-mp.dps))  # the end itself: its limit
            with mp.extradps(60):
                u = E - V(r0 + sgn * t * t) + vre
                if u <= 0:
                    return mpf(0)
                return 2 * t / sqrt(u)
        top = sqrt(span)
        pts = [mpf(0)] + [top * mpf(10) ** (-mpf(k) / 2) for k in range(40, 0, -1)] + [top]
        return quad(g, pts, maxdegree=10)
    return side(rm, +1, re - rm) + side(rp, -1, rp - re)


def bracket(V, vre, E, re, direction, rb):
    # step outward until V - V(re) - E changes sign
    x = re
    step = mpf("1e-3") * re
    while True:
        nxt = x + direction * step
        if rb is not None and direction < 0 and nxt <= rb:
            return (rb, x)
        if V(nxt) - vre - E > 0:
            return (nxt, x) if direction < 0 else (x, nxt)
        x = nxt
        step *= 2


def compute(key, p, frac_strings):
    V = potential(key, p)
    re, vre, top, rb = well(key, p, V)
    rows = []
    for fs in frac_strings:
        E = mpf(float(mpf(fs) * top))  # the float64 energy of the test
        lo, hi = bracket(V, vre, E, re, -1, rb)
        rm = turning(V, vre, E, lo, hi)
        lo, hi = bracket(V, vre, E, re, +1, rb)
        rp = turning(V, vre, E, lo, hi)
        rows.append((fs, E, rm, rp, integral(V, vre, E, rm, rp, re)))
    return re, vre, top, rb, rows


def main():
    out = {"library": "mpmath " + __import__("mpmath").__version__, "digits": 40, "forms": []}
    for key, spec, p in FORMS:
        mp.dps = 40
        re, vre, top, rb, rows = compute(key, p, FRACTIONS)
        mp.dps = 50
        re2, _, top2, _, rows2 = compute(key, p, FRACTIONS)
        mp.dps = 40
        entry = {"key": key, "spec": spec, "params": p, "re": mp.nstr(re, 30), "v_re": mp.nstr(vre, 30),
                 "top": mp.nstr(top, 30), "rows": []}
        for (fs, E, rm, rp, I), (_, E2, _, _, I2) in zip(rows, rows2):
            assert E == E2
            rel = abs(I / I2 - 1)
            assert rel < mpf("1e-18"), (key, fs, rel)
            entry["rows"].append({"fraction": fs, "energy_ev": repr(float(E)),
                                  "inner": mp.nstr(rm, 30), "outer": mp.nstr(rp, 30),
                                  "integral": mp.nstr(I, 30)})
        out["forms"].append(entry)
        print(key, "done")
    path = os.path.join(os.path.dirname(os.path.abspath(__file__)), "reference.json")
    with open(path, "w") as f:
        json.dump(out, f, indent=1)
        f.write("\n")


if __name__ == "__main__":
    main()
