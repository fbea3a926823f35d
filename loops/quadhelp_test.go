package loops

import (
	"math"
	"sort"

	"gonum.org/v1/gonum/integrate/quad"
)

// gradedIntegral integrates a complex function over [a, b] with gonum's Gauss–Legendre rule on a
// mesh graded geometrically towards the given points (integrable log or power singularities
// there), n nodes per cell.
func gradedIntegral(f func(float64) complex128, a, b float64, sing []float64, n int) complex128 {
	cuts := []float64{a, b}
	for _, s := range sing {
		if s > a && s < b {
			cuts = append(cuts, s)
		}
	}
	sort.Float64s(cuts)
	var total complex128
	for i := 0; i+1 < len(cuts); i++ {
		lo, hi := cuts[i], cuts[i+1]
		if hi-lo < 1e-300 {
			continue
		}
		// grade towards both ends of each cell
		var pts []float64
		const levels = 40
		for k := levels; k >= 1; k-- {
			pts = append(pts, lo+(hi-lo)*0.5*math.Pow(0.5, float64(k)))
		}
		pts = append(pts, lo+(hi-lo)*0.5)
		for k := 1; k <= levels; k++ {
			pts = append(pts, hi-(hi-lo)*0.5*math.Pow(0.5, float64(k)))
		}
		pts = append([]float64{lo}, pts...)
		pts = append(pts, hi)
		for j := 0; j+1 < len(pts); j++ {
			total += gaussCell(f, pts[j], pts[j+1], n)
		}
	}
	return total
}

var gaussCache = map[int][2][]float64{}

func gaussCell(f func(float64) complex128, lo, hi float64, n int) complex128 {
	r, ok := gaussCache[n]
	if !ok {
		x := make([]float64, n)
		w := make([]float64, n)
		quad.Legendre{}.FixedLocations(x, w, 0, 1)
		r = [2][]float64{x, w}
		gaussCache[n] = r
	}
	var s complex128
	for i, x := range r[0] {
		s += complex(r[1][i], 0) * f(lo+(hi-lo)*x)
	}
	return s * complex(hi-lo, 0)
}

var testGaussCache = map[int][2][]float64{}

// testGauss returns the n-point Gauss–Legendre rule on [0, 1] from gonum, with the nodes graded
// towards both ends by the substitution x = y²(3 − 2y) (smooths endpoint singularities).
func testGauss(n int) (x, w []float64) {
	if r, ok := testGaussCache[n]; ok {
		return r[0], r[1]
	}
	y := make([]float64, n)
	wy := make([]float64, n)
	quad.Legendre{}.FixedLocations(y, wy, 0, 1)
	x = make([]float64, n)
	w = make([]float64, n)
	for i := range y {
		x[i] = y[i] * y[i] * (3 - 2*y[i])
		w[i] = wy[i] * 6 * y[i] * (1 - y[i])
	}
	testGaussCache[n] = [2][]float64{x, w}
	return x, w
}
