package loops

import (
	"math"
	"math/cmplx"
	"math/rand"
	"testing"
)

// TestRfunAgainstQuadrature checks R(t0, y) = ∫₀¹ [ln(t−y) − ln(t0−y)]/(t−t0) dt in all three
// regimes against Gauss–Legendre quadrature (gonum) on a graded mesh.
func TestRfunAgainstQuadrature(t *testing.T) {
	r := rand.New(rand.NewSource(21))
	randC := func(scale float64) complex128 {
		return complex(scale*(2*r.Float64()-0.5), scale*(2*r.Float64()-1))
	}
	for i := 0; i < 400; i++ {
		var t0, y complex128
		switch i % 6 {
		case 0: // generic
			t0, y = randC(2), randC(2)
		case 1: // y far
			t0, y = randC(1), randC(50)
		case 2: // t0 far
			t0, y = randC(50), randC(1)
		case 3: // real root near or inside the segment, complex t0
			y = withI0(1.5*r.Float64()-0.25, float64(2*r.Intn(2)-1))
			t0 = randC(1.5)
		case 4: // real t0 inside the segment (principal-value case), complex or real y
			t0 = complex(r.Float64(), 0)
			if r.Intn(2) == 0 {
				y = randC(2)
			} else {
				y = withI0(3*r.Float64()-1, float64(2*r.Intn(2)-1))
			}
		case 5: // both real-ish, y outside
			y = withI0(1+3*r.Float64(), float64(2*r.Intn(2)-1))
			t0 = complex(4*r.Float64()-2, 0.3*(r.Float64()-0.5))
		}
		if cmplx.Abs(t0-y) < 0.05 || (imag(t0) != 0 && math.Abs(imag(t0)) < 0.02 && real(t0) > -0.02 && real(t0) < 1.02) {
			continue
		}
		got, _ := rfun(t0, y)
		lt := clog(t0 - y)
		f := func(t float64) complex128 {
			return (clog(complex(t, 0)-y) - lt) / (complex(t, 0) - t0)
		}
		sing := []float64{real(y), real(t0)}
		want := gradedIntegral(f, 0, 1, sing, 12)
		if d := cmplx.Abs(got - want); d > 1e-12*(1+cmplx.Abs(want)) {
			t.Errorf("R(%v, %v) = %v, quadrature %v (|diff| %.2g)", t0, y, got, want, d)
		}
	}
}
