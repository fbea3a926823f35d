package loops

import (
	"math"
	"math/big"
	"math/rand"
	"testing"

	"gonum.org/v1/gonum/integrate/quad"
)

// Fixed random sets of Euclidean and physical points for the benchmarks.
func benchTris(n int, physical bool) []tri {
	r := rand.New(rand.NewSource(99))
	out := make([]tri, n)
	for i := range out {
		if physical {
			out[i] = randomPhysicalTri(r)
		} else {
			out[i] = randomEuclideanTri(r)
		}
	}
	return out
}

func benchC0(b *testing.B, physical bool) {
	pts := benchTris(256, physical)
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		t := &pts[i&255]
		if _, err := C0(t.s[0][1], t.s[1][2], t.s[0][2], t.m2[0], t.m2[1], t.m2[2], 1); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkC0Euclidean(b *testing.B) { benchC0(b, false) }
func BenchmarkC0Physical(b *testing.B)  { benchC0(b, true) }

func benchB0(b *testing.B, physical bool) {
	r := rand.New(rand.NewSource(98))
	type pt struct{ p2, a, c float64 }
	pts := make([]pt, 256)
	for i := range pts {
		m0, m1 := 0.2+2*r.Float64(), 0.2+2*r.Float64()
		p2 := -10 * r.Float64()
		if physical {
			p2 = (m0 + m1) * (m0 + m1) * 2 * r.Float64()
		}
		pts[i] = pt{p2, m0 * m0, m1 * m1}
	}
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		p := pts[i&255]
		if _, err := B0(p.p2, p.a, p.c, 1); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkB0Euclidean(b *testing.B) { benchB0(b, false) }
func BenchmarkB0Physical(b *testing.B)  { benchB0(b, true) }

func benchD0(b *testing.B, physical bool) {
	r := rand.New(rand.NewSource(97))
	var pts []box
	for len(pts) < 256 {
		var bx box
		if physical {
			bx = randomPhysicalBox(r)
		} else {
			bx = randomEuclideanBox(r)
		}
		if _, err := d0Of(bx); err == nil {
			pts = append(pts, bx)
		}
	}
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if _, err := d0Of(pts[i&255]); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkD0Euclidean(b *testing.B) { benchD0(b, false) }
func BenchmarkD0Physical(b *testing.B)  { benchD0(b, true) }

// gonumC0 is C0 = −∫ dx/F over the simplex by gonum's nested fixed Gauss–Legendre rule (n×n
// points, collapsed coordinates), the independent method the benchmarks compare speed with.
func gonumC0(t *tri, n int) float64 {
	outer := func(u float64) float64 {
		inner := func(v float64) float64 {
			x1 := u
			x2 := (1 - u) * v
			x0 := 1 - x1 - x2
			f := x0*t.m2[0] + x1*t.m2[1] + x2*t.m2[2] - x0*x1*t.s[0][1] - x1*x2*t.s[1][2] - x0*x2*t.s[0][2]
			return (1 - u) / f
		}
		return quad.Fixed(inner, 0, 1, n, quad.Legendre{}, 0)
	}
	return -quad.Fixed(outer, 0, 1, n, quad.Legendre{}, 0)
}

// gonumD0 is D0 = ∫ dx/F² over the simplex by gonum's nested fixed Gauss–Legendre rule.
func gonumD0(b *box, n int) float64 {
	return quad.Fixed(func(u float64) float64 {
		return quad.Fixed(func(v float64) float64 {
			return quad.Fixed(func(w float64) float64 {
				x1 := u
				x2 := (1 - u) * v
				x3 := (1 - u) * (1 - v) * w
				x0 := 1 - x1 - x2 - x3
				xs := [4]float64{x0, x1, x2, x3}
				f := 0.0
				for p := 0; p < 4; p++ {
					f += xs[p] * b.m2[p]
					for q := p + 1; q < 4; q++ {
						f -= xs[p] * xs[q] * b.s[p][q]
					}
				}
				return (1 - u) * (1 - u) * (1 - v) / (f * f)
			}, 0, 1, n, quad.Legendre{}, 0)
		}, 0, 1, n, quad.Legendre{}, 0)
	}, 0, 1, n, quad.Legendre{}, 0)
}

// BenchmarkC0GonumQuadrature times gonum quadrature of C0 at the Euclidean benchmark points
// (24×24 points, about 1e-8 there), for the speed ratio to BenchmarkC0Euclidean.
func BenchmarkC0GonumQuadrature(b *testing.B) {
	pts := benchTris(256, false)
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		_ = gonumC0(&pts[i&255], 24)
	}
}

// BenchmarkD0GonumQuadrature times gonum quadrature of D0 at Euclidean points (16³ points).
func BenchmarkD0GonumQuadrature(b *testing.B) {
	r := rand.New(rand.NewSource(97))
	pts := make([]box, 64)
	for i := range pts {
		pts[i] = randomEuclideanBox(r)
	}
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		_ = gonumD0(&pts[i&63], 16)
	}
}

// BenchmarkAccuracy reports the smallest number of agreeing digits between the float64 path and
// the arbitrary-precision path (100 bits) over fixed random Euclidean and physical points
// (metrics B0-digits, C0-digits, D0-digits); the timing itself is of no interest.
func BenchmarkAccuracy(b *testing.B) {
	f := big.NewFloat
	r := rand.New(rand.NewSource(77))
	minB, minC, minD := 17.0, 17.0, 17.0
	for i := 0; i < 40; i++ {
		m0, m1 := 2*r.Float64(), 2*r.Float64()
		p2 := 20*r.Float64() - 10
		v, _ := B0(p2, m0*m0, m1*m1, 1)
		w, _ := B0Big(f(p2), f(m0*m0), f(m1*m1), f(1), 100)
		minB = math.Min(minB, digits(v.Finite, w.Finite.Complex128()))
	}
	for i, t := range append(benchTris(16, false), benchTris(16, true)...) {
		_ = i
		v, _ := c0Of(t)
		w, _ := C0Big(f(t.s[0][1]), f(t.s[1][2]), f(t.s[0][2]), f(t.m2[0]), f(t.m2[1]), f(t.m2[2]), f(1), 100)
		minC = math.Min(minC, digits(v.Finite, w.Finite.Complex128()))
	}
	n := 0
	for n < 16 {
		bx := randomPhysicalBox(r)
		if n%2 == 0 {
			bx = randomEuclideanBox(r)
		}
		v, err := d0Of(bx)
		if err != nil {
			continue
		}
		w, _ := D0Big(f(bx.s[0][1]), f(bx.s[1][2]), f(bx.s[2][3]), f(bx.s[0][3]), f(bx.s[0][2]), f(bx.s[1][3]),
			f(bx.m2[0]), f(bx.m2[1]), f(bx.m2[2]), f(bx.m2[3]), f(1), 100)
		minD = math.Min(minD, digits(v.Finite, w.Finite.Complex128()))
		n++
	}
	for i := 0; i < b.N; i++ {
	}
	b.ReportMetric(minB, "B0-digits")
	b.ReportMetric(minC, "C0-digits")
	b.ReportMetric(minD, "D0-digits")
}
