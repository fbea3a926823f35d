package loops

import (
	"math"
	"math/cmplx"
)

// clog is the principal complex logarithm, ½ ln(x² + y²) + i atan2(y, x) when the squares stay in
// range (faster than cmplx.Log's scaled hypot; the real part is accurate in absolute terms).
func clog(z complex128) complex128 {
	x, y := real(z), imag(z)
	if m := math.Max(math.Abs(x), math.Abs(y)); m > 1e-150 && m < 1e150 {
		return complex(0.5*math.Log(x*x+y*y), math.Atan2(y, x))
	}
	return cmplx.Log(z)
}

// cabs is |z| without the scaling of math.Hypot when the squares stay in range.
func cabs(z complex128) float64 {
	x, y := real(z), imag(z)
	if m := math.Max(math.Abs(x), math.Abs(y)); m > 1e-150 && m < 1e150 {
		return math.Sqrt(x*x + y*y)
	}
	return cmplx.Abs(z)
}

// l1 is |Re z| + |Im z|, a cheap magnitude for cancellation estimates.
func l1(z complex128) float64 { return math.Abs(real(z)) + math.Abs(imag(z)) }

// log1p returns ln(1+w) accurately for small |w| (principal branch).
func log1p(w complex128) complex128 {
	x, y := real(w), imag(w)
	if math.Abs(x) > 0.5 || math.Abs(y) > 0.5 {
		return clog(1 + w)
	}
	return complex(0.5*math.Log1p(x*(2+x)+y*y), math.Atan2(y, 1+x))
}

// sum3 returns a + b + c with the rounding errors of the two additions compensated (Knuth's
// TwoSum), so that combinations such as m_k² − m_j² − s_jk keep their digits whichever pair of
// terms cancels (an on-shell leg next to a tiny mass, equal masses, …).
func sum3(a, b, c float64) float64 {
	s1, e1 := twoSum(a, b)
	s2, e2 := twoSum(s1, c)
	return s2 + (e1 + e2)
}

func twoSum(a, b float64) (s, e float64) {
	s = a + b
	bb := s - a
	e = (a - (s - bb)) + (b - bb)
	return s, e
}

// arg is the principal argument of z.
func arg(z complex128) float64 { return math.Atan2(imag(z), real(z)) }

// sum4 is sum3 for four terms.
func sum4(a, b, c, d float64) float64 {
	s1, e1 := twoSum(a, b)
	s2, e2 := twoSum(s1, c)
	s3, e3 := twoSum(s2, d)
	return s3 + (e1 + e2 + e3)
}
