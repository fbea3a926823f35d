package pv

import (
	"math/big"

	"loopmatch/expr"
)

// The reduction keeps its coefficients fraction-free: the coefficient of each scalar integral
// is a polynomial numerator over a denominator written as a product of powers of registered
// factor polynomials (Gram determinants, linear polynomials in d, mass differences). Adding
// two coefficients takes the least common multiple of two factor lists and polynomial
// products, with no polynomial GCD; whole factors that divide a numerator are cancelled by
// exact division after each step (comb.go, tidy), and each coefficient is brought to lowest
// terms once, when it leaves the package. (Normalising after every step spent most of the time
// of symbolic reductions in GCDs of large polynomials.)

// fexp is the factor number id of the registry to the power e > 0.
type fexp struct{ id, e int }

// denom is a product of registered factors, sorted by id; nil is 1.
type denom []fexp

// lcmDen returns the least common multiple of a and b as factor lists.
func lcmDen(a, b denom) denom {
	out := make(denom, 0, len(a)+len(b))
	i, j := 0, 0
	for i < len(a) || j < len(b) {
		switch {
		case j == len(b) || (i < len(a) && a[i].id < b[j].id):
			out = append(out, a[i])
			i++
		case i == len(a) || b[j].id < a[i].id:
			out = append(out, b[j])
			j++
		default:
			out = append(out, fexp{a[i].id, max(a[i].e, b[j].e)})
			i++
			j++
		}
	}
	return out
}

// mulDen returns a·b.
func mulDen(a, b denom) denom {
	if len(b) == 0 {
		return a
	}
	if len(a) == 0 {
		return b
	}
	out := make(denom, 0, len(a)+len(b))
	i, j := 0, 0
	for i < len(a) || j < len(b) {
		switch {
		case j == len(b) || (i < len(a) && a[i].id < b[j].id):
			out = append(out, a[i])
			i++
		case i == len(a) || b[j].id < a[i].id:
			out = append(out, b[j])
			j++
		default:
			out = append(out, fexp{a[i].id, a[i].e + b[j].e})
			i++
			j++
		}
	}
	return out
}

// quoDen returns a/b for b dividing a.
func quoDen(a, b denom) denom {
	var out denom
	j := 0
	for _, f := range a {
		e := f.e
		if j < len(b) && b[j].id == f.id {
			e -= b[j].e
			j++
		}
		if e > 0 {
			out = append(out, fexp{f.id, e})
		}
	}
	return out
}

// factorSet is the registry of denominator factors of one reduction: primitive non-constant
// polynomials, numbered in the order they are met.
type factorSet struct {
	polys []expr.Poly
	index map[string]int
	pows  map[fexp]expr.Poly
}

func newFactorSet() *factorSet {
	return &factorSet{index: map[string]int{}, pows: map[fexp]expr.Poly{}}
}

// register returns the number of the factor p (made primitive; constants are not factors).
func (fs *factorSet) register(p expr.Poly) (int, *big.Rat) {
	c, q := p.PrimitiveZ()
	key := q.String()
	if id, ok := fs.index[key]; ok {
		return id, c
	}
	fs.polys = append(fs.polys, q)
	fs.index[key] = len(fs.polys) - 1
	return len(fs.polys) - 1, c
}

// split writes d = c·Π f^e over the registered factors by trial division; a remainder that
// no registered factor divides is registered as a new factor.
func (fs *factorSet) split(d expr.Poly) (*big.Rat, denom) {
	c, q := d.PrimitiveZ()
	var out denom
	for id, f := range fs.polys {
		if q.IsConst() {
			break
		}
		e := 0
		for {
			x, ok := q.DivExact(f)
			if !ok {
				break
			}
			q = x
			e++
		}
		if e > 0 {
			out = append(out, fexp{id, e})
		}
	}
	if k, ok := q.ConstValue(); ok {
		return c.Mul(c, k), out
	}
	id, k := fs.register(q)
	return c.Mul(c, k), mulDen(out, denom{{id, 1}})
}

// poly returns the product of the factors in d.
func (fs *factorSet) poly(d denom) expr.Poly {
	p := expr.PolyInt(1)
	for _, f := range d {
		x, ok := fs.pows[f]
		if !ok {
			x = fs.polys[f.id].Pow(f.e)
			fs.pows[f] = x
		}
		p = p.Mul(x)
	}
	return p
}

// mult is a multiplier num/den of a combination.
type mult struct {
	num expr.Poly
	den denom
}

// constMult returns the rational a/b.
func constMult(a, b int64) mult { return mult{num: expr.PolyConst(big.NewRat(a, b))} }

// fromRat converts a rational function to a multiplier over registered factors.
func (fs *factorSet) fromRat(x expr.RatFunc) mult {
	if x.IsPoly() {
		return mult{num: x.Num()}
	}
	c, d := fs.split(x.Den())
	return mult{num: x.Num().Scale(new(big.Rat).Inv(c)), den: d}
}

// addMult returns a + b.
func (fs *factorSet) addMult(a, b mult) mult {
	if a.num.IsZero() {
		return b
	}
	if b.num.IsZero() {
		return a
	}
	l := lcmDen(a.den, b.den)
	return mult{num: a.num.Mul(fs.poly(quoDen(l, a.den))).Add(b.num.Mul(fs.poly(quoDen(l, b.den)))), den: l}
}

// mulMult returns a·b.
func mulMult(a, b mult) mult {
	return mult{num: a.num.Mul(b.num), den: mulDen(a.den, b.den)}
}
