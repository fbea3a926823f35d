package running

import (
	"fmt"
	"math"
)

// rhs evaluates dy/dt into dy.
type rhs func(t float64, y, dy []float64)

// Dormand–Prince 5(4) coefficients: J.R. Dormand, P.J. Prince, J. Comput. Appl. Math. 6 (1980) 19.
var (
	dpC = [7]float64{0, 1.0 / 5, 3.0 / 10, 4.0 / 5, 8.0 / 9, 1, 1}
	dpA = [7][6]float64{
		{},
		{1.0 / 5},
		{3.0 / 40, 9.0 / 40},
		{44.0 / 45, -56.0 / 15, 32.0 / 9},
		{19372.0 / 6561, -25360.0 / 2187, 64448.0 / 6561, -212.0 / 729},
		{9017.0 / 3168, -355.0 / 33, 46732.0 / 5247, 49.0 / 176, -5103.0 / 18656},
		{35.0 / 384, 0, 500.0 / 1113, 125.0 / 192, -2187.0 / 6784, 11.0 / 84},
	}
	// 5th-order weights are the last row of dpA; dpE = b5 − b4 gives the error estimate.
	dpE = [7]float64{71.0 / 57600, 0, -71.0 / 16695, 71.0 / 1920, -17253.0 / 339200, 22.0 / 525, -1.0 / 40}
)

// maxSteps bounds one integration, so a stiff or divergent system ends with an error.
const maxSteps = 200000

// integrate advances y from t0 to t1 with the adaptive Dormand–Prince 5(4) pair, keeping the
// local error of every component below tol·(|y|+tiny). guard, if not nil, is called after
// every accepted step and stops the integration with its error.
func integrate(f rhs, t0, t1 float64, y []float64, tol float64, guard func(t float64, y []float64) error) error {
	if t0 == t1 {
		return nil
	}
	n := len(y)
	var k [7][]float64
	for i := range k {
		k[i] = make([]float64, n)
	}
	tmp := make([]float64, n)
	ynew := make([]float64, n)
	dir := math.Copysign(1, t1-t0)
	span := math.Abs(t1 - t0)
	h := dir * math.Min(span, 0.01*math.Max(span, 1e-3))
	t := t0
	f(t, y, k[0])
	for step := 0; ; step++ {
		if step >= maxSteps {
			return fmt.Errorf("running: RGE integration did not finish in %d steps", maxSteps)
		}
		if (t+h-t1)*dir > 0 {
			h = t1 - t
		}
		for s := 1; s < 7; s++ {
			for i := 0; i < n; i++ {
				acc := y[i]
				for j := 0; j < s; j++ {
					acc += h * dpA[s][j] * k[j][i]
				}
				tmp[i] = acc
			}
			if s == 6 {
				copy(ynew, tmp)
			}
			f(t+dpC[s]*h, tmp, k[s])
		}
		errMax := 0.0
		for i := 0; i < n; i++ {
			e := 0.0
			for j := 0; j < 7; j++ {
				e += dpE[j] * k[j][i]
			}
			sc := tol * (math.Max(math.Abs(y[i]), math.Abs(ynew[i])) + 1e-30)
			if r := math.Abs(h*e) / sc; r > errMax || math.IsNaN(r) {
				errMax = r
			}
		}
		if math.IsNaN(errMax) || math.IsInf(errMax, 0) {
			h /= 4
			if math.Abs(h) < 1e-14*span {
				return fmt.Errorf("running: RGE integration broke down at t = %g: %w", t, ErrNonPerturbative)
			}
			f(t, y, k[0])
			continue
		}
		if errMax <= 1 {
			t += h
			copy(y, ynew)
			copy(k[0], k[6]) // first-same-as-last
			if guard != nil {
				if err := guard(t, y); err != nil {
					return err
				}
			}
			if (t-t1)*dir >= 0 || math.Abs(t-t1) <= 1e-15*math.Max(1, math.Abs(t1)) {
				return nil
			}
		}
		fac := 0.9 * math.Pow(math.Max(errMax, 1e-10), -0.2)
		h *= math.Min(5, math.Max(0.2, fac))
		if math.Abs(h) < 1e-14*span {
			return fmt.Errorf("running: RGE integration step size vanished at t = %g: %w", t, ErrNonPerturbative)
		}
	}
}
