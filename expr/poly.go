package expr

import (
	"fmt"
	"math/big"
	"slices"
	"sort"
	"strings"
)

// VarPow is one variable raised to a positive integer power inside a monomial.
type VarPow struct {
	Var string
	Exp int
}

// Mono is a monomial: variables sorted by name, each with a positive exponent.
// The empty Mono is the constant monomial 1.
type Mono []VarPow

// Degree is the total degree of the monomial.
func (m Mono) Degree() int {
	d := 0
	for _, vp := range m {
		d += vp.Exp
	}
	return d
}

// Exp returns the exponent of v in m (0 if absent).
func (m Mono) Exp(v string) int {
	for _, vp := range m {
		if vp.Var == v {
			return vp.Exp
		}
		if vp.Var > v {
			break
		}
	}
	return 0
}

// monoCmp orders monomials for the canonical term order: higher total degree first, then
// lexicographically by variable name (a variable earlier in the alphabet with a higher power
// first). It returns -1 when a comes before b.
func monoCmp(a, b Mono) int {
	da, db := a.Degree(), b.Degree()
	if da != db {
		if da > db {
			return -1
		}
		return 1
	}
	return monoLexCmp(a, b)
}

// monoLexCmp is the lexicographic part of monoCmp.
func monoLexCmp(a, b Mono) int {
	n := min(len(a), len(b))
	for i := 0; i < n; i++ {
		if a[i].Var != b[i].Var {
			if a[i].Var < b[i].Var {
				return -1
			}
			return 1
		}
		if a[i].Exp != b[i].Exp {
			if a[i].Exp > b[i].Exp {
				return -1
			}
			return 1
		}
	}
	switch {
	case len(a) > len(b):
		return -1
	case len(a) < len(b):
		return 1
	}
	return 0
}

func monoMul(a, b Mono) Mono {
	if len(a) == 0 {
		return b
	}
	if len(b) == 0 {
		return a
	}
	out := make(Mono, 0, len(a)+len(b))
	i, j := 0, 0
	for i < len(a) && j < len(b) {
		switch {
		case a[i].Var == b[j].Var:
			out = append(out, VarPow{a[i].Var, a[i].Exp + b[j].Exp})
			i++
			j++
		case a[i].Var < b[j].Var:
			out = append(out, a[i])
			i++
		default:
			out = append(out, b[j])
			j++
		}
	}
	out = append(out, a[i:]...)
	return append(out, b[j:]...)
}

// monoDiv returns a/b and whether b divides a.
func monoDiv(a, b Mono) (Mono, bool) {
	out := make(Mono, 0, len(a))
	j := 0
	for _, vp := range a {
		if j < len(b) && b[j].Var < vp.Var {
			return nil, false
		}
		if j < len(b) && b[j].Var == vp.Var {
			e := vp.Exp - b[j].Exp
			j++
			if e < 0 {
				return nil, false
			}
			if e > 0 {
				out = append(out, VarPow{vp.Var, e})
			}
			continue
		}
		out = append(out, vp)
	}
	if j < len(b) {
		return nil, false
	}
	return out, true
}

func monoEqual(a, b Mono) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i] != b[i] {
			return false
		}
	}
	return true
}

// PolyTerm is one coefficient–monomial pair of a polynomial.
type PolyTerm struct {
	Mono Mono
	Coef *big.Rat // never modified after construction
}

// Poly is a sparse multivariate polynomial over the rationals. Its terms are kept in the
// canonical order of monoCmp with no zero coefficients, so equal polynomials have equal terms.
// A Poly is immutable: every operation returns a new value.
type Poly struct {
	terms []PolyTerm
}

var (
	ratZero = new(big.Rat)
	ratOne  = big.NewRat(1, 1)
)

// PolyConst returns the constant polynomial c.
func PolyConst(c *big.Rat) Poly {
	if c.Sign() == 0 {
		return Poly{}
	}
	return Poly{terms: []PolyTerm{{Mono: nil, Coef: new(big.Rat).Set(c)}}}
}

// PolyInt returns the constant polynomial n.
func PolyInt(n int64) Poly { return PolyConst(big.NewRat(n, 1)) }

// PolyVar returns the polynomial consisting of the single variable v.
func PolyVar(v string) Poly {
	return Poly{terms: []PolyTerm{{Mono: Mono{{v, 1}}, Coef: ratOne}}}
}

// PolyMono returns c times the monomial m.
func PolyMono(c *big.Rat, m Mono) Poly {
	if c.Sign() == 0 {
		return Poly{}
	}
	return Poly{terms: []PolyTerm{{Mono: m, Coef: new(big.Rat).Set(c)}}}
}

// Terms returns the terms in canonical order. The caller must not modify them.
func (p Poly) Terms() []PolyTerm { return p.terms }

// Len is the number of terms.
func (p Poly) Len() int { return len(p.terms) }

// IsZero reports whether p is the zero polynomial.
func (p Poly) IsZero() bool { return len(p.terms) == 0 }

// IsConst reports whether p is a constant (possibly zero).
func (p Poly) IsConst() bool {
	return len(p.terms) == 0 || (len(p.terms) == 1 && len(p.terms[0].Mono) == 0)
}

// ConstValue returns the value of a constant polynomial; ok is false otherwise.
func (p Poly) ConstValue() (*big.Rat, bool) {
	if len(p.terms) == 0 {
		return new(big.Rat), true
	}
	if len(p.terms) == 1 && len(p.terms[0].Mono) == 0 {
		return new(big.Rat).Set(p.terms[0].Coef), true
	}
	return nil, false
}

// IsOne reports whether p is the constant 1.
func (p Poly) IsOne() bool {
	return len(p.terms) == 1 && len(p.terms[0].Mono) == 0 && p.terms[0].Coef.Cmp(ratOne) == 0
}

// LeadCoef is the coefficient of the first term in canonical order (0 for the zero polynomial).
func (p Poly) LeadCoef() *big.Rat {
	if len(p.terms) == 0 {
		return new(big.Rat)
	}
	return p.terms[0].Coef
}

// Equal reports whether p and q are the same polynomial.
func (p Poly) Equal(q Poly) bool {
	if len(p.terms) != len(q.terms) {
		return false
	}
	for i := range p.terms {
		if !monoEqual(p.terms[i].Mono, q.terms[i].Mono) || p.terms[i].Coef.Cmp(q.terms[i].Coef) != 0 {
			return false
		}
	}
	return true
}

// Vars returns the sorted list of variables that occur in p.
func (p Poly) Vars() []string {
	seen := map[string]bool{}
	for _, t := range p.terms {
		for _, vp := range t.Mono {
			seen[vp.Var] = true
		}
	}
	out := make([]string, 0, len(seen))
	for v := range seen {
		out = append(out, v)
	}
	sort.Strings(out)
	return out
}

// Has reports whether the variable v occurs in p.
func (p Poly) Has(v string) bool {
	for _, t := range p.terms {
		if t.Mono.Exp(v) > 0 {
			return true
		}
	}
	return false
}

// Degree returns the highest power of v in p (0 for the zero polynomial).
func (p Poly) Degree(v string) int {
	d := 0
	for _, t := range p.terms {
		d = max(d, t.Mono.Exp(v))
	}
	return d
}

// TotalDegree is the highest total degree of a term.
func (p Poly) TotalDegree() int {
	if len(p.terms) == 0 {
		return 0
	}
	return p.terms[0].Mono.Degree()
}

// fromTerms sorts raw terms, merges equal monomials and drops zeros. The terms' coefficient
// pointers may be mutated (they must be owned by the caller).
func fromTerms(ts []PolyTerm) Poly {
	if len(ts) == 0 {
		return Poly{}
	}
	slices.SortFunc(ts, func(a, b PolyTerm) int { return monoCmp(a.Mono, b.Mono) })
	out := ts[:0]
	for _, t := range ts {
		if n := len(out); n > 0 && monoEqual(out[n-1].Mono, t.Mono) {
			out[n-1].Coef.Add(out[n-1].Coef, t.Coef)
			continue
		}
		out = append(out, t)
	}
	res := out[:0]
	for _, t := range out {
		if t.Coef.Sign() != 0 {
			res = append(res, t)
		}
	}
	return Poly{terms: res}
}

// Add returns p + q.
func (p Poly) Add(q Poly) Poly { return p.addScaled(q, 1) }

// Sub returns p − q.
func (p Poly) Sub(q Poly) Poly { return p.addScaled(q, -1) }

// addScaled merges the two sorted term lists.
func (p Poly) addScaled(q Poly, sign int) Poly {
	if len(q.terms) == 0 {
		return p
	}
	if len(p.terms) == 0 && sign == 1 {
		return q
	}
	out := make([]PolyTerm, 0, len(p.terms)+len(q.terms))
	i, j := 0, 0
	for i < len(p.terms) || j < len(q.terms) {
		var c int
		switch {
		case i == len(p.terms):
			c = 1
		case j == len(q.terms):
			c = -1
		default:
			c = monoCmp(p.terms[i].Mono, q.terms[j].Mono)
		}
		switch {
		case c < 0:
			out = append(out, p.terms[i])
			i++
		case c > 0:
			t := q.terms[j]
			if sign < 0 {
				t = PolyTerm{Mono: t.Mono, Coef: new(big.Rat).Neg(t.Coef)}
			}
			out = append(out, t)
			j++
		default:
			s := new(big.Rat)
			if sign < 0 {
				s.Sub(p.terms[i].Coef, q.terms[j].Coef)
			} else {
				s.Add(p.terms[i].Coef, q.terms[j].Coef)
			}
			if s.Sign() != 0 {
				out = append(out, PolyTerm{Mono: p.terms[i].Mono, Coef: s})
			}
			i++
			j++
		}
	}
	return Poly{terms: out}
}

// Neg returns −p.
func (p Poly) Neg() Poly {
	out := make([]PolyTerm, len(p.terms))
	for i, t := range p.terms {
		out[i] = PolyTerm{Mono: t.Mono, Coef: new(big.Rat).Neg(t.Coef)}
	}
	return Poly{terms: out}
}

// Scale returns c·p.
func (p Poly) Scale(c *big.Rat) Poly {
	if c.Sign() == 0 {
		return Poly{}
	}
	if c.Cmp(ratOne) == 0 {
		return p
	}
	out := make([]PolyTerm, len(p.terms))
	for i, t := range p.terms {
		out[i] = PolyTerm{Mono: t.Mono, Coef: new(big.Rat).Mul(t.Coef, c)}
	}
	return Poly{terms: out}
}

// MulMono returns c·m·p.
func (p Poly) MulMono(c *big.Rat, m Mono) Poly {
	if c.Sign() == 0 {
		return Poly{}
	}
	out := make([]PolyTerm, len(p.terms))
	for i, t := range p.terms {
		out[i] = PolyTerm{Mono: monoMul(t.Mono, m), Coef: new(big.Rat).Mul(t.Coef, c)}
	}
	// The canonical order is a monomial order, so multiplying every term by m keeps it.
	return Poly{terms: out}
}

// Mul returns p·q.
func (p Poly) Mul(q Poly) Poly {
	if len(p.terms) == 0 || len(q.terms) == 0 {
		return Poly{}
	}
	if len(p.terms) == 1 {
		return q.MulMono(p.terms[0].Coef, p.terms[0].Mono)
	}
	if len(q.terms) == 1 {
		return p.MulMono(q.terms[0].Coef, q.terms[0].Mono)
	}
	ts := make([]PolyTerm, 0, len(p.terms)*len(q.terms))
	for _, a := range p.terms {
		for _, b := range q.terms {
			ts = append(ts, PolyTerm{Mono: monoMul(a.Mono, b.Mono), Coef: new(big.Rat).Mul(a.Coef, b.Coef)})
		}
	}
	return fromTerms(ts)
}

// Pow returns p^n for n ≥ 0.
func (p Poly) Pow(n int) Poly {
	if n < 0 {
		panic("expr: Poly.Pow with negative exponent")
	}
	res := PolyInt(1)
	base := p
	for n > 0 {
		if n&1 == 1 {
			res = res.Mul(base)
		}
		n >>= 1
		if n > 0 {
			base = base.Mul(base)
		}
	}
	return res
}

// Derivative returns ∂p/∂v.
func (p Poly) Derivative(v string) Poly {
	var ts []PolyTerm
	for _, t := range p.terms {
		e := t.Mono.Exp(v)
		if e == 0 {
			continue
		}
		m := make(Mono, 0, len(t.Mono))
		for _, vp := range t.Mono {
			if vp.Var == v {
				if vp.Exp > 1 {
					m = append(m, VarPow{v, vp.Exp - 1})
				}
				continue
			}
			m = append(m, vp)
		}
		ts = append(ts, PolyTerm{Mono: m, Coef: new(big.Rat).Mul(t.Coef, big.NewRat(int64(e), 1))})
	}
	return fromTerms(ts)
}

// Subst replaces the variable v by the polynomial q.
func (p Poly) Subst(v string, q Poly) Poly {
	if !p.Has(v) {
		return p
	}
	// Group by power of v, using Horner-like accumulation of q powers.
	byPow := map[int][]PolyTerm{}
	maxe := 0
	for _, t := range p.terms {
		e := t.Mono.Exp(v)
		m := t.Mono
		if e > 0 {
			m = make(Mono, 0, len(t.Mono)-1)
			for _, vp := range t.Mono {
				if vp.Var != v {
					m = append(m, vp)
				}
			}
		}
		byPow[e] = append(byPow[e], PolyTerm{Mono: m, Coef: t.Coef})
		maxe = max(maxe, e)
	}
	res := Poly{}
	qp := PolyInt(1)
	for e := 0; e <= maxe; e++ {
		if ts, ok := byPow[e]; ok {
			cp := make([]PolyTerm, len(ts))
			for i, t := range ts {
				cp[i] = PolyTerm{Mono: t.Mono, Coef: new(big.Rat).Set(t.Coef)}
			}
			res = res.Add(fromTerms(cp).Mul(qp))
		}
		if e < maxe {
			qp = qp.Mul(q)
		}
	}
	return res
}

// CoeffsIn writes p as Σ_e c_e v^e and returns the coefficients c_e (polynomials free of v),
// indexed by e from 0 to Degree(v).
func (p Poly) CoeffsIn(v string) []Poly {
	deg := p.Degree(v)
	raw := make([][]PolyTerm, deg+1)
	for _, t := range p.terms {
		e := t.Mono.Exp(v)
		m := t.Mono
		if e > 0 {
			m = make(Mono, 0, len(t.Mono)-1)
			for _, vp := range t.Mono {
				if vp.Var != v {
					m = append(m, vp)
				}
			}
		}
		raw[e] = append(raw[e], PolyTerm{Mono: m, Coef: t.Coef})
	}
	out := make([]Poly, deg+1)
	for e, ts := range raw {
		// Dividing terms of equal v-degree by v^e keeps their order (a monomial order).
		out[e] = Poly{terms: ts}
	}
	return out
}

// FromCoeffs is the inverse of CoeffsIn: Σ_e c[e]·v^e.
func FromCoeffs(v string, c []Poly) Poly {
	var ts []PolyTerm
	for e, ce := range c {
		for _, t := range ce.terms {
			m := t.Mono
			if e > 0 {
				m = monoMul(t.Mono, Mono{{v, e}})
			}
			ts = append(ts, PolyTerm{Mono: m, Coef: new(big.Rat).Set(t.Coef)})
		}
	}
	return fromTerms(ts)
}

// String prints p in canonical text form, e.g. "a^2 + a*b + b^2".
func (p Poly) String() string {
	if len(p.terms) == 0 {
		return "0"
	}
	var sb strings.Builder
	for i, t := range p.terms {
		c := t.Coef
		neg := c.Sign() < 0
		abs := new(big.Rat).Abs(c)
		writeSign(&sb, i == 0, neg)
		writeMonoTerm(&sb, abs, t.Mono)
	}
	return sb.String()
}

// writeMonoTerm writes |c|·m as text: "3*x^2*y", "x/2", "1/3".
func writeMonoTerm(sb *strings.Builder, abs *big.Rat, m Mono) {
	num := abs.Num()
	den := abs.Denom()
	one := num.IsInt64() && num.Int64() == 1
	if len(m) == 0 {
		sb.WriteString(abs.RatString())
		return
	}
	if !one {
		sb.WriteString(num.String())
		sb.WriteString("*")
	}
	for k, vp := range m {
		if k > 0 {
			sb.WriteString("*")
		}
		sb.WriteString(vp.Var)
		if vp.Exp != 1 {
			fmt.Fprintf(sb, "^%d", vp.Exp)
		}
	}
	if !den.IsInt64() || den.Int64() != 1 {
		sb.WriteString("/")
		sb.WriteString(den.String())
	}
}
