package emit

import (
	"fmt"
	"math"
	"math/big"
	"strings"
	"sync"

	"loopmatch/expr/specfun"
)

// This file holds the float64 programs the emitter writes: a tree of arithmetic on the
// arguments and on local values computed once. The same tree is printed as Go source,
// interpreted in float64 (for scans) and analysed for its rounding error in high precision.

type op uint8

const (
	opConst op = iota // a float64 constant
	opArg             // an argument
	opLocal           // a local value
	opAdd             // n-ary sum, evaluated left to right
	opSub
	opMul // n-ary product, evaluated left to right
	opDiv
	opNeg
	opLog
	opSqrt
	opLi2
	opCl2
)

// node is one operation of a float64 program.
type node struct {
	op    op
	kids  []*node
	idx   int        // opArg, opLocal
	val   float64    // opConst: the float64 value
	exact *big.Float // opConst: the exact value (at the analysis precision)
	lit   string     // opConst: Go source (an exact constant expression or a literal)
}

// local is a value computed once and named.
type local struct {
	name string
	val  *node
}

// body is a sequence of locals and a result.
type body struct {
	locals []local
	result *node
}

// u is the unit roundoff of float64.
const u = 0x1p-53

func constRat(r *big.Rat, prec uint) *node {
	f, _ := r.Float64()
	lit := r.Num().String()
	if !r.IsInt() {
		lit = "(" + r.Num().String() + ".0 / " + r.Denom().String() + ")"
	} else if !r.Num().IsInt64() || math.Abs(float64(r.Num().Int64())) > 1<<53 {
		lit = r.Num().String() + ".0"
	}
	return &node{op: opConst, val: f, exact: new(big.Float).SetPrec(prec).SetRat(r), lit: lit}
}

func constBig(x *big.Float) *node {
	f, _ := x.Float64()
	return &node{op: opConst, val: f, exact: x, lit: floatLit(f)}
}

func constInt(n int64, prec uint) *node { return constRat(big.NewRat(n, 1), prec) }

// floatLit prints f as the shortest Go literal that reads back to f.
func floatLit(f float64) string {
	s := fmt.Sprint(f)
	if !strings.ContainsAny(s, ".eEn") { // keep the float type visible: 2 → 2.0
		s += ".0"
	}
	return s
}

func isConst(n *node, v float64) bool {
	return n.op == opConst && n.val == v && n.exact != nil && n.exact.Cmp(big.NewFloat(v)) == 0
}

func mul(kids ...*node) *node {
	var ks []*node
	for _, k := range kids {
		if k == nil || isConst(k, 1) {
			continue
		}
		ks = append(ks, k)
	}
	switch len(ks) {
	case 0:
		return &node{op: opConst, val: 1, exact: big.NewFloat(1), lit: "1"}
	case 1:
		return ks[0]
	}
	return &node{op: opMul, kids: ks}
}

func add(kids ...*node) *node {
	switch len(kids) {
	case 0:
		return &node{op: opConst, val: 0, exact: new(big.Float), lit: "0"}
	case 1:
		return kids[0]
	}
	return &node{op: opAdd, kids: kids}
}

func div(a, b *node) *node {
	if isConst(b, 1) {
		return a
	}
	return &node{op: opDiv, kids: []*node{a, b}}
}

func sub(a, b *node) *node { return &node{op: opSub, kids: []*node{a, b}} }
func neg(a *node) *node    { return &node{op: opNeg, kids: []*node{a}} }
func call(o op, a *node) *node {
	return &node{op: o, kids: []*node{a}}
}
func arg(i int) *node { return &node{op: opArg, idx: i} }
func loc(i int) *node { return &node{op: opLocal, idx: i} }
func (b *body) add(name string, v *node) *node {
	b.locals = append(b.locals, local{name, v})
	return loc(len(b.locals) - 1)
}

// eval interprets the node in float64.
func (n *node) eval(args, locals []float64) float64 {
	switch n.op {
	case opConst:
		return n.val
	case opArg:
		return args[n.idx]
	case opLocal:
		return locals[n.idx]
	case opAdd:
		s := n.kids[0].eval(args, locals)
		for _, k := range n.kids[1:] {
			s += k.eval(args, locals)
		}
		return s
	case opSub:
		return n.kids[0].eval(args, locals) - n.kids[1].eval(args, locals)
	case opMul:
		p := n.kids[0].eval(args, locals)
		for _, k := range n.kids[1:] {
			p *= k.eval(args, locals)
		}
		return p
	case opDiv:
		return n.kids[0].eval(args, locals) / n.kids[1].eval(args, locals)
	case opNeg:
		return -n.kids[0].eval(args, locals)
	case opLog:
		return math.Log(n.kids[0].eval(args, locals))
	case opSqrt:
		return math.Sqrt(n.kids[0].eval(args, locals))
	case opLi2:
		return specfun.Li2Real(n.kids[0].eval(args, locals))
	case opCl2:
		return specfun.Cl2(n.kids[0].eval(args, locals))
	}
	panic("emit: unknown op")
}

func (b *body) eval(args []float64) float64 {
	var buf [32]float64
	locals := buf[:0]
	if len(b.locals) > len(buf) {
		locals = make([]float64, 0, len(b.locals))
	}
	for _, l := range b.locals {
		locals = append(locals, l.val.eval(args, locals))
	}
	return b.result.eval(args, locals)
}

// valErr is an exact value with two measures of the rounding error of its float64
// evaluation: e, a first-order bound on its absolute value, and s2, the variance of the error
// when every rounding is an independent error of standard deviation u·|result|.
type valErr struct{ v, e, s2 *big.Float }

// bound runs the forward error analysis of the node at exact arguments (N.J. Higham, Accuracy
// and Stability of Numerical Algorithms, 2nd ed., SIAM 2002, §3.1–3.3: each operation adds at
// most u·|result|, and errors of the operands propagate through the exact derivatives). Next to
// the worst-case bound it accumulates the variance of the error in the model of independent
// roundings (the probabilistic view of N.J. Higham, T. Mary, SIAM J. Sci. Comput. 41 (2019)
// A2815, where the bound's n·u becomes about √n·u). The library functions are taken as accurate
// to 2u relative (math.Log and math.Sqrt are within one ulp), the emitted dilogarithm and
// Clausen function to 8u. A division by zero or a logarithm of a non-positive number gives an
// infinite bound.
func (n *node) bound(args []*big.Float, locals []valErr, prec uint) valErr {
	nf := func() *big.Float { return new(big.Float).SetPrec(prec) }
	abs := func(x *big.Float) *big.Float { return nf().Abs(x) }
	sq := func(x *big.Float) *big.Float { return nf().Mul(x, x) }
	ru := func(x *big.Float, k float64) *big.Float { return nf().Mul(abs(x), big.NewFloat(k*u)) }
	inf := valErr{nf(), nf().SetInf(false), nf().SetInf(false)}
	switch n.op {
	case opConst:
		d := abs(nf().Sub(n.exact, big.NewFloat(n.val)))
		return valErr{n.exact, d, sq(d)}
	case opArg:
		return valErr{args[n.idx], nf(), nf()}
	case opLocal:
		return locals[n.idx]
	case opAdd:
		s := n.kids[0].bound(args, locals, prec)
		v, e, s2 := nf().Set(s.v), nf().Set(s.e), nf().Set(s.s2)
		for _, k := range n.kids[1:] {
			x := k.bound(args, locals, prec)
			v.Add(v, x.v)
			r := ru(v, 1)
			e.Add(e, x.e).Add(e, r)
			s2.Add(s2, x.s2).Add(s2, sq(r))
		}
		return valErr{v, e, s2}
	case opSub:
		a, b := n.kids[0].bound(args, locals, prec), n.kids[1].bound(args, locals, prec)
		v := nf().Sub(a.v, b.v)
		r := ru(v, 1)
		return valErr{v, nf().Add(a.e, b.e).Add(nf().Add(a.e, b.e), r), nf().Add(a.s2, b.s2).Add(nf().Add(a.s2, b.s2), sq(r))}
	case opMul:
		s := n.kids[0].bound(args, locals, prec)
		v, e, s2 := nf().Set(s.v), nf().Set(s.e), nf().Set(s.s2)
		for _, k := range n.kids[1:] {
			x := k.bound(args, locals, prec)
			e1 := nf().Mul(abs(v), x.e)
			e2 := nf().Mul(abs(x.v), e)
			v2 := nf().Mul(sq(v), x.s2)
			v3 := nf().Mul(sq(x.v), s2)
			v.Mul(v, x.v)
			r := ru(v, 1)
			e = e1.Add(e1, e2).Add(e1, r)
			s2 = v2.Add(v2, v3).Add(v2, sq(r))
		}
		return valErr{v, e, s2}
	case opDiv:
		a, b := n.kids[0].bound(args, locals, prec), n.kids[1].bound(args, locals, prec)
		if b.v.Sign() == 0 {
			return inf
		}
		v := nf().Quo(a.v, b.v)
		r := ru(v, 1)
		e := nf().Mul(abs(v), b.e)
		e.Add(e, a.e).Quo(e, abs(b.v)).Add(e, r)
		s2 := nf().Mul(sq(v), b.s2)
		s2.Add(s2, a.s2).Quo(s2, sq(b.v)).Add(s2, sq(r))
		return valErr{v, e, s2}
	case opNeg:
		a := n.kids[0].bound(args, locals, prec)
		return valErr{nf().Neg(a.v), a.e, a.s2}
	case opLog, opSqrt, opLi2, opCl2:
		a := n.kids[0].bound(args, locals, prec)
		return funcBound(n.op, a, prec)
	}
	return inf
}

// funcBound propagates the error of a through a library function: the derivative d times the
// argument's error, plus the function's own rounding of k·u relative.
func funcBound(o op, a valErr, prec uint) valErr {
	nf := func() *big.Float { return new(big.Float).SetPrec(prec) }
	inf := valErr{nf(), nf().SetInf(false), nf().SetInf(false)}
	var v, d *big.Float
	k := 2.0
	one := big.NewFloat(1)
	switch o {
	case opLog:
		if a.v.Sign() <= 0 {
			return inf
		}
		v = cachedLog(a.v, prec)
		d = nf().Quo(one, a.v)
	case opSqrt:
		if a.v.Sign() <= 0 {
			return inf
		}
		v = nf().Sqrt(a.v)
		d = nf().Quo(one, nf().Mul(v, big.NewFloat(2)))
	case opLi2:
		k = 8
		switch {
		case a.v.Sign() == 0:
			v, d = nf(), nf().SetInt64(1)
		case a.v.Cmp(one) > 0:
			return inf
		case a.v.Cmp(one) == 0:
			v = specfun.Li2Big(specfun.RealComplex(a.v, prec), prec).Re
			d = nf()
			if a.e.Sign() != 0 {
				return inf
			}
		default: // d Li2/dx = −log(1 − x)/x
			v = specfun.Li2Big(specfun.RealComplex(a.v, prec), prec).Re
			l := specfun.Log(specfun.RealComplex(nf().Sub(one, a.v), prec), prec).Re
			d = nf().Quo(l, a.v)
		}
	case opCl2:
		k = 8
		v = specfun.Cl2Big(a.v, prec)
		// d Cl2/dθ = −log|2 sin(θ/2)|, taken in float64.
		th, _ := a.v.Float64()
		d = big.NewFloat(math.Abs(math.Log(math.Abs(2*math.Sin(th/2)))) + 1)
	default:
		return inf
	}
	d.Abs(d)
	r := nf().Mul(nf().Abs(v), big.NewFloat(k*u))
	e := nf().Mul(d, a.e)
	s2 := nf().Mul(nf().Mul(d, d), a.s2)
	return valErr{v, e.Add(e, r), s2.Add(s2, nf().Mul(r, r))}
}

func (b *body) bound(args []*big.Float, prec uint) valErr {
	locals := make([]valErr, 0, len(b.locals))
	for _, l := range b.locals {
		locals = append(locals, l.val.bound(args, locals, prec))
	}
	return b.result.bound(args, locals, prec)
}

// Go precedence levels of the printed operators.
const (
	precSum  = 4
	precProd = 5
	precUnit = 6
)

// goSrc prints the node as a Go expression; argument and local names come from the caller.
func (n *node) goSrc(args []string, locals []local, fns funcNames) string {
	s, _ := n.goPrec(args, locals, fns)
	return s
}

// funcNames are the Go names of the special functions in the emitted file.
type funcNames struct{ li2, cl2 string }

func (n *node) goPrec(args []string, locals []local, fns funcNames) (string, int) {
	sub := func(k *node, min int) string {
		s, p := k.goPrec(args, locals, fns)
		if p < min {
			return "(" + s + ")"
		}
		return s
	}
	switch n.op {
	case opConst:
		if n.val < 0 || strings.HasPrefix(n.lit, "-") {
			return n.lit, precSum // a leading minus binds like a sum
		}
		return n.lit, precUnit
	case opArg:
		return args[n.idx], precUnit
	case opLocal:
		return locals[n.idx].name, precUnit
	case opAdd:
		var sb strings.Builder
		for i, k := range n.kids {
			if i > 0 && k.op == opNeg {
				sb.WriteString(" - ")
				sb.WriteString(sub(k.kids[0], precProd))
				continue
			}
			if i > 0 {
				sb.WriteString(" + ")
				sb.WriteString(sub(k, precProd))
				continue
			}
			sb.WriteString(sub(k, precSum))
		}
		return sb.String(), precSum
	case opSub:
		return sub(n.kids[0], precSum) + " - " + sub(n.kids[1], precProd), precSum
	case opMul:
		parts := make([]string, len(n.kids))
		for i, k := range n.kids {
			parts[i] = sub(k, precProd)
			if i > 0 && k.op == opConst && strings.HasPrefix(parts[i], "-") {
				parts[i] = "(" + parts[i] + ")"
			}
		}
		return strings.Join(parts, " * "), precProd
	case opDiv:
		return sub(n.kids[0], precProd) + " / " + sub(n.kids[1], precUnit), precProd
	case opNeg:
		// −(a·b) and −(a/b) print as −a·b and −a/b: negation is exact, so (−a)·b is the same
		// float64 value.
		if k := n.kids[0]; k.op == opMul || k.op == opDiv {
			return "-" + sub(k, precProd), precSum
		}
		return "-" + sub(n.kids[0], precUnit), precSum
	case opLog:
		return "math.Log(" + n.kids[0].goSrc(args, locals, fns) + ")", precUnit
	case opSqrt:
		return "math.Sqrt(" + n.kids[0].goSrc(args, locals, fns) + ")", precUnit
	case opLi2:
		return fns.li2 + "(" + n.kids[0].goSrc(args, locals, fns) + ")", precUnit
	case opCl2:
		return fns.cl2 + "(" + n.kids[0].goSrc(args, locals, fns) + ")", precUnit
	}
	return "?", precUnit
}

// uses reports the special functions a node calls.
func (n *node) uses(o op) bool {
	if n.op == o {
		return true
	}
	for _, k := range n.kids {
		if k.uses(o) {
			return true
		}
	}
	return false
}

func (b *body) uses(o op) bool {
	for _, l := range b.locals {
		if l.val.uses(o) {
			return true
		}
	}
	return b.result.uses(o)
}

// prune drops the locals the result does not use and renumbers the others.
func (b *body) prune() {
	used := make([]bool, len(b.locals))
	var mark func(n *node)
	mark = func(n *node) {
		if n.op == opLocal && !used[n.idx] {
			used[n.idx] = true
			mark(b.locals[n.idx].val)
		}
		for _, k := range n.kids {
			mark(k)
		}
	}
	mark(b.result)
	remap := make([]int, len(b.locals))
	var out []local
	for i, l := range b.locals {
		if used[i] {
			remap[i] = len(out)
			out = append(out, l)
		}
	}
	var fix func(n *node)
	seen := map[*node]bool{}
	fix = func(n *node) {
		if seen[n] {
			return
		}
		seen[n] = true
		if n.op == opLocal {
			n.idx = remap[n.idx]
		}
		for _, k := range n.kids {
			fix(k)
		}
	}
	for _, l := range out {
		fix(l.val)
	}
	fix(b.result)
	b.locals = out
}

// logCache holds logarithms of float64 values at a precision: the analysis evaluates log x at
// the same grid points for every function.
var logCache sync.Map // logKey → *big.Float

type logKey struct {
	x    float64
	prec uint
}

func cachedLog(x *big.Float, prec uint) *big.Float {
	f, acc := x.Float64()
	if acc != big.Exact {
		return specfun.Log(specfun.RealComplex(x, prec), prec).Re
	}
	k := logKey{f, prec}
	if v, ok := logCache.Load(k); ok {
		return v.(*big.Float)
	}
	v := specfun.Log(specfun.RealComplex(x, prec), prec).Re
	logCache.Store(k, v)
	return v
}
