package loops

import (
	"errors"
	"math"
	"math/big"
	"math/cmplx"
	"strings"
	"testing"
)

// TestA0B0ClosedForms checks the closed forms of ../shared/PHYSICS.md (Denner, Fortschr. Phys. 41
// (1993) 307, with Δ → 1/ε):
// A0(m) = m²(1/ε + 1 − L), B0(0; m, m) = 1/ε − L, B0(0; m0, m1) = 1/ε + 1 − (m0² L0 − m1² L1)/(m0² − m1²).
func TestA0B0ClosedForms(t *testing.T) {
	for _, c := range []struct{ m0, m1, mu2 float64 }{{1, 2, 1}, {0.3, 7, 4}, {5, 5.0000001, 2}, {91.2, 80.4, 100}} {
		a, _ := A0(c.m0*c.m0, c.mu2)
		L0 := math.Log(c.m0 * c.m0 / c.mu2)
		L1 := math.Log(c.m1 * c.m1 / c.mu2)
		if real(a.Pole1) != c.m0*c.m0 || math.Abs(real(a.Finite)-c.m0*c.m0*(1-L0)) > 1e-14*c.m0*c.m0*(1+math.Abs(L0)) {
			t.Errorf("A0(%g) = %v", c.m0, a)
		}
		b, _ := B0(0, c.m0*c.m0, c.m0*c.m0, c.mu2)
		if math.Abs(real(b.Finite)+L0) > 1e-14*(1+math.Abs(L0)) {
			t.Errorf("B0(0; m, m) = %v, want %g", b.Finite, -L0)
		}
		b, _ = B0(0, c.m0*c.m0, c.m1*c.m1, c.mu2)
		a0, a1 := c.m0*c.m0, c.m1*c.m1
		want := 1 - (a0*L0-a1*L1)/(a0-a1)
		tol := 1e-13
		if math.Abs(a0-a1) < 1e-6*a0 {
			tol = 1e-7 // the closed form itself cancels; the code uses the log1p form
		}
		if math.Abs(real(b.Finite)-want) > tol*(1+math.Abs(want)) {
			t.Errorf("B0(0; %g, %g) = %v, want %g", c.m0, c.m1, b.Finite, want)
		}
	}
	if a, _ := A0(0, 1); a != (Value{}) {
		t.Errorf("A0(0) = %v, want 0", a)
	}
	if b, _ := B0(0, 0, 0, 1); b != (Value{}) {
		t.Errorf("B0(0;0,0) = %v, want 0 (scaleless)", b)
	}
}

// TestB0Threshold checks continuity across the threshold p² = (m0+m1)² from both sides and
// Im B0 = π λ^{1/2}(p², m0², m1²)/p² above it (PHYSICS.md), including just above threshold and far
// above, for equal and unequal masses.
func TestB0Threshold(t *testing.T) {
	for _, m := range [][2]float64{{1, 1}, {1, 2}, {0.1, 3}, {80.4, 91.2}} {
		th := (m[0] + m[1]) * (m[0] + m[1])
		a, b := m[0]*m[0], m[1]*m[1]
		at, _ := B0(th, a, b, 1)
		for _, d := range []float64{1e-4, 1e-7, 1e-10} {
			below, _ := B0(th*(1-d), a, b, 1)
			above, _ := B0(th*(1+d), a, b, 1)
			if imag(below.Finite) != 0 {
				t.Errorf("Im B0 below threshold = %g", imag(below.Finite))
			}
			// B0 − B0(th) = O(√δ): both sides approach the threshold value
			if cmplx.Abs(below.Finite-at.Finite) > 10*math.Sqrt(d) || cmplx.Abs(above.Finite-at.Finite) > 10*math.Sqrt(d) {
				t.Errorf("B0 not continuous at threshold %v: %v | %v | %v", m, below.Finite, at.Finite, above.Finite)
			}
		}
		for _, f := range []float64{1 + 1e-9, 1 + 1e-3, 1.5, 10, 1e4} {
			p2 := th * f
			v, _ := B0(p2, a, b, 1)
			want := math.Pi * math.Sqrt(kallen(p2, a, b)) / p2
			if math.Abs(imag(v.Finite)-want) > 1e-14*want {
				t.Errorf("Im B0(%g; %v) = %.17g, want π√λ/p² = %.17g", p2, m, imag(v.Finite), want)
			}
		}
	}
}

// TestB0PrimeAgainstDifferences checks B0′ against a central difference of B0 (where B0 is smooth)
// and against B0′(0; m0, m1) closed forms: 1/(6m²) for equal masses and 1/(2m1²) for m0 = 0
// (from ∫₀¹ x(1−x)/F; derived in docs/INTEGRALS.md).
func TestB0PrimeAgainstDifferences(t *testing.T) {
	for _, c := range [][3]float64{{-3, 1, 2}, {0.5, 1, 1}, {10, 1, 2}, {2, 0, 1}, {-100, 3, 0.2}, {1e-6, 1, 1.5}} {
		p2, a, b := c[0], c[1]*c[1], c[2]*c[2]
		h := 1e-5 * math.Max(1, math.Abs(p2))
		bp, _ := B0(p2+h, a, b, 1)
		bm, _ := B0(p2-h, a, b, 1)
		fd := (bp.Finite - bm.Finite) / complex(2*h, 0)
		d, err := B0Prime(p2, a, b, 1)
		if err != nil {
			t.Fatal(err)
		}
		if cmplx.Abs(d.Finite-fd) > 1e-7*cmplx.Abs(d.Finite) {
			t.Errorf("B0′(%v) = %v, difference quotient %v", c, d.Finite, fd)
		}
	}
	for _, m := range []float64{0.5, 1, 3} {
		d, _ := B0Prime(0, m*m, m*m, 1)
		if math.Abs(real(d.Finite)-1/(6*m*m)) > 1e-15/(m*m) {
			t.Errorf("B0′(0; m, m) = %v, want 1/(6m²)", d.Finite)
		}
		d, _ = B0Prime(0, 0, m*m, 1)
		if math.Abs(real(d.Finite)-1/(2*m*m)) > 1e-15/(m*m) {
			t.Errorf("B0′(0; 0, m) = %v, want 1/(2m²)", d.Finite)
		}
	}
	if _, err := B0Prime(4, 1, 1, 1); err == nil {
		t.Error("B0′ at threshold should be an error")
	}
	if _, err := B0Prime(0, 0, 0, 1); err == nil {
		t.Error("B0′(0;0,0) should be an error")
	}
}

// TestB0SmallMomentum checks the expansion region p² → 0 and large mass ratios against the big
// path (the straightforward root formula loses all digits there).
func TestB0SmallMomentum(t *testing.T) {
	f := big.NewFloat
	for _, c := range [][3]float64{{1e-10, 1, 1}, {-1e-12, 4, 9}, {1e-8, 1e-6, 1}, {3, 1e-10, 1}, {1e-3, 173 * 173, 4.2 * 4.2}, {-2e-9, 91.2 * 91.2, 91.2 * 91.2}} {
		v, _ := B0(c[0], c[1], c[2], 1)
		w, _ := B0Big(f(c[0]), f(c[1]), f(c[2]), f(1), 80)
		if d := cmplx.Abs(v.Finite - w.Finite.Complex128()); d > 1e-14*(1+cmplx.Abs(w.Finite.Complex128())) {
			t.Errorf("B0%v = %v, big %v", c, v.Finite, w.Finite.Complex128())
		}
		p, err := B0Prime(c[0], c[1], c[2], 1)
		pb, _ := B0PrimeBig(f(c[0]), f(c[1]), f(c[2]), f(1), 80)
		if err == nil && cmplx.Abs(p.Finite-pb.Finite.Complex128()) > 1e-13*cmplx.Abs(pb.Finite.Complex128()) {
			t.Errorf("B0′%v = %v, big %v", c, p.Finite, pb.Finite.Complex128())
		}
	}
}

// TestEvalArguments checks the entry point: names, arity, the notation's unsquared masses, and
// the errors for NaN, infinite and negative inputs.
func TestEvalArguments(t *testing.T) {
	v, err := Eval("C0", []float64{-1, -2, -3, 1, 2, 3}, 1)
	if err != nil {
		t.Fatal(err)
	}
	w, _ := C0(-1, -2, -3, 1, 4, 9, 1)
	if v != w {
		t.Errorf("Eval C0 = %v, C0 with squared masses = %v", v, w)
	}
	if a, _ := Eval("B0'", []float64{1, 1, 2}, 1); a != mustEval(t, "B0prime", []float64{1, 1, 2}) {
		t.Error("B0' and B0prime differ")
	}
	bad := []struct {
		name string
		args []float64
		mu2  float64
		want string
	}{
		{"C0", []float64{1, 2, 3}, 1, "takes 6 arguments"},
		{"D0", []float64{1, 2, 3, 4, 5, 6, 1, 1, 1}, 1, "takes 10 arguments"},
		{"B0", []float64{math.NaN(), 1, 1}, 1, "argument 1"},
		{"B0", []float64{1, math.Inf(1), 1}, 1, "argument 2"},
		{"A0", []float64{-1}, 1, "negative"},
		{"B0", []float64{1, 1, 1}, 0, "scale"},
		{"E0", []float64{1}, 1, "unknown integral"},
	}
	for _, c := range bad {
		_, err := Eval(c.name, c.args, c.mu2)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("Eval(%s, %v, %g): error %v, want one mentioning %q", c.name, c.args, c.mu2, err, c.want)
		}
	}
	// direct calls validate too
	if _, err := C0(1, 1, 1, -1, 1, 1, 1); err == nil || !strings.Contains(err.Error(), "negative") {
		t.Errorf("C0 with m0² < 0: %v", err)
	}
	if _, err := D0(math.NaN(), 0, 0, 0, 0, 0, 1, 1, 1, 1, 1); err == nil {
		t.Error("D0 with NaN: no error")
	}
	// a configuration outside the covered set returns ErrNotCovered, not a number or a panic
	_, err = D0(0, 0, 0, 0, 1, 1, 0, 0, 0, 1, 1) // three massless lines, infrared divergent
	if !errors.Is(err, ErrNotCovered) {
		t.Errorf("three massless lines: %v, want ErrNotCovered", err)
	}
	bv, err := EvalBig("C0", []*big.Float{big.NewFloat(-1), big.NewFloat(-2), big.NewFloat(-3), big.NewFloat(1), big.NewFloat(2), big.NewFloat(3)}, big.NewFloat(1), 100)
	if err != nil || cmplx.Abs(bv.Finite.Complex128()-w.Finite) > 1e-14 {
		t.Errorf("EvalBig C0 = %v (%v), float %v", bv.Value(), err, w)
	}
	if _, err := EvalBig("A0", []*big.Float{big.NewFloat(-2)}, big.NewFloat(1), 100); err == nil {
		t.Error("EvalBig with a negative mass: no error")
	}
}

func mustEval(t *testing.T, name string, args []float64) Value {
	t.Helper()
	v, err := Eval(name, args, 1)
	if err != nil {
		t.Fatal(err)
	}
	return v
}
