package expr_test

import (
	"errors"
	"math"
	"testing"

	"loopmatch/expr"
)

// TestEvalAccurate evaluates closed forms of the kind matching produces, with powers of 1/(x − 1)
// that cancel against a logarithm, near and at x = 1, where complex128 evaluation loses most
// digits, against the Taylor series from ln x = Σ (−1)^{k+1}(x − 1)^k/k (Abramowitz & Stegun
// 4.1.24).
func TestEvalAccurate(t *testing.T) {
	// g(x) = (ln x − (x − 1) + (x − 1)²/2)/(x − 1)³ → 1/3 − (x − 1)/4 + (x − 1)²/5 − …
	e := parse(t, "(log(x) - (x - 1) + (x - 1)^2/2)/(x - 1)^3")
	series := func(h float64) float64 {
		s, p := 0.0, 1.0
		for k := 3; k < 40; k++ {
			s += p / float64(k) * math.Pow(-1, float64(k+1))
			p *= h
		}
		return s
	}
	for _, h := range []float64{1e-1, 1e-3, 1e-6, 1e-9, 1e-12, -1e-7} {
		x := 1 + h
		want := series(x - 1) // x − 1 is exact in binary (Sterbenz), so this is the series at the binary x
		got, err := e.EvalAccurate(map[string]complex128{"x": complex(x, 0)})
		if err != nil {
			t.Fatal(err)
		}
		if rel := math.Abs(real(got)-want) / want; rel > 1e-14 {
			t.Errorf("x = 1%+g: %.17g, want %.17g (rel %g)", h, real(got), want, rel)
		}
		fast, _ := e.Eval(map[string]complex128{"x": complex(x, 0)})
		if h <= 1e-9 && h > 0 && math.Abs(real(fast)-want)/want < 1e-3 {
			t.Errorf("x = 1%+g: complex128 evaluation %g is accurate; the test does not exercise cancellation", h, real(fast))
		}
	}
	// x = 1 exactly: the limit 1/3.
	got, err := e.EvalAccurate(map[string]complex128{"x": 1})
	if err != nil || math.Abs(real(got)-1.0/3) > 1e-15 {
		t.Errorf("x = 1: %v, %v; want 1/3", got, err)
	}
	// A true pole is an error.
	if _, err := parse(t, "1/(x - 1)").EvalAccurate(map[string]complex128{"x": 1}); !errors.Is(err, expr.ErrSingular) {
		t.Errorf("pole at x = 1: %v, want ErrSingular", err)
	}
	// Two masses equal: the limit along mF = mS.
	f := parse(t, "(mF^2 - mS^2 - mS^2*log(mF^2/mS^2))/(mF^2 - mS^2)^2")
	got, err = f.EvalAccurate(map[string]complex128{"mF": 1000, "mS": 1000})
	if want := 1.0 / 2 / 1e6; err != nil || math.Abs(real(got)-want) > 1e-15*want {
		t.Errorf("mF = mS: %v, %v; want %g", got, err, want)
	}
}
