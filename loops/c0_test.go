package loops

import (
	"math"
	"math/big"
	"math/cmplx"
	"math/rand"
	"testing"
)

// feynC0 computes C0 = −∫_simplex dx/(F(x) − i0) by direct Feynman-parameter quadrature with
// gonum's Gauss–Legendre rule (n×n points, collapsed coordinates x1 = u, x2 = (1−u)v) on a
// contour deformed into the lower half plane, u → u − iλ u(1−u) ∂_u F, v → v − iλ v(1−v) ∂_v F
// (Soper's method; λ = 0 for Euclidean points where F > 0). Independent of the analytic code.
func feynC0(t *tri, n int, lam float64) complex128 {
	x, w := testGauss(n)
	F := func(u, v complex128) complex128 {
		x1 := u
		x2 := (1 - u) * v
		x0 := 1 - x1 - x2
		return x0*complex(t.m2[0], 0) + x1*complex(t.m2[1], 0) + x2*complex(t.m2[2], 0) -
			x0*x1*complex(t.s[0][1], 0) - x1*x2*complex(t.s[1][2], 0) - x0*x2*complex(t.s[0][2], 0)
	}
	var s complex128
	const h = 1e-6
	for a := 0; a < n; a++ {
		for b := 0; b < n; b++ {
			u, v := x[a], x[b]
			zu, zv := complex(u, 0), complex(v, 0)
			jac := complex(1, 0)
			if lam != 0 {
				// deformation from the real gradient; Jacobian by central differences
				def := func(u, v float64) (complex128, complex128) {
					fu := real(F(complex(u+h, 0), complex(v, 0))-F(complex(u-h, 0), complex(v, 0))) / (2 * h)
					fv := real(F(complex(u, 0), complex(v+h, 0))-F(complex(u, 0), complex(v-h, 0))) / (2 * h)
					return complex(u, -lam*u*(1-u)*fu), complex(v, -lam*v*(1-v)*fv)
				}
				zu, zv = def(u, v)
				up, vp := def(u+h, v)
				um, vm := def(u-h, v)
				uq, vq := def(u, v+h)
				un, vn := def(u, v-h)
				j11 := (up - um) / (2 * h)
				j21 := (vp - vm) / (2 * h)
				j12 := (uq - un) / (2 * h)
				j22 := (vq - vn) / (2 * h)
				jac = j11*j22 - j12*j21
			}
			s += complex(w[a]*w[b], 0) * jac * (1 - zu) / F(zu, zv)
		}
	}
	return -s
}

func randomEuclideanTri(r *rand.Rand) tri {
	m := func() float64 { x := 0.1 + 3*r.Float64(); return x * x }
	return newTri(-10*r.Float64(), -10*r.Float64(), -10*r.Float64(), m(), m(), m())
}

// TestC0AgainstFeynmanQuadrature compares C0 at 60 random Euclidean points with direct
// Feynman-parameter quadrature (required agreement 1e-8).
func TestC0AgainstFeynmanQuadrature(t *testing.T) {
	r := rand.New(rand.NewSource(31))
	for i := 0; i < 60; i++ {
		tr := randomEuclideanTri(r)
		v, err := C0(tr.s[0][1], tr.s[1][2], tr.s[0][2], tr.m2[0], tr.m2[1], tr.m2[2], 1)
		if err != nil {
			t.Fatal(err)
		}
		want := feynC0(&tr, 36, 0)
		if d := cmplx.Abs(v.Finite - want); d > 1e-8*cmplx.Abs(want) {
			t.Errorf("C0 at %+v = %v, quadrature %v (rel. %.2g)", tr, v.Finite, want, d/cmplx.Abs(want))
		}
	}
}

// permTri returns the triangle with lines relabelled by perm (new line i = old line perm[i]).
func permTri(t tri, perm [3]int) tri {
	var u tri
	for i := 0; i < 3; i++ {
		u.m2[i] = t.m2[perm[i]]
		for j := 0; j < 3; j++ {
			u.s[i][j] = t.s[perm[i]][perm[j]]
		}
	}
	u.fillY()
	return u
}

var perms3 = [][3]int{{0, 1, 2}, {1, 0, 2}, {0, 2, 1}, {2, 1, 0}, {1, 2, 0}, {2, 0, 1}}

func c0Of(t tri) (Value, error) {
	return C0(t.s[0][1], t.s[1][2], t.s[0][2], t.m2[0], t.m2[1], t.m2[2], 1)
}

// randomPhysicalTri draws invariants of both signs, often above the thresholds of their lines.
func randomPhysicalTri(r *rand.Rand) tri {
	m := [3]float64{}
	for i := range m {
		m[i] = 0.2 + 2*r.Float64()
	}
	inv := func(i, j int) float64 {
		th := (m[i] + m[j]) * (m[i] + m[j])
		switch r.Intn(4) {
		case 0:
			return -5 * r.Float64()
		case 1:
			return th * r.Float64()
		default:
			return th * (1 + 3*r.Float64())
		}
	}
	return newTri(inv(0, 1), inv(1, 2), inv(0, 2), m[0]*m[0], m[1]*m[1], m[2]*m[2])
}

// TestC0Permutations checks the invariance of C0 under the six relabellings of its lines at
// random physical and Euclidean points (the formula is not manifestly symmetric: each labelling
// takes a different path through its logarithms and dilogarithms).
func TestC0Permutations(t *testing.T) {
	r := rand.New(rand.NewSource(32))
	for i := 0; i < 300; i++ {
		tr := randomPhysicalTri(r)
		if i%3 == 0 {
			tr = randomEuclideanTri(r)
		}
		ref, err := c0Of(tr)
		if err != nil {
			t.Fatalf("%+v: %v", tr, err)
		}
		for _, p := range perms3[1:] {
			v, err := c0Of(permTri(tr, p))
			if err != nil {
				t.Fatalf("%+v %v: %v", tr, p, err)
			}
			if d := cmplx.Abs(v.Finite - ref.Finite); d > 1e-11*cmplx.Abs(ref.Finite) {
				t.Errorf("C0 at %+v: perm %v gives %v, identity %v (rel. %.2g)", tr, p, v.Finite, ref.Finite, d/cmplx.Abs(ref.Finite))
			}
		}
	}
}

// TestC0PhysicalContour compares C0 at random physical points with the deformed-contour
// Feynman-parameter quadrature (independent of the analytic continuation in the formula).
func TestC0PhysicalContour(t *testing.T) {
	r := rand.New(rand.NewSource(33))
	n := 0
	for n < 40 {
		tr := randomPhysicalTri(r)
		v, err := c0Of(tr)
		if err != nil {
			t.Fatal(err)
		}
		sc := tr.scale()
		want := feynC0(&tr, 80, 0.6/sc)
		want2 := feynC0(&tr, 120, 0.4/sc)
		if cmplx.Abs(want-want2) > 1e-7*cmplx.Abs(want) {
			continue // quadrature not converged (singularity near the contour); skip this point
		}
		n++
		if d := cmplx.Abs(v.Finite - want); d > 1e-6*cmplx.Abs(want) {
			t.Errorf("C0 at %+v = %v, contour quadrature %v (rel. %.2g)", tr, v.Finite, want, d/cmplx.Abs(want))
		}
	}
}

// TestC0ZeroMomentum checks C0(0,0,0; m0,m1,m2) = −Σ_i m_i² ln m_i² / Π_{j≠i}(m_i² − m_j²) (partial
// fractions of the three propagators; derived in docs/INTEGRALS.md), including nearly equal masses,
// against the direct formula at well-separated masses and the quadrature at clustered ones.
func TestC0ZeroMomentum(t *testing.T) {
	direct := func(a, b, c float64) float64 {
		return -(a*math.Log(a)/((a-b)*(a-c)) + b*math.Log(b)/((b-a)*(b-c)) + c*math.Log(c)/((c-a)*(c-b)))
	}
	for _, m := range [][3]float64{{1, 4, 9}, {1, 2, 30}, {0.5, 7, 100}, {2, 3, 5}} {
		v, _ := C0(0, 0, 0, m[0], m[1], m[2], 1)
		if w := direct(m[0], m[1], m[2]); math.Abs(real(v.Finite)-w) > 1e-13*math.Abs(w) {
			t.Errorf("C0(0,0,0; %v) = %v, want %v", m, v.Finite, w)
		}
	}
	for _, m := range [][3]float64{{1, 1, 1}, {1, 1 + 1e-9, 1 + 2e-9}, {1, 1.1, 1.25}, {3, 3, 3.5}} {
		v, _ := C0(0, 0, 0, m[0], m[1], m[2], 1)
		tr := newTri(0, 0, 0, m[0], m[1], m[2])
		w := feynC0(&tr, 30, 0)
		if d := cmplx.Abs(v.Finite - w); d > 1e-14*cmplx.Abs(w) {
			t.Errorf("C0(0,0,0; %v) = %v, quadrature %v", m, v.Finite, w)
		}
	}
}

// TestC0SpecialPaths checks the paths for special kinematics against independent evaluations:
// Gauss quadrature for nearly constant F (small momenta, nearly equal masses) against the
// arbitrary-precision projective formula; collinear momenta (λ(p1², (p2−p1)², p2²) = 0) against
// the limit of nearby non-collinear points; p1 = 0 (F constant along a direction: the chord
// path) against the partial-fraction identity C0(0, s, s; m0, m1, M) =
// [B0(s; m0, M) − B0(s; m1, M)]/(m0² − m1²) and, at m0 = m1, the derivative of B0 in m0²
// (central difference).
func TestC0SpecialPaths(t *testing.T) {
	f := big.NewFloat
	for _, c := range [][6]float64{
		{-1e-6, 2e-6, -3e-6, 1, 1, 1}, {1e-4, -2e-4, 1e-4, 4, 4.1, 3.9}, {0.01, 0.02, -0.03, 1, 1.05, 1.1},
	} {
		tr := newTri(c[0], c[1], c[2], c[3], c[4], c[5])
		if tr.variation() > quadKappa {
			t.Fatalf("%v is not in the quadrature regime", c)
		}
		v, _ := c0Of(tr)
		w, _ := C0Big(f(c[0]), f(c[1]), f(c[2]), f(c[3]), f(c[4]), f(c[5]), f(1), 80)
		if d := digits(v.Finite, w.Finite.Complex128()); d < 14 {
			t.Errorf("C0%v = %v, big %v (%.1f digits)", c, v.Finite, w.Finite.Complex128(), d)
		}
	}
	// collinear: p2 = 2 p1, p1² = s → (s, s, 4s)
	for _, c := range [][4]float64{{1, 1, 2, 3}, {-2, 1, 1.5, 2}, {3, 0.5, 0.7, 0.9}} {
		s := c[0]
		v, err := C0(s, s, 4*s, c[1], c[2], c[3], 1)
		if err != nil {
			t.Fatal(err)
		}
		near, _ := C0(s, s*(1+1e-7), 4*s, c[1], c[2], c[3], 1)
		if cmplx.Abs(v.Finite-near.Finite) > 1e-6*cmplx.Abs(v.Finite) {
			t.Errorf("collinear C0(%g,%g,%g; %v) = %v, nearby %v", s, s, 4*s, c[1:], v.Finite, near.Finite)
		}
	}
	// p1 = 0: C0(0, s, s; m0, m1, M)
	for _, c := range [][4]float64{{-2, 1, 2, 1.5}, {5, 1, 1.2, 1.3}, {-1, 1, 1, 2}, {7, 0.5, 0.5, 1}} {
		s, m0, m1, M := c[0], c[1]*c[1], c[2]*c[2], c[3]*c[3]
		v, err := C0(0, s, s, m0, m1, M, 1)
		if err != nil {
			t.Fatal(err)
		}
		var want complex128
		if m0 != m1 {
			a, _ := B0(s, m0, M, 1)
			b, _ := B0(s, m1, M, 1)
			want = (a.Finite - b.Finite) / complex(m0-m1, 0)
		} else {
			h := 1e-5 * m0
			a, _ := B0(s, m0+h, M, 1)
			b, _ := B0(s, m0-h, M, 1)
			want = (a.Finite - b.Finite) / complex(2*h, 0)
		}
		if cmplx.Abs(v.Finite-want) > 1e-8*cmplx.Abs(want) {
			t.Errorf("C0(0,%g,%g; %v) = %v, partial fractions %v", s, s, c[1:], v.Finite, want)
		}
	}
}

// TestC0OnLandauSurface checks triangles on and next to the surface F* = 0 (the stationary point
// of the Feynman-parameter quadric has F = 0, outside the simplex), where the projective formula
// has cancelling ln F* terms. C0(0, −m², 0; m², 0, 0) = −∫_simplex dx/(m²(x0 + x1 x2)) = −ζ(2)/m²
// (by hand: ∫₀¹ dx1 ∫₀^{1−x1} dx2 /(1 − x1 − x2 + x1 x2) = ∫₀¹ −ln(x1)/(1 − x1) dx1 = π²/6),
// in every labelling of the lines, float64 and big; nearby points against Feynman-parameter
// quadrature. The float64 formula returned −97.2 − 1.09i for m = 1 before.
func TestC0OnLandauSurface(t *testing.T) {
	f := big.NewFloat
	for _, m2 := range []float64{1e-4, 1, 1e4} {
		want := complex(-math.Pi*math.Pi/6/m2, 0)
		base := newTri(0, -m2, 0, m2, 0, 0)
		for _, perm := range [][3]int{{0, 1, 2}, {1, 2, 0}, {2, 0, 1}, {0, 2, 1}} {
			tr := permTri(base, perm)
			v, err := c0Of(tr)
			if err != nil || digits(v.Finite, want) < 13 {
				t.Errorf("C0 on the surface, m² = %g, lines %v: %v, %v; want %v", m2, perm, v.Finite, err, want)
			}
		}
		w, err := C0Big(f(0), f(-m2), f(0), f(m2), f(0), f(0), f(1), 80)
		if err != nil || digits(w.Finite.Complex128(), want) < 15 {
			t.Errorf("C0Big on the surface, m² = %g: %v, %v; want %v", m2, w.Finite.Complex128(), err, want)
		}
	}
	for _, m2 := range []float64{1 + 1e-7, 1 - 1e-7, 1 + 1e-4, 1 - 1e-3, 1.01} {
		tr := newTri(0, -1, 0, m2, 0, 0)
		v, err := c0Of(tr)
		if err != nil {
			t.Fatal(err)
		}
		w, _ := C0Big(f(0), f(-1), f(0), f(m2), f(0), f(0), f(1), 80)
		if d := digits(v.Finite, w.Finite.Complex128()); d < 11.5 {
			t.Errorf("C0(0, -1, 0; %v, 0, 0) = %v, big %v (%.1f digits)", m2, v.Finite, w.Finite.Complex128(), d)
		}
		if q := feynC0(&tr, 200, 0); cmplx.Abs(v.Finite-q) > 1e-6*cmplx.Abs(q) {
			t.Errorf("C0(0, -1, 0; %v, 0, 0) = %v, quadrature %v", m2, v.Finite, q)
		}
	}
}
