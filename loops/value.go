package loops

import (
	"errors"
	"fmt"
	"math"
)

// Value is the Laurent expansion Pole2/ε² + Pole1/ε + Finite + O(ε) of a scalar integral,
// without the common factor i/(16π²) (see the package comment).
type Value struct {
	Pole2, Pole1, Finite complex128
}

// String formats the three coefficients.
func (v Value) String() string {
	return fmt.Sprintf("%v/ε² + %v/ε + %v", v.Pole2, v.Pole1, v.Finite)
}

// ErrNotCovered is wrapped by the errors of configurations that this package does not evaluate;
// the message names the configuration.
var ErrNotCovered = errors.New("configuration not covered")

// checkInputs rejects NaN and infinite invariants, negative or non-finite squared masses and a
// non-positive or non-finite μ².
func checkInputs(fn string, inv []float64, m2 []float64, mu2 float64) error {
	for i, s := range inv {
		if math.IsNaN(s) || math.IsInf(s, 0) {
			return fmt.Errorf("loops.%s: invariant %d is %v, want a finite number", fn, i+1, s)
		}
	}
	for i, m := range m2 {
		if math.IsNaN(m) || math.IsInf(m, 0) {
			return fmt.Errorf("loops.%s: squared mass m%d² is %v, want a finite number", fn, i, m)
		}
		if m < 0 {
			return fmt.Errorf("loops.%s: squared mass m%d² = %g is negative (masses must be real)", fn, i, m)
		}
	}
	if math.IsNaN(mu2) || math.IsInf(mu2, 0) || mu2 <= 0 {
		return fmt.Errorf("loops.%s: scale μ² = %v, want a positive finite number", fn, mu2)
	}
	return nil
}

// scaleOf returns the largest magnitude among the arguments (0 if all vanish).
func scaleOf(xs ...float64) float64 {
	s := 0.0
	for _, x := range xs {
		if a := math.Abs(x); a > s {
			s = a
		}
	}
	return s
}

// snapTol is the relative tolerance (of the largest invariant or squared mass) within which an
// invariant is taken to equal an on-shell value or zero when the infrared structure is
// classified. It absorbs the rounding of m·m for masses given as decimals (80.4² is not exact).
const snapTol = 1e-12

// same reports whether a and b agree within snapTol·scale.
func same(a, b, scale float64) bool { return math.Abs(a-b) <= snapTol*scale }
