#!/usr/bin/python3
"""Cross-check of core/atoms/data.go against an independent, older table.

The masses in data.go are AME2020 values written from memory, the weights
IUPAC 2021 values written from memory. This script compares them with the
tables of the periodictable package (Debian: python3-periodictable 1.6.0),
whose isotope masses come from an older mass evaluation, and checks that every
nuclide that package gives a natural abundance is in data.go. CI does not run
it (run it by hand: /usr/bin/python3 core/atoms/testdata/crosscheck.py).

Result when the table was written (2026-12-02):
  - every stable nuclide of the reference is present;
  - all masses agree within 4e-5 u; light nuclides (Z < 20) within 2e-6 u;
    the systematic shifts of 5e-6 to 2e-5 u for Z > 20 are the known
    re-evaluation between the older table and AME2003 onwards (e.g. 197Au
    196.966552 -> 196.96656879), and the single larger ones (78Kr, 110Pd,
    120Te, 126Xe, 130Ba, 136Ce, ...) are double-beta nuclides re-measured by
    Penning traps since;
  - weights agree within 3e-4 relative except Zn (65.409 -> 65.38, the 2007
    revision).
"""
import re
import sys

import periodictable as pt

src = open(__file__.rsplit("/", 2)[0] + "/data.go").read()
elements = re.findall(r'\{"(\w+)", (\d+), ([\d.]+)\}', src.split("var isotopes")[0])
isotopes = re.findall(r'\{"(\w+)", (\d+), ([\d.]+)\}', src.split("var isotopes")[1])
worst = 0.0
for sym, a, m in isotopes:
    el = getattr(pt, sym)
    try:
        ref = el[int(a)].mass
    except KeyError:
        continue
    d = abs(float(m) - ref)
    worst = max(worst, d)
    if d > 4e-5:
        print("mass differs:", a + sym, m, ref)
mine = {(s, int(a)) for s, a, _ in isotopes}
for el in pt.elements:
    if el.number == 0:
        continue
    for a in el.isotopes:
        if el[a].abundance > 0 and (el.symbol, a) not in mine:
            print("missing stable nuclide:", a, el.symbol)
for sym, z, w in elements:
    w = float(w)
    if pt.elements[int(z)].symbol != sym:
        print("symbol differs:", z, sym)
    if w and abs(w - pt.elements[int(z)].mass) / w > 3e-4:
        print("weight differs:", sym, w, pt.elements[int(z)].mass)
print("largest mass difference %.2g u" % worst)
sys.exit(0)
