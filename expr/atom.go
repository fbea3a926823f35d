package expr

import (
	"fmt"
	"math/big"
	"strings"
)

// Atom is an indivisible factor of a term. Atoms with equal keys are equal; the key is also
// the atom's canonical text, so printing is deterministic. The concrete atoms are
//
//	Const   π, ζ3, ζ5, …, and the imaginary unit I
//	Fn      a function of expressions: log, Li2, Cl2, sqrt, and opaque named functions such as the
//	        scalar integrals A0, B0, C0, D0 (the packages that own them give them meaning)
//	Dot     a scalar product p.q of two momenta
//	Vec     a vector component p[mu]
//	Metric  the metric g(mu, nu)
//	Levi    the Levi-Civita symbol levi(a, b, c, d) with index or momentum slots
//	Prop    a propagator denominator K^2 − M², appearing with negative powers
//	Chain   a closed spinor chain ubar(a) … u(b), with its Dirac and colour matrices in order
//	Trace   the trace of a string of Dirac and colour matrices (a fermion loop)
//	Colour  colour objects outside chains: f(a, b, c), delta(i, j)
type Atom interface {
	// Key is the canonical text of the atom.
	Key() string
	// order is the sort class: atoms sort by class, then by key.
	order() int
}

// Sort classes of atoms: constants first, then transcendental functions, then kinematics,
// colour, propagators and chains.
const (
	classConst = iota
	classFn
	classDot
	classVec
	classMetric
	classLevi
	classColour
	classChain
	classTrace
	classProp
)

// Const is a named transcendental constant or the imaginary unit.
type Const struct{ Name string }

// The constants the engine knows by name.
var (
	Pi    = Const{"pi"}
	Zeta3 = Const{"zeta3"}
	Zeta5 = Const{"zeta5"}
	Zeta7 = Const{"zeta7"}
	I     = Const{"I"}
)

func (c Const) Key() string { return c.Name }
func (c Const) order() int  { return classConst }

// Fn is a function applied to expression arguments. I0 records an infinitesimal imaginary part
// of the (single) argument for log and Li2: +1 means arg + i0 (the default reading of a negative
// real argument), −1 means arg − i0.
type Fn struct {
	Name  string
	Args  []Expr
	I0    int
	Split int // number of leading arguments printed before a ";" (invariants; masses), 0 for none
	key   string
}

// NewFn builds a function atom.
func NewFn(name string, i0 int, args ...Expr) Fn { return NewFnSplit(name, i0, 0, args...) }

// NewFnSplit builds a function atom whose first split arguments are separated from the rest
// by ";" in its text, as in B0(p2; m0, m1).
func NewFnSplit(name string, i0, split int, args ...Expr) Fn {
	f := Fn{Name: name, Args: args, I0: i0, Split: split}
	var sb strings.Builder
	sb.WriteString(name)
	sb.WriteString("(")
	for i, a := range args {
		switch {
		case i > 0 && i == split:
			sb.WriteString("; ")
		case i > 0:
			sb.WriteString(", ")
		}
		sb.WriteString(a.String())
	}
	if i0 < 0 {
		sb.WriteString(" - i0")
	}
	sb.WriteString(")")
	f.key = sb.String()
	return f
}

func (f Fn) Key() string { return f.key }
func (f Fn) order() int  { return classFn }

// Dot is the scalar product of two momenta, stored with A ≤ B.
type Dot struct{ A, B string }

// NewDot returns the canonical Dot.
func NewDot(a, b string) Dot {
	if b < a {
		a, b = b, a
	}
	return Dot{a, b}
}

func (d Dot) Key() string { return d.A + "." + d.B }
func (d Dot) order() int  { return classDot }

// Vec is the component p[mu] of a momentum or polarisation vector.
type Vec struct{ P, Mu string }

func (v Vec) Key() string { return v.P + "[" + v.Mu + "]" }
func (v Vec) order() int  { return classVec }

// Metric is g(mu, nu), stored with Mu ≤ Nu.
type Metric struct{ Mu, Nu string }

// NewMetric returns the canonical Metric.
func NewMetric(mu, nu string) Metric {
	if nu < mu {
		mu, nu = nu, mu
	}
	return Metric{mu, nu}
}

func (g Metric) Key() string { return "g(" + g.Mu + ", " + g.Nu + ")" }
func (g Metric) order() int  { return classMetric }

// Slot is one argument of the Levi-Civita symbol: a Lorentz index or a momentum contracted
// into it.
type Slot struct {
	Name  string
	Index bool
}

// Levi is ε^{abcd} with index or momentum slots. Its canonical form has the slots sorted (the
// sign of the permutation goes to the coefficient); see NewLevi.
type Levi struct{ S [4]Slot }

func (l Levi) Key() string {
	parts := make([]string, 4)
	for i, s := range l.S {
		parts[i] = s.Name
	}
	return "levi(" + strings.Join(parts, ", ") + ")"
}
func (l Levi) order() int { return classLevi }

// NewLevi sorts the slots and returns the sign of the permutation; the sign is 0 when two slots
// are equal (the symbol vanishes).
func NewLevi(s [4]Slot) (Levi, int) {
	sign := 1
	for i := 0; i < 4; i++ {
		for j := 0; j < 3-i; j++ {
			if s[j].Name > s[j+1].Name {
				s[j], s[j+1] = s[j+1], s[j]
				sign = -sign
			} else if s[j].Name == s[j+1].Name {
				return Levi{}, 0
			}
		}
	}
	for j := 0; j < 3; j++ {
		if s[j].Name == s[j+1].Name {
			return Levi{}, 0
		}
	}
	return Levi{s}, sign
}

// Prop is the propagator denominator K² − M². K is canonical up to sign: its first momentum has
// a positive coefficient.
type Prop struct {
	K   Mom
	M2  RatFunc
	key string
}

// NewProp returns the canonical propagator for K² − M2.
func NewProp(k Mom, m2 RatFunc) Prop {
	if len(k) > 0 && k[0].Coef.Sign() < 0 {
		k = k.Scale(big.NewRat(-1, 1))
	}
	p := Prop{K: k, M2: m2}
	var sb strings.Builder
	sb.WriteString("(")
	if k.isSingle() {
		sb.WriteString(k.String())
	} else {
		sb.WriteString("(" + k.String() + ")")
	}
	sb.WriteString("^2")
	switch {
	case m2.IsZero():
	case m2.Num().Len() == 1 && m2.IsPoly():
		c := m2.Num().terms[0].Coef
		if c.Sign() < 0 {
			sb.WriteString(" + ")
			sb.WriteString(m2.Neg().String())
		} else {
			sb.WriteString(" - ")
			sb.WriteString(m2.String())
		}
	default:
		sb.WriteString(" - (" + m2.String() + ")")
	}
	sb.WriteString(")")
	p.key = sb.String()
	return p
}

func (p Prop) Key() string { return p.key }
func (p Prop) order() int  { return classProp }

// Massless reports whether the propagator has M² = 0.
func (p Prop) Massless() bool { return p.M2.IsZero() }

// NCOp names an element of a non-commuting string.
type NCOp int

// The elements of Dirac and colour strings.
const (
	NCGamma NCOp = iota // gamma(mu)
	NCSlash             // slash(p)
	NCG5                // G5
	NCPL                // PL = (1 − γ5)/2
	NCPR                // PR = (1 + γ5)/2
	NCSigma             // sigma(mu, nu) = (i/2)[γ^mu, γ^nu]
	NCUBar              // ubar(leg)
	NCVBar              // vbar(leg)
	NCU                 // u(leg)
	NCV                 // v(leg)
	NCT                 // T(a): colour generator in the fundamental representation
)

var ncNames = [...]string{"gamma", "slash", "G5", "PL", "PR", "sigma", "ubar", "vbar", "u", "v", "T"}

// NC is one element of a non-commuting string. Args holds Lorentz indices (gamma, sigma), the
// momentum (slash), the leg (spinors) or the adjoint colour index (T).
type NC struct {
	Op   NCOp
	Args []string
}

// Key is the element's canonical text.
func (n NC) Key() string {
	switch n.Op {
	case NCG5, NCPL, NCPR:
		return ncNames[n.Op]
	}
	return ncNames[n.Op] + "(" + strings.Join(n.Args, ", ") + ")"
}

// IsBar reports whether the element opens a spinor chain (ubar, vbar).
func (n NC) IsBar() bool { return n.Op == NCUBar || n.Op == NCVBar }

// IsSpinor reports whether the element closes a spinor chain (u, v).
func (n NC) IsSpinor() bool { return n.Op == NCU || n.Op == NCV }

// Chain is a closed spinor chain: Elems[0] is ubar/vbar, the last element u/v, and between them
// Dirac and colour matrices in order.
type Chain struct {
	Elems []NC
	key   string
}

// NewChain builds a chain atom from its elements.
func NewChain(elems []NC) Chain {
	parts := make([]string, len(elems))
	for i, e := range elems {
		parts[i] = e.Key()
	}
	return Chain{Elems: elems, key: "(" + strings.Join(parts, " ") + ")"}
}

func (c Chain) Key() string { return c.key }
func (c Chain) order() int  { return classChain }

// Trace is the trace of a closed string of Dirac and colour matrices (a fermion loop):
// tr(gamma(al) slash(k) …). Package expr/dirac evaluates it.
type Trace struct {
	Elems []NC
	key   string
}

// NewTrace builds a trace atom from its elements.
func NewTrace(elems []NC) Trace {
	parts := make([]string, len(elems))
	for i, e := range elems {
		parts[i] = e.Key()
	}
	return Trace{Elems: elems, key: "tr(" + strings.Join(parts, " ") + ")"}
}

func (t Trace) Key() string { return t.key }
func (t Trace) order() int  { return classTrace }

// Colour is a colour object outside spinor chains: the structure constants f(a, b, c) (slots
// sorted, sign of the permutation to the coefficient) or delta(i, j).
type Colour struct {
	Name string // "f" or "delta"
	Args []string
}

func (c Colour) Key() string { return c.Name + "(" + strings.Join(c.Args, ", ") + ")" }
func (c Colour) order() int  { return classColour }

// AtomPow is an atom raised to a nonzero integer power.
type AtomPow struct {
	A   Atom
	Pow int
}

func atomCmp(a, b Atom) int {
	if a.order() != b.order() {
		return a.order() - b.order()
	}
	return strings.Compare(a.Key(), b.Key())
}

// atomText prints a^n (n ≥ 1) for use in a product.
func atomText(a Atom, n int) string {
	s := a.Key()
	if n == 1 {
		return s
	}
	return fmt.Sprintf("%s^%d", s, n)
}

// RatText prints a rational number the way the canonical text does.
func RatText(r *big.Rat) string { return r.RatString() }

// NewStructureF returns the canonical f(a, b, c) (slots sorted) and the sign of the
// permutation; the sign is 0 when two slots are equal.
func NewStructureF(a, b, c string) (Colour, int) {
	s := []string{a, b, c}
	sign := 1
	for i := 0; i < 3; i++ {
		for j := 0; j < 2-i; j++ {
			switch {
			case s[j] > s[j+1]:
				s[j], s[j+1] = s[j+1], s[j]
				sign = -sign
			case s[j] == s[j+1]:
				return Colour{}, 0
			}
		}
	}
	if s[0] == s[1] || s[1] == s[2] {
		return Colour{}, 0
	}
	return Colour{Name: "f", Args: s}, sign
}

// NewDelta returns the canonical delta(i, j) (symmetric, slots sorted).
func NewDelta(i, j string) Colour {
	if j < i {
		i, j = j, i
	}
	return Colour{Name: "delta", Args: []string{i, j}}
}
