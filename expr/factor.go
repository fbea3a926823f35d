package expr

import (
	"math/big"
	"slices"
	"strings"
)

// This file writes polynomials as products of square-free factors (Yun's algorithm, D.Y.Y.
// Yun, Proc. SYMSAC 1976, 26), for display: (x^3 - 3*x^2 + 3*x - 1) prints as (x - 1)^3.

// FactorPow is a polynomial factor with its multiplicity.
type FactorPow struct {
	P   Poly
	Pow int
}

// SquareFree writes p = c · Π P_i^{n_i} with c a rational constant and the P_i square-free,
// primitive, pairwise coprime, with positive leading coefficients; monomial factors come first.
func SquareFree(p Poly) (*big.Rat, []FactorPow) {
	if p.IsZero() {
		return new(big.Rat), nil
	}
	c, pp := p.PrimitiveZ()
	var out []FactorPow
	// Monomial content.
	if m := pp.monoGCDPoly(); len(m) > 0 {
		for _, vp := range m {
			out = append(out, FactorPow{PolyVar(vp.Var), vp.Exp})
		}
		pp, _ = pp.DivExact(PolyMono(ratOne, m))
	}
	out = append(out, squareFreeRec(pp)...)
	// Merge equal factors and sort for a stable display.
	merged := map[string]int{}
	polys := map[string]Poly{}
	for _, f := range out {
		if f.P.IsConst() {
			continue
		}
		k := f.P.String()
		merged[k] += f.Pow
		polys[k] = f.P
	}
	out = out[:0]
	for k, n := range merged {
		out = append(out, FactorPow{polys[k], n})
	}
	slices.SortFunc(out, func(a, b FactorPow) int {
		if a.P.Len() != b.P.Len() {
			return a.P.Len() - b.P.Len()
		}
		return strings.Compare(a.P.String(), b.P.String())
	})
	return c, out
}

// squareFreeRec decomposes a primitive polynomial without monomial content.
func squareFreeRec(p Poly) []FactorPow {
	vars := p.Vars()
	if len(vars) == 0 {
		return nil
	}
	v := vars[0]
	// Content in v (a polynomial in the other variables) is decomposed separately.
	zc, zp := contentIn(toZ(p), v)
	content, prim := zc.toPoly(), zp.toPoly()
	out := squareFreeRec(content)
	// Yun's algorithm in v on the primitive part.
	f := prim
	df := f.Derivative(v)
	a0 := GCD(f, df)
	b, _ := f.DivExact(a0)
	c, _ := df.DivExact(a0)
	d := c.Sub(b.Derivative(v))
	for i := 1; !b.IsConst(); i++ {
		a := GCD(b, d)
		if !a.IsConst() {
			_, ap := a.PrimitiveZ()
			out = append(out, FactorPow{ap, i})
		}
		b, _ = b.DivExact(a)
		c, _ = d.DivExact(a)
		d = c.Sub(b.Derivative(v))
		if i > 64 {
			break
		}
	}
	return out
}

// Pretty prints r with its numerator and denominator as products of square-free factors, for
// reports: "-(x^2 - 5*x - 2)/(24*(x - 1)^3)". It is not the canonical text (which the parser reads
// back to the same value as well, but expanded).
func (r RatFunc) Pretty() string {
	neg, num, den := r.prettyParts()
	sign := ""
	if neg {
		sign = "-"
	}
	return sign + quotientText(num, den)
}

// prettyParts gives the sign and the factored numerator and denominator texts of r.
func (r RatFunc) prettyParts() (neg bool, num, den string) {
	cn, fn := SquareFree(r.Num())
	cd, fd := SquareFree(r.Den())
	c := new(big.Rat).Quo(cn, cd)
	if neg = c.Sign() < 0; neg {
		c.Neg(c)
	}
	return neg, productText(c.Num(), fn), productText(c.Denom(), fd)
}

// quotientText writes num/den with the parentheses each side needs ("x" when den is "1").
func quotientText(num, den string) string {
	if den == "1" {
		return num
	}
	if strings.ContainsAny(topLevel(num), "+- ") {
		num = "(" + num + ")"
	}
	if strings.ContainsAny(topLevel(den), "*/+- ") {
		den = "(" + den + ")"
	}
	return num + "/" + den
}

// topLevel returns s without its parenthesised parts, so that the operators left are the ones
// that bind last; a leading sign is kept out (it is not an operator between factors).
func topLevel(s string) string {
	var sb strings.Builder
	depth := 0
	for _, r := range s {
		switch {
		case r == '(':
			depth++
		case r == ')':
			depth--
		case depth == 0:
			sb.WriteRune(r)
		}
	}
	return sb.String()
}

func productText(k *big.Int, fs []FactorPow) string {
	var parts []string
	if !(k.IsInt64() && k.Int64() == 1) || len(fs) == 0 {
		parts = append(parts, k.String())
	}
	for _, f := range fs {
		s := f.P.String()
		if f.P.Len() > 1 || len(fs) > 1 && f.Pow > 1 && strings.ContainsAny(s, "*") {
			s = "(" + s + ")"
		}
		if f.Pow > 1 {
			s += "^" + itoa(f.Pow)
		}
		parts = append(parts, s)
	}
	return strings.Join(parts, "*")
}

func itoa(n int) string { return big.NewInt(int64(n)).String() }

// Pretty prints e with every coefficient in factored form, one term after the other.
func (e Expr) Pretty() string { return e.joinTerms(Term.prettyText) }

// prettyText writes the term as one fraction: the factored coefficient with the atoms of
// positive power in the numerator and those of negative power in the denominator.
func (t Term) prettyText() string {
	neg, num, den := t.Coef.prettyParts()
	var up, down []string
	for _, a := range t.Atoms {
		if a.Pow > 0 {
			up = append(up, atomText(a.A, a.Pow))
		} else {
			down = append(down, atomText(a.A, -a.Pow))
		}
	}
	join := func(c string, atoms []string) string {
		if len(atoms) == 0 {
			return c
		}
		if c == "1" {
			return strings.Join(atoms, "*")
		}
		if strings.ContainsAny(topLevel(c), "+- ") {
			c = "(" + c + ")"
		}
		return c + "*" + strings.Join(atoms, "*")
	}
	out := quotientText(join(num, up), join(den, down))
	if neg {
		out = "-" + out
	}
	return out
}
