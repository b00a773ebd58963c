"""A pairwell plugin in Python: the Linnett (1940) form.

Linnett's potential of a diatomic molecule joins an inverse-power repulsion
to an exponential attraction (the reverse of Buckingham's choice):

    V(r) = a/r^m − b·e^(−n·r)

(J. W. Linnett, Trans. Faraday Soc. 36, 1123 (1940); listed as "Linnett"
by Y. P. Varshni, Rev. Mod. Phys. 29, 664 (1957); both references from
memory). pairwell's parameters must have units it knows, and a in eV·Å^m
has none, so the plugin writes the form with its minimum:

    V(r) = A·(re/r)^m − B·e^(−n·(r − re)),
    A = De·n·re/(m − n·re),  B = De·m/(m − n·re),

which is the same function (a = A·re^m, b = B·e^(n·re)) with V(re) = −De
and V′(re) = 0, for n·re < m. Parameters, in order: De (eV), re (Å), m
(dimensionless), n (1/Å), all positive.

The normalized Taylor coefficients c_k = V⁽ᵏ⁾(r)/k! are exact at every
order, from the binomial series of (r + h)^(−m) and the exponential series:

    c_k = A·p_k − B·e_k,
    p_0 = (re/r)^m,  p_k = p_(k−1)·(−(m + k − 1))/(k·r),
    e_0 = e^(−n·(r − re)),  e_k = e_(k−1)·(−n)/k,

so c_k never forms k! or V⁽ᵏ⁾ and stays finite where V⁽ᵏ⁾ would overflow.

Run by pairwell through the launcher pairwell-plugin-linnett beside this
file; see pairwell_plugin.py for the protocol.
"""

import math
import sys

import pairwell_plugin as pp
import pairwell_pb2 as pb

VERSION = "1.0.0"

REFERENCE = "J. W. Linnett, Trans. Faraday Soc. 36, 1123 (1940)"


class Linnett:
    """The metadata of the form, and open(params) for a parameter set."""

    key = "linnett"
    aliases = ()
    name = "Linnett"
    formula = "V = A(re/r)^m − B·exp(−n(r − re)), A = De·n·re/(m − n·re), B = De·m/(m − n·re)"
    params = (
        pp.Param("De", pb.DIMENSION_ENERGY, pb.CONSTRAINT_POSITIVE, "well depth V(∞) − V(re)"),
        pp.Param("re", pb.DIMENSION_LENGTH, pb.CONSTRAINT_POSITIVE, "equilibrium distance"),
        pp.Param("m", pb.DIMENSION_DIMENSIONLESS, pb.CONSTRAINT_POSITIVE,
                 "exponent of the repulsion A(re/r)^m; m > n·re"),
        pp.Param("n", pb.DIMENSION_INVERSE_LENGTH, pb.CONSTRAINT_POSITIVE,
                 "decay constant of the attraction B·exp(−n(r − re))"),
    )
    domain = "every r > 0; V → 0 from above as r → ∞"
    reference = REFERENCE
    notes = ("Linnett's a/r^m − b·exp(−n·r) written with its minimum: a = A·re^m, b = B·exp(n·re); "
             "needs n·re < m. Energy zero at dissociation: V(re) = −De, "
             "V″(re) = De·m·n·(m + 1 − n·re)/(re·(m − n·re)). The power outlasts the exponential, "
             "so beyond the well V rises above 0 to a low maximum and falls back to 0: "
             "energies from 0 to that maximum are not bound. Served by a plugin written in Python.")
    max_order = 64

    def open(self, params):
        de, re, m, n = params
        if not n * re < m:
            raise pp.Failure(pb.ERROR_KIND_PARAM,
                             "linnett: n·re = %r must be less than m = %r (else the form has no minimum at re)"
                             % (n * re, m))
        return Potential(de, re, m, n)


class Potential:
    """V(r) = A·(re/r)^m − B·e^(−n(r − re)) for one parameter set."""

    def __init__(self, de, re, m, n):
        self.de, self.re, self.m, self.n = de, re, m, n
        gap = m - n * re
        self.a = de * n * re / gap
        self.b = de * m / gap

    def domain(self):
        return pb.Domain(min=0.0, max=math.inf, barrier=False, limit=0.0,
                         barrier_energy=0.0, equilibrium_guess=self.re)

    def curvature(self):
        """V″(re) in eV/Å²."""
        de, re, m, n = self.de, self.re, self.m, self.n
        return de * m * n * (m + 1 - n * re) / (re * (m - n * re))

    def identities(self):
        src = "V′(re) = 0, V(re) = −De by the choice of A and B; V″(re) differentiated by hand"
        return [
            pb.Identity(name="minimum at re", quantity=pb.QUANTITY_EQUILIBRIUM_R,
                        value=self.re, source=src),
            pb.Identity(name="V(re) = −De", quantity=pb.QUANTITY_MINIMUM_ENERGY,
                        value=-self.de, source=src),
            pb.Identity(name="V″(re) = De·m·n(m + 1 − n·re)/(re(m − n·re))",
                        quantity=pb.QUANTITY_DERIVATIVE_AT_MINIMUM, order=2,
                        value=self.curvature(), source=src),
        ]

    def taylor(self, order, rs):
        """c_0 … c_order at every r, row-major: (order + 1)·len(rs) values."""
        pp.check_r(rs, self.domain())
        a, b, re, m, n = self.a, self.b, self.re, self.m, self.n
        out = []
        for i, r in enumerate(rs):
            try:
                p = (re / r) ** m
            except OverflowError:
                raise pp.PointFailure(i, pb.ERROR_KIND_DOMAIN,
                                      "linnett: (re/r)^m overflows a float64 at r = %r Å" % r)
            e = math.exp(-n * (r - re))
            out.append(a * p - b * e)
            for k in range(1, order + 1):
                p *= -(m + k - 1) / (k * r)
                e *= -n / k
                out.append(a * p - b * e)
            for k, c in enumerate(out[len(out) - order - 1:]):
                if not math.isfinite(c):
                    raise pp.PointFailure(i, pb.ERROR_KIND_DOMAIN,
                                          "linnett: c_%d = V⁽%d⁾/%d! overflows a float64 at r = %r Å" % (k, k, k, r))
        return out


if __name__ == "__main__":
    # The launcher passes its own path, the one a person ran.
    pp.serve(VERSION, [Linnett()], argv0=sys.argv[1] if len(sys.argv) > 1 else sys.argv[0])
