# Reference values for core/cutoff tests, computed with mpmath 1.3.0 at 40
# digits, independently of pairwell: python3 reference.py
from mpmath import mp, mpf, diff, findroot, quad, pi, exp, inf

mp.dps = 40
kB = mpf('1.380649e-23') / mpf('1.602176634e-19')  # eV/K, exact (SI 2019)

# Lennard-Jones, eps = 120 K k_B, sigma = 3.4 A, r_c = 8.5 A.
eps, sig, rc = 120 * kB, mpf('3.4'), mpf('8.5')
V = lambda r: 4 * eps * ((sig / r)**12 - (sig / r)**6)
dV = lambda r: diff(V, r)
vc, dvc = V(rc), dV(rc)
# Force shift: V_fs = V - V(rc) - (r - rc) V'(rc); minimum where V' = V'(rc).
Vfs = lambda r: V(r) - vc - (r - rc) * dvc
re0 = 2**(mpf(1) / 6) * sig
re = findroot(lambda r: dV(r) - dvc, re0)
print("lj force-shift re", re, "re shift", re - re0)
print("lj force-shift depth", -Vfs(re), "depth shift", -Vfs(re) - eps)
k0 = diff(V, re0, 2)
print("lj force-shift k", diff(V, re, 2), "k shift", diff(V, re, 2) - k0)
# Shift: depth changes by V(rc), re and k do not.
print("lj shift depth", eps + vc)
# Tail corrections by quadrature of the definitions, rho = 0.02 /A^3.
rho = mpf('0.02')
u = 2 * pi * rho * quad(lambda r: r**2 * V(r), [rc, inf])
p = -mpf(2) / 3 * pi * rho**2 * quad(lambda r: r**3 * dV(r), [rc, inf])
print("lj tail u", u, "p", p)

# Morse, De = 4.6 eV, a = 1.87 /A, re = 1.27 A, r_c = 6 A, rho = 0.05 /A^3.
De, a, rm, rcm, rhom = mpf('4.6'), mpf('1.87'), mpf('1.27'), mpf(6), mpf('0.05')
Vm = lambda r: De * ((1 - exp(-a * (r - rm)))**2 - 1)
dVm = lambda r: 2 * De * a * (1 - exp(-a * (r - rm))) * exp(-a * (r - rm))
um = 2 * pi * rhom * quad(lambda r: r**2 * Vm(r), [rcm, inf])
pm = -mpf(2) / 3 * pi * rhom**2 * quad(lambda r: r**3 * dVm(r), [rcm, inf])
print("morse tail u", um, "p", pm)
