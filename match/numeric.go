package match

import (
	"errors"
	"fmt"
	"math"
	"math/big"

	"loopmatch/expr"
	"loopmatch/expr/notation"
	"loopmatch/expr/specfun"
	"loopmatch/loops"
)

// This file evaluates the coefficients of the general route numerically. Their expressions are
// finite parts: every scalar-integral atom (Bub, dBub, Tri, Box; loops.Atom) stands for its
// MS-bar finite part at the scale μ, and the coefficients are rational functions of the
// parameters. Passarino–Veltman coefficients cancel strongly when momenta or masses are small
// (inverse Gram determinants), so the evaluation is done in arbitrary precision with the
// scalar integrals of package loops.

// numPrec is the working precision of the evaluation in bits (about 75 decimal digits).
const numPrec = 256

// ErrIRDivergent is wrapped by the error for a scalar integral with an infrared pole on the
// general route, whose finite part alone is not the value of the amplitude.
var ErrIRDivergent = errors.New("infrared-divergent scalar integral")

// point is a numerical point: values of the parameters and μ.
type point map[string]float64

// pointOf evaluates the values of the file (in order) and the scale of the block.
func pointOf(p *notation.Program, mb *notation.MatchBlock) (point, error) {
	vals := map[string]complex128{}
	for _, n := range p.ValueOrder {
		v, err := p.Values[n].Eval(vals)
		if err != nil {
			return nil, fmt.Errorf("value of %s: %v", n, err)
		}
		vals[n] = v
	}
	if mb.ScaleSet {
		v, err := mb.Scale.Eval(vals)
		if err != nil {
			return nil, fmt.Errorf("scale: %v", err)
		}
		vals["mu"] = v
	}
	if _, ok := vals["mu"]; !ok {
		return nil, fmt.Errorf("no value of the scale mu (give a scale line or values mu = …)")
	}
	pt := point{}
	for n, v := range vals {
		if imag(v) != 0 {
			return nil, fmt.Errorf("value of %s is not real (%v)", n, v)
		}
		pt[n] = real(v)
	}
	return pt, nil
}

// with returns a copy of the point with some values changed.
func (pt point) with(changes map[string]float64) point {
	out := point{}
	for k, v := range pt {
		out[k] = v
	}
	for k, v := range changes {
		out[k] = v
	}
	return out
}

// text lists the point in the declaration order of p.
func (pt point) text(p *notation.Program) string {
	var s string
	for _, n := range append(append([]string{}, p.DeclOrder...), "mu") {
		v, ok := pt[n]
		if !ok {
			continue
		}
		if s != "" {
			s += ", "
		}
		s += fmt.Sprintf("%s = %.10g", n, v)
	}
	return s
}

func (pt point) big() map[string]specfun.Complex {
	out := map[string]specfun.Complex{}
	for k, v := range pt {
		out[k] = specfun.NewComplex(v, 0, numPrec)
	}
	return out
}

// EvalFinite evaluates a finite-part expression of the general route (scalar-integral atoms
// standing for their MS-bar finite parts) at the values vals (which must contain mu), in
// arbitrary precision. The dimension d, which the canonical form of tensor operators can leave
// in a coefficient, is 4 unless vals sets it. A scalar integral with an infrared pole at this point is an error
// wrapping ErrIRDivergent.
func EvalFinite(e expr.Expr, vals map[string]float64) (complex128, error) {
	v, err := evalFiniteBig(e, point(vals))
	if err != nil {
		return 0, err
	}
	return v.Complex128(), nil
}

func evalFiniteBig(e expr.Expr, pt point) (specfun.Complex, error) {
	mu, ok := pt["mu"]
	if !ok || mu <= 0 {
		return specfun.Complex{}, fmt.Errorf("evaluation needs a positive value of mu")
	}
	bvals := pt.big()
	if _, ok := bvals[expr.DimSymbol]; !ok {
		// finite parts: a dimension left by the canonical form of the operators is 4
		bvals[expr.DimSymbol] = specfun.NewComplex(4, 0, numPrec)
	}
	mu2 := new(big.Float).SetPrec(numPrec).SetFloat64(mu)
	mu2.Mul(mu2, mu2)
	sum := specfun.NewComplex(0, 0, numPrec)
	cache := map[string]specfun.Complex{}
	for _, t := range e.Terms() {
		if len(t.Loops) > 0 || len(t.NC) > 0 {
			return specfun.Complex{}, fmt.Errorf("cannot evaluate %s: a loop integral or an open Dirac string", expr.FromTerm(t))
		}
		v, err := t.Coef.EvalBig(bvals, numPrec)
		if err != nil {
			return specfun.Complex{}, err
		}
		for _, a := range t.Atoms {
			var x specfun.Complex
			if loops.IsScalarAtom(a.A) {
				key := a.A.Key()
				c, ok := cache[key]
				if !ok {
					if c, err = scalarFinite(a.A.(expr.Fn), bvals, mu2); err != nil {
						return specfun.Complex{}, err
					}
					cache[key] = c
				}
				x = c
			} else {
				if x, err = expr.FromAtom(a.A, 1).EvalBig(bvals, numPrec); err != nil {
					return specfun.Complex{}, err
				}
			}
			for range abs(a.Pow) {
				if a.Pow > 0 {
					v = v.Mul(x)
				} else {
					v = v.Quo(x)
				}
			}
		}
		sum = sum.Add(v)
	}
	return sum, nil
}

func abs(n int) int {
	if n < 0 {
		return -n
	}
	return n
}

// scalarFinite evaluates the finite part of one scalar-integral atom; Tri, Box and dBub must be
// free of poles (an infrared regulator), Bub and Tad have their ultraviolet poles only.
func scalarFinite(f expr.Fn, vals map[string]specfun.Complex, mu2 *big.Float) (specfun.Complex, error) {
	args := make([]*big.Float, len(f.Args))
	for i, a := range f.Args {
		z, err := a.EvalBig(vals, numPrec)
		if err != nil {
			return specfun.Complex{}, err
		}
		if im, _ := z.Im.Float64(); math.Abs(im) > 0 {
			return specfun.Complex{}, fmt.Errorf("%s: argument %d is not real", f.Key(), i+1)
		}
		args[i] = z.Re
	}
	var v loops.BigValue
	var err error
	switch f.Name {
	case loops.TadName:
		v, err = loops.A0Big(args[0], mu2, numPrec)
	case loops.BubName:
		v, err = loops.B0Big(args[0], args[1], args[2], mu2, numPrec)
	case loops.DBubName:
		v, err = loops.B0PrimeBig(args[0], args[1], args[2], mu2, numPrec)
	case loops.TriName:
		v, err = loops.C0Big(args[0], args[1], args[2], args[3], args[4], args[5], mu2, numPrec)
	case loops.BoxName:
		v, err = loops.D0Big(args[0], args[1], args[2], args[3], args[4], args[5], args[6], args[7], args[8], args[9], mu2, numPrec)
	default:
		return specfun.Complex{}, fmt.Errorf("%s: the general route evaluates the squared-mass scalar integrals only", f.Key())
	}
	if err != nil {
		return specfun.Complex{}, fmt.Errorf("%s: %w", f.Key(), err)
	}
	switch f.Name {
	case loops.TriName, loops.BoxName, loops.DBubName:
		if !v.Pole2.IsZero() || !v.Pole1.IsZero() {
			return specfun.Complex{}, fmt.Errorf("%w: %s has the poles %s/eps^2 + %s/eps here; regulate the infrared by light masses or off-shell momenta", ErrIRDivergent, f.Key(), v.Pole2.Text(6), v.Pole1.Text(6))
		}
	}
	return v.Finite, nil
}
