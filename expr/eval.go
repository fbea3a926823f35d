package expr

import (
	"errors"
	"fmt"
	"math"
	"math/big"
	"math/cmplx"
	"strings"
	"sync"

	"loopmatch/expr/specfun"
)

// This file evaluates expressions numerically: in complex128, and in arbitrary precision with
// the precision (in bits) as a parameter. A symbol "conj(y)" takes the value given for it, or
// else the complex conjugate of the value of y.

// errVanishing marks a denominator that is zero at the values of an evaluation.
var errVanishing = errors.New("vanishes at these values")

// lookup returns the value of a symbol.
func lookup(vals map[string]complex128, v string) (complex128, error) {
	if x, ok := vals[v]; ok {
		return x, nil
	}
	if inner, ok := strings.CutPrefix(v, "conj("); ok {
		if x, ok := vals[strings.TrimSuffix(inner, ")")]; ok {
			return cmplx.Conj(x), nil
		}
	}
	return 0, fmt.Errorf("no value for the symbol %s", v)
}

// Eval evaluates p at the given values.
func (p Poly) Eval(vals map[string]complex128) (complex128, error) {
	var sum complex128
	for _, t := range p.terms {
		c, _ := t.Coef.Float64()
		x := complex(c, 0)
		for _, vp := range t.Mono {
			v, err := lookup(vals, vp.Var)
			if err != nil {
				return 0, err
			}
			x *= cpow(v, vp.Exp)
		}
		sum += x
	}
	return sum, nil
}

func cpow(z complex128, n int) complex128 {
	r := complex(1, 0)
	for n > 0 {
		if n&1 == 1 {
			r *= z
		}
		z *= z
		n >>= 1
	}
	return r
}

// Eval evaluates r at the given values; a vanishing denominator is an error.
func (r RatFunc) Eval(vals map[string]complex128) (complex128, error) {
	n, err := r.num.Eval(vals)
	if err != nil {
		return 0, err
	}
	if r.IsPoly() {
		return n, nil
	}
	d, err := r.den.Eval(vals)
	if err != nil {
		return 0, err
	}
	if d == 0 {
		return 0, fmt.Errorf("the denominator %s vanishes at these values", r.den)
	}
	return n / d, nil
}

// Eval evaluates e in complex128. Loop integrals, Dirac strings and Lorentz objects have no
// numerical value and give an error, as do opaque functions.
func (e Expr) Eval(vals map[string]complex128) (complex128, error) {
	var sum complex128
	for _, t := range e.terms {
		if len(t.Loops) > 0 || len(t.NC) > 0 {
			return 0, fmt.Errorf("cannot evaluate %s numerically: it is a loop integral or a Dirac string", t)
		}
		x, err := t.Coef.Eval(vals)
		if err != nil {
			return 0, err
		}
		for _, a := range t.Atoms {
			v, err := evalAtom(a.A, vals)
			if err != nil {
				return 0, err
			}
			if a.Pow > 0 {
				x *= cpow(v, a.Pow)
			} else {
				if v == 0 {
					return 0, fmt.Errorf("%s vanishes in a denominator", a.A.Key())
				}
				x /= cpow(v, -a.Pow)
			}
		}
		sum += x
	}
	return sum, nil
}

var zetaFloat sync.Map // int → float64

func zetaF(k int) (float64, error) {
	if v, ok := zetaFloat.Load(k); ok {
		return v.(float64), nil
	}
	z, err := specfun.Zeta(k, 64)
	if err != nil {
		return 0, err
	}
	f, _ := z.Float64()
	zetaFloat.Store(k, f)
	return f, nil
}

func evalAtom(a Atom, vals map[string]complex128) (complex128, error) {
	switch x := a.(type) {
	case Const:
		switch {
		case x == Pi:
			return complex(math.Pi, 0), nil
		case x == I:
			return complex(0, 1), nil
		case strings.HasPrefix(x.Name, "zeta"):
			var k int
			if _, err := fmt.Sscanf(x.Name, "zeta%d", &k); err == nil && k >= 2 {
				f, err := zetaF(k)
				return complex(f, 0), err
			}
		}
	case Fn:
		args := make([]complex128, len(x.Args))
		for i, arg := range x.Args {
			v, err := arg.Eval(vals)
			if err != nil {
				return 0, err
			}
			args[i] = v
		}
		switch x.Name {
		case FnLog:
			z := args[0]
			if z == 0 {
				return 0, fmt.Errorf("log(0) in %s", x.Key())
			}
			if imag(z) == 0 && real(z) < 0 {
				return complex(math.Log(-real(z)), float64(x.I0)*math.Pi), nil
			}
			return cmplx.Log(z), nil
		case FnLi2:
			return specfun.Li2Side(args[0], x.I0), nil
		case FnCl2:
			if imag(args[0]) != 0 {
				return 0, fmt.Errorf("Cl2 needs a real argument, got %v", args[0])
			}
			return complex(specfun.Cl2(real(args[0])), 0), nil
		case FnSqrt:
			return cmplx.Sqrt(args[0]), nil
		}
	}
	return 0, fmt.Errorf("cannot evaluate %s numerically", a.Key())
}

// EvalBig evaluates e with prec bits of precision. Values are given as arbitrary-precision
// complex numbers.
func (e Expr) EvalBig(vals map[string]specfun.Complex, prec uint) (specfun.Complex, error) {
	sum, _, err := e.evalBig(vals, prec)
	return sum, err
}

// evalBig returns the value of e and the sum of the magnitudes of its terms (the scale against
// which cancellations are measured).
func (e Expr) evalBig(vals map[string]specfun.Complex, prec uint) (specfun.Complex, *big.Float, error) {
	sum := specfun.NewComplex(0, 0, prec)
	scale := new(big.Float).SetPrec(prec)
	for _, t := range e.terms {
		if len(t.Loops) > 0 || len(t.NC) > 0 {
			return specfun.Complex{}, nil, fmt.Errorf("cannot evaluate %s numerically: it is a loop integral or a Dirac string", t)
		}
		x, err := t.Coef.EvalBig(vals, prec)
		if err != nil {
			return specfun.Complex{}, nil, err
		}
		for _, a := range t.Atoms {
			v, err := evalAtomBig(a.A, vals, prec)
			if err != nil {
				return specfun.Complex{}, nil, err
			}
			n := a.Pow
			if n < 0 {
				if v.IsZero() {
					return specfun.Complex{}, nil, fmt.Errorf("%s in a denominator %w", a.A.Key(), errVanishing)
				}
				v, n = v.Inv(), -n
			}
			x = x.Mul(bigPow(v, n, prec))
		}
		sum = sum.Add(x)
		scale.Add(scale, x.Abs())
	}
	return sum, scale, nil
}

func bigPow(z specfun.Complex, n int, prec uint) specfun.Complex {
	r := specfun.NewComplex(1, 0, prec)
	for n > 0 {
		if n&1 == 1 {
			r = r.Mul(z)
		}
		z = z.Mul(z)
		n >>= 1
	}
	return r
}

func lookupBig(vals map[string]specfun.Complex, v string) (specfun.Complex, error) {
	if x, ok := vals[v]; ok {
		return x, nil
	}
	if inner, ok := strings.CutPrefix(v, "conj("); ok {
		if x, ok := vals[strings.TrimSuffix(inner, ")")]; ok {
			return x.Conj(), nil
		}
	}
	return specfun.Complex{}, fmt.Errorf("no value for the symbol %s", v)
}

// EvalBig evaluates p with prec bits.
func (p Poly) EvalBig(vals map[string]specfun.Complex, prec uint) (specfun.Complex, error) {
	sum := specfun.NewComplex(0, 0, prec)
	for _, t := range p.terms {
		c := new(big.Float).SetPrec(prec).SetRat(t.Coef)
		x := specfun.RealComplex(c, prec)
		for _, vp := range t.Mono {
			v, err := lookupBig(vals, vp.Var)
			if err != nil {
				return specfun.Complex{}, err
			}
			x = x.Mul(bigPow(v.SetPrec(prec), vp.Exp, prec))
		}
		sum = sum.Add(x)
	}
	return sum, nil
}

// EvalBig evaluates r with prec bits.
func (r RatFunc) EvalBig(vals map[string]specfun.Complex, prec uint) (specfun.Complex, error) {
	n, err := r.num.EvalBig(vals, prec)
	if err != nil {
		return specfun.Complex{}, err
	}
	if r.IsPoly() {
		return n, nil
	}
	d, err := r.den.EvalBig(vals, prec)
	if err != nil {
		return specfun.Complex{}, err
	}
	if d.IsZero() {
		return specfun.Complex{}, fmt.Errorf("the denominator %s %w", r.den, errVanishing)
	}
	return n.Quo(d), nil
}

func evalAtomBig(a Atom, vals map[string]specfun.Complex, prec uint) (specfun.Complex, error) {
	switch x := a.(type) {
	case Const:
		switch {
		case x == Pi:
			return specfun.RealComplex(specfun.Pi(prec), prec), nil
		case x == I:
			return specfun.NewComplex(0, 1, prec), nil
		case strings.HasPrefix(x.Name, "zeta"):
			var k int
			if _, err := fmt.Sscanf(x.Name, "zeta%d", &k); err == nil && k >= 2 {
				z, err := specfun.Zeta(k, prec)
				if err != nil {
					return specfun.Complex{}, err
				}
				return specfun.RealComplex(z, prec), nil
			}
		}
	case Fn:
		args := make([]specfun.Complex, len(x.Args))
		for i, arg := range x.Args {
			v, err := arg.EvalBig(vals, prec)
			if err != nil {
				return specfun.Complex{}, err
			}
			args[i] = v
		}
		switch x.Name {
		case FnLog:
			z := args[0]
			if z.IsZero() {
				return specfun.Complex{}, fmt.Errorf("log(0) in %s", x.Key())
			}
			if z.Im.Sign() == 0 && z.Re.Sign() < 0 {
				l := specfun.Log(z.Neg(), prec)
				pi := specfun.Pi(prec)
				if x.I0 < 0 {
					pi.Neg(pi)
				}
				return specfun.ComplexOf(l.Re, pi), nil
			}
			return specfun.Log(z, prec), nil
		case FnLi2:
			return specfun.Li2BigSide(args[0], x.I0, prec), nil
		case FnCl2:
			if args[0].Im.Sign() != 0 {
				return specfun.Complex{}, fmt.Errorf("Cl2 needs a real argument")
			}
			return specfun.RealComplex(specfun.Cl2Big(args[0].Re, prec), prec), nil
		case FnSqrt:
			return specfun.Sqrt(args[0], prec), nil
		}
	}
	return specfun.Complex{}, fmt.Errorf("cannot evaluate %s numerically", a.Key())
}
