package atoms

import (
	"errors"
	"math"
	"testing"
)

func FuzzMass(f *testing.F) {
	for _, s := range append(append(Symbols(), Isotopes()...), "", "D", "T", "cl", "Xx", "14C", "035Cl", "³⁵Cl", "Tc", "99999999999999999999H") {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		m, err := Mass(s)
		if err != nil {
			if !errors.Is(err, ErrUnknownSymbol) && !errors.Is(err, ErrNoStandardWeight) {
				t.Fatalf("Mass(%q): unexpected error %v", s, err)
			}
			return
		}
		// Known masses lie in (1, 253) u (¹H to ²⁵²Cf).
		if math.IsNaN(m) || math.IsInf(m, 0) || m < 1 || m > 253 {
			t.Fatalf("Mass(%q) = %v, want a finite mass in u", s, m)
		}
	})
}

func FuzzParsePair(f *testing.F) {
	for _, s := range []string{"H-Cl", "1H-35Cl", "D-D", "C-O", "12C-16O", "h-cl", "1H–37Cl", "HCl", "H-CL", "Au-Au", "1H35Cl", "-", "H-Cl-Br", "Tc-H", " Xe - Xe "} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		p, err := ParsePair(s)
		if err != nil {
			if !errors.Is(err, ErrMalformedPair) && !errors.Is(err, ErrUnknownSymbol) && !errors.Is(err, ErrNoStandardWeight) {
				t.Fatalf("ParsePair(%q): unexpected error %v", s, err)
			}
			return
		}
		for _, m := range []float64{p.MassA, p.MassB, p.Mu} {
			if math.IsNaN(m) || math.IsInf(m, 0) || m <= 0 {
				t.Fatalf("ParsePair(%q) = %+v, want finite positive masses", s, p)
			}
		}
		if p.Mu > min(p.MassA, p.MassB) || p.Mu < min(p.MassA, p.MassB)/2 {
			t.Fatalf("ParsePair(%q): μ = %v outside [min/2, min]", s, p.Mu)
		}
		want := p.MassA * p.MassB / (p.MassA + p.MassB)
		if math.Abs(p.Mu-want) > 1e-12*want {
			t.Fatalf("ParsePair(%q): μ = %v, want %v", s, p.Mu, want)
		}
		// The canonical form parses to the same pair.
		q, err := ParsePair(p.String())
		if err != nil || q != p {
			t.Fatalf("ParsePair(%q) = %+v, but canonical %q gives %+v, %v", s, p, p.String(), q, err)
		}
	})
}
