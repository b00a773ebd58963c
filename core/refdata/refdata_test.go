package refdata

import (
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

func TestRead(t *testing.T) {
	in := `# invented scan
r_bohr, energy_hartree, force_hartree_per_bohr, weight
3.0, -460.1, 0.01, 1
2.0, -460.0, 0.2, 0.5

2.5, -460.2, 0, 2
`
	d, err := Read(strings.NewReader(in), "scan.csv")
	require.NoError(t, err)
	// CODATA 2018: a0 = 0.529177210903 Å, Eh = 27.211386245988 eV.
	assert.InDeltaSlice(t, []float64{2 * 0.529177210903, 2.5 * 0.529177210903, 3 * 0.529177210903}, d.R, 1e-15)
	assert.InDelta(t, -460.0*27.211386245988, d.E[0], 1e-9)
	assert.InDelta(t, 0.2*27.211386245988/0.529177210903, d.F[0], 1e-12)
	assert.Equal(t, []float64{0.5, 2, 1}, d.W)
	assert.NoError(t, d.Validate())

	// 1 kcal/mol = 4184 J / N_A = 0.0433641043 eV (CODATA 2018 e and N_A).
	d, err = Read(strings.NewReader("energy_kcal_per_mol,r_angstrom\n1,1\n2,2\n"), "x")
	require.NoError(t, err)
	assert.InDelta(t, 0.0433641043, d.E[0], 1e-10)
	assert.Nil(t, d.F)
	assert.Nil(t, d.W)
}

func TestReadErrors(t *testing.T) {
	for _, c := range []struct{ in, want string }{
		{"", "no header"},
		{"# only a comment\n", "no header"},
		{"r_angstrom,energy_ev\n", "no data lines"},
		{"r_angstrom,energy_furlong\n1,2\n", `line 1: unknown column "energy_furlong"`},
		{"r_angstrom,energy_ev,energy_hartree\n1,2,3\n", "line 1: columns"},
		{"energy_ev\n1\n", "line 1: no separation column"},
		{"r_angstrom\n1\n", "line 1: no energy column"},
		{"r_angstrom,energy_ev\n1,2\n2,NaN\n", `line 3: energy_ev: "NaN" is not a finite number`},
		{"r_angstrom,energy_ev\n1,2\n2,x\n", `line 3: energy_ev: "x"`},
		{"r_angstrom,energy_ev\n1,2\n2\n", "line 3: 1 values"},
		{"r_angstrom,energy_ev\n-1,2\n", "line 2: r_angstrom: -1 must be > 0"},
		{"r_angstrom,energy_ev,weight\n1,2,-1\n", "line 2: weight"},
		{"r_angstrom,energy_ev\n1,2\n# c\n1.0,3\n", "line 4: r = 1 Å given twice (also on line 2)"},
		{"r_angstrom,energy_ev\n1,2\n1,\"3\n", "invalid reference data"},
	} {
		_, err := Read(strings.NewReader(c.in), "scan.csv")
		require.Error(t, err, "%q", c.in)
		assert.ErrorIs(t, err, ErrFormat)
		assert.Contains(t, err.Error(), c.want, "%q", c.in)
		assert.NotContains(t, err.Error(), "\n")
	}
}

// FuzzRead: any input is either read into valid data or refused with a
// one-line ErrFormat error.
func FuzzRead(f *testing.F) {
	f.Add("r_angstrom,energy_ev\n1,2\n2,3\n")
	f.Add("# c\nr_bohr,energy_hartree,weight\n1,2,0\n")
	f.Add("r_pm,energy_per_cm,force_ev_per_angstrom\n100,1e4,0.5\n")
	f.Fuzz(func(t *testing.T, in string) {
		d, err := Read(strings.NewReader(in), "fuzz")
		if err != nil {
			assert.ErrorIs(t, err, ErrFormat)
			return
		}
		assert.NoError(t, d.Validate())
	})
}
