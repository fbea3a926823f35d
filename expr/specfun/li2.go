package specfun

import (
	"math"
	"math/big"
	"math/cmplx"
)

const (
	zeta2 = math.Pi * math.Pi / 6 // ζ(2) = π²/6
	// li2Terms Bernoulli terms beyond u − u²/4 reach 1e-17 relative for |u| ≤ 1.05,
	// the largest |u| = |ln(1−z)| left after the reflection and inversion maps.
	li2Terms = 13
)

// li2Coef[k] = B_{2k+2}/(2k+3)!: the coefficients of Li2(z) = u − u²/4 + Σ_k li2Coef[k] u^{2k+3},
// u = −ln(1−z): the Bernoulli expansion Li2(z) = Σ_n B_n u^{n+1}/(n+1)! (Lewin 1981, ch. 1),
// which converges for |u| < 2π.
var li2Coef [li2Terms]float64

func init() {
	for k := 0; k < li2Terms; k++ {
		c := new(big.Rat).Quo(BernoulliEven(k+1), new(big.Rat).SetInt(factorial(2*k+3)))
		li2Coef[k], _ = c.Float64()
	}
}

// Li2 returns the dilogarithm Li2(z) = −∫₀^z ln(1−t)/t dt on its principal branch, for every
// complex z, to about 1e-15 relative accuracy. The cut is the real half-line (1, ∞); a real
// z > 1 with zero imaginary part is taken as z − i0 (see the package comment and Li2Side).
func Li2(z complex128) complex128 {
	x, y := real(z), imag(z)
	if math.IsNaN(x) || math.IsNaN(y) {
		return cmplx.NaN()
	}
	if y == 0 {
		if x > 1 {
			return complex(li2Real(x), -math.Pi*math.Log(x))
		}
		return complex(li2Real(x), 0)
	}
	if math.IsInf(x, 0) || math.IsInf(y, 0) {
		return cmplx.Inf()
	}
	return li2Complex(z)
}

// Li2Side returns Li2 at z + side·i0: for real z > 1 (zero imaginary part) side > 0 gives the value
// from above, Re + iπ ln z, and side < 0 (or 0) the value from below, Re − iπ ln z. Off the cut the
// side is ignored and Li2Side(z, s) = Li2(z).
func Li2Side(z complex128, side int) complex128 {
	if imag(z) == 0 && real(z) > 1 && side > 0 {
		return complex(li2Real(real(z)), math.Pi*math.Log(real(z)))
	}
	return Li2(z)
}

// Li2Real returns Li2(x) for real x ≤ 1 and the real part of Li2(x ± i0) for x > 1.
func Li2Real(x float64) float64 { return li2Real(x) }

func li2Real(x float64) float64 {
	switch {
	case math.IsNaN(x):
		return x
	case math.IsInf(x, -1):
		return math.Inf(-1)
	case math.IsInf(x, 1):
		return math.Inf(-1)
	case x == 1:
		return zeta2
	case x == 0:
		return 0
	case x > 1:
		// Li2(x ± i0) = π²/3 − ½ ln²x − Li2(1/x) ± iπ ln x (inversion formula, Lewin 1981 ch. 1, with ln(−x∓i0) = ln x ∓ iπ).
		l := math.Log(x)
		return 2*zeta2 - 0.5*l*l - li2Real(1/x)
	case x < -1:
		// Inversion (Lewin 1981, ch. 1): Li2(x) = −Li2(1/x) − π²/6 − ½ ln²(−x).
		l := math.Log(-x)
		return -li2Real(1/x) - zeta2 - 0.5*l*l
	case x > 0.5:
		// Reflection (Lewin 1981, ch. 1): Li2(x) = π²/6 − ln x ln(1−x) − Li2(1−x).
		return zeta2 - math.Log(x)*math.Log1p(-x) - li2SeriesReal(1-x)
	}
	return li2SeriesReal(x)
}

// li2SeriesReal evaluates the Bernoulli series for −1 ≤ x ≤ 1/2.
func li2SeriesReal(x float64) float64 {
	u := -math.Log1p(-x)
	u2 := u * u
	p := li2Coef[li2Terms-1]
	for k := li2Terms - 2; k >= 0; k-- {
		p = p*u2 + li2Coef[k]
	}
	return u - 0.25*u2 + u*u2*p
}

func li2Complex(z complex128) complex128 {
	x, y := real(z), imag(z)
	if x*x+y*y > 1 {
		// Inversion (Lewin 1981, ch. 1): Li2(z) = −Li2(1/z) − π²/6 − ½ ln²(−z), z ∉ [0, ∞).
		w := inv(z)
		l := clog(-z)
		return -li2Unit(w) - complex(zeta2, 0) - 0.5*l*l
	}
	return li2Unit(z)
}

// clog is the principal complex logarithm, computed as ½ ln(x² + y²) + i atan2(y, x) when the
// squares cannot overflow or underflow (faster than cmplx.Log's scaled hypot).
func clog(z complex128) complex128 {
	x, y := real(z), imag(z)
	if m := math.Max(math.Abs(x), math.Abs(y)); m > 1e-150 && m < 1e150 {
		return complex(0.5*math.Log(x*x+y*y), math.Atan2(y, x))
	}
	return cmplx.Log(z)
}

// li2Unit evaluates Li2 for |z| ≤ 1 (z not real-positive > 1).
func li2Unit(z complex128) complex128 {
	if real(z) > 0.5 {
		// Reflection (Lewin 1981, ch. 1): Li2(z) = π²/6 − ln z ln(1−z) − Li2(1−z); the series for
		// Li2(1−z) runs in −ln(1 − (1−z)) = −ln z.
		v := 1 - z
		lz := log1p(z - 1)
		return complex(zeta2, 0) - lz*clog(v) - li2Series(v, lz)
	}
	return li2Series(z, log1p(-z))
}

// li2Series returns Li2(z) from l = ln(1−z) by the Bernoulli series in u = −l.
func li2Series(z, l complex128) complex128 {
	if z == 0 {
		return 0
	}
	u := -l
	u2 := u * u
	p := complex(li2Coef[li2Terms-1], 0)
	for k := li2Terms - 2; k >= 0; k-- {
		p = p*u2 + complex(li2Coef[k], 0)
	}
	return u - 0.25*u2 + u*u2*p
}

// log1p returns ln(1+w) accurately for small |w| (principal branch).
func log1p(w complex128) complex128 {
	x, y := real(w), imag(w)
	if math.Abs(x) > 0.5 || math.Abs(y) > 0.5 {
		return clog(1 + w)
	}
	// ln|1+w| = ½ ln(1 + 2x + x² + y²)
	re := 0.5 * math.Log1p(x*(2+x)+y*y)
	im := math.Atan2(y, 1+x)
	return complex(re, im)
}

// inv returns 1/z keeping the sign of a tiny imaginary part.
func inv(z complex128) complex128 {
	x, y := real(z), imag(z)
	if math.Abs(x) >= math.Abs(y) {
		r := y / x
		d := x + y*r
		return complex(1/d, -r/d)
	}
	r := x / y
	d := x*r + y
	return complex(r/d, -1/d)
}
