package units

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"
)

// CelsiusZero is 0 °C in K (exact, by the definition of the Celsius scale).
const CelsiusZero = 273.15

// ParseTemperature reads a temperature and returns it in K. A bare number
// is in K; the suffixes are "K", "degC" (also "°C" and "℃", an offset of
// CelsiusZero) and any energy unit of Parse, read as the thermal energy
// k_B·T ("0.025eV", "200cm-1", "1kcal/mol"). The result is not checked to
// be positive. Errors are a *ParseError of dimension Temperature, as for
// Parse.
func ParseTemperature(s string) (float64, error) {
	num, unit, err := splitNumber(strings.TrimSpace(s))
	if err != nil {
		return 0, &ParseError{Input: s, Dim: Temperature, Err: err}
	}
	switch unit {
	case "", "K":
		return Parse(s, Temperature)
	case "degC", "°C", "℃":
		v, err := strconv.ParseFloat(num, 64)
		if err != nil || math.IsInf(v+CelsiusZero, 0) {
			return 0, &ParseError{Input: s, Dim: Temperature, Err: fmt.Errorf("%w: %q", ErrNotFinite, num)}
		}
		return v + CelsiusZero, nil
	}
	e, err := Parse(s, Energy)
	if err != nil {
		var pe *ParseError
		if errors.As(err, &pe) && (errors.Is(pe.Err, ErrWrongDimension) || errors.Is(pe.Err, ErrUnknownUnit)) {
			return 0, &ParseError{Input: s, Dim: Temperature,
				Err: fmt.Errorf("%w: %q: a temperature is in K, degC or an energy k_B·T (eV, meV, cm-1, kcal/mol, …)", ErrUnknownUnit, unit)}
		}
		if errors.As(err, &pe) {
			return 0, &ParseError{Input: s, Dim: Temperature, Err: pe.Err}
		}
		return 0, err
	}
	t := e / BoltzmannEV
	if math.IsInf(t, 0) {
		return 0, &ParseError{Input: s, Dim: Temperature, Err: fmt.Errorf("%w: %s is out of range in K", ErrNotFinite, s)}
	}
	return t, nil
}
