package expr

import (
	"errors"
	"fmt"
	"maps"
	"math/big"
	"math/cmplx"
	"slices"

	"loopmatch/expr/specfun"
)

// ErrSingular reports that an expression has a pole at the values it is evaluated at.
var ErrSingular = errors.New("the expression is singular at these values")

// EvalAccurate evaluates e at complex128 values (taken as exact binary numbers) and returns the
// nearest complex128 of the exact value, within a few units in the last place. Closed forms of
// Wilson coefficients cancel strongly near equal masses (terms like 1/(x − 1)^4), which complex128
// evaluation turns into wrong digits; here the precision is doubled until two evaluations agree
// to 2^-60 of the value (or of the terms' scale for a value that vanishes). At a removable
// singularity (a denominator that vanishes while the expression stays finite, x = 1 exactly) the
// value is the limit, the mean of the values at two points a relative 2^-40 away on either side
// (an error of order 2^-80); a true pole gives ErrSingular.
func (e Expr) EvalAccurate(vals map[string]complex128) (complex128, error) {
	v, err := e.evalConverged(vals, 0)
	if err == nil || !errors.Is(err, errVanishing) {
		return v, err
	}
	// Removable singularity or pole: approach the point from two sides along a direction that
	// changes every ratio of the values.
	side := func(sign float64) (complex128, error) { return e.evalConverged(vals, sign) }
	lo, err1 := side(-1)
	hi, err2 := side(1)
	if err1 != nil || err2 != nil {
		return 0, fmt.Errorf("%w (%v)", ErrSingular, errors.Join(err1, err2))
	}
	diff, size := cabs(hi-lo), max(cabs(hi), cabs(lo))
	if diff > 1e-6*size { // first order in the step: about 1e-12 for a removable point, order 1 at a pole
		return 0, fmt.Errorf("%w: the values on either side differ (%g and %g)", ErrSingular, lo, hi)
	}
	return (lo + hi) / 2, nil
}

// evalConverged evaluates with doubling precision; with dir ≠ 0 every value v_i is moved to
// v_i (1 + dir·c_i·2^-40) with distinct c_i, so that the point leaves any hyperplane v_i = v_j.
// Near such a point expanded denominators cancel to about 2^-40 per power, so a vanishing
// denominator there only means that the precision is still too low.
func (e Expr) evalConverged(vals map[string]complex128, dir float64) (complex128, error) {
	names := slices.Sorted(maps.Keys(vals))
	var prev specfun.Complex
	for prec := uint(192); prec <= 1<<14; prec *= 2 {
		bv := make(map[string]specfun.Complex, len(vals))
		for i, n := range names {
			z := specfun.NewComplex(real(vals[n]), imag(vals[n]), prec)
			if dir != 0 {
				f := new(big.Float).SetPrec(prec).SetMantExp(big.NewFloat(dir/float64(i+2)), -40)
				f.Add(f, big.NewFloat(1))
				z = z.Scale(f)
			}
			bv[n] = z
		}
		cur, scale, err := e.evalBig(bv, prec)
		if err != nil {
			if dir != 0 && errors.Is(err, errVanishing) {
				continue
			}
			return 0, err
		}
		if prev.Re != nil {
			d := cur.Sub(prev).Abs()
			tol := new(big.Float).SetMantExp(cur.Abs(), -60)
			floor := new(big.Float).SetMantExp(scale, -int(prec/2))
			if tol.Cmp(floor) < 0 {
				tol = floor
			}
			if d.Cmp(tol) <= 0 {
				return cur.Complex128(), nil
			}
		}
		prev = cur
	}
	return 0, fmt.Errorf("the value does not settle at 16384 bits of precision")
}

func cabs(z complex128) float64 { return cmplx.Abs(z) }
