package loops

import (
	"math"

	"loopmatch/expr/specfun"
)

// The basic integral of the triangle and box formulas,
//
//	R(t0, y) = ∫₀¹ [ln(t − y) − ln(t0 − y)] / (t − t0) dt,
//
// with principal logarithms, y off the segment [0, 1] (a root of a Feynman-parameter quadratic;
// a real root carries its infinitesimal imaginary part as an explicit tiny one, see withI0) and
// t0 anywhere except y (for real t0 in (0, 1) the integrand is regular because ln(t − y) is
// continuous along the segment). Three evaluations:
//
//   - y far from the segment (|t − t0| ≤ 0.3|t0 − y| on it): the series of ln(1 + (t−t0)/(t0−y)),
//     plus 2πi η ∫dt/(t−t0) when the principal logarithms differ by a turn;
//   - t0 far (|t − y| ≤ 0.3|t0 − y|): the series in w = (t − y)/(t0 − y) of ∫ ℓ(w)/(w − 1) dw,
//     ℓ = ln(t−y) − ln(t0−y), whose antiderivative needs no branch bookkeeping;
//   - otherwise dilogarithms: with c = t0 − y and v = (t − y)/c, the integrand is
//     [ln v + 2πi η]/(v − 1), ∫ ln v/(v−1) dv = −Li2(1 − v), and the path in v is split where it
//     crosses the cut of ln v (η is constant on each piece and read off at its midpoint).
//
// rfun also returns the sum of the magnitudes of the parts it added, for the caller's estimate
// of cancellations.
func rfun(t0, y complex128) (complex128, float64) { return rfunC(t0, y, t0-y) }

// rfunC is rfun with c = t0 − y supplied by the caller (computed without cancellation when t0 is
// close to the root y; see edgeIntegral).
func rfunC(t0, y, c complex128) (complex128, float64) {
	ac := cabs(c)
	if math.Max(cabs(t0), cabs(1-t0)) <= 0.3*ac {
		return rfunFarY(t0, y, c)
	}
	if math.Max(cabs(y), cabs(1-y)) <= 0.3*ac {
		return rfunFarT0(t0, y, c)
	}
	return rfunLi2(t0, y, c)
}

// lt0 returns ∫₀¹ dt/(t − t0): ln(1 − t0) − ln(−t0), or its principal value for real t0 in (0, 1).
func lt0(t0 complex128) complex128 {
	if imag(t0) == 0 {
		r := real(t0)
		return complex(math.Log(math.Abs((1-r)/r)), 0)
	}
	if cabs(t0) > 2 {
		return log1p(-1 / t0)
	}
	return clog(1-t0) - clog(-t0)
}

func rfunFarY(t0, y, c complex128) (complex128, float64) {
	z := 1 / c
	a := (1 - t0) * z // (1−t0)/(t0−y)
	b := -t0 * z      // (−t0)/(t0−y)
	pa, pb := a, b
	var s complex128
	for n := 1; n < 200; n++ {
		term := (pa - pb) / complex(float64(n*n), 0)
		if n%2 == 0 {
			s -= term
		} else {
			s += term
		}
		if l1(pa)+l1(pb) < 1e-18*(l1(s)+1e-300) {
			break
		}
		pa *= a
		pb *= b
	}
	mag := l1(s)
	// ln(t−y) − ln(t0−y) = log1p((t−t0)/(t0−y)) + 2πi η, η constant in t; read it at t = 0.
	eta := math.Round((arg(-y) - arg(c) - arg(1+b)) / (2 * math.Pi))
	if eta != 0 {
		l := complex(0, 2*math.Pi*eta) * lt0(t0)
		s += l
		mag += l1(l)
	}
	return s, mag
}

func rfunFarT0(t0, y, c complex128) (complex128, float64) {
	lc := clog(c)
	wa, wb := -y/c, (1-y)/c
	la, lb := clog(-y)-lc, clog(1-y)-lc
	var s complex128
	mag := 0.0
	pa, pb := wa, wb // w^{n+1}
	for n := 0; n < 200; n++ {
		k := complex(float64(n+1), 0)
		tb := pb * (lb/k - 1/(k*k))
		ta := pa * (la/k - 1/(k*k))
		s -= tb - ta
		mag += l1(tb) + l1(ta)
		if l1(tb)+l1(ta) < 1e-18*(l1(s)+1e-300) {
			break
		}
		pa *= wa
		pb *= wb
	}
	return s, mag
}

func rfunLi2(t0, y, c complex128) (complex128, float64) {
	ic := 1 / c
	argc := math.Atan2(imag(c), real(c))
	// η on a piece, from the arguments only: ln(t−y) − ln c − ln v = 2πi η with v = (t−y)/c. The
	// three arguments are taken separately (not arg(t−y) − arg c wrapped by hand): on a cut the
	// infinitesimal imaginary parts decide, and only the complex division keeps their signs.
	etaAt := func(t float64) float64 {
		d := complex(t, 0) - y
		return math.Round((arg(d) - argc - arg(d*ic)) / (2 * math.Pi))
	}
	// Split points of the path v(t) = (t − y)/c, t ∈ [0, 1], where it crosses the cut of ln v.
	// When y is a real root inside the segment, the path runs through v = 0 itself (up to the
	// infinitesimal): the crossing is taken at t = Re y with v = 0 exactly, where −Li2(1 − v) is
	// continuous. Otherwise the crossing is where Im v = 0 with Re v < 0.
	va := -y * ic
	vb := (1 - y) * ic
	la := specfun.Li2(1 - va)
	lb := specfun.Li2(1 - vb)
	mag := l1(la) + l1(lb)
	tsplit := -1.0
	var lIn, lOut complex128 // −Li2(1−v) boundary values at the split, from each side
	yr := real(y)
	if math.Abs(imag(y)) <= 1e-30*(1+math.Abs(yr)) && yr > 0 && yr < 1 {
		tsplit = yr
		lIn = zeta2c
		lOut = zeta2c
	} else if imag(ic) != 0 {
		tc := -imag(va) / imag(ic)
		if tc > 0 && tc < 1 {
			vc := real((complex(tc, 0) - y) * ic)
			if vc < 0 {
				tsplit = tc
				// For t < tc, Im v has the sign of −Im(1/c), so 1 − v has the sign of +Im(1/c).
				side := 1
				if imag(ic) < 0 {
					side = -1
				}
				lIn = specfun.Li2Side(complex(1-vc, 0), side)
				lOut = specfun.Li2Side(complex(1-vc, 0), -side)
				mag += 2 * l1(lIn)
			}
		}
	}
	if tsplit < 0 {
		s := la - lb
		if eta := etaAt(0.5); eta != 0 {
			l := complex(0, 2*math.Pi*eta) * lt0(t0)
			s += l
			mag += l1(l)
		}
		return s, mag
	}
	s := la - lIn + lOut - lb
	if eta := etaAt(0.5 * tsplit); eta != 0 {
		l := complex(0, 2*math.Pi*eta) * clog((complex(tsplit, 0)-t0)/(-t0))
		s += l
		mag += l1(l)
	}
	if eta := etaAt(0.5 * (tsplit + 1)); eta != 0 {
		l := complex(0, 2*math.Pi*eta) * clog((1-t0)/(complex(tsplit, 0)-t0))
		s += l
		mag += l1(l)
	}
	return s, mag
}

var zeta2c = complex(math.Pi*math.Pi/6, 0)

// i0Size is the magnitude given to an infinitesimal imaginary part, relative to 1 + |y|. It is far
// below any rounding of the problem's numbers yet far above the float64 underflow.
const i0Size = 1e-60

// withI0 returns the real root y with the infinitesimal imaginary part of sign sigma.
func withI0(y, sigma float64) complex128 {
	return complex(y, math.Copysign(i0Size*(1+math.Abs(y)), sigma))
}
