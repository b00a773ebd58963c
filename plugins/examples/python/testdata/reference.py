"""Reference values of the Linnett form for the Python plugin's tests.

Independent of the plugin: mpmath 1.3.0 at 50 digits differentiates
Linnett's own form V(r) = a/r^m − b·exp(−n·r) numerically (mpmath.taylor),
with a = A·re^m, b = B·exp(n·re), A = De·n·re/(m − n·re),
B = De·m/(m − n·re); it also finds the minimum and the outer maximum with
findroot. The output is pasted into plugins/python_test.go. Run with

    python3 plugins/examples/python/testdata/reference.py
"""
import mpmath as mp

mp.mp.dps = 50

# Invented, bond-sized parameters (the test's): De eV, re Å, m, n 1/Å.
De, re, m, n = mp.mpf("4.6"), mp.mpf("1.27"), mp.mpf(6), mp.mpf("2.5")
A = De * n * re / (m - n * re)
B = De * m / (m - n * re)
a = A * re**m
b = B * mp.exp(n * re)


def V(r):
    return a / r**m - b * mp.exp(-n * r)


def rep(r):
    return a / r**m


def att(r):
    return b * mp.exp(-n * r)


# c_k = V⁽ᵏ⁾(r)/k!, and the size of the two terms whose difference it is
# (|repulsion⁽ᵏ⁾| + |attraction⁽ᵏ⁾|)/k!, the scale of its rounding error.
order = 8
for r in ("0.9", "1.27", "1.6", "2.5", "4"):
    x = mp.mpf(r)
    cs = mp.taylor(V, x, order)
    scale = [abs(p) + abs(q) for p, q in zip(mp.taylor(rep, x, order), mp.taylor(att, x, order))]
    print("{%s, []float64{%s}, []float64{%s}}," % (
        r, ", ".join(mp.nstr(c, 17) for c in cs), ", ".join(mp.nstr(s, 3) for s in scale)))



def dV(r):
    return -m * a / r ** (m + 1) + n * b * mp.exp(-n * r)


# V′ > 0 between the minimum and the outer maximum, < 0 beyond: one root in
# each bracket.
def bisect(f, lo, hi):
    flo = f(lo)
    for _ in range(200):
        mid = (lo + hi) / 2
        if (f(mid) > 0) == (flo > 0):
            lo, flo = mid, f(mid)
        else:
            hi = mid
    return (lo + hi) / 2


rmin = bisect(dV, mp.mpf(1), mp.mpf(2))
print("minimum", mp.nstr(rmin, 20), mp.nstr(V(rmin), 20), mp.nstr(mp.diff(V, rmin, 2), 20))
rzero = bisect(V, mp.mpf(2), mp.mpf(50))
rmax = bisect(dV, mp.mpf(2), mp.mpf(50))
print("outer zero", mp.nstr(rzero, 20), "outer maximum", mp.nstr(rmax, 20), mp.nstr(V(rmax), 20))


def d2V(r):
    return m * (m + 1) * a / r ** (m + 2) - n * n * b * mp.exp(-n * r)


# The inflection point outside the minimum (V″ > 0 at re, < 0 at the outer
# zero) and the restoring force there, V′ at it.
rinf = bisect(d2V, rmin, rzero)
print("inflection", mp.nstr(rinf, 20), "max restoring force", mp.nstr(dV(rinf), 20))
