package units

import "math"

// Physical constants. Values are the exact SI (2019) defining constants and the
// CODATA 2018 recommended values (Tiesinga et al. 2021, Rev. Mod. Phys. 93, 025010).
// Derived constants are untyped constant expressions, so they are evaluated
// exactly by the compiler and rounded to float64 only once, at their use.
const (
	// ElectronVolt is the electron volt in J, equal to the elementary charge
	// in C (exact, SI 2019).
	ElectronVolt = 1.602176634e-19
	// Dalton is the unified atomic mass unit u = m(¹²C)/12 in kg (CODATA 2018).
	Dalton = 1.66053906660e-27
	// SpeedOfLight is the speed of light in vacuum c in m/s (exact).
	SpeedOfLight = 299792458
	// Planck is the Planck constant h in J·s (exact, SI 2019).
	Planck = 6.62607015e-34
	// ReducedPlanck is ħ = h/(2π) in J·s.
	ReducedPlanck = Planck / (2 * math.Pi)
	// Boltzmann is the Boltzmann constant k_B in J/K (exact, SI 2019).
	Boltzmann = 1.380649e-23
	// BoltzmannEV is k_B in eV/K (= 8.617333262...e-5, exact).
	BoltzmannEV = Boltzmann / ElectronVolt
	// Avogadro is the Avogadro constant N_A in 1/mol (exact, SI 2019).
	Avogadro = 6.02214076e23
	// HartreeEV is the Hartree energy E_h in eV (CODATA 2018).
	HartreeEV = 27.211386245988
	// RydbergEV is the Rydberg energy R∞hc = E_h/2 in eV (CODATA 2018).
	RydbergEV = HartreeEV / 2
	// BohrAngstrom is the Bohr radius a₀ in Å (CODATA 2018).
	BohrAngstrom = 0.529177210903
	// ElectronMass is the electron mass m_e in kg (CODATA 2018).
	ElectronMass = 9.1093837015e-31
	// ElectronMassU is the electron mass m_e in u (CODATA 2018).
	ElectronMassU = 5.48579909065e-4
	// KcalPerMolEV is 1 kcal/mol (thermochemical calorie, 4.184 J) per
	// particle, in eV: 4184 J / N_A.
	KcalPerMolEV = 4184 / Avogadro / ElectronVolt
	// KJPerMolEV is 1 kJ/mol per particle, in eV: 1000 J / N_A.
	KJPerMolEV = 1000 / Avogadro / ElectronVolt
	// WavenumberEV is the photon energy h·c·ν̃ of ν̃ = 1 cm⁻¹, in eV.
	WavenumberEV = Planck * SpeedOfLight * 100 / ElectronVolt
	// HbarEVfs is ħ in eV·fs.
	HbarEVfs = ReducedPlanck / ElectronVolt * 1e15
	// NewtonPerMeterEV is a force constant of 1 N/m expressed in eV/Å²
	// (1 J/m² = 1/(e·10²⁰) eV/Å²).
	NewtonPerMeterEV = 1 / ElectronVolt / 1e20
)

// Unexported conversion factors between the package's default units.
const (
	// hcEVAngstrom is h·c in eV·Å: the photon energy in eV of a wavenumber of 1/Å.
	hcEVAngstrom = Planck * SpeedOfLight / ElectronVolt * 1e10
	// omega2Unit is the value in (rad/fs)² of k/μ = 1 eV/(Å²·u).
	omega2Unit = ElectronVolt / (1e-20 * Dalton) * 1e-30
	// lightCmPerFs is c in cm/fs.
	lightCmPerFs = SpeedOfLight * 100 * 1e-15
)
