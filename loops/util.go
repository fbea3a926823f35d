package loops

import (
	"math"
	"math/cmplx"
)

// clog is the principal complex logarithm.
func clog(z complex128) complex128 { return cmplx.Log(z) }

// log1p returns ln(1+w) accurately for small |w| (principal branch).
func log1p(w complex128) complex128 {
	x, y := real(w), imag(w)
	if math.Abs(x) > 0.5 || math.Abs(y) > 0.5 {
		return cmplx.Log(1 + w)
	}
	return complex(0.5*math.Log1p(x*(2+x)+y*y), math.Atan2(y, 1+x))
}
