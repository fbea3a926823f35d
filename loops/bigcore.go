package loops

import (
	"math"
	"math/big"

	"loopmatch/expr/specfun"
)

// BigValue is the arbitrary-precision counterpart of Value.
type BigValue struct {
	Pole2, Pole1, Finite specfun.Complex
}

// Value returns the nearest float64 Value.
func (v BigValue) Value() Value {
	return Value{Pole2: v.Pole2.Complex128(), Pole1: v.Pole1.Complex128(), Finite: v.Finite.Complex128()}
}

type bc = specfun.Complex

// bnum is the working context of one arbitrary-precision evaluation: the working precision w.
type bnum struct{ w uint }

func (n bnum) f(x float64) *big.Float     { return new(big.Float).SetPrec(n.w).SetFloat64(x) }
func (n bnum) fl(x *big.Float) *big.Float { return new(big.Float).SetPrec(n.w).Set(x) }
func (n bnum) c(re, im float64) bc        { return specfun.NewComplex(re, im, n.w) }
func (n bnum) r(x *big.Float) bc          { return specfun.RealComplex(x, n.w) }
func (n bnum) zero() bc                   { return n.c(0, 0) }
func (n bnum) one() bc                    { return n.c(1, 0) }
func (n bnum) log(z bc) bc                { return specfun.Log(z, n.w) }
func (n bnum) li2(z bc) bc                { return specfun.Li2Big(z, n.w) }
func (n bnum) sqrt(z bc) bc               { return specfun.Sqrt(z, n.w) }
func (n bnum) pi() *big.Float             { return specfun.Pi(n.w) }
func (n bnum) phase(z bc) float64 {
	f, _ := specfun.Atan2(z.Im, z.Re, n.w).Float64()
	return f
}

// sum3 returns a + b − c rounded once to the working precision (the intermediate sum is exact),
// so that Y_ij = (m_i² + m_j² − s_ij)/2 keeps a small mass next to an on-shell leg.
func (n bnum) sum3(a, b, c *big.Float) *big.Float {
	p := a.Prec()
	for _, x := range []*big.Float{b, c} {
		if x.Prec() > p {
			p = x.Prec()
		}
	}
	lo, hi := 0, 0
	first := true
	for _, x := range []*big.Float{a, b, c} {
		if x.Sign() == 0 {
			continue
		}
		e := x.MantExp(nil)
		if first || e < lo {
			lo = e
		}
		if first || e > hi {
			hi = e
		}
		first = false
	}
	q := p + uint(hi-lo) + 8
	s := new(big.Float).SetPrec(q).Add(a, b)
	s.Sub(s, c)
	return new(big.Float).SetPrec(n.w).Set(s)
}

// tiny returns 2^{−3w}·(1 + |x|): the magnitude of an infinitesimal imaginary part, far below the
// working precision.
func (n bnum) tiny(x *big.Float) *big.Float {
	a := new(big.Float).SetPrec(n.w).Abs(x)
	a.Add(a, n.f(1))
	return a.SetMantExp(a, -3*int(n.w))
}

// isTinyIm reports whether z's imaginary part is an infinitesimal (|Im z| ≤ 2^{−2w}(1+|Re z|)).
func (n bnum) isTinyIm(z bc) bool {
	if z.Im.Sign() == 0 {
		return true
	}
	a := new(big.Float).SetPrec(n.w).Abs(z.Re)
	a.Add(a, n.f(1))
	a.SetMantExp(a, -2*int(n.w))
	return new(big.Float).Abs(z.Im).Cmp(a) <= 0
}

func (n bnum) withI0(y *big.Float, sigma int) bc {
	t := n.tiny(y)
	if sigma < 0 {
		t.Neg(t)
	}
	return bc{Re: n.fl(y), Im: t}
}

// lnMinusI0 returns ln(x − i0) for real x.
func (n bnum) lnMinusI0(x *big.Float) bc {
	if x.Sign() < 0 {
		l := specfun.Log(n.r(new(big.Float).Neg(x)), n.w)
		return bc{Re: l.Re, Im: new(big.Float).Neg(n.pi())}
	}
	return n.log(n.r(x))
}

// li2Side returns Li2(x ± i0) for real x.
func (n bnum) li2Side(x *big.Float, side int) bc {
	return specfun.Li2BigSide(n.r(x), side, n.w)
}

func (n bnum) abs(z bc) float64 {
	f, _ := z.Abs().Float64()
	return f
}

// lt0 returns ∫₀¹ dt/(t − t0), or its principal value for real t0 in (0, 1).
func (n bnum) lt0(t0 bc) bc {
	if t0.Im.Sign() == 0 {
		r := new(big.Float).SetPrec(n.w).Sub(n.f(1), t0.Re)
		r.Quo(r, t0.Re)
		r.Abs(r)
		return n.log(n.r(r))
	}
	return n.log(n.one().Sub(t0)).Sub(n.log(t0.Neg()))
}

// rfun is the arbitrary-precision R(t0, y) = ∫₀¹ [ln(t−y) − ln(t0−y)]/(t − t0) dt in the
// dilogarithm form of rfunLi2 (valid in every regime; cancellations are covered by the guard bits).
func (n bnum) rfun(t0, y bc) bc { return n.rfunC(t0, y, t0.Sub(y)) }

// rfunC is rfun with c = t0 − y supplied by the caller.
func (n bnum) rfunC(t0, y, c bc) bc {
	ic := c.Inv()
	argc := n.phase(c)
	etaAt := func(t *big.Float) float64 {
		d := n.r(t).Sub(y)
		return math.Round((n.phase(d) - argc - n.phase(d.Mul(ic))) / (2 * math.Pi))
	}
	va := y.Neg().Mul(ic)
	vb := n.one().Sub(y).Mul(ic)
	la := n.li2(n.one().Sub(va))
	lb := n.li2(n.one().Sub(vb))
	var tsplit *big.Float
	var lIn, lOut bc
	if n.isTinyIm(y) && y.Re.Sign() > 0 && y.Re.Cmp(n.f(1)) < 0 {
		tsplit = n.fl(y.Re)
		z2 := n.li2(n.one())
		lIn, lOut = z2, z2
	} else if ic.Im.Sign() != 0 {
		tc := new(big.Float).SetPrec(n.w).Quo(va.Im, ic.Im)
		tc.Neg(tc)
		if tc.Sign() > 0 && tc.Cmp(n.f(1)) < 0 {
			vc := n.r(tc).Sub(y).Mul(ic).Re
			if vc.Sign() < 0 {
				tsplit = tc
				side := 1
				if ic.Im.Sign() < 0 {
					side = -1
				}
				x := new(big.Float).SetPrec(n.w).Sub(n.f(1), vc)
				lIn = n.li2Side(x, side)
				lOut = n.li2Side(x, -side)
			}
		}
	}
	twoPiI := func(eta float64) bc {
		p := new(big.Float).SetPrec(n.w).Mul(n.pi(), n.f(2*eta))
		return bc{Re: n.f(0), Im: p}
	}
	if tsplit == nil {
		s := la.Sub(lb)
		half := n.f(0.5)
		if eta := etaAt(half); eta != 0 {
			s = s.Add(twoPiI(eta).Mul(n.lt0(t0)))
		}
		return s
	}
	s := la.Sub(lIn).Add(lOut).Sub(lb)
	mid1 := new(big.Float).SetPrec(n.w).Quo(tsplit, n.f(2))
	if eta := etaAt(mid1); eta != 0 {
		s = s.Add(twoPiI(eta).Mul(n.log(n.r(tsplit).Sub(t0).Quo(t0.Neg()))))
	}
	mid2 := new(big.Float).SetPrec(n.w).Add(tsplit, n.f(1))
	mid2.Quo(mid2, n.f(2))
	if eta := etaAt(mid2); eta != 0 {
		s = s.Add(twoPiI(eta).Mul(n.log(n.one().Sub(t0).Quo(n.r(tsplit).Sub(t0)))))
	}
	return s
}

// quadRootsI0 is the arbitrary-precision counterpart of quadRootsI0 (real coefficients).
func (n bnum) quadRootsI0(A, B, C *big.Float) (roots []bc, lnLead bc, ok bool) {
	w := n.w
	switch {
	case A.Sign() != 0:
		disc := new(big.Float).SetPrec(w).Mul(B, B)
		disc.Sub(disc, new(big.Float).SetPrec(w).Mul(new(big.Float).SetPrec(w).Mul(A, C), n.f(4)))
		if disc.Sign() >= 0 {
			sq := new(big.Float).SetPrec(w).Sqrt(disc)
			if B.Sign() < 0 {
				sq.Neg(sq)
			}
			q := new(big.Float).SetPrec(w).Add(B, sq)
			q.Quo(q, n.f(-2))
			var y1, y2 *big.Float
			if q.Sign() == 0 {
				y1, y2 = n.f(0), n.f(0)
			} else {
				y1 = new(big.Float).SetPrec(w).Quo(q, A)
				y2 = new(big.Float).SetPrec(w).Quo(C, q)
			}
			if y1.Cmp(y2) == 0 {
				roots = []bc{n.withI0(y1, 1), n.withI0(y2, -1)}
			} else {
				d := new(big.Float).SetPrec(w).Sub(y1, y2)
				s1 := d.Sign() * A.Sign()
				roots = []bc{n.withI0(y1, s1), n.withI0(y2, -s1)}
			}
		} else {
			sq := new(big.Float).SetPrec(w).Sqrt(new(big.Float).Neg(disc))
			twoA := new(big.Float).SetPrec(w).Mul(A, n.f(2))
			re := new(big.Float).SetPrec(w).Quo(new(big.Float).Neg(B), twoA)
			im := new(big.Float).SetPrec(w).Quo(sq, twoA)
			roots = []bc{{Re: re, Im: im}, {Re: n.fl(re), Im: new(big.Float).Neg(im)}}
		}
		lnLead = n.lnMinusI0(A)
	case B.Sign() != 0:
		y := new(big.Float).SetPrec(w).Quo(C, B)
		y.Neg(y)
		roots = []bc{n.withI0(y, B.Sign())}
		lnLead = n.lnMinusI0(B)
	case C.Sign() != 0:
		return nil, n.lnMinusI0(C), true
	default:
		return nil, bc{}, false
	}
	for _, tmf := range []float64{0.5, 0.3819660112501051, 0.7236067977499789, 0.1, 0.9} {
		tm := n.f(tmf)
		fv := new(big.Float).SetPrec(w).Mul(A, tm)
		fv.Add(fv, B)
		fv.Mul(fv, tm)
		fv.Add(fv, C)
		if fv.Sign() == 0 {
			continue
		}
		ph, _ := lnLead.Im.Float64() // the imaginary part of the leading logarithm
		for _, y := range roots {
			ph += n.phase(n.r(tm).Sub(y))
		}
		fph := 0.0
		if fv.Sign() < 0 {
			fph = -math.Pi
		}
		k := math.Round((fph - ph) / (2 * math.Pi))
		if k != 0 {
			lnLead = lnLead.Add(bc{Re: n.f(0), Im: new(big.Float).SetPrec(w).Mul(n.pi(), n.f(2*k))})
		}
		break
	}
	return roots, lnLead, true
}

// logIntegral is the arbitrary-precision ∫₀¹ ln(F(x) − i0) dx, F = p2 x² + (b − a − p2) x + a.
func (n bnum) logIntegral(p2, a, b *big.Float) bc {
	w := n.w
	if p2.Sign() == 0 {
		if a.Cmp(b) == 0 {
			return n.log(n.r(a))
		}
		// (b ln b − a ln a)/(b − a) − 1, with x ln x → 0 at 0
		xlnx := func(x *big.Float) *big.Float {
			if x.Sign() == 0 {
				return n.f(0)
			}
			l := n.log(n.r(x)).Re
			return l.Mul(l, x)
		}
		num := new(big.Float).SetPrec(w).Sub(xlnx(b), xlnx(a))
		num.Quo(num, new(big.Float).SetPrec(w).Sub(b, a))
		num.Sub(num, n.f(1))
		return n.r(num)
	}
	B := new(big.Float).SetPrec(w).Sub(b, a)
	B.Sub(B, p2)
	roots, lnLead, _ := n.quadRootsI0(p2, B, a)
	// ∫₀¹ ln(t − y) dt = (1 − y) ln(1 − y) + y ln(−y) − 1 along the segment (continuous branch)
	s := lnLead
	for _, y := range roots {
		one := n.one()
		t := one.Sub(y)
		var term bc
		if !t.IsZero() {
			term = t.Mul(n.log(t))
		} else {
			term = n.zero()
		}
		if !y.IsZero() {
			term = term.Add(y.Mul(n.log(y.Neg())))
		}
		s = s.Add(term).Sub(one)
	}
	return s
}
