package specfun

import (
	"math"
	"math/cmplx"
	"math/rand"
	"testing"
)

// Catalan's constant G = Σ (−1)^n/(2n+1)² = 0.91596559417721901505… (common knowledge; the digits
// are checked at 100 digits against Ramanujan's series in big_test.go).
const catalan = 0.91596559417721901505

func relErr(got, want complex128) float64 {
	d := cmplx.Abs(got - want)
	if a := cmplx.Abs(want); a > 1e-300 {
		return d / a
	}
	return d
}

func TestLi2SpecialValues(t *testing.T) {
	ln2 := math.Ln2
	g := (math.Sqrt(5) - 1) / 2 // 1/golden ratio
	lg := math.Log(g)
	tests := []struct {
		name string
		z    complex128
		want complex128
	}{
		// Lewin 1981, ch. 1: Li2(1) = ζ(2), Li2(−1) = −π²/12, Li2(1/2) = π²/12 − ½ ln²2.
		{"Li2(1)", 1, complex(math.Pi*math.Pi/6, 0)},
		{"Li2(-1)", -1, complex(-math.Pi*math.Pi/12, 0)},
		{"Li2(1/2)", 0.5, complex(math.Pi*math.Pi/12-ln2*ln2/2, 0)},
		// Lewin 1981, ch. 1 (Landen's values at the golden ratio):
		// Li2((√5−1)/2) = π²/10 − ln²((√5−1)/2), Li2((3−√5)/2) = π²/15 − ln²((√5−1)/2).
		{"Li2(1/phi)", complex(g, 0), complex(math.Pi*math.Pi/10-lg*lg, 0)},
		{"Li2(1/phi^2)", complex(g*g, 0), complex(math.Pi*math.Pi/15-lg*lg, 0)},
		// Li2(i) = −π²/48 + iG (Lewin 1981, ch. 1; G Catalan's constant).
		{"Li2(i)", 1i, complex(-math.Pi*math.Pi/48, catalan)},
		// Li2(2 − i0) = π²/4 − iπ ln 2 (inversion formula with Li2(1/2); mpmath gives the same).
		{"Li2(2)", 2, complex(math.Pi*math.Pi/4, -math.Pi*ln2)},
		{"Li2(0)", 0, 0},
		{"Li2(-1e-20)", -1e-20, -1e-20},
	}
	for _, tc := range tests {
		got := Li2(tc.z)
		if e := relErr(got, tc.want); e > 2e-16*8 {
			t.Errorf("%s = %v, want %v (rel. err %.2g)", tc.name, got, tc.want, e)
		}
	}
}

func TestLi2CutSides(t *testing.T) {
	for _, x := range []float64{1.0000001, 1.5, 2, 3, 10, 1e6} {
		below := Li2(complex(x, 0))
		if got := Li2(complex(x, math.Copysign(0, -1))); got != below {
			t.Errorf("Li2(%g − 0i) = %v differs from Li2(%g + 0i) = %v", x, got, x, below)
		}
		if got := Li2Side(complex(x, 0), -1); got != below {
			t.Errorf("Li2Side(%g, −1) = %v, want Li2 = %v", x, got, below)
		}
		above := Li2Side(complex(x, 0), +1)
		// Im Li2(x ± i0) = ±π ln x (principal branch).
		if d := math.Abs(imag(above) - math.Pi*math.Log(x)); d > 1e-15*math.Abs(imag(above)) {
			t.Errorf("Im Li2(%g + i0) = %g, want π ln x = %g", x, imag(above), math.Pi*math.Log(x))
		}
		if real(above) != real(below) || imag(above) != -imag(below) {
			t.Errorf("Li2(%g ± i0): %v and %v are not conjugate", x, above, below)
		}
		// Continuity: a tiny imaginary part selects the same side.
		eps := 1e-12 * x
		if e := relErr(Li2(complex(x, eps)), above); e > 1e-10 {
			t.Errorf("Li2(%g + i%g) = %v, not close to Li2(x + i0) = %v", x, eps, Li2(complex(x, eps)), above)
		}
		if e := relErr(Li2(complex(x, -eps)), below); e > 1e-10 {
			t.Errorf("Li2(%g − i%g) = %v, not close to Li2(x − i0) = %v", x, eps, Li2(complex(x, -eps)), below)
		}
	}
}

// randomPoint draws points from several regions: the unit annulus, near z = 1, near e^{±iπ/3},
// tiny and huge moduli, near the real axis.
func randomPoint(r *rand.Rand) complex128 {
	switch r.Intn(7) {
	case 0:
		return cmplx.Rect(0.9+0.2*r.Float64(), 2*math.Pi*r.Float64())
	case 1:
		return 1 + cmplx.Rect(math.Pow(10, -12*r.Float64()), 2*math.Pi*r.Float64())
	case 2:
		return cmplx.Rect(1+1e-6*(r.Float64()-0.5), math.Pi/3*(1+1e-3*(r.Float64()-0.5))) * complex(1, 0)
	case 3:
		return cmplx.Rect(math.Pow(10, -20*r.Float64()), 2*math.Pi*r.Float64())
	case 4:
		return cmplx.Rect(math.Pow(10, 20*r.Float64()), 2*math.Pi*r.Float64())
	case 5:
		return complex(20*(r.Float64()-0.5), 1e-9*(r.Float64()-0.5))
	}
	return complex(10*(r.Float64()-0.5), 10*(r.Float64()-0.5))
}

func TestLi2Identities(t *testing.T) {
	r := rand.New(rand.NewSource(1))
	z2 := complex(math.Pi*math.Pi/6, 0)
	for i := 0; i < 2000; i++ {
		z := randomPoint(r)
		if imag(z) == 0 {
			continue
		}
		// Reflection (Lewin 1981, ch. 1): Li2(z) + Li2(1−z) = π²/6 − ln z ln(1−z).
		lhs := Li2(z) + Li2(1-z)
		rhs := z2 - cmplx.Log(z)*cmplx.Log(1-z)
		scale := cmplx.Abs(Li2(z)) + cmplx.Abs(Li2(1-z)) + cmplx.Abs(cmplx.Log(z)*cmplx.Log(1-z)) + 1
		if d := cmplx.Abs(lhs - rhs); d > 4e-15*scale {
			t.Errorf("reflection at z = %v: |lhs − rhs| = %.3g (scale %.3g)", z, d, scale)
		}
		// Inversion (Lewin 1981, ch. 1): Li2(z) + Li2(1/z) = −π²/6 − ½ ln²(−z), z ∉ [0, ∞).
		lhs = Li2(z) + Li2(1/z)
		l := cmplx.Log(-z)
		rhs = -z2 - 0.5*l*l
		scale = cmplx.Abs(Li2(z)) + cmplx.Abs(Li2(1/z)) + cmplx.Abs(l*l) + 1
		if d := cmplx.Abs(lhs - rhs); d > 4e-15*scale {
			t.Errorf("inversion at z = %v: |lhs − rhs| = %.3g (scale %.3g)", z, d, scale)
		}
		// Duplication (Lewin 1981, ch. 1): Li2(z) + Li2(−z) = ½ Li2(z²).
		if cmplx.Abs(z) < 1e8 {
			lhs = Li2(z) + Li2(-z)
			rhs = 0.5 * Li2(z*z)
			scale = cmplx.Abs(Li2(z)) + cmplx.Abs(Li2(-z)) + 1e-300
			if d := cmplx.Abs(lhs - rhs); d > 4e-15*scale {
				t.Errorf("duplication at z = %v: |lhs − rhs| = %.3g (scale %.3g)", z, d, scale)
			}
		}
	}
}

// TestLi2AgainstBig compares the float64 Li2 with Li2Big at 120 bits (independent series
// truncation and working precision) at many points, including |z| ≈ 1 and z ≈ 1.
func TestLi2AgainstBig(t *testing.T) {
	r := rand.New(rand.NewSource(2))
	worst := 0.0
	for i := 0; i < 600; i++ {
		z := randomPoint(r)
		got := Li2(z)
		want := Li2Big(NewComplex(real(z), imag(z), 120), 120).Complex128()
		e := relErr(got, want)
		if e > worst {
			worst = e
		}
		if e > 4e-15 {
			t.Errorf("Li2(%v) = %v, big gives %v (rel. err %.2g)", z, got, want, e)
		}
	}
	t.Logf("worst relative error of Li2 vs Li2Big: %.2g", worst)
}

func TestCl2Values(t *testing.T) {
	tests := []struct {
		name  string
		theta float64
		want  float64
	}{
		// Cl2(π/3) = 1.0149416064096536250… (../shared/PHYSICS.md, checked there with mpmath).
		{"Cl2(pi/3)", math.Pi / 3, 1.0149416064096536250},
		// Cl2(π/2) = Catalan's constant (common knowledge).
		{"Cl2(pi/2)", math.Pi / 2, catalan},
		// Duplication Cl2(2θ) = 2Cl2(θ) − 2Cl2(π−θ) (Lewin 1981, ch. 4) at θ = π/3 gives
		// Cl2(2π/3) = (2/3) Cl2(π/3).
		{"Cl2(2pi/3)", 2 * math.Pi / 3, 2.0 / 3 * 1.0149416064096536250},
		{"Cl2(0)", 0, 0},
		{"Cl2(pi)", math.Pi, 0},
		{"Cl2(-pi/2)", -math.Pi / 2, -catalan},
		{"Cl2(2pi+pi/2)", 2*math.Pi + math.Pi/2, catalan},
		{"Cl2(2pi-pi/2)", 2*math.Pi - math.Pi/2, -catalan},
		{"Cl2(1e-10)", 1e-10, 1e-10 * (1 - math.Log(1e-10))},
	}
	for _, tc := range tests {
		got := Cl2(tc.theta)
		tol := 4e-16 * math.Max(math.Abs(tc.want), 1e-300)
		if tc.want == 0 {
			tol = 1e-15
		}
		if math.Abs(got-tc.want) > tol {
			t.Errorf("%s = %.17g, want %.17g", tc.name, got, tc.want)
		}
	}
}

func TestCl2AgainstLi2(t *testing.T) {
	// Cl2(θ) = Im Li2(e^{iθ}) (Lewin 1981, ch. 4), and Cl2 against Cl2Big.
	r := rand.New(rand.NewSource(3))
	for i := 0; i < 300; i++ {
		th := 40 * (r.Float64() - 0.5)
		got := Cl2(th)
		viaLi2 := imag(Li2(cmplx.Rect(1, th)))
		if math.Abs(got-viaLi2) > 2e-15 {
			t.Errorf("Cl2(%g) = %.17g, Im Li2(e^{iθ}) = %.17g", th, got, viaLi2)
		}
		bt := NewComplex(th, 0, 120).Re
		want, _ := Cl2Big(bt, 120).Float64()
		if math.Abs(got-want) > 1e-15*math.Max(1, math.Abs(want)) || (math.Abs(want) > 1e-3 && math.Abs(got-want) > 4e-16*math.Abs(want)*4) {
			t.Errorf("Cl2(%g) = %.17g, Cl2Big = %.17g", th, got, want)
		}
	}
	// Near π the value is small: relative accuracy from the expansion about π.
	for _, d := range []float64{1e-3, 1e-8, 1e-12} {
		th := math.Pi - d
		got := Cl2(th)
		want, _ := Cl2Big(NewComplex(th, 0, 160).Re, 160).Float64()
		if math.Abs(got-want) > 4e-15*math.Abs(want) {
			t.Errorf("Cl2(π − %g) = %.17g, Cl2Big = %.17g", d, got, want)
		}
	}
}

func BenchmarkLi2(b *testing.B) {
	r := rand.New(rand.NewSource(5))
	pts := make([]complex128, 1024)
	for i := range pts {
		pts[i] = randomPoint(r)
	}
	b.ResetTimer()
	var s complex128
	for i := 0; i < b.N; i++ {
		s += Li2(pts[i&1023])
	}
	_ = s
}

func BenchmarkLi2Real(b *testing.B) {
	r := rand.New(rand.NewSource(6))
	pts := make([]float64, 1024)
	for i := range pts {
		pts[i] = 20 * (r.Float64() - 0.7)
	}
	b.ResetTimer()
	var s float64
	for i := 0; i < b.N; i++ {
		s += Li2Real(pts[i&1023])
	}
	_ = s
}

func BenchmarkCl2(b *testing.B) {
	var s float64
	for i := 0; i < b.N; i++ {
		s += Cl2(float64(i&1023) * 0.01)
	}
	_ = s
}

func TestLi2RealAgainstBig(t *testing.T) {
	r := rand.New(rand.NewSource(4))
	for i := 0; i < 400; i++ {
		var x float64
		switch i % 4 {
		case 0:
			x = 100 * (r.Float64() - 0.5)
		case 1:
			x = 1 + 1e-8*(r.Float64()-0.5)
		case 2:
			x = -1 + 1e-3*(r.Float64()-0.5)
		default:
			x = 0.5 + 1e-3*(r.Float64()-0.5)
		}
		got := Li2(complex(x, 0))
		want := Li2Big(NewComplex(x, 0, 120), 120).Complex128()
		if e := relErr(got, want); e > 2e-15 {
			t.Errorf("Li2(%.17g) = %v, big gives %v (rel. err %.2g)", x, got, want, e)
		}
	}
}
