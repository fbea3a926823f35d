package pv

import (
	"fmt"
	"math/big"

	"loopmatch/expr"
	"loopmatch/loops"
)

// bigEvaluator evaluates a reduced coefficient at a numeric kinematic point with the exact
// rational coefficients (expanded in ε) and loops' arbitrary-precision scalar integrals, so that
// the cancellations between the terms of a Passarino–Veltman result (inverse Gram determinants)
// cost no digits. Scalar integrals are cached by atom.
type bigEvaluator struct {
	mu2   float64
	prec  uint
	cache map[string]loops.BigValue
}

func newBigEvaluator(mu2 float64) *bigEvaluator {
	return &bigEvaluator{mu2: mu2, prec: 128, cache: map[string]loops.BigValue{}}
}

// eval returns the 1/ε pole and the finite part (real parts) of e, which must be rational in d
// times one real scalar-integral atom per term (no 1/ε² poles: Euclidean points).
func (b *bigEvaluator) eval(e expr.Expr) (pole, finite *big.Float, err error) {
	pole = new(big.Float).SetPrec(b.prec)
	finite = new(big.Float).SetPrec(b.prec)
	for _, t := range e.Terms() {
		if len(t.Atoms) != 1 || t.Atoms[0].Pow != 1 {
			return nil, nil, fmt.Errorf("term %s is not one scalar integral", expr.FromTerm(t))
		}
		f, ok := t.Atoms[0].A.(expr.Fn)
		if !ok {
			return nil, nil, fmt.Errorf("atom %s is not a scalar integral", f.Key())
		}
		v, err := b.atom(f)
		if err != nil {
			return nil, nil, err
		}
		s, err := expr.SeriesFromRatFunc(t.Coef, 2)
		if err != nil {
			return nil, nil, err
		}
		if s.Lo < 0 {
			return nil, nil, fmt.Errorf("coefficient %s has a pole in ε", t.Coef)
		}
		c0, err := constOf(s.Coef(0), b.prec)
		if err != nil {
			return nil, nil, err
		}
		c1, err := constOf(s.Coef(1), b.prec)
		if err != nil {
			return nil, nil, err
		}
		if v.Pole2.Re.Sign() != 0 {
			return nil, nil, fmt.Errorf("%s has a double pole", f.Key())
		}
		x := new(big.Float).SetPrec(b.prec)
		pole.Add(pole, x.Mul(c0, v.Pole1.Re))
		finite.Add(finite, new(big.Float).SetPrec(b.prec).Mul(c0, v.Finite.Re))
		finite.Add(finite, new(big.Float).SetPrec(b.prec).Mul(c1, v.Pole1.Re))
	}
	return pole, finite, nil
}

// constOf converts a rational constant expression to a big.Float.
func constOf(e expr.Expr, prec uint) (*big.Float, error) {
	r, ok := e.AsRatFunc()
	if !ok {
		return nil, fmt.Errorf("%s is not rational", e)
	}
	c, ok := r.ConstValue()
	if !ok {
		return nil, fmt.Errorf("%s is not a constant", e)
	}
	return new(big.Float).SetPrec(prec).SetRat(c), nil
}

// atom evaluates a squared-mass scalar-integral atom in arbitrary precision.
func (b *bigEvaluator) atom(f expr.Fn) (loops.BigValue, error) {
	if v, ok := b.cache[f.Key()]; ok {
		return v, nil
	}
	args := make([]*big.Float, len(f.Args))
	for i, a := range f.Args {
		x, err := constOf(a, b.prec)
		if err != nil {
			return loops.BigValue{}, err
		}
		args[i] = x
	}
	mu2 := new(big.Float).SetPrec(b.prec).SetFloat64(b.mu2)
	var v loops.BigValue
	var err error
	switch f.Name {
	case loops.TadName:
		v, err = loops.A0Big(args[0], mu2, b.prec)
	case loops.BubName:
		v, err = loops.B0Big(args[0], args[1], args[2], mu2, b.prec)
	case loops.TriName:
		v, err = loops.C0Big(args[0], args[1], args[2], args[3], args[4], args[5], mu2, b.prec)
	case loops.BoxName:
		v, err = loops.D0Big(args[0], args[1], args[2], args[3], args[4], args[5], args[6], args[7], args[8], args[9], mu2, b.prec)
	default:
		err = fmt.Errorf("unknown scalar integral %s", f.Name)
	}
	if err == nil {
		b.cache[f.Key()] = v
	}
	return v, err
}
