// Package refdata reads reference data for fits: CSV files of an energy
// scan E(r), optionally with forces and weights.
//
// The format: comment lines start with '#'; the first other line is the
// header, naming each column with its unit; every later line is one point.
// Columns, in any order:
//
//	separation (exactly one):  r_angstrom, r_bohr, r_nm, r_pm
//	energy (exactly one):      energy_ev, energy_mev, energy_hartree,
//	                           energy_kcal_per_mol, energy_kj_per_mol,
//	                           energy_per_cm, energy_kelvin
//	force −dE/dr (optional):   force_ev_per_angstrom, force_hartree_per_bohr
//	weight (optional):         weight (≥ 0, dimensionless)
//
// Values are converted to Å, eV and eV/Å with the CODATA 2018 constants of
// package units (1 bohr = 0.529177210903 Å, 1 hartree = 27.211386245988 eV,
// 1 kcal/mol = 4184 J / N_A, 1 cm⁻¹ = hc·100 m⁻¹, 1 K = k_B). Points may
// come in any order and are returned sorted by r. Every malformed line
// (a missing or non-numeric value, NaN or ±Inf, r ≤ 0, a negative weight,
// an r given twice) is an error naming the line.
package refdata

import (
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"sort"
	"strconv"
	"strings"

	"github.com/pairwell/pairwell/core/fit"
	"github.com/pairwell/pairwell/core/units"
)

// MaxSize is the largest reference-data file read, 16 MiB (about 400 000
// lines of three numbers).
const MaxSize = 16 << 20

// ErrFormat means a reference-data file is malformed.
var ErrFormat = errors.New("invalid reference data")

// column is a known column: its kind and the factor to pairwell's units.
type column struct {
	kind   kind
	factor float64
}

type kind int

const (
	kindR kind = iota
	kindE
	kindF
	kindW
)

// Columns maps every accepted column name to its conversion factor to Å,
// eV, eV/Å (1 for weight).
var columns = map[string]column{
	"r_angstrom":             {kindR, 1},
	"r_bohr":                 {kindR, units.BohrAngstrom},
	"r_nm":                   {kindR, 10},
	"r_pm":                   {kindR, 0.01},
	"energy_ev":              {kindE, 1},
	"energy_mev":             {kindE, 1e-3},
	"energy_hartree":         {kindE, units.HartreeEV},
	"energy_kcal_per_mol":    {kindE, units.KcalPerMolEV},
	"energy_kj_per_mol":      {kindE, units.KJPerMolEV},
	"energy_per_cm":          {kindE, units.WavenumberEV},
	"energy_kelvin":          {kindE, units.BoltzmannEV},
	"force_ev_per_angstrom":  {kindF, 1},
	"force_hartree_per_bohr": {kindF, units.HartreeEV / units.BohrAngstrom},
	"weight":                 {kindW, 1},
}

// ColumnNames returns the accepted column names, sorted.
func ColumnNames() []string {
	out := make([]string, 0, len(columns))
	for k := range columns {
		out = append(out, k)
	}
	sort.Strings(out)
	return out
}

// Load reads the reference-data file at path.
func Load(path string) (fit.Data, error) {
	f, err := os.Open(path)
	if err != nil {
		return fit.Data{}, fmt.Errorf("reference data: %w", err)
	}
	defer f.Close()
	return Read(f, path)
}

// Read parses reference data from r; source names it in errors.
func Read(r io.Reader, source string) (fit.Data, error) {
	cr := csv.NewReader(r)
	cr.Comment = '#'
	cr.TrimLeadingSpace = true
	cr.FieldsPerRecord = -1
	bad := func(line int, format string, args ...any) error {
		return fmt.Errorf("%w: %s: line %d: %s", ErrFormat, source, line, fmt.Sprintf(format, args...))
	}
	header, err := cr.Read()
	if err == io.EOF {
		return fit.Data{}, fmt.Errorf("%w: %s: no header line (expected e.g. r_angstrom,energy_ev)", ErrFormat, source)
	}
	if err != nil {
		return fit.Data{}, fmt.Errorf("%w: %s: %s", ErrFormat, source, oneLine(err.Error()))
	}
	hline, _ := cr.FieldPos(0)
	cols := make([]column, len(header))
	index := map[kind]int{}
	names := map[kind]string{}
	for i, h := range header {
		h = strings.ToLower(strings.TrimSpace(h))
		c, ok := columns[h]
		if !ok {
			return fit.Data{}, bad(hline, "unknown column %q; allowed: %s", h, strings.Join(ColumnNames(), ", "))
		}
		if prev, dup := names[c.kind]; dup {
			return fit.Data{}, bad(hline, "columns %q and %q give the same quantity", prev, h)
		}
		cols[i], index[c.kind], names[c.kind] = c, i, h
	}
	if _, ok := index[kindR]; !ok {
		return fit.Data{}, bad(hline, "no separation column (r_angstrom, r_bohr, r_nm or r_pm)")
	}
	if _, ok := index[kindE]; !ok {
		return fit.Data{}, bad(hline, "no energy column (energy_ev, energy_hartree, energy_kcal_per_mol, …)")
	}
	type point struct {
		line       int
		r, e, f, w float64
	}
	var pts []point
	for {
		rec, err := cr.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			return fit.Data{}, fmt.Errorf("%w: %s: %s", ErrFormat, source, oneLine(err.Error()))
		}
		line, _ := cr.FieldPos(0)
		if len(rec) == 1 && strings.TrimSpace(rec[0]) == "" {
			continue
		}
		if len(rec) != len(header) {
			return fit.Data{}, bad(line, "%d values, the header names %d columns", len(rec), len(header))
		}
		p := point{line: line}
		for i, s := range rec {
			s = strings.TrimSpace(s)
			v, err := strconv.ParseFloat(s, 64)
			if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
				return fit.Data{}, bad(line, "%s: %q is not a finite number", header[i], s)
			}
			v *= cols[i].factor
			switch cols[i].kind {
			case kindR:
				if !(v > 0) {
					return fit.Data{}, bad(line, "%s: %s must be > 0", header[i], s)
				}
				p.r = v
			case kindE:
				p.e = v
			case kindF:
				p.f = v
			case kindW:
				if v < 0 {
					return fit.Data{}, bad(line, "weight: %s must be ≥ 0", s)
				}
				p.w = v
			}
		}
		pts = append(pts, p)
	}
	if len(pts) == 0 {
		return fit.Data{}, fmt.Errorf("%w: %s: no data lines after the header", ErrFormat, source)
	}
	sort.SliceStable(pts, func(a, b int) bool { return pts[a].r < pts[b].r })
	d := fit.Data{R: make([]float64, len(pts)), E: make([]float64, len(pts))}
	_, hasF := index[kindF]
	_, hasW := index[kindW]
	if hasF {
		d.F = make([]float64, len(pts))
	}
	if hasW {
		d.W = make([]float64, len(pts))
	}
	for i, p := range pts {
		if i > 0 && p.r == pts[i-1].r {
			a, b := min(p.line, pts[i-1].line), max(p.line, pts[i-1].line)
			return fit.Data{}, bad(b, "r = %g Å given twice (also on line %d)", p.r, a)
		}
		d.R[i], d.E[i] = p.r, p.e
		if hasF {
			d.F[i] = p.f
		}
		if hasW {
			d.W[i] = p.w
		}
	}
	return d, nil
}

func oneLine(s string) string { return strings.Join(strings.Fields(s), " ") }
