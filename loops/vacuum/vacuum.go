// Package vacuum evaluates vacuum integrals (no external momenta) exactly in d: one-loop
// integrals with any integer powers and masses reduce by partial fractions to the tadpole
// master Tad(M²); scaleless integrals vanish in dimensional regularisation (and are reported);
// masters expand in ε to any requested order.
//
// Normalisation: every integral is (16π²/i) times μ^{2ε} (e^{γ_E}/4π)^ε ∫ d^dk/(2π)^d of its
// integrand per loop, so that Tad(M²) = A0(M) of PHYSICS.md:
//
//	Tad(M²) = −M² e^{γ_E ε} Γ(−1+ε) (M²/μ²)^{−ε} = M² [1/ε + 1 − L + ε(1 − L + L²/2 + π²/12)] + …,
//	L = ln(M²/μ²).
package vacuum

import (
	"fmt"
	"math/big"
	"strings"

	"loopmatch/expr"
	"loopmatch/loops"
)

// TadName is the function name of the one-loop tadpole master, Tad(M²) with the mass squared as
// its argument (loops.TadName).
const TadName = loops.TadName

// Tad returns the master atom Tad(m2).
func Tad(m2 expr.RatFunc) expr.Expr {
	return expr.FromAtom(expr.NewFn(TadName, 1, expr.FromRF(m2)), 1)
}

// Line is one propagator factor 1/(k² − M2)^Pow of a one-loop vacuum integral; a negative Pow
// is a numerator factor (k² − M2)^{−Pow}.
type Line struct {
	M2  expr.RatFunc
	Pow int
}

// Info reports what a reduction did that the user should know.
type Info struct {
	// Scaleless lists the integrals without a scale that were set to zero, with their
	// coefficients (dimensional regularisation: ∫ (k²)^n = 0). In matching these are the places
	// where infrared poles of the full theory turn into ultraviolet poles of the effective theory.
	Scaleless []string
}

// Merge adds the entries of other.
func (i *Info) Merge(other Info) { i.Scaleless = append(i.Scaleless, other.Scaleless...) }

// xVar is the internal variable for k² in the partial fractions.
const xVar = "k2·"

// Loop1 returns ∫ (k²)^a / Π_i (k² − M2_i)^{Pow_i} (normalised as in the package comment),
// exact in d, as a combination of Tad masters with coefficients rational in d and the masses.
func Loop1(a int, lines []Line) (expr.Expr, Info, error) {
	var info Info
	if a < 0 {
		lines = append(lines, Line{M2: expr.RFInt(0), Pow: -a})
		a = 0
	}
	x := expr.RFVar(xVar)
	// Merge equal masses; move numerator factors into N(x).
	num := expr.RF(expr.PolyVar(xVar).Pow(a))
	var dens []den
outer:
	for _, l := range lines {
		if l.Pow == 0 {
			continue
		}
		if l.M2.Has(xVar) {
			return expr.Expr{}, info, fmt.Errorf("vacuum: mass %s uses a reserved name", l.M2)
		}
		if l.Pow < 0 {
			f, _ := x.Sub(l.M2).Pow(-l.Pow)
			num = num.Mul(f)
			continue
		}
		for i := range dens {
			if dens[i].m2.Equal(l.M2) {
				dens[i].n += l.Pow
				continue outer
			}
		}
		dens = append(dens, den{l.M2, l.Pow})
	}
	if len(dens) == 0 {
		info.Scaleless = append(info.Scaleless, fmt.Sprintf("∫ %s = 0", strings.ReplaceAll(num.String(), xVar, "k^2")))
		return expr.Zero(), info, nil
	}
	fr, err := fractions(num, dens)
	if err != nil {
		return expr.Expr{}, info, err
	}
	res := expr.Zero()
	for _, f := range fr {
		if f.M2.IsZero() {
			info.Scaleless = append(info.Scaleless, fmt.Sprintf("(%s) ∫ 1/(k^2)^%d = 0", f.Coef, f.Pow))
			continue
		}
		t, err := tadPower(f.M2, f.Pow)
		if err != nil {
			return expr.Expr{}, info, err
		}
		res = res.Add(t.Scale(f.Coef))
	}
	return res, info, nil
}

// Fraction is one term Coef/(x − M2)^Pow of a partial-fraction decomposition in x = k².
type Fraction struct {
	Coef, M2 expr.RatFunc
	Pow      int
}

// Fractions decomposes Π_i 1/(x − M2_i)^{Pow_i} (all powers positive; equal masses are merged)
// into partial fractions in x.
func Fractions(lines []Line) ([]Fraction, error) {
	var dens []den
outer:
	for _, l := range lines {
		if l.Pow < 0 {
			return nil, fmt.Errorf("vacuum: Fractions takes denominators only")
		}
		if l.Pow == 0 {
			continue
		}
		for i := range dens {
			if dens[i].m2.Equal(l.M2) {
				dens[i].n += l.Pow
				continue outer
			}
		}
		dens = append(dens, den{l.M2, l.Pow})
	}
	return fractions(expr.RFInt(1), dens)
}

// den is a denominator factor (x − m2)^n.
type den struct {
	m2 expr.RatFunc
	n  int
}

// fractions returns the fractional part of num(x)/Π (x − M_i)^{n_i} (distinct M_i): the
// coefficient of 1/(x − M_i)^j is g^{(n_i−j)}(M_i)/(n_i − j)! with g = num/Π_{k≠i}(x − M_k)^{n_k}.
func fractions(num expr.RatFunc, dens []den) ([]Fraction, error) {
	x := expr.RFVar(xVar)
	var out []Fraction
	for i, di := range dens {
		g := num
		for k, dk := range dens {
			if k == i {
				continue
			}
			f, _ := x.Sub(dk.m2).Pow(dk.n)
			var err error
			if g, err = g.Div(f); err != nil {
				return nil, err
			}
		}
		deriv := g
		fact := big.NewInt(1)
		for order := 0; order < di.n; order++ {
			if order > 0 {
				deriv = deriv.Derivative(xVar)
				fact.Mul(fact, big.NewInt(int64(order)))
			}
			c, err := deriv.Subst(xVar, di.m2)
			if err != nil {
				return nil, fmt.Errorf("vacuum: partial fractions: %v", err)
			}
			c = c.Scale(new(big.Rat).SetFrac(big.NewInt(1), fact))
			if !c.IsZero() {
				out = append(out, Fraction{Coef: c, M2: di.m2, Pow: di.n - order})
			}
		}
	}
	return out, nil
}

// tadPower returns ∫ 1/(k² − M2)^n = (−1)^{n−1}/(n−1)! Π_{l=−1}^{n−3} ((2l + 4 − d)/2) · M2^{1−n} Tad(M2),
// from Γ(n − 2 + ε)/Γ(−1 + ε) = Π_{l=−1}^{n−3} (l + ε) with ε = (4 − d)/2.
func tadPower(m2 expr.RatFunc, n int) (expr.Expr, error) {
	if n < 1 {
		return expr.Expr{}, fmt.Errorf("vacuum: tadpole power %d", n)
	}
	d := expr.RFVar(expr.DimSymbol)
	c := expr.RFInt(1)
	for l := -1; l <= n-3; l++ {
		f, _ := expr.RFInt(int64(2*l + 4)).Sub(d).Div(expr.RFInt(2))
		c = c.Mul(f)
	}
	fact := new(big.Int).MulRange(1, int64(n-1))
	sign := int64(1)
	if (n-1)%2 == 1 {
		sign = -1
	}
	c = c.Scale(new(big.Rat).SetFrac(big.NewInt(sign), fact))
	mp, err := m2.Pow(1 - n)
	if err != nil {
		return expr.Expr{}, err
	}
	return Tad(m2).Scale(c.Mul(mp)), nil
}
