package dirac

import (
	"errors"
	"fmt"

	"loopmatch/expr"
)

// epsilon0123 is ε^{0123} (PHYSICS.md); the sign of every γ5-odd trace follows it.
const epsilon0123 = -1

// ErrG5Reading reports a γ5-odd trace whose Levi-Civita terms survive: in NDR its value
// depends on where the trace is read, so a reading point must be named.
var ErrG5Reading = errors.New("γ5-odd trace depends on the reading point")

// Trace returns with·tr(el) for a string of Dirac matrices (gamma, slash, G5, PL, PR, sigma) in
// d dimensions. The γ5-even part uses tr 1 = 4 and
// tr(a1 … an) = Σ_k (−1)^k (a1·ak) tr(a2 … âk … an); contracted indices give g^μ_μ = d.
// γ5 is anticommuted to the right end (NDR) and the γ5-odd part is
//
//	tr(a1 a2 a3 R γ5) = (a1·a2) tr(a3 R γ5) − (a1·a3) tr(a2 R γ5) + (a2·a3) tr(a1 R γ5)
//	                    − c i Σ_k (−1)^{k+1} ε(a1 a2 a3 r_k) tr(R without r_k),
//
// the four-dimensional reduction of a1 a2 a3 by the Chisholm form
// γ^μγ^νγ^ρ = g^{μν}γ^ρ − g^{μρ}γ^ν + g^{νρ}γ^μ + c iε^{μνρσ}γ_σγ5, c = ε^{0123}, which follows
// from γ5 = iγ⁰γ¹γ²γ³ (γ⁰γ¹γ²γ³ = −iγ5) and gives tr(γ^μγ^νγ^ργ^σγ5) = −4i c ε^{μνρσ}; with
// ε^{0123} = −1 that is +4iε^{μνρσ} (checked against explicit matrices in the tests; PHYSICS.md
// quotes −4iε^{μνρσ}, which holds for ε^{0123} = +1). The trace is read as written from its first element, or
// from element opt.ReadingPoint. When Levi-Civita terms survive the contraction with `with`
// and no reading point is named, Trace refuses with ErrG5Reading. Colour generators are not
// allowed (see ColourTrace).
func Trace(el []expr.NC, with expr.Expr, opt Options) (expr.Expr, Report, error) {
	rep := Report{Scheme: opt.scheme()}
	for _, n := range el {
		if n.Op == expr.NCT {
			return expr.Expr{}, rep, fmt.Errorf("Trace takes Dirac matrices only; use ColourTrace for T(%s)", n.Args[0])
		}
		if n.IsBar() || n.IsSpinor() {
			return expr.Expr{}, rep, fmt.Errorf("a trace cannot contain the spinor %s", n.Key())
		}
	}
	if k := opt.ReadingPoint; k > 0 {
		if k > len(el) {
			return expr.Expr{}, rep, fmt.Errorf("reading point %d is beyond the %d elements of the trace", k, len(el))
		}
		el = append(append([]expr.NC{}, el[k-1:]...), el[:k-1]...)
	}
	terms, _, err := parseElems(el)
	if err != nil {
		return expr.Expr{}, rep, fmt.Errorf("%w in a trace", err)
	}
	if terms, err = contractInside(terms, MaxStringTerms); err != nil {
		return expr.Expr{}, rep, err
	}
	var parts []expr.Expr
	odd := false
	count := 0
	for _, t := range terms {
		// tr(G x) with x = 1, γ5, PL = (1 − γ5)/2, PR = (1 + γ5)/2
		even, g5 := rfOne, expr.RFInt(0)
		switch t.x {
		case xG5:
			even, g5 = expr.RFInt(0), rfOne
		case xL:
			even, g5 = expr.RFRat(bigHalf), expr.RFRat(bigHalf).Neg()
		case xR:
			even, g5 = expr.RFRat(bigHalf), expr.RFRat(bigHalf)
		}
		pre := expr.FromTerm(expr.Term{Coef: t.c, Atoms: iAtom(t.i)})
		for _, f := range t.f {
			if pre, err = pre.Mul(plainPair(f)); err != nil {
				return expr.Expr{}, rep, err
			}
		}
		if !even.IsZero() {
			tr, err := traceEven(t.g, &count)
			if err != nil {
				return expr.Expr{}, rep, err
			}
			x, err := mulScaled(tr.Scale(even), pre)
			if err != nil {
				return expr.Expr{}, rep, err
			}
			parts = append(parts, x)
		}
		if !g5.IsZero() && len(t.g) >= 4 && len(t.g)%2 == 0 {
			tr, err := traceOdd(t.g, &count)
			if err != nil {
				return expr.Expr{}, rep, err
			}
			x, err := mulScaled(tr.Scale(g5), pre)
			if err != nil {
				return expr.Expr{}, rep, err
			}
			parts = append(parts, x)
			odd = odd || !x.IsZero()
		}
	}
	out, err := mulScaled(expr.Sum(parts...), with)
	if err != nil {
		return expr.Expr{}, rep, err
	}
	if odd && opt.ReadingPoint == 0 {
		for _, t := range out.Terms() {
			for _, a := range t.Atoms {
				if _, ok := a.A.(expr.Levi); ok {
					return expr.Expr{}, rep, fmt.Errorf("%w: the γ5-odd part of the trace leaves Levi-Civita terms (e.g. %s) after contraction; with an anticommuting γ5 in d dimensions their value depends on where the trace is read. Name a reading point (Options.ReadingPoint) to accept the trace read from that element", ErrG5Reading, t)
				}
			}
		}
	}
	return out, rep, nil
}

// mulScaled is a·b, by scaling when b is a rational function (no renormalisation of a's terms).
func mulScaled(a, b expr.Expr) (expr.Expr, error) {
	if r, ok := b.AsRatFunc(); ok {
		return a.Scale(r), nil
	}
	return a.Mul(b)
}

func iAtom(i bool) []expr.AtomPow {
	if i {
		return []expr.AtomPow{{A: expr.I, Pow: 1}}
	}
	return nil
}

// plainPair is a·b with no leg momenta: g(μ, ν), p[μ] or p.q.
func plainPair(p pair) expr.Expr {
	a, b := p[0], p[1]
	switch {
	case !a.mom && !b.mom:
		return expr.FromAtom(expr.NewMetric(a.name, b.name), 1)
	case !a.mom:
		return expr.FromAtom(expr.Vec{P: b.name, Mu: a.name}, 1)
	case !b.mom:
		return expr.FromAtom(expr.Vec{P: a.name, Mu: b.name}, 1)
	}
	return expr.FromAtom(expr.NewDot(a.name, b.name), 1)
}

// traceEven is tr(g) by the pairing recursion; its terms are built as products of pairs.
func traceEven(g []slot, count *int) (expr.Expr, error) {
	if len(g)%2 == 1 {
		return expr.Zero(), nil
	}
	var terms []expr.Term
	var rec func(rest []slot, sign int, atoms []expr.AtomPow, coef expr.RatFunc) error
	rec = func(rest []slot, sign int, atoms []expr.AtomPow, coef expr.RatFunc) error {
		if len(rest) == 0 {
			c := expr.RFInt(int64(4 * sign)).Mul(coef)
			terms = append(terms, expr.Term{Coef: c, Atoms: append([]expr.AtomPow{}, atoms...)})
			if *count++; *count > MaxStringTerms {
				return fmt.Errorf("%w: a trace expands into more than %d terms", expr.ErrTooLarge, MaxStringTerms)
			}
			return nil
		}
		a := rest[0]
		for k := 1; k < len(rest); k++ {
			s := sign
			if k%2 == 0 {
				s = -s
			}
			nrest := make([]slot, 0, len(rest)-2)
			nrest = append(append(nrest, rest[1:k]...), rest[k+1:]...)
			at, c := pairAtom(a, rest[k])
			if err := rec(nrest, s, append(atoms, at...), coef.Mul(c)); err != nil {
				return err
			}
		}
		return nil
	}
	if err := rec(g, 1, nil, rfOne); err != nil {
		return expr.Expr{}, err
	}
	parts := make([]expr.Expr, len(terms))
	for i, t := range terms {
		parts[i] = expr.FromTerm(t)
	}
	return expr.Sum(parts...), nil
}

// pairAtom is a·b as atoms (with g^μ_μ = d folded into the coefficient).
func pairAtom(a, b slot) ([]expr.AtomPow, expr.RatFunc) {
	switch {
	case !a.mom && !b.mom:
		if a.name == b.name {
			return nil, rfD
		}
		return []expr.AtomPow{{A: expr.NewMetric(a.name, b.name), Pow: 1}}, rfOne
	case !a.mom:
		return []expr.AtomPow{{A: expr.Vec{P: b.name, Mu: a.name}, Pow: 1}}, rfOne
	case !b.mom:
		return []expr.AtomPow{{A: expr.Vec{P: a.name, Mu: b.name}, Pow: 1}}, rfOne
	}
	return []expr.AtomPow{{A: expr.NewDot(a.name, b.name), Pow: 1}}, rfOne
}

func levSlot(s slot) expr.Slot { return expr.Slot{Name: s.name, Index: !s.mom} }

// traceOdd is tr(g γ5) by the recursion in the doc of Trace.
func traceOdd(g []slot, count *int) (expr.Expr, error) {
	n := len(g)
	if n < 4 || n%2 == 1 {
		return expr.Zero(), nil
	}
	a1, a2, a3 := g[0], g[1], g[2]
	R := g[3:]
	out := expr.Zero()
	for _, c := range []struct {
		x, y, keep slot
		s          int64
	}{{a1, a2, a3, 1}, {a1, a3, a2, -1}, {a2, a3, a1, 1}} {
		sub := append([]slot{c.keep}, R...)
		tr, err := traceOdd(sub, count)
		if err != nil {
			return expr.Expr{}, err
		}
		if tr.IsZero() {
			continue
		}
		at, k := pairAtom(c.x, c.y)
		x, err := tr.Mul(expr.FromTerm(expr.Term{Coef: k.Mul(expr.RFInt(c.s)), Atoms: at}))
		if err != nil {
			return expr.Expr{}, err
		}
		out = out.Add(x)
	}
	// − i Σ_k (−1)^{k+1} ε(a1 a2 a3 r_k) tr(R \ r_k)
	for k := range R {
		lv, sign := expr.NewLevi([4]expr.Slot{levSlot(a1), levSlot(a2), levSlot(a3), levSlot(R[k])})
		if sign == 0 {
			continue
		}
		rest := append(append([]slot{}, R[:k]...), R[k+1:]...)
		tr, err := traceEven(rest, count)
		if err != nil {
			return expr.Expr{}, err
		}
		// −c i (−1)^{k+1} (k 1-based; +1 for the first element of R)
		s := int64(-epsilon0123 * sign)
		if k%2 == 1 {
			s = -s
		}
		x, err := tr.Mul(expr.FromTerm(expr.Term{Coef: expr.RFInt(s), Atoms: []expr.AtomPow{{A: lv, Pow: 1}, {A: expr.I, Pow: 1}}}))
		if err != nil {
			return expr.Expr{}, err
		}
		out = out.Add(x)
	}
	return out, nil
}

// ColourTrace returns tr(T^{a1} … T^{an}) in the fundamental representation, reduced with the
// rules of the colour algebra (tr 1 = Nc, tr T^a = 0, tr T^a T^b = δ^{ab}/2, repeated indices
// summed). A trace of three or more generators with distinct free indices is refused (it needs
// the symmetric d^{abc}).
func ColourTrace(adj []string, opt Options) (expr.Expr, error) {
	s := &simplifier{opt: opt, limit: MaxStringTerms}
	s.cpool = append([]string{}, opt.ColourDummies...)
	st := cstate{c: rfOne, lines: []cline{{-1, -1, append([]string{}, adj...)}}}
	res, err := s.reduceColour(st, 0)
	if err != nil {
		return expr.Expr{}, err
	}
	out := expr.Zero()
	for _, r := range res {
		out = out.Add(r.factor())
	}
	return out, nil
}
