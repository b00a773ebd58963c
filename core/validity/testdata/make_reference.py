#!/usr/bin/env python3
"""Reference limits of the potential criterion, for core/validity's tests.

Computed with mpmath 1.3.0 (a general-purpose arbitrary-precision library) at
mp.dps = 40 significant digits, and checked by recomputing at 50 (the script
stops if the two differ by more than 1e-20 relative). The forms are evaluated
in exact arithmetic from their float64 parameters (mpf(float) is exact).

For a form, a truncation order N and a tolerance tau, the limit on each side
is the smallest displacement s > 0 (x = -s compression, x = +s stretch) where

    |V_N(re + x) - V(re + x)| = tau * (V(re + x) - V(re)),
    V_N(re + x) = sum_{k=0}^{N} c_k x^k,  c_k = V^(k)(re)/k!,

with re the exact minimum and c_k from mpmath's diff. The crossing is
bracketed by a geometric scan from s = 1e-9 A (ratio 1.01) and refined by
bisection. Parameter sets are invented and illustrative; the Buckingham set
is the one `pairwell compare --match re=2,De=1,k=0.05` derives (printed
float64 values).

It also gives the period-criterion limit of the matched Buckingham at order 2
(see PERIOD_CASES), at 30 and 36 digits (agreeing to 1e-14, set by the root
solver; far below the 1e-9 the test asks).

Output: reference.json beside this script (CI does not run the script; its
output is committed). Run:  python3 make_reference.py
"""
import json
import os

from mpmath import mp, mpf, exp, findroot, diff, factorial, quad, sqrt

CASES = [
    # key, spec, parameters, order, tolerance
    ("morse", "morse:De=4.7,a=2.0,re=0.74", [4.7, 2.0, 0.74], 2, 1e-4),
    ("morse", "morse:De=4.7,a=2.0,re=0.74", [4.7, 2.0, 0.74], 2, 5e-5),
    ("morse", "morse:De=4.7,a=2.0,re=0.74", [4.7, 2.0, 0.74], 2, 1e-6),
    ("morse", "morse:De=4.7,a=2.0,re=0.74", [4.7, 2.0, 0.74], 4, 1e-4),
    ("lennard-jones", "lj:epsilon=0.0104,sigma=3.4", [0.0104, 3.4], 2, 1e-5),
    ("buckingham", "buckingham:A=6579.873925314489,rho=0.28551925944331363,C=446.17267673956303",
     [6579.873925314489, 0.28551925944331363, 446.17267673956303], 2, 0.01),
    ("buckingham", "buckingham:A=6579.873925314489,rho=0.28551925944331363,C=446.17267673956303",
     [6579.873925314489, 0.28551925944331363, 446.17267673956303], 3, 0.01),
]


def potential(key, p):
    p = [mpf(x) for x in p]
    if key == "morse":
        de, a, re = p
        return lambda r: de * ((1 - exp(-a * (r - re))) ** 2 - 1), re
    if key == "lennard-jones":
        eps, sig = p
        return lambda r: 4 * eps * ((sig / r) ** 12 - (sig / r) ** 6), mpf(2) ** (mpf(1) / 6) * sig
    A, rho, C = p
    V = lambda r: A * exp(-r / rho) - C / r ** 6
    return V, None


def limits(key, p, n, tol):
    V, re = potential(key, p)
    if re is None:
        re = findroot(lambda r: diff(V, r), mpf(2))
    c = [diff(V, re, k) / factorial(k) for k in range(n + 1)]
    c[1] = mpf(0)
    vre = V(re)
    out = []
    for sgn in (-1, 1):
        def g(s):
            x = sgn * s
            v = V(re + x)
            vn = sum(c[k] * x ** k for k in range(n + 1))
            return abs(vn - v) - mpf(tol) * (v - vre)
        s = mpf("1e-9")
        while g(s * mpf("1.01")) <= 0:
            s *= mpf("1.01")
        lo, hi = s, s * mpf("1.01")
        for _ in range(200):
            mid = (lo + hi) / 2
            if g(mid) <= 0:
                lo = mid
            else:
                hi = mid
        out.append(lo)
    return re, out


# The period criterion at order 2: the smallest E > 0 where
# |T0/T(E) - 1| = tau, T0 = 2 pi sqrt(mu/k) the harmonic period, for the
# matched Buckingham (the ratio does not depend on mu). T(E) = sqrt(2 mu) I(E)
# with I(E) = integral of dr/sqrt(E - V + V(re)) between the turning points,
# by tanh-sinh quadrature in t (r = r-/+ -/+ t^2 next to each end), as in
# core/period/testdata/make_reference.py; the root in E by the Anderson-
# Bjorck bracketing solver.
PERIOD_CASES = [
    ("buckingham", "buckingham:A=6579.873925314489,rho=0.28551925944331363,C=446.17267673956303",
     [6579.873925314489, 0.28551925944331363, 446.17267673956303], 0.01, ("2e-9", "8e-9")),
]


def period_integral(V, vre, E, re):
    def turning(direction):
        x, step = re, mpf("1e-6")
        while V(x + direction * step) - vre - E < 0:
            x, step = x + direction * step, step * 2
        a, b = sorted((x, x + direction * step))
        return findroot(lambda r: V(r) - vre - E, (a, b), solver="anderson")
    rm, rp = turning(-1), turning(+1)

    def side(r0, sgn, span):
        def g(t):
            t = max(t, mpf(10) ** (-mp.dps))
            with mp.extradps(60):
                u = E - V(r0 + sgn * t * t) + vre
                if u <= 0:
                    return mpf(0)
                return 2 * t / sqrt(u)
        top = sqrt(span)
        pts = [mpf(0)] + [top * mpf(10) ** (-mpf(k) / 2) for k in range(24, 0, -1)] + [top]
        return quad(g, pts, maxdegree=8)
    return side(rm, +1, re - rm) + side(rp, -1, rp - re)


def period_limit(key, p, tol, bracket):
    V, re = potential(key, p)
    if re is None:
        re = findroot(lambda r: diff(V, r), mpf(2))
    vre = V(re)
    i0 = 2 * mp.pi / sqrt(2 * diff(V, re, 2))
    f = lambda E: 1 - i0 / period_integral(V, vre, E, re) - mpf(tol)
    return findroot(f, (mpf(bracket[0]), mpf(bracket[1])), solver="anderson")


def main():
    out = {"library": "mpmath " + __import__("mpmath").__version__, "digits": 40, "cases": []}
    for key, spec, p, n, tol in CASES:
        mp.dps = 40
        re, (comp, stre) = limits(key, p, n, tol)
        mp.dps = 50
        _, (comp2, stre2) = limits(key, p, n, tol)
        mp.dps = 40
        for a, b in ((comp, comp2), (stre, stre2)):
            assert abs(a / b - 1) < mpf("1e-20"), (spec, n, tol, a, b)
        out["cases"].append({"key": key, "spec": spec, "order": n, "tolerance": tol, "re": mp.nstr(re, 30),
                             "compression_angstrom": mp.nstr(comp, 30), "stretch_angstrom": mp.nstr(stre, 30)})
        print(spec, n, tol, mp.nstr(comp, 15), mp.nstr(stre, 15))
    out["period_cases"] = []
    for key, spec, p, tol, br in PERIOD_CASES:
        mp.dps = 30
        e1 = period_limit(key, p, tol, br)
        mp.dps = 36
        e2 = period_limit(key, p, tol, br)
        assert abs(e1 / e2 - 1) < mpf("1e-14"), (spec, e1, e2)  # the root solver stops near 1e-16
        out["period_cases"].append({"key": key, "spec": spec, "order": 2, "tolerance": tol,
                                    "energy_ev": mp.nstr(e2, 25), "digits": 36})
        print(spec, "period", mp.nstr(e2, 15))
    path = os.path.join(os.path.dirname(os.path.abspath(__file__)), "reference.json")
    with open(path, "w") as f:
        json.dump(out, f, indent=1)
        f.write("\n")


if __name__ == "__main__":
    main()
