package expr

import (
	"errors"
	"fmt"
	"math/big"
	"slices"
	"strings"
)

// Term is one product in an expression: a rational-function coefficient, commuting atoms with
// integer powers, an ordered string of non-commuting elements (empty once spinor chains are
// closed), and the loop momenta the term is integrated over (∫ d^dk/(2π)^d with the MS-bar
// measure of the notation; empty for tree-level terms).
type Term struct {
	Coef  RatFunc
	Atoms []AtomPow
	NC    []NC
	Loops []string
	key   string
}

// Expr is a sum of terms in canonical form: terms sorted by their atoms, equal atom products
// merged, no zero coefficients. The zero Expr has no terms. An Expr is immutable.
type Expr struct {
	terms []Term
}

// MaxTerms bounds the number of terms any single operation may produce; beyond it the operation
// fails with ErrTooLarge instead of exhausting memory.
var MaxTerms = 200000

// MaxPolyWork bounds the number of polynomial term products one multiplication of expressions
// may perform, so that coefficients cannot grow without limit.
var MaxPolyWork = 20_000_000

// mulWork estimates the coefficient work of e·b.
func mulWork(e, b Expr) int {
	sb := 0
	for _, y := range b.terms {
		sb += y.Coef.num.Len() + y.Coef.Den().Len()
	}
	w := 0
	for _, x := range e.terms {
		w += (x.Coef.num.Len() + x.Coef.Den().Len()) * sb
		if w > MaxPolyWork {
			return w
		}
	}
	return w
}

// ErrTooLarge reports that an expression outgrew MaxTerms.
var ErrTooLarge = errors.New("expression too large")

// Zero is the zero expression.
func Zero() Expr { return Expr{} }

// Int returns the constant n.
func Int(n int64) Expr { return FromRF(RFInt(n)) }

// Num returns the rational constant r.
func Num(r *big.Rat) Expr { return FromRF(RFRat(r)) }

// Sym returns the symbol v.
func Sym(v string) Expr { return FromRF(RFVar(v)) }

// FromRF returns the rational function r as an expression.
func FromRF(r RatFunc) Expr {
	if r.IsZero() {
		return Expr{}
	}
	return Expr{terms: []Term{normTermMust(Term{Coef: r.fix()})}}
}

// FromAtom returns a^pow.
func FromAtom(a Atom, pow int) Expr {
	return fromTerm(Term{Coef: RFInt(1), Atoms: []AtomPow{{a, pow}}})
}

// FromNC returns the single non-commuting element n.
func FromNC(n NC) Expr { return fromTerm(Term{Coef: RFInt(1), NC: []NC{n}}) }

// FromTerm returns the expression with the single term t (normalised).
func FromTerm(t Term) Expr { return fromTerm(t) }

func fromTerm(t Term) Expr {
	nt, ok := normTerm(t)
	if !ok {
		return Expr{}
	}
	return Expr{terms: []Term{nt}}
}

// Terms returns the terms in canonical order; the caller must not modify them.
func (e Expr) Terms() []Term { return e.terms }

// Len is the number of terms.
func (e Expr) Len() int { return len(e.terms) }

// IsZero reports whether e is zero.
func (e Expr) IsZero() bool { return len(e.terms) == 0 }

// Equal reports whether a and b are the same expression.
func (e Expr) Equal(b Expr) bool {
	if len(e.terms) != len(b.terms) {
		return false
	}
	for i := range e.terms {
		if e.terms[i].key != b.terms[i].key || !e.terms[i].Coef.Equal(b.terms[i].Coef) {
			return false
		}
	}
	return true
}

// AsRatFunc returns e as a rational function when it has no atoms, no non-commuting elements
// and no loops.
func (e Expr) AsRatFunc() (RatFunc, bool) {
	switch len(e.terms) {
	case 0:
		return RFInt(0), true
	case 1:
		t := e.terms[0]
		if len(t.Atoms) == 0 && len(t.NC) == 0 && len(t.Loops) == 0 {
			return t.Coef, true
		}
	}
	return RatFunc{}, false
}

// Key is the canonical key of the term without its coefficient.
func (t Term) Key() string { return t.key }

// Add returns e + b.
func (e Expr) Add(b Expr) Expr {
	if len(b.terms) == 0 {
		return e
	}
	if len(e.terms) == 0 {
		return b
	}
	out := make([]Term, 0, len(e.terms)+len(b.terms))
	i, j := 0, 0
	for i < len(e.terms) || j < len(b.terms) {
		var c int
		switch {
		case i == len(e.terms):
			c = 1
		case j == len(b.terms):
			c = -1
		default:
			c = strings.Compare(e.terms[i].key, b.terms[j].key)
		}
		switch {
		case c < 0:
			out = append(out, e.terms[i])
			i++
		case c > 0:
			out = append(out, b.terms[j])
			j++
		default:
			s := e.terms[i].Coef.Add(b.terms[j].Coef)
			if !s.IsZero() {
				t := e.terms[i]
				t.Coef = s
				out = append(out, t)
			}
			i++
			j++
		}
	}
	return Expr{terms: out}
}

// Neg returns −e.
func (e Expr) Neg() Expr {
	out := make([]Term, len(e.terms))
	for i, t := range e.terms {
		t.Coef = t.Coef.Neg()
		out[i] = t
	}
	return Expr{terms: out}
}

// Sub returns e − b.
func (e Expr) Sub(b Expr) Expr { return e.Add(b.Neg()) }

// Scale returns r·e.
func (e Expr) Scale(r RatFunc) Expr {
	if r.IsZero() {
		return Expr{}
	}
	if r.IsOne() {
		return e
	}
	out := make([]Term, len(e.terms))
	for i, t := range e.terms {
		t.Coef = t.Coef.Mul(r)
		out[i] = t
	}
	return Expr{terms: out}
}

// Mul returns e·b; non-commuting strings are concatenated in the order e then b. It fails when
// the product would exceed MaxTerms or integrates the same loop momentum twice.
func (e Expr) Mul(b Expr) (Expr, error) {
	if len(e.terms) == 0 || len(b.terms) == 0 {
		return Expr{}, nil
	}
	if len(e.terms)*len(b.terms) > MaxTerms {
		return Expr{}, fmt.Errorf("%w: product of %d and %d terms exceeds the limit of %d", ErrTooLarge, len(e.terms), len(b.terms), MaxTerms)
	}
	if w := mulWork(e, b); w > MaxPolyWork {
		return Expr{}, fmt.Errorf("%w: the product needs about %d coefficient multiplications, more than the limit of %d", ErrTooLarge, w, MaxPolyWork)
	}
	ts := make([]Term, 0, len(e.terms)*len(b.terms))
	for _, x := range e.terms {
		for _, y := range b.terms {
			t, err := mulTerms(x, y)
			if err != nil {
				return Expr{}, err
			}
			if nt, ok := normTerm(t); ok {
				ts = append(ts, nt)
			}
		}
	}
	return collect(ts), nil
}

// MustMul is Mul for callers that know neither limit can be hit (small constant factors).
func (e Expr) MustMul(b Expr) Expr {
	r, err := e.Mul(b)
	if err != nil {
		panic(err)
	}
	return r
}

// ErrLoopTwice reports a product of two integrals over the same loop momentum.
var ErrLoopTwice = errors.New("the same loop momentum is integrated twice in one product")

func mulTerms(x, y Term) (Term, error) {
	t := Term{Coef: x.Coef.Mul(y.Coef)}
	t.Atoms = make([]AtomPow, 0, len(x.Atoms)+len(y.Atoms))
	t.Atoms = append(append(t.Atoms, x.Atoms...), y.Atoms...)
	if len(x.NC)+len(y.NC) > 0 {
		t.NC = append(append(make([]NC, 0, len(x.NC)+len(y.NC)), x.NC...), y.NC...)
	}
	if len(y.Loops) > 0 {
		for _, l := range y.Loops {
			if slices.Contains(x.Loops, l) {
				return Term{}, fmt.Errorf("%w: %s", ErrLoopTwice, l)
			}
		}
		t.Loops = append(append([]string{}, x.Loops...), y.Loops...)
	} else {
		t.Loops = x.Loops
	}
	return t, nil
}

// collect sorts normalised terms and merges equal keys.
func collect(ts []Term) Expr {
	slices.SortFunc(ts, func(a, b Term) int { return strings.Compare(a.key, b.key) })
	out := ts[:0]
	for _, t := range ts {
		if n := len(out); n > 0 && out[n-1].key == t.key {
			out[n-1].Coef = out[n-1].Coef.Add(t.Coef)
			continue
		}
		out = append(out, t)
	}
	res := out[:0]
	for _, t := range out {
		if !t.Coef.IsZero() {
			res = append(res, t)
		}
	}
	return Expr{terms: res}
}

// Sum adds expressions.
func Sum(es ...Expr) Expr {
	var ts []Term
	for _, e := range es {
		ts = append(ts, e.terms...)
	}
	cp := make([]Term, len(ts))
	copy(cp, ts)
	return collect(cp)
}

// Pow returns e^n. Negative powers are allowed for a rational function and for a single term
// whose atoms may be inverted (no non-commuting elements, no loops). Every step is a checked
// multiplication, so growth is bounded by MaxTerms and MaxPolyWork.
func (e Expr) Pow(n int) (Expr, error) {
	if n < 0 {
		inv, err := e.inverse()
		if err != nil {
			return Expr{}, err
		}
		return inv.Pow(-n)
	}
	res := Int(1)
	base := e
	for n > 0 {
		var err error
		if n&1 == 1 {
			if res, err = res.Mul(base); err != nil {
				return Expr{}, err
			}
		}
		n >>= 1
		if n > 0 {
			if base, err = base.Mul(base); err != nil {
				return Expr{}, err
			}
		}
	}
	return res, nil
}

// inverse returns 1/e for a rational function or a single invertible term.
func (e Expr) inverse() (Expr, error) {
	if r, ok := e.AsRatFunc(); ok {
		inv, err := r.Inv()
		if err != nil {
			return Expr{}, err
		}
		return FromRF(inv), nil
	}
	if len(e.terms) != 1 {
		return Expr{}, fmt.Errorf("cannot invert a sum with non-rational parts")
	}
	t := e.terms[0]
	if len(t.NC) > 0 || len(t.Loops) > 0 {
		return Expr{}, fmt.Errorf("cannot invert a Dirac string or a loop integral")
	}
	c, err := t.Coef.Inv()
	if err != nil {
		return Expr{}, err
	}
	nt := Term{Coef: c}
	for _, a := range t.Atoms {
		nt.Atoms = append(nt.Atoms, AtomPow{a.A, -a.Pow})
	}
	return fromTerm(nt), nil
}

// normTermMust normalises a term that is known to be nonzero and well formed.
func normTermMust(t Term) Term {
	nt, ok := normTerm(t)
	if !ok {
		return Term{Coef: RFInt(0)}
	}
	return nt
}

// normTerm brings a term to canonical form; ok is false when the term vanishes.
func normTerm(t Term) (Term, bool) {
	if t.Coef.IsZero() {
		return Term{}, false
	}
	t.Coef = t.Coef.fix()
	// Close spinor chains in the non-commuting string.
	if len(t.NC) > 0 {
		t = closeChains(t)
	}
	atoms, coef, ok := mergeAtoms(t.Atoms, t.Coef)
	if !ok {
		return Term{}, false
	}
	t.Atoms, t.Coef = atoms, coef
	if hasIndices(t) {
		var ok bool
		t, ok = contract(t)
		if !ok {
			return Term{}, false
		}
	}
	if len(t.Loops) > 1 {
		l := append([]string{}, t.Loops...)
		slices.Sort(l)
		t.Loops = l
	}
	t.key = termKey(t)
	return t, true
}

// mergeAtoms sorts atoms, adds powers of equal atoms and applies the rules I² = −1 and
// sqrt(x)² = x for rational x. ok is false if the product vanishes.
func mergeAtoms(in []AtomPow, coef RatFunc) ([]AtomPow, RatFunc, bool) {
	if len(in) == 0 {
		return nil, coef, true
	}
	as := append([]AtomPow{}, in...)
	slices.SortStableFunc(as, func(a, b AtomPow) int { return atomCmp(a.A, b.A) })
	out := as[:0]
	for _, a := range as {
		if n := len(out); n > 0 && out[n-1].A.Key() == a.A.Key() && out[n-1].A.order() == a.A.order() {
			out[n-1].Pow += a.Pow
			continue
		}
		out = append(out, a)
	}
	res := out[:0]
	for _, a := range out {
		if a.Pow == 0 {
			continue
		}
		if c, ok := a.A.(Const); ok && c == I {
			p := ((a.Pow % 4) + 4) % 4
			if p >= 2 {
				coef = coef.Neg()
				p -= 2
			}
			if p == 0 {
				continue
			}
			a.Pow = 1
		}
		if f, ok := a.A.(Fn); ok && f.Name == "sqrt" && (a.Pow >= 2 || a.Pow <= -1) {
			if r, ok := f.Args[0].AsRatFunc(); ok {
				// sqrt(x)^n = x^{⌊n/2⌋}·sqrt(x)^{n mod 2}
				q := a.Pow / 2
				rem := a.Pow - 2*q
				if rem < 0 {
					q--
					rem += 2
				}
				p, err := r.Pow(q)
				if err != nil {
					return nil, coef, false
				}
				coef = coef.Mul(p)
				if rem == 0 {
					continue
				}
				a.Pow = rem
			}
		}
		res = append(res, a)
	}
	return res, coef, true
}

// closeChains cuts every segment ubar … u of the non-commuting string into a Chain atom.
func closeChains(t Term) Term {
	var open []NC
	atoms := append([]AtomPow{}, t.Atoms...)
	nc := t.NC
	i := 0
	for i < len(nc) {
		if nc[i].IsBar() {
			j := i + 1
			for j < len(nc) && !nc[j].IsSpinor() && !nc[j].IsBar() {
				j++
			}
			if j < len(nc) && nc[j].IsSpinor() {
				atoms = append(atoms, AtomPow{NewChain(append([]NC{}, nc[i:j+1]...)), 1})
				i = j + 1
				continue
			}
		}
		open = append(open, nc[i])
		i++
	}
	t.Atoms = atoms
	t.NC = open
	return t
}

func termKey(t Term) string {
	var sb strings.Builder
	if len(t.Loops) > 0 {
		sb.WriteString("loop ")
		sb.WriteString(strings.Join(t.Loops, ","))
		sb.WriteString("|")
	}
	for _, a := range t.Atoms {
		fmt.Fprintf(&sb, "%d:%s^%d;", a.A.order(), a.A.Key(), a.Pow)
	}
	if len(t.NC) > 0 {
		sb.WriteString("|")
		for _, n := range t.NC {
			sb.WriteString(n.Key())
			sb.WriteString(" ")
		}
	}
	return sb.String()
}

// Subst replaces the symbol v by r everywhere: coefficients, function arguments and propagator
// masses.
func (e Expr) Subst(v string, r RatFunc) (Expr, error) {
	ts := make([]Term, 0, len(e.terms))
	for _, t := range e.terms {
		c, err := t.Coef.Subst(v, r)
		if err != nil {
			return Expr{}, err
		}
		nt := Term{Coef: c, NC: t.NC, Loops: t.Loops}
		extra := Int(1)
		for _, a := range t.Atoms {
			na, err := substAtom(a.A, v, r)
			if err != nil {
				return Expr{}, err
			}
			if na.isAtom {
				nt.Atoms = append(nt.Atoms, AtomPow{na.atom, a.Pow})
				continue
			}
			p, err := na.expr.Pow(a.Pow)
			if err != nil {
				return Expr{}, err
			}
			if extra, err = extra.Mul(p); err != nil {
				return Expr{}, err
			}
		}
		x, err := fromTerm(nt).Mul(extra)
		if err != nil {
			return Expr{}, err
		}
		ts = append(ts, x.terms...)
	}
	return collect(ts), nil
}

type atomOrExpr struct {
	isAtom bool
	atom   Atom
	expr   Expr
}

func substAtom(a Atom, v string, r RatFunc) (atomOrExpr, error) {
	switch x := a.(type) {
	case Fn:
		args := make([]Expr, len(x.Args))
		changed := false
		for i, arg := range x.Args {
			na, err := arg.Subst(v, r)
			if err != nil {
				return atomOrExpr{}, err
			}
			args[i] = na
			changed = changed || !na.Equal(arg)
		}
		if !changed {
			return atomOrExpr{isAtom: true, atom: a}, nil
		}
		var e Expr
		if x.Split > 0 {
			e = FromAtom(NewFnSplit(x.Name, x.I0, x.Split, args...), 1)
		} else {
			var err error
			if e, err = Apply(x.Name, x.I0, args...); err != nil {
				return atomOrExpr{}, err
			}
		}
		return atomOrExpr{expr: e}, nil
	case Prop:
		if !x.M2.Has(v) {
			return atomOrExpr{isAtom: true, atom: a}, nil
		}
		m2, err := x.M2.Subst(v, r)
		if err != nil {
			return atomOrExpr{}, err
		}
		return atomOrExpr{isAtom: true, atom: NewProp(x.K, m2)}, nil
	}
	return atomOrExpr{isAtom: true, atom: a}, nil
}

// MapAtoms replaces atoms: for every atom a with f(a) = (x, true) the factor a^n becomes x^n.
func (e Expr) MapAtoms(f func(Atom) (Expr, bool)) (Expr, error) {
	var ts []Term
	for _, t := range e.terms {
		nt := Term{Coef: t.Coef, NC: t.NC, Loops: t.Loops}
		extra := Int(1)
		for _, a := range t.Atoms {
			x, ok := f(a.A)
			if !ok {
				nt.Atoms = append(nt.Atoms, a)
				continue
			}
			p, err := x.Pow(a.Pow)
			if err != nil {
				return Expr{}, err
			}
			if extra, err = extra.Mul(p); err != nil {
				return Expr{}, err
			}
		}
		x, err := fromTerm(nt).Mul(extra)
		if err != nil {
			return Expr{}, err
		}
		ts = append(ts, x.terms...)
		if len(ts) > MaxTerms {
			return Expr{}, fmt.Errorf("%w: substitution produced more than %d terms", ErrTooLarge, MaxTerms)
		}
	}
	return collect(ts), nil
}

// Vars lists the symbols in coefficients, function arguments and propagator masses, sorted.
func (e Expr) Vars() []string {
	var out []string
	for _, t := range e.terms {
		out = unionVars(out, t.Coef.Vars())
		for _, a := range t.Atoms {
			switch x := a.A.(type) {
			case Fn:
				for _, arg := range x.Args {
					out = unionVars(out, arg.Vars())
				}
			case Prop:
				out = unionVars(out, x.M2.Vars())
			}
		}
	}
	return out
}

// Group is a product of selected atoms with the expression that multiplies it.
type Group struct {
	Atoms []AtomPow
	Key   string
	Coef  Expr
}

// Collect groups the terms of e by the product of the atoms that sel accepts; the other atoms
// stay in each group's coefficient. Groups come out sorted by key.
func (e Expr) Collect(sel func(Atom) bool) []Group {
	idx := map[string]int{}
	var groups []Group
	var rest [][]Term
	for _, t := range e.terms {
		var keep, other []AtomPow
		for _, a := range t.Atoms {
			if sel(a.A) {
				keep = append(keep, a)
			} else {
				other = append(other, a)
			}
		}
		key := termKey(Term{Atoms: keep})
		i, ok := idx[key]
		if !ok {
			i = len(groups)
			idx[key] = i
			groups = append(groups, Group{Atoms: keep, Key: key})
			rest = append(rest, nil)
		}
		ct := Term{Coef: t.Coef, Atoms: other, NC: t.NC, Loops: t.Loops}
		ct.key = termKey(ct)
		rest[i] = append(rest[i], ct)
	}
	for i := range groups {
		groups[i].Coef = collect(rest[i])
	}
	slices.SortFunc(groups, func(a, b Group) int { return strings.Compare(a.Key, b.Key) })
	return groups
}

// HasLoops reports whether any term is integrated over a loop momentum.
func (e Expr) HasLoops() bool {
	for _, t := range e.terms {
		if len(t.Loops) > 0 {
			return true
		}
	}
	return false
}

// Integrate wraps every term of e in integrals over the loop momenta moms (the notation's
// "loop k { … }"). It fails if a term is already integrated over one of them.
func Integrate(e Expr, moms ...string) (Expr, error) {
	ts := make([]Term, 0, len(e.terms))
	for _, t := range e.terms {
		for _, m := range moms {
			if slices.Contains(t.Loops, m) {
				return Expr{}, fmt.Errorf("%w: %s", ErrLoopTwice, m)
			}
		}
		nt := t
		nt.Loops = append(append([]string{}, t.Loops...), moms...)
		n, ok := normTerm(nt)
		if ok {
			ts = append(ts, n)
		}
	}
	return collect(ts), nil
}

// MapCoef replaces every coefficient r by f(r) (atoms unchanged).
func (e Expr) MapCoef(f func(RatFunc) (RatFunc, error)) (Expr, error) {
	ts := make([]Term, 0, len(e.terms))
	for _, t := range e.terms {
		c, err := f(t.Coef)
		if err != nil {
			return Expr{}, err
		}
		if c.IsZero() {
			continue
		}
		t.Coef = c.fix()
		ts = append(ts, t)
	}
	return Expr{terms: ts}, nil
}
