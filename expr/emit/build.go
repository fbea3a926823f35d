package emit

import (
	"fmt"
	"math/big"
	"strings"

	"loopmatch/expr"
)

// This file turns an expression of real variables into a float64 program that keeps the
// digits a naive one-to-one translation loses for no reason: denominators are evaluated as products of
// their square-free factors (so (x − 1)^4 is (x − 1)·(x − 1)·… and not x^4 − 4x^3 + …, whose
// evaluation near x = 1 cancels), numerators by Horner's rule, and every logarithm, factor and
// power once.

// builder assembles one body.
type builder struct {
	vars  []string // argument names, in order
	prec  uint
	b     body
	cache map[string]*node // CSE of locals by key
	names map[string]bool
	seq   int
}

func newBuilder(vars []string, prec uint) *builder {
	bl := &builder{vars: vars, prec: prec, cache: map[string]*node{}, names: map[string]bool{}}
	for _, v := range vars {
		bl.names[v] = true
	}
	return bl
}

// name returns a fresh local name built from base.
func (bl *builder) name(base string) string {
	if !bl.names[base] && !goReserved[base] {
		bl.names[base] = true
		return base
	}
	for i := 2; ; i++ {
		s := fmt.Sprintf("%s%d", base, i)
		if !bl.names[s] && !goReserved[s] {
			bl.names[s] = true
			return s
		}
	}
}

// goReserved holds names an emitted local must not take.
var goReserved = map[string]bool{
	"break": true, "case": true, "chan": true, "const": true, "continue": true, "default": true,
	"defer": true, "else": true, "fallthrough": true, "for": true, "func": true, "go": true,
	"goto": true, "if": true, "import": true, "interface": true, "map": true, "package": true,
	"range": true, "return": true, "select": true, "struct": true, "switch": true, "type": true,
	"var": true, "math": true, "cmplx": true, "real": true, "complex": true,
	"imag": true, "len": true, "cap": true, "new": true, "make": true, "min": true, "max": true,
	"true": true, "false": true, "nil": true, "iota": true, "float64": true, "complex128": true,
}

// localOf returns the cached local for key or creates it.
func (bl *builder) localOf(key, base string, mk func() (*node, error)) (*node, error) {
	if n, ok := bl.cache[key]; ok {
		return n, nil
	}
	v, err := mk()
	if err != nil {
		return nil, err
	}
	n := bl.b.add(bl.name(base), v)
	bl.cache[key] = n
	return n, nil
}

func (bl *builder) varNode(v string) (*node, error) {
	for i, x := range bl.vars {
		if x == v {
			return arg(i), nil
		}
	}
	return nil, fmt.Errorf("the symbol %s is not an argument of the function", v)
}

// poly returns p(vars) by Horner's rule in the first variable that occurs, recursively.
func (bl *builder) poly(p expr.Poly) (*node, error) {
	if c, ok := p.ConstValue(); ok {
		return constRat(c, bl.prec), nil
	}
	var v string
	for _, x := range bl.vars {
		if p.Has(x) {
			v = x
			break
		}
	}
	if v == "" {
		return nil, fmt.Errorf("the polynomial %s has a symbol that is not an argument", p)
	}
	xv, _ := bl.varNode(v)
	cs := p.CoeffsIn(v)
	// p = v^k·q with q(0) ≠ 0
	k := 0
	for cs[k].IsZero() {
		k++
	}
	cs = cs[k:]
	var acc *node
	for i := len(cs) - 1; i >= 0; i-- {
		var c *node
		if !cs[i].IsZero() {
			var err error
			if c, err = bl.poly(cs[i]); err != nil {
				return nil, err
			}
		}
		switch {
		case acc == nil:
			acc = c
		case c == nil:
			acc = mul(acc, xv)
		default:
			acc = addTerm(mul(acc, xv), c)
		}
	}
	for i := 0; i < k; i++ {
		acc = mul(acc, xv)
	}
	return acc, nil
}

// addTerm returns a + c, written a − |c| for a negative constant c.
func addTerm(a, c *node) *node {
	if c.op == opConst && c.val < 0 {
		m := *c
		m.val = -c.val
		m.exact = new(big.Float).Neg(c.exact)
		m.lit = strings.TrimPrefix(c.lit, "-")
		if strings.HasPrefix(m.lit, "(-") {
			m.lit = "(" + strings.TrimPrefix(m.lit, "(-")
		}
		return sub(a, &m)
	}
	return add(a, c)
}

// factorPow returns f^n for a polynomial factor f, as a local when f is not a single symbol;
// powers are built by repeated squaring, each power a local.
func (bl *builder) factorPow(f expr.Poly, n int) (*node, error) {
	key := "f:" + f.String()
	var base *node
	if vs := f.Vars(); len(vs) == 1 && f.Equal(expr.PolyVar(vs[0])) {
		base, _ = bl.varNode(vs[0])
	} else {
		var err error
		base, err = bl.localOf(key, "d", func() (*node, error) { return bl.poly(f) })
		if err != nil {
			return nil, err
		}
	}
	return bl.power(key, base, n)
}

func (bl *builder) power(key string, base *node, n int) (*node, error) {
	if n == 1 {
		return base, nil
	}
	bname := "p"
	if base.op == opLocal {
		bname = bl.b.locals[base.idx].name
	} else if base.op == opArg {
		bname = bl.vars[base.idx]
	}
	return bl.localOf(fmt.Sprintf("%s^%d", key, n), fmt.Sprintf("%s%d", bname, n), func() (*node, error) {
		if n == 2 {
			return mul(base, base), nil
		}
		half, err := bl.power(key, base, n/2)
		if err != nil {
			return nil, err
		}
		if n%2 == 0 {
			return mul(half, half), nil
		}
		return mul(half, half, base), nil
	})
}

// ratFunc returns num/den as (numerator node, denominator node) with den factored.
func (bl *builder) ratFunc(r expr.RatFunc) (*node, *node, error) {
	cn, np := r.Num().PrimitiveZ()
	cd, fs := expr.SquareFree(r.Den())
	c := new(big.Rat).Quo(cn, cd)
	num, err := bl.poly(np)
	if err != nil {
		return nil, nil, err
	}
	var dens []*node
	for _, f := range fs {
		d, err := bl.factorPow(f.P, f.Pow)
		if err != nil {
			return nil, nil, err
		}
		dens = append(dens, d)
	}
	numN := new(big.Int).Abs(c.Num())
	nums := []*node{}
	if numN.Cmp(big.NewInt(1)) != 0 {
		nums = append(nums, constRat(new(big.Rat).SetInt(numN), bl.prec))
	}
	if !isConst(num, 1) {
		nums = append(nums, num)
	}
	if c.Denom().Cmp(big.NewInt(1)) != 0 {
		dens = append([]*node{constRat(new(big.Rat).SetInt(c.Denom()), bl.prec)}, dens...)
	}
	n := mul(nums...)
	if c.Sign() < 0 {
		n = neg(n)
	}
	return n, mul(dens...), nil
}

// atom returns the local holding a function atom of the arguments.
func (bl *builder) atom(a expr.Atom) (*node, error) {
	f, ok := a.(expr.Fn)
	if !ok || len(f.Args) != 1 {
		return nil, fmt.Errorf("%s has no float64 form", a.Key())
	}
	var o op
	base := "l"
	switch f.Name {
	case expr.FnLog:
		o, base = opLog, "log"
	case expr.FnSqrt:
		o, base = opSqrt, "sqrt"
	case expr.FnLi2:
		o, base = opLi2, "li2"
	case expr.FnCl2:
		o, base = opCl2, "cl2"
	default:
		return nil, fmt.Errorf("%s has no float64 form", a.Key())
	}
	r, ok := f.Args[0].AsRatFunc()
	if !ok {
		return nil, fmt.Errorf("the argument of %s is not a rational function", a.Key())
	}
	if vs := r.Vars(); len(vs) == 1 && r.Equal(expr.RFVar(vs[0])) {
		base += vs[0]
	} else {
		base = base[:1]
	}
	return bl.localOf("a:"+a.Key(), base, func() (*node, error) {
		n, d, err := bl.ratFunc(r)
		if err != nil {
			return nil, err
		}
		return call(o, div(n, d)), nil
	})
}

// constant returns the float64 value of a product of constant atoms (π, ζ3, log 2, …) times c.
func constant(c *big.Rat, atoms []expr.AtomPow, prec uint) (*node, error) {
	if len(atoms) == 0 {
		return constRat(c, prec), nil
	}
	e := expr.FromTerm(expr.Term{Coef: expr.RFRat(c), Atoms: atoms})
	v, err := e.EvalBig(nil, prec)
	if err != nil {
		return nil, err
	}
	if v.Im.Sign() != 0 {
		return nil, fmt.Errorf("the constant %s is not real", e)
	}
	return constBig(v.Re), nil
}

// build returns the program of a real expression of the builder's variables.
func (bl *builder) build(e expr.Expr) (*node, error) {
	var terms []*node
	for _, t := range e.Terms() {
		if len(t.Loops) > 0 || len(t.NC) > 0 {
			return nil, fmt.Errorf("a loop integral or a Dirac string has no float64 form: %s", t)
		}
		num, den, err := bl.ratFunc(t.Coef)
		if err != nil {
			return nil, err
		}
		negate := false
		if num.op == opNeg {
			negate, num = true, num.kids[0]
		}
		nums, dens := []*node{}, []*node{}
		var consts []expr.AtomPow
		for _, a := range t.Atoms {
			if !dependsOn(a.A, bl.vars) {
				consts = append(consts, a)
				continue
			}
			x, err := bl.atom(a.A)
			if err != nil {
				return nil, err
			}
			p, err := bl.power("a:"+a.A.Key(), x, abs(a.Pow))
			if err != nil {
				return nil, err
			}
			if a.Pow > 0 {
				nums = append(nums, p)
			} else {
				dens = append(dens, p)
			}
		}
		if len(consts) > 0 {
			k, err := constant(big.NewRat(1, 1), consts, bl.prec)
			if err != nil {
				return nil, err
			}
			if k.val < 0 {
				negate = !negate
				k = constBig(new(big.Float).Neg(k.exact))
			}
			nums = append([]*node{k}, nums...)
		}
		n := mul(append([]*node{num}, nums...)...)
		if len(dens) > 0 {
			den = mul(append([]*node{den}, dens...)...)
		}
		term := div(n, den)
		if negate {
			term = neg(term)
		}
		terms = append(terms, term)
	}
	return add(terms...), nil
}

func abs(n int) int {
	if n < 0 {
		return -n
	}
	return n
}

// dependsOn reports whether an atom involves one of the variables.
func dependsOn(a expr.Atom, vars []string) bool {
	f, ok := a.(expr.Fn)
	if !ok {
		return false
	}
	for _, arg := range f.Args {
		for _, v := range arg.Vars() {
			for _, w := range vars {
				if v == w {
					return true
				}
			}
		}
	}
	return false
}

// closedForm builds the body of e in the variables vars.
func closedForm(e expr.Expr, vars []string, prec uint) (*body, error) {
	bl := newBuilder(vars, prec)
	r, err := bl.build(e)
	if err != nil {
		return nil, err
	}
	bl.b.result = r
	bl.b.prune()
	return &bl.b, nil
}
