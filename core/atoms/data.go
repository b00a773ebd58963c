package atoms

// element is a chemical element with its conventional standard atomic weight.
type element struct {
	symbol string
	z      int
	weight float64 // u; 0 if the element has no standard atomic weight
}

// elements lists H (Z = 1) to Xe (Z = 54) in order of Z. Read only.
//
// Weights are the IUPAC/CIAAW 2021 abridged standard atomic weights
// (Prohaska et al. 2022, Pure Appl. Chem. 94, 573), using the conventional
// single values for elements whose standard atomic weight is an interval
// (H, Li, B, C, N, O, Mg, Si, S, Cl, Ar, Br); values from memory.
// Technetium has no stable isotope and therefore no standard atomic weight.
var elements = []element{
	{"H", 1, 1.008},
	{"He", 2, 4.0026},
	{"Li", 3, 6.94},
	{"Be", 4, 9.0122},
	{"B", 5, 10.81},
	{"C", 6, 12.011},
	{"N", 7, 14.007},
	{"O", 8, 15.999},
	{"F", 9, 18.998},
	{"Ne", 10, 20.180},
	{"Na", 11, 22.990},
	{"Mg", 12, 24.305},
	{"Al", 13, 26.982},
	{"Si", 14, 28.085},
	{"P", 15, 30.974},
	{"S", 16, 32.06},
	{"Cl", 17, 35.45},
	{"Ar", 18, 39.95},
	{"K", 19, 39.098},
	{"Ca", 20, 40.078},
	{"Sc", 21, 44.956},
	{"Ti", 22, 47.867},
	{"V", 23, 50.942},
	{"Cr", 24, 51.996},
	{"Mn", 25, 54.938},
	{"Fe", 26, 55.845},
	{"Co", 27, 58.933},
	{"Ni", 28, 58.693},
	{"Cu", 29, 63.546},
	{"Zn", 30, 65.38},
	{"Ga", 31, 69.723},
	{"Ge", 32, 72.630},
	{"As", 33, 74.922},
	{"Se", 34, 78.971},
	{"Br", 35, 79.904},
	{"Kr", 36, 83.798},
	{"Rb", 37, 85.468},
	{"Sr", 38, 87.62},
	{"Y", 39, 88.906},
	{"Zr", 40, 91.224},
	{"Nb", 41, 92.906},
	{"Mo", 42, 95.95},
	{"Tc", 43, 0},
	{"Ru", 44, 101.07},
	{"Rh", 45, 102.91},
	{"Pd", 46, 106.42},
	{"Ag", 47, 107.87},
	{"Cd", 48, 112.41},
	{"In", 49, 114.82},
	{"Sn", 50, 118.71},
	{"Sb", 51, 121.76},
	{"Te", 52, 127.60},
	{"I", 53, 126.90},
	{"Xe", 54, 131.29},
}

// isotope is a nuclide with its atomic mass (neutral atom, including electrons).
type isotope struct {
	symbol string // element symbol
	a      int    // mass number
	mass   float64
}

// isotopes lists the known nuclides in order of Z, then A. Read only.
//
// Masses are AME2020 atomic masses (Wang et al. 2021, Chin. Phys. C 45,
// 030003), from memory; ¹²C is 12 u exactly by definition of the unit.
var isotopes = []isotope{
	{"H", 1, 1.00782503223},
	{"H", 2, 2.01410177812},
	{"H", 3, 3.01604928132},
	{"He", 4, 4.00260325413},
	{"Li", 6, 6.0151228874},
	{"Li", 7, 7.0160034366},
	{"Be", 9, 9.012183065},
	{"B", 10, 10.01293695},
	{"B", 11, 11.00930536},
	{"C", 12, 12},
	{"C", 13, 13.00335483507},
	{"N", 14, 14.00307400443},
	{"N", 15, 15.00010889888},
	{"O", 16, 15.99491461957},
	{"O", 17, 16.99913175650},
	{"O", 18, 17.99915961286},
	{"F", 19, 18.99840316273},
	{"Ne", 20, 19.9924401762},
	{"Na", 23, 22.9897692820},
	{"Si", 28, 27.9769265350},
	{"P", 31, 30.9737619984},
	{"S", 32, 31.9720711744},
	{"Cl", 35, 34.968852682},
	{"Cl", 37, 36.965902602},
	{"Ar", 36, 35.967545105},
	{"Ar", 40, 39.9623831237},
	{"K", 39, 38.9637064864},
	{"Br", 79, 78.9183376},
	{"Br", 81, 80.9162897},
	{"Kr", 84, 83.9114977282},
	{"I", 127, 126.9044719},
	{"Xe", 129, 128.9047808611},
	{"Xe", 132, 131.9041550856},
}

// isotopeAliases maps special hydrogen symbols to mass numbers.
var isotopeAliases = map[string]int{"D": 2, "T": 3}
