"""Reference ⟨r⟩_v and ⟨r²⟩_v of Morse oscillators, for levels_test.go.

Computed with mpmath 1.3.0 at 30 significant digits from the exact Morse
eigenfunctions (P. M. Morse, Phys. Rev. 34, 57 (1929)):

    χ_v ∝ z^s e^(−z/2) L_v^(2s)(z),  z = 2λ e^(−a(r−re)),  s = λ − v − ½,
    λ = √(2μDe)/(aħ),

so that r = re − ln(z/2λ)/a and |χ|² dr ∝ z^(2s−1) e^(−z) L² dz on z ∈ (0, ∞)
(the whole line r ∈ (−∞, ∞); the part r < 0 is below 1e-30 for the sets
used). Constants: CODATA 2018 (h, e exact; u = 1.66053906660e-27 kg).
Run: python3 morse_moments.py  (CI does not run it; the output is pasted
into levels_test.go).
"""
from mpmath import mp, mpf, sqrt, pi, quad, laguerre, exp, log, inf

mp.dps = 30
h = mpf("6.62607015e-34")
e = mpf("1.602176634e-19")
u = mpf("1.66053906660e-27")
hbar = h / (2 * pi)
c = hbar**2 / (2 * u * mpf("1e-20")) / e  # ħ²/(2·1 u) in eV·Å²

sets = [
    # name, De (eV), a (1/Å), re (Å), μ (u), levels
    ("hcl-like", "4.6", "1.87", "1.27", "0.98", [0, 1, 5, 10]),
    ("ar2-like", "0.0123", "1.7", "3.76", "19.98", [0, 1, 3]),
]
for name, De, a, re, mu, vs in sets:
    De, a, re, mu = mpf(De), mpf(a), mpf(re), mpf(mu)
    lam = sqrt(De / (c / mu)) / a
    for v in vs:
        s = lam - v - mpf(1) / 2
        w = lambda z: z ** (2 * s - 1) * exp(-z) * laguerre(v, 2 * s, z) ** 2
        r = lambda z: re - log(z / (2 * lam)) / a
        pts = [0, 2 * lam * mpf("0.01"), 2 * lam, 2 * lam * 4, inf]
        n = quad(w, pts)
        m1 = quad(lambda z: w(z) * r(z), pts) / n
        m2 = quad(lambda z: w(z) * r(z) ** 2, pts) / n
        print('{"%s", %d, %s, %s},' % (name, v, mp.nstr(m1, 20), mp.nstr(m2, 20)))
