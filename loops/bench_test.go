package loops

import (
	"math/rand"
	"testing"
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
