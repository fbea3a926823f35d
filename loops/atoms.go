package loops

import (
	"fmt"
	"math/cmplx"

	"loopmatch/expr"
)

// Names of the scalar-integral atoms inside expressions (expr.Fn). Unlike the notation's calls
// A0(m), B0(p2; m0, m1), … they take the masses SQUARED, so that reductions stay rational:
//
//	Tad(M0²) = A0(M0)
//	Bub(p²; M0², M1²) = B0(p²; M0, M1),  dBub(p²; M0², M1²) = ∂B0/∂p²
//	Tri(s1, s2, s3; M0², M1², M2²) = C0(s1, s2, s3; M0, M1, M2)
//	Box(s01, s12, s23, s30, s02, s13; M0², …, M3²) = D0(…; M0, …, M3)
const (
	TadName  = "Tad"
	BubName  = "Bub"
	DBubName = "dBub"
	TriName  = "Tri"
	BoxName  = "Box"
)

// squaredArity gives the invariants and masses of each atom.
var squaredArity = map[string][2]int{
	TadName: {0, 1}, BubName: {1, 2}, DBubName: {1, 2}, TriName: {3, 3}, BoxName: {6, 4},
}

// notationArity is the same for the notation's calls with masses (not squared).
var notationArity = map[string][2]int{
	"A0": {0, 1}, "B0": {1, 2}, "B0prime": {1, 2}, "C0": {3, 3}, "D0": {6, 4},
}

// Atom returns the scalar-integral atom name(invariants; masses squared).
func Atom(name string, invariants []expr.RatFunc, m2 []expr.RatFunc) (expr.Expr, error) {
	ar, ok := squaredArity[name]
	if !ok {
		return expr.Expr{}, fmt.Errorf("unknown scalar integral %s", name)
	}
	if len(invariants) != ar[0] || len(m2) != ar[1] {
		return expr.Expr{}, fmt.Errorf("%s takes %d invariants and %d masses", name, ar[0], ar[1])
	}
	var args []expr.Expr
	for _, x := range invariants {
		args = append(args, expr.FromRF(x))
	}
	for _, x := range m2 {
		args = append(args, expr.FromRF(x))
	}
	return expr.FromAtom(expr.NewFnSplit(name, 1, ar[0], args...), 1), nil
}

// IsScalarAtom reports whether a is one of the scalar-integral atoms (squared-mass or notation
// form).
func IsScalarAtom(a expr.Atom) bool {
	f, ok := a.(expr.Fn)
	if !ok {
		return false
	}
	_, sq := squaredArity[f.Name]
	_, nt := notationArity[f.Name]
	return sq || nt
}

// laurent is a truncated Laurent series Σ_{k=lo}^{order−1} c_k ε^k with complex coefficients.
type laurent struct {
	lo    int
	c     []complex128
	order int
}

func (a laurent) at(k int) complex128 {
	if k < a.lo || k >= a.order {
		return 0
	}
	return a.c[k-a.lo]
}

func (a laurent) mul(b laurent) laurent {
	lo := a.lo + b.lo
	order := min(a.lo+b.order, b.lo+a.order)
	out := laurent{lo: lo, order: order, c: make([]complex128, max(order-lo, 0))}
	for k := lo; k < order; k++ {
		var s complex128
		for i := a.lo; i < a.order; i++ {
			s += a.at(i) * b.at(k-i)
		}
		out.c[k-lo] = s
	}
	return out
}

func fromValue(v Value) laurent {
	return laurent{lo: -2, order: 1, c: []complex128{v.Pole2, v.Pole1, v.Finite}}
}

// EvalLaurent evaluates an expression whose terms are rational functions of d and the
// parameters times scalar-integral atoms (either form) and ε-free atoms, at the given values of
// the symbols and μ² = mu2. It returns the coefficients of 1/ε², 1/ε and ε⁰ without the common
// factor i/(16π²) per loop. It fails when a product of divergent integrals would need their
// O(ε) parts, which the numerical functions do not provide.
func EvalLaurent(e expr.Expr, vals map[string]complex128, mu2 float64) (Value, error) {
	var total [3]complex128
	for _, t := range e.Terms() {
		if len(t.Loops) > 0 || len(t.NC) > 0 {
			return Value{}, fmt.Errorf("cannot evaluate %s numerically: it is still a loop integral or a Dirac string", t)
		}
		rest := expr.Term{Coef: expr.RFInt(1)}
		prod := laurent{lo: 0, order: 3, c: []complex128{1, 0, 0}}
		for _, a := range t.Atoms {
			if !IsScalarAtom(a.A) {
				rest.Atoms = append(rest.Atoms, a)
				continue
			}
			if a.Pow < 0 {
				return Value{}, fmt.Errorf("scalar integral %s in a denominator", a.A.Key())
			}
			v, err := evalAtom(a.A.(expr.Fn), vals, mu2)
			if err != nil {
				return Value{}, err
			}
			for range a.Pow {
				prod = prod.mul(fromValue(v))
			}
		}
		cs, err := expr.SeriesFromRatFunc(t.Coef, 3)
		if err != nil {
			return Value{}, err
		}
		coef := laurent{lo: cs.Lo, order: cs.Order, c: make([]complex128, cs.Order-cs.Lo)}
		for k := cs.Lo; k < cs.Order; k++ {
			x, err := cs.Coef(k).Eval(vals)
			if err != nil {
				return Value{}, err
			}
			coef.c[k-cs.Lo] = x
		}
		restVal, err := expr.FromTerm(rest).Eval(vals)
		if err != nil {
			return Value{}, err
		}
		r := prod.mul(coef)
		if r.order < 1 {
			return Value{}, fmt.Errorf("evaluating %s needs O(ε) parts of divergent scalar integrals", t)
		}
		for k := r.lo; k < -2; k++ {
			if r.at(k) != 0 {
				return Value{}, fmt.Errorf("%s has a pole of order %d", t, -k)
			}
		}
		for k := -2; k <= 0; k++ {
			total[k+2] += r.at(k) * restVal
		}
	}
	return Value{Pole2: total[0], Pole1: total[1], Finite: total[2]}, nil
}

// evalAtom evaluates one scalar-integral atom numerically (real arguments only).
func evalAtom(f expr.Fn, vals map[string]complex128, mu2 float64) (Value, error) {
	args := make([]float64, len(f.Args))
	for i, a := range f.Args {
		x, err := a.Eval(vals)
		if err != nil {
			return Value{}, err
		}
		if imag(x) != 0 || cmplx.IsNaN(x) {
			return Value{}, fmt.Errorf("%s: argument %d is not real (%v)", f.Key(), i+1, x)
		}
		args[i] = real(x)
	}
	if _, ok := notationArity[f.Name]; ok {
		return Eval(f.Name, args, mu2)
	}
	ar := squaredArity[f.Name]
	inv, m2 := args[:ar[0]], args[ar[0]:]
	for _, m := range m2 {
		if m < 0 {
			return Value{}, fmt.Errorf("%s: negative mass squared %g", f.Key(), m)
		}
	}
	switch f.Name {
	case TadName:
		return A0(m2[0], mu2)
	case BubName:
		return B0(inv[0], m2[0], m2[1], mu2)
	case DBubName:
		return B0Prime(inv[0], m2[0], m2[1], mu2)
	case TriName:
		return C0(inv[0], inv[1], inv[2], m2[0], m2[1], m2[2], mu2)
	case BoxName:
		return D0(inv[0], inv[1], inv[2], inv[3], inv[4], inv[5], m2[0], m2[1], m2[2], m2[3], mu2)
	}
	return Value{}, fmt.Errorf("unknown scalar integral %s", f.Name)
}
