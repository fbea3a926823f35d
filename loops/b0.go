package loops

import (
	"fmt"
	"math"
)

// A0 returns the tadpole A0(m) = m²(1/ε + 1 − ln(m²/μ²)) for m2 = m² ≥ 0 (A0(0) = 0, scaleless).
func A0(m2, mu2 float64) (Value, error) {
	if err := checkInputs("A0", nil, []float64{m2}, mu2); err != nil {
		return Value{}, err
	}
	if m2 == 0 {
		return Value{}, nil
	}
	return Value{Pole1: complex(m2, 0), Finite: complex(m2*(1-math.Log(m2/mu2)), 0)}, nil
}

// B0 returns B0(p²; m0, m1) = 1/ε − ∫₀¹ ln[(x m1² + (1−x) m0² − x(1−x) p² − i0)/μ²] dx for any real
// p2 = p² and m02 = m0², m12 = m1² ≥ 0. B0(0; 0, 0) = 0 (scaleless: the UV and IR poles cancel).
//
// The integral is done with the roots of the quadratic: the real part as a sum of
// (1−r)ln|1−r| + r ln|r| − 1 over the roots r (a series in 1/r for |r| ≥ 2, so that p² → 0 and
// large mass ratios keep their digits), the imaginary part as π times the length of the
// interval of x in [0, 1] where the quadratic is negative (Im B0 = π λ^{1/2}/p² above threshold).
func B0(p2, m02, m12, mu2 float64) (Value, error) {
	if err := checkInputs("B0", []float64{p2}, []float64{m02, m12}, mu2); err != nil {
		return Value{}, err
	}
	if p2 == 0 && m02 == 0 && m12 == 0 {
		return Value{}, nil
	}
	f := -logIntegral(p2, m02, m12) + complex(math.Log(mu2), 0)
	return Value{Pole1: 1, Finite: f}, nil
}

// B0Prime returns B0′(p²; m0, m1) = ∂B0/∂p² = ∫₀¹ x(1−x)/(x m1² + (1−x) m0² − x(1−x) p² − i0) dx.
// For p² = m1² with m0 = 0 (or p² = m0² with m1 = 0) it is infrared divergent and the dimensionally
// regularised result −1/(2m²ε) + (½ ln(m²/μ²) − 1)/m² is returned. At a threshold
// p² = (m0+m1)² > 0, and at p² = 0 with both masses zero, it does not exist and an error is returned.
func B0Prime(p2, m02, m12, mu2 float64) (Value, error) {
	if err := checkInputs("B0Prime", []float64{p2}, []float64{m02, m12}, mu2); err != nil {
		return Value{}, err
	}
	scale := scaleOf(p2, m02, m12)
	if m02 == 0 && m12 == 0 {
		if p2 == 0 {
			return Value{}, fmt.Errorf("loops.B0Prime: B0′(0; 0, 0) is undefined (∂/∂p² of a scaleless integral at p² = 0)")
		}
		return Value{Finite: complex(-1/p2, 0)}, nil
	}
	// Infrared-divergent on-shell derivative with one massless line (dimensional regularisation):
	// B0(p²;0,m) = 1/ε + … ; ∂/∂p² at p² = m² = (1/m²)[−1/(2ε) − 1 − ½ ln(μ²/m²)] (derived in
	// docs/INTEGRALS.md from ∫₀¹ x(1−x) x^{−2−2ε} dx).
	if (m02 == 0 && same(p2, m12, scale)) || (m12 == 0 && same(p2, m02, scale)) {
		m2 := m02 + m12
		return Value{Pole1: complex(-0.5/m2, 0), Finite: complex((0.5*math.Log(m2/mu2)-1)/m2, 0)}, nil
	}
	d, err := b0Deriv(p2, m02, m12)
	if err != nil {
		return Value{}, err
	}
	return Value{Finite: d}, nil
}

// kallen returns λ(p², a, b) for a, b ≥ 0 in the product form (p² − (√a+√b)²)(p² − (√a−√b)²),
// accurate near both thresholds.
func kallen(p2, a, b float64) float64 {
	ma, mb := math.Sqrt(a), math.Sqrt(b)
	return (p2 - (ma+mb)*(ma+mb)) * (p2 - (ma-mb)*(ma-mb))
}

// bigRoot is the modulus from which a root r is treated by series in 1/r.
const bigRoot = 2

// fR returns ∫₀¹ ln|x − r| dx = (1−r) ln|1−r| + r ln|r| − 1 for real r.
func fR(r float64) float64 {
	s := -1.0
	if r != 1 {
		s += (1 - r) * math.Log(math.Abs(1-r))
	}
	if r != 0 {
		s += r * math.Log(math.Abs(r))
	}
	return s
}

// gSeries returns −Σ_{k≥1} u^k/(k(k+1)) = fR(1/u) − ln|1/u| for |u| ≤ 1/2 (u = 1/r).
func gSeries(u float64) float64 {
	s, pw := 0.0, 1.0
	for k := 1; k < 80; k++ {
		pw *= u
		t := pw / float64(k*(k+1))
		s -= t
		if math.Abs(t) < 1e-17*math.Abs(s) {
			break
		}
	}
	return s
}

// powerSumSeries returns −Σ_k (u1^k + u2^k)/(k(k+1)) for the roots u1, u2 of u² − e1 u + e2 = 0
// (real coefficients, roots real or complex conjugate, |u| ≤ 1/2), by Newton's recurrence for
// the power sums, so that complex-conjugate roots need no complex arithmetic.
func powerSumSeries(e1, e2 float64) float64 {
	pPrev, p := 2.0, e1 // P_0, P_1
	s := -p / 2
	for k := 2; k < 100; k++ {
		pPrev, p = p, e1*p-e2*pPrev
		t := p / float64(k*(k+1))
		s -= t
		if math.Abs(t) < 1e-17*math.Abs(s) && k > 3 {
			break
		}
	}
	return s
}

// logIntegral returns ∫₀¹ ln(F(x) − i0) dx with F(x) = p2 x² + (b − a − p2) x + a, a, b ≥ 0.
func logIntegral(p2, a, b float64) complex128 {
	if p2 == 0 {
		if a == b {
			return complex(math.Log(a), 0)
		}
		lo, hi := math.Min(a, b), math.Max(a, b)
		if lo == 0 {
			return complex(math.Log(hi)-1, 0)
		}
		// (hi ln hi − lo ln lo)/(hi − lo) − 1 = ln hi − r ln r/(1 − r) − 1, r = lo/hi
		r := lo / hi
		u := (hi - lo) / hi
		return complex(math.Log(hi)-r*math.Log1p(-u)/u-1, 0)
	}
	B := sum3(b, -a, -p2)
	C := a
	lam := kallen(p2, a, b)
	if lam < 0 {
		// complex-conjugate roots; then a > 0, p2 > 0 and F > 0 on [0, 1]
		if 4*p2 <= C/(bigRoot*bigRoot) {
			// |r|² = C/p2 ≥ bigRoot²: series in u = 1/r, u1 + u2 = −B/C, u1 u2 = p2/C
			return complex(math.Log(C)+powerSumSeries(-B/C, p2/C), 0)
		}
		r := complex(-B/(2*p2), math.Sqrt(-lam)/(2*p2))
		g := (1-r)*clog(1-r) + r*clog(-r)
		return complex(math.Log(p2)+2*real(g)-2, 0)
	}
	// real roots r1, r2 (p2 r1 r2 = C)
	sq := math.Sqrt(lam)
	q := -0.5 * (B + math.Copysign(sq, B))
	r1 := q / p2
	r2 := 0.0
	if q != 0 {
		r2 = C / q
	} else {
		r2 = r1
	}
	big1, big2 := math.Abs(r1) >= bigRoot, math.Abs(r2) >= bigRoot
	var re float64
	switch {
	case big1 && big2:
		re = math.Log(C) + powerSumSeries(-B/C, p2/C)
	case big1:
		re = math.Log(math.Abs(q)) + gSeries(1/r1) + fR(r2)
	case big2:
		re = math.Log(math.Abs(p2*C/q)) + gSeries(1/r2) + fR(r1)
	default:
		re = math.Log(math.Abs(p2)) + fR(r1) + fR(r2)
	}
	// measure of {x ∈ [0,1]: F(x) < 0}
	x1, x2 := math.Min(r1, r2), math.Max(r1, r2)
	in := overlap(x1, x2)
	if lam > 0 && x1 >= 0 && x2 <= 1 {
		in = sq / math.Abs(p2) // = x2 − x1 without cancellation
	}
	meas := in
	if p2 < 0 {
		meas = 1 - in
	}
	return complex(re, -math.Pi*meas)
}

// overlap returns the length of [x1, x2] ∩ [0, 1].
func overlap(x1, x2 float64) float64 {
	lo, hi := math.Max(x1, 0), math.Min(x2, 1)
	if hi > lo {
		return hi - lo
	}
	return 0
}

// gTilde returns x(1−x)L(x) − x + ½ with L(x) = ∫₀¹ dt/(t − x) for a root x of F − i0 whose
// infinitesimal imaginary part has the sign sigma (used only for real x in (0, 1)).
func gTilde(x complex128, sigma float64) complex128 {
	if imag(x) == 0 {
		r := real(x)
		if r == 0 || r == 1 {
			return complex(0.5-r, 0)
		}
		if math.Abs(r) >= bigRoot {
			return complex(gTildeSeries(1/r), 0)
		}
		l := complex(math.Log(math.Abs((1-r)/r)), 0)
		if r > 0 && r < 1 {
			l += complex(0, math.Pi*sigma)
		}
		return complex(r*(1-r), 0)*l - complex(r-0.5, 0)
	}
	l := clog(1-x) - clog(-x)
	return x*(1-x)*l - x + 0.5
}

// gTildeSeries returns −Σ_{k≥1} u^k/((k+1)(k+2)), the value of gTilde at x = 1/u for |u| ≤ 1/2.
func gTildeSeries(u float64) float64 {
	s, pw := 0.0, 1.0
	for k := 1; k < 80; k++ {
		pw *= u
		t := pw / float64((k+1)*(k+2))
		s -= t
		if math.Abs(t) < 1e-17*math.Abs(s) {
			break
		}
	}
	return s
}

// b0Deriv returns ∫₀¹ x(1−x)/(F(x) − i0) dx (finite cases).
func b0Deriv(p2, a, b float64) (complex128, error) {
	if p2 == 0 {
		d := b - a
		if d == 0 {
			return complex(1/(6*a), 0), nil
		}
		// F = d(x − x0), x0 = −a/d: B0′ = gTilde(x0)/d
		x0 := -a / d
		if math.Abs(x0) >= bigRoot {
			return complex(gTildeSeries(1/x0)/d, 0), nil
		}
		return gTilde(complex(x0, 0), 0) / complex(d, 0), nil
	}
	B := sum3(b, -a, -p2)
	C := a
	lam := kallen(p2, a, b)
	if lam < 0 && 4*p2 <= C/(bigRoot*bigRoot) || lam >= 0 && C > 0 && bothBig(p2, B, C, lam) {
		// both roots large: (1/C) Σ_k h_{k−1}(u1, u2)/((k+1)(k+2)), h the complete homogeneous sums
		e1, e2 := -B/C, p2/C
		hPrev, h := 0.0, 1.0 // h_{−1}, h_0
		s := h / 6
		for k := 2; k < 100; k++ {
			hPrev, h = h, e1*h-e2*hPrev
			t := h / float64((k+1)*(k+2))
			s += t
			if math.Abs(t) < 1e-17*math.Abs(s) && k > 3 {
				break
			}
		}
		return complex(s/C, 0), nil
	}
	if lam < 0 {
		sq := math.Sqrt(-lam)
		x1 := complex(-B/(2*p2), sq/(2*p2))
		x2 := complex(real(x1), -imag(x1))
		return (gTilde(x1, 0) - gTilde(x2, 0)) / complex(0, sq), nil
	}
	if lam == 0 {
		x0 := -B / (2 * p2)
		if x0 > 0 && x0 < 1 {
			return 0, fmt.Errorf("loops.B0Prime: B0′ is singular at the threshold p² = (m0+m1)² = %g", p2)
		}
		// limit of the difference quotient: gTilde′(x0)/p2 = ((1 − 2x0)L(x0) − 2)/p2
		l := math.Log(math.Abs((1 - x0) / x0))
		return complex(((1-2*x0)*l-2)/p2, 0), nil
	}
	sq := math.Sqrt(lam)
	q := -0.5 * (B + math.Copysign(sq, B))
	x1 := q / p2
	x2 := C / q
	// Im x_i has the sign of F′(x_i) = p2 (x_i − x_j).
	s1 := math.Copysign(1, p2*(x1-x2))
	g := gTilde(complex(x1, 0), s1) - gTilde(complex(x2, 0), -s1)
	return g / complex(math.Copysign(sq, q), 0), nil
}

// bothBig reports whether both real roots of p2 x² + B x + C have modulus ≥ bigRoot.
func bothBig(p2, B, C, lam float64) bool {
	sq := math.Sqrt(lam)
	q := -0.5 * (B + math.Copysign(sq, B))
	if q == 0 {
		return false
	}
	return math.Abs(q/p2) >= bigRoot && math.Abs(C/q) >= bigRoot
}
