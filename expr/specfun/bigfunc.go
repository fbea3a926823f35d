package specfun

import (
	"math"
	"math/big"
	"sync"

	"github.com/ALTree/bigfloat"
)

// lnReal returns ln x for x > 0 at precision p. Arguments within 1/16 of 1 use
// ln x = 2 atanh((x−1)/(x+1)), so that the relative accuracy holds however close x is to 1.
func lnReal(x *big.Float, p uint) *big.Float {
	q := p + 32
	one := newFloat(q).SetInt64(1)
	t := newFloat(q).Sub(x, one)
	if t.Sign() == 0 {
		return newFloat(p)
	}
	if t.MantExp(nil) <= -4 { // |x−1| < 1/16
		s := newFloat(q).Add(x, one)
		return atanhSeries(t.Quo(t, s), p)
	}
	xx := newFloat(q).Set(x)
	return bigfloat.Log(xx).SetPrec(p)
}

// log1pReal returns ln(1+w) for w > −1 at precision p, accurate for small |w|.
func log1pReal(w *big.Float, p uint) *big.Float {
	q := p + 32
	if w.Sign() == 0 {
		return newFloat(p)
	}
	if w.MantExp(nil) <= -4 {
		d := newFloat(q).Add(newFloat(q).SetInt64(2), w)
		return atanhSeries(newFloat(q).Quo(w, d), p)
	}
	return lnReal(newFloat(q).Add(newFloat(q).SetInt64(1), w), p)
}

// atanhSeries returns 2 atanh(r) = 2(r + r³/3 + r⁵/5 + …) for small |r|.
func atanhSeries(r *big.Float, p uint) *big.Float {
	q := p + 32
	r2 := newFloat(q).Mul(r, r)
	term := newFloat(q).Set(r)
	sum := newFloat(q).Set(r)
	t := newFloat(q)
	for n := int64(1); ; n++ {
		term.Mul(term, r2)
		t.Quo(term, newFloat(q).SetInt64(2*n+1))
		sum.Add(sum, t)
		if t.Sign() == 0 || t.MantExp(nil) < sum.MantExp(nil)-int(q) {
			break
		}
	}
	sum.Mul(sum, newFloat(q).SetInt64(2))
	return sum.SetPrec(p)
}

// Log returns the principal logarithm ln|z| + i arg z, arg in (−π, π], at precision prec.
// A negative real z with imaginary part +0 gives arg = π, with −0 gives −π (as math/cmplx).
// Log(0) has real part −Inf.
func Log(z Complex, prec uint) Complex {
	p := prec + 32
	if z.IsZero() {
		return Complex{newFloat(prec).SetInf(true), newFloat(prec)}
	}
	var re *big.Float
	if z.Im.Sign() == 0 {
		a := newFloat(p).Abs(z.Re)
		re = lnReal(a, p)
	} else {
		// ½ ln(x²+y²), with x²+y² formed (nearly) exactly so that |z| ≈ 1 keeps its digits.
		q := 2*z.Prec() + 64
		s := newFloat(q).Mul(z.Re, z.Re)
		s.Add(s, newFloat(q).Mul(z.Im, z.Im))
		re = lnReal(s, p)
		re.Quo(re, newFloat(p).SetInt64(2))
	}
	im := Atan2(z.Im, z.Re, p)
	return Complex{re.SetPrec(prec), im.SetPrec(prec)}
}

// log1pC returns ln(1+w) at precision prec, accurate for small |w|.
func log1pC(w Complex, prec uint) Complex {
	e := w.exponent()
	extra := uint(0)
	if e < 0 {
		extra = uint(-e)
	}
	if extra > 4*prec {
		extra = 4 * prec
	}
	q := w.Prec() + extra + 64
	one := Complex{newFloat(q).SetInt64(1), newFloat(q)}
	s := one.Add(w.SetPrec(q)) // exact up to q bits
	if w.Im.Sign() == 0 && w.Re.Cmp(big.NewFloat(-1)) > 0 {
		return Complex{log1pReal(w.Re, prec), newFloat(prec).Set(w.Im)}
	}
	return Log(s, prec)
}

// Atan2 returns the angle of the point (x, y) in (−π, π] at precision prec, as math.Atan2 does,
// including the signs of zeros: Atan2(+0, x<0) = π, Atan2(−0, x<0) = −π.
func Atan2(y, x *big.Float, prec uint) *big.Float {
	p := prec + 32
	switch {
	case x.Sign() == 0 && y.Sign() == 0:
		if x.Signbit() {
			pi := Pi(prec)
			if y.Signbit() {
				pi.Neg(pi)
			}
			return pi
		}
		r := newFloat(prec)
		if y.Signbit() {
			r.Neg(r)
		}
		return r
	case x.Sign() == 0:
		h := Pi(p)
		h.Quo(h, newFloat(p).SetInt64(2))
		if y.Sign() < 0 {
			h.Neg(h)
		}
		return h.SetPrec(prec)
	}
	a := atanBig(newFloat(p).Quo(y, x), p)
	if x.Sign() > 0 {
		return a.SetPrec(prec)
	}
	pi := Pi(p)
	if y.Signbit() {
		a.Sub(a, pi)
	} else {
		a.Add(a, pi)
	}
	return a.SetPrec(prec)
}

// atanBig returns atan(x) at precision p: reduction to |x| ≤ 1 by atan x = ±π/2 − atan(1/x),
// then halving atan x = 2 atan(x/(1+√(1+x²))) down to |x| < 2^-10, then the Taylor series.
func atanBig(x *big.Float, p uint) *big.Float {
	if x.Sign() == 0 {
		return newFloat(p).Set(x)
	}
	q := p + 32
	a := newFloat(q).Abs(x)
	one := newFloat(q).SetInt64(1)
	inverted := false
	if a.Cmp(one) > 0 {
		a.Quo(one, a)
		inverted = true
	}
	k := 0
	lim := newFloat(q).SetMantExp(one, -10)
	t := newFloat(q)
	for a.Cmp(lim) > 0 {
		t.Mul(a, a)
		t.Add(t, one)
		t.Sqrt(t)
		t.Add(t, one)
		a.Quo(a, t)
		k++
	}
	a2 := newFloat(q).Mul(a, a)
	term := newFloat(q).Set(a)
	sum := newFloat(q).Set(a)
	for n := int64(1); ; n++ {
		term.Mul(term, a2)
		t.Quo(term, newFloat(q).SetInt64(2*n+1))
		if n%2 == 1 {
			sum.Sub(sum, t)
		} else {
			sum.Add(sum, t)
		}
		if t.Sign() == 0 || t.MantExp(nil) < sum.MantExp(nil)-int(q) {
			break
		}
	}
	sum.SetMantExp(sum, k)
	if inverted {
		h := Pi(q)
		h.Quo(h, newFloat(q).SetInt64(2))
		sum.Sub(h, sum)
	}
	if x.Sign() < 0 {
		sum.Neg(sum)
	}
	return sum.SetPrec(p)
}

// Sqrt returns the principal square root of z (Re ≥ 0; a negative real z with imaginary part +0
// gives +i√|z|, with −0 gives −i√|z|) at precision prec.
func Sqrt(z Complex, prec uint) Complex {
	p := prec + 32
	if z.IsZero() {
		return Complex{newFloat(prec), newFloat(prec).Set(z.Im)}
	}
	r := z.SetPrec(p).Abs()
	two := newFloat(p).SetInt64(2)
	if z.Re.Sign() >= 0 {
		t := newFloat(p).Add(r, z.Re)
		t.Quo(t, two)
		t.Sqrt(t)
		im := newFloat(p).Quo(z.Im, t)
		im.Quo(im, two)
		return Complex{t.SetPrec(prec), im.SetPrec(prec)}
	}
	t := newFloat(p).Sub(r, z.Re)
	t.Quo(t, two)
	t.Sqrt(t)
	re := newFloat(p).Abs(z.Im)
	re.Quo(re, t)
	re.Quo(re, two)
	if z.Im.Signbit() {
		t.Neg(t)
	}
	return Complex{re.SetPrec(prec), t.SetPrec(prec)}
}

// coefCache keeps, per working precision, the Bernoulli-series coefficients of Li2
// (B_{2k}/(2k+1)!) and of Cl2 (|B_{2k}|/(2k(2k+1)!) and (2^{2k}−1)|B_{2k}|/(2k(2k+1)!)).
var coefCache struct {
	sync.Mutex
	li2, cl2a, cl2b map[uint][]*big.Float
}

func seriesCoef(kind string, k int, p uint) *big.Float {
	coefCache.Lock()
	defer coefCache.Unlock()
	if coefCache.li2 == nil {
		coefCache.li2 = map[uint][]*big.Float{}
		coefCache.cl2a = map[uint][]*big.Float{}
		coefCache.cl2b = map[uint][]*big.Float{}
	}
	var m map[uint][]*big.Float
	switch kind {
	case "li2":
		m = coefCache.li2
	case "cl2a":
		m = coefCache.cl2a
	default:
		m = coefCache.cl2b
	}
	s := m[p]
	for len(s) < k {
		j := len(s) + 1 // coefficient index k ≥ 1
		b := BernoulliEven(j)
		var r *big.Rat
		switch kind {
		case "li2":
			r = new(big.Rat).Quo(b, new(big.Rat).SetInt(factorial(2*j+1)))
		case "cl2a", "cl2b":
			d := new(big.Int).Mul(big.NewInt(int64(2*j)), factorial(2*j+1))
			r = new(big.Rat).Quo(new(big.Rat).Abs(b), new(big.Rat).SetInt(d))
			if kind == "cl2b" {
				f := new(big.Int).Sub(new(big.Int).Lsh(big.NewInt(1), uint(2*j)), big.NewInt(1))
				r.Mul(r, new(big.Rat).SetInt(f))
			}
		}
		s = append(s, newFloat(p).SetRat(r))
	}
	m[p] = s
	return s[k-1]
}

// Li2Big returns the dilogarithm Li2(z) at precision prec (bits), with the conventions of Li2:
// principal branch, cut (1, ∞), a real z > 1 with zero imaginary part taken as z − i0.
func Li2Big(z Complex, prec uint) Complex {
	return Li2BigSide(z, -1, prec)
}

// Li2BigSide returns Li2 at z + side·i0: for real z > 1 (zero imaginary part) side > 0 gives the
// value from above and side ≤ 0 the value from below; elsewhere it equals Li2Big(z, prec).
func Li2BigSide(z Complex, side int, prec uint) Complex {
	p := prec + 64
	z = z.SetPrec(p)
	if z.Im.Sign() == 0 {
		x := z.Re
		one := newFloat(p).SetInt64(1)
		re := li2RealBig(x, p)
		im := newFloat(p)
		if x.Cmp(one) > 0 {
			im = lnReal(x, p)
			im.Mul(im, Pi(p))
			if side <= 0 {
				im.Neg(im)
			}
		}
		return Complex{re.SetPrec(prec), im.SetPrec(prec)}
	}
	var r Complex
	q := 2*p + 16
	abs2 := newFloat(q).Mul(z.Re, z.Re)
	abs2.Add(abs2, newFloat(q).Mul(z.Im, z.Im))
	if abs2.Cmp(newFloat(q).SetInt64(1)) > 0 {
		// Inversion (Lewin 1981, ch. 1): Li2(z) = −Li2(1/z) − π²/6 − ½ ln²(−z).
		w := z.Inv()
		l := Log(z.Neg(), p)
		l2 := l.Mul(l)
		l2 = l2.Scale(newFloat(p).SetFloat64(0.5))
		r = li2UnitBig(w, p).Neg()
		r = r.Sub(RealComplex(zeta2Big(p), p)).Sub(l2)
	} else {
		r = li2UnitBig(z, p)
	}
	return r.SetPrec(prec)
}

func zeta2Big(p uint) *big.Float {
	pi := Pi(p + 16)
	pi.Mul(pi, pi)
	return pi.Quo(pi, newFloat(p+16).SetInt64(6)).SetPrec(p)
}

// li2UnitBig evaluates Li2 for |z| ≤ 1, z not real.
func li2UnitBig(z Complex, p uint) Complex {
	half := newFloat(p).SetFloat64(0.5)
	one := NewComplex(1, 0, p)
	if z.Re.Cmp(half) > 0 {
		// Reflection (Lewin 1981, ch. 1): Li2(z) = π²/6 − ln z ln(1−z) − Li2(1−z).
		v := one.Sub(z)
		lnz := log1pC(v.Neg(), p)
		lnv := Log(v, p)
		s := li2SeriesBig(lnz.Neg(), p) // u = −ln(1−v) = −ln z
		return RealComplex(zeta2Big(p), p).Sub(lnz.Mul(lnv)).Sub(s)
	}
	l := log1pC(z.Neg(), p)
	return li2SeriesBig(l.Neg(), p)
}

// li2SeriesBig returns Σ_n B_n u^{n+1}/(n+1)! = u − u²/4 + Σ_k B_{2k} u^{2k+1}/(2k+1)!.
func li2SeriesBig(u Complex, p uint) Complex {
	if u.IsZero() {
		return u
	}
	u2 := u.Mul(u)
	quarter := newFloat(p).SetFloat64(0.25)
	sum := u.Sub(u2.Scale(quarter))
	pw := u.Mul(u2) // u^{2k+1}
	target := u.exponent() - int(p) - 4
	for k := 1; ; k++ {
		t := pw.Scale(seriesCoef("li2", k, p))
		sum = sum.Add(t)
		if t.IsZero() || t.exponent() < target {
			break
		}
		pw = pw.Mul(u2)
		if k > 4*int(p) { // cannot happen for |u| ≤ 1.1; guards against misuse
			break
		}
	}
	return sum
}

// li2RealBig returns Li2(x) for x ≤ 1 and Re Li2(x ± i0) for x > 1, at precision p.
func li2RealBig(x *big.Float, p uint) *big.Float {
	one := newFloat(p).SetInt64(1)
	switch {
	case x.Sign() == 0:
		return newFloat(p)
	case x.Cmp(one) == 0:
		return zeta2Big(p)
	case x.Cmp(one) > 0:
		// π²/3 − ½ ln²x − Li2(1/x)
		l := lnReal(x, p)
		l.Mul(l, l)
		l.Quo(l, newFloat(p).SetInt64(2))
		r := zeta2Big(p)
		r.Mul(r, newFloat(p).SetInt64(2))
		r.Sub(r, l)
		return r.Sub(r, li2RealBig(newFloat(p).Quo(one, x), p))
	case x.Cmp(newFloat(p).SetInt64(-1)) < 0:
		// −Li2(1/x) − π²/6 − ½ ln²(−x)
		l := lnReal(newFloat(p).Neg(x), p)
		l.Mul(l, l)
		l.Quo(l, newFloat(p).SetInt64(2))
		r := li2RealBig(newFloat(p).Quo(one, x), p)
		r.Neg(r)
		r.Sub(r, zeta2Big(p))
		return r.Sub(r, l)
	case x.Cmp(newFloat(p).SetFloat64(0.5)) > 0:
		// π²/6 − ln x ln(1−x) − Li2(1−x)
		v := newFloat(p).Sub(one, x)
		lx := log1pReal(newFloat(p).Neg(v), p)
		lv := lnReal(v, p)
		r := zeta2Big(p)
		r.Sub(r, lx.Mul(lx, lv))
		return r.Sub(r, li2SeriesRealBig(v, p))
	}
	return li2SeriesRealBig(x, p)
}

func li2SeriesRealBig(x *big.Float, p uint) *big.Float {
	u := log1pReal(newFloat(p).Neg(x), p)
	u.Neg(u)
	s := li2SeriesBig(RealComplex(u, p), p)
	return s.Re
}

// Cl2Big returns the Clausen function Cl2(θ) at precision prec for any real θ (the argument is
// reduced modulo 2π at a precision that covers the size of θ).
func Cl2Big(theta *big.Float, prec uint) *big.Float {
	p := prec + 64
	if theta.Sign() == 0 {
		return newFloat(prec)
	}
	e := theta.MantExp(nil)
	if e < 0 {
		e = 0
	}
	q := p + uint(e) + 16
	pi := Pi(q)
	twoPi := newFloat(q).Mul(pi, newFloat(q).SetInt64(2))
	t := newFloat(q).Set(theta)
	if newFloat(q).Abs(t).Cmp(pi) > 0 {
		k := newFloat(q).Quo(t, twoPi)
		ki, _ := k.Int(nil)
		// round to nearest
		frac := newFloat(q).Sub(k, newFloat(q).SetInt(ki))
		if frac.Cmp(big.NewFloat(0.5)) > 0 {
			ki.Add(ki, big.NewInt(1))
		} else if frac.Cmp(big.NewFloat(-0.5)) < 0 {
			ki.Sub(ki, big.NewInt(1))
		}
		t.Sub(t, newFloat(q).Mul(newFloat(q).SetInt(ki), twoPi))
	}
	t.SetPrec(p)
	sign := 1
	if t.Sign() < 0 {
		t.Neg(t)
		sign = -1
	}
	if t.Sign() == 0 {
		return newFloat(prec)
	}
	piP := Pi(p)
	twoThirdsPi := newFloat(p).Mul(piP, newFloat(p).SetFloat64(2))
	twoThirdsPi.Quo(twoThirdsPi, newFloat(p).SetInt64(3))
	var r *big.Float
	if t.Cmp(twoThirdsPi) <= 0 {
		// θ − θ ln θ + Σ_k |B_2k| θ^{2k+1}/(2k (2k+1)!)
		t2 := newFloat(p).Mul(t, t)
		pw := newFloat(p).Mul(t, t2)
		r = lnReal(t, p)
		r.Mul(r, t)
		r.Sub(t, r)
		target := r.MantExp(nil) - int(p) - 4
		for k := 1; ; k++ {
			term := newFloat(p).Mul(pw, seriesCoef("cl2a", k, p))
			r.Add(r, term)
			if term.Sign() == 0 || term.MantExp(nil) < target {
				break
			}
			pw.Mul(pw, t2)
		}
	} else {
		// Cl2(π−φ) = φ ln 2 − Σ_k (2^{2k}−1)|B_2k| φ^{2k+1}/(2k (2k+1)!)
		phi := newFloat(p).Sub(newFloat(p).SetPrec(q).Set(pi), t)
		phi.SetPrec(p)
		f2 := newFloat(p).Mul(phi, phi)
		pw := newFloat(p).Mul(phi, f2)
		r = lnReal(newFloat(p).SetInt64(2), p)
		r.Mul(r, phi)
		if phi.Sign() == 0 {
			return newFloat(prec)
		}
		target := r.MantExp(nil) - int(p) - 4
		for k := 1; ; k++ {
			term := newFloat(p).Mul(pw, seriesCoef("cl2b", k, p))
			r.Sub(r, term)
			if term.Sign() == 0 || term.MantExp(nil) < target {
				break
			}
			pw.Mul(pw, f2)
		}
	}
	if sign < 0 {
		r.Neg(r)
	}
	return r.SetPrec(prec)
}

// float64 helper for tests and callers: the number of bits for d decimal digits.
func bitsForDigits(d int) uint { return uint(math.Ceil(float64(d)*math.Log2(10))) + 8 }
