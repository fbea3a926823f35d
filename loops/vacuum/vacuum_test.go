package vacuum

import (
	"math"
	"math/big"
	"math/cmplx"
	"math/rand/v2"
	"testing"

	"loopmatch/expr"
	"loopmatch/loops"
)

func rf(s string) expr.RatFunc { return expr.RFVar(s) }

func sq(s string) expr.RatFunc { return rf(s).Mul(rf(s)) }

// evalSeries returns the coefficients of ε^k (k = −2 … 0) of s at the given values.
func evalSeries(t *testing.T, s expr.Series, vals map[string]complex128) [3]complex128 {
	t.Helper()
	var out [3]complex128
	for k := -2; k <= 0; k++ {
		v, err := s.Coef(k).Eval(vals)
		if err != nil {
			t.Fatalf("eval %v: %v", s.Coef(k), err)
		}
		out[k+2] = v
	}
	return out
}

// TestTadSeries checks Tad against the expansion of A0 in PHYSICS.md:
// A0(m) = m² [1/ε + 1 − L + ε(1 − L + L²/2 + π²/12)], L = ln(m²/μ²).
func TestTadSeries(t *testing.T) {
	s, err := ExpandEps(Tad(sq("m")), 2, PositiveMasses)
	if err != nil {
		t.Fatal(err)
	}
	vals := map[string]complex128{"m": 3, "mu": 2}
	L := math.Log(9.0 / 4.0)
	want := []float64{9, 9 * (1 - L), 9 * (1 - L + L*L/2 + math.Pi*math.Pi/12)}
	for k := -1; k <= 1; k++ {
		v, err := s.Coef(k).Eval(vals)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(real(v)-want[k+1]) > 1e-13*math.Abs(want[k+1]) {
			t.Errorf("coefficient of eps^%d: %v, want %v", k, v, want[k+1])
		}
	}
}

func TestLoop1Exact(t *testing.T) {
	cases := []struct {
		a     int
		lines []Line
		want  string
	}{
		{0, []Line{{sq("m"), 1}}, "Tad(m^2)"},
		// ∫1/(k²−m²)² = (d−2)/(2m²) Tad: Γ(ε)/Γ(−1+ε) = −1 + ε.
		{0, []Line{{sq("m"), 2}}, "(d - 2)/(2*m^2)*Tad(m^2)"},
		// k²/(k²−m²) = 1 + m²/(k²−m²): the 1 is scaleless.
		{1, []Line{{sq("m"), 1}}, "m^2*Tad(m^2)"},
		// Numerator factor cancels a propagator.
		{0, []Line{{sq("m"), 2}, {sq("m"), -1}}, "Tad(m^2)"},
		// Partial fractions in two masses: 1/((x−A)(x−B)) = (1/(x−A) − 1/(x−B))/(A−B).
		{0, []Line{{sq("A"), 1}, {sq("B"), 1}}, "1/(A^2 - B^2)*Tad(A^2) - 1/(A^2 - B^2)*Tad(B^2)"},
	}
	for _, c := range cases {
		got, _, err := Loop1(c.a, c.lines)
		if err != nil {
			t.Fatal(err)
		}
		if got.String() != c.want {
			t.Errorf("Loop1(%d, %v) = %s, want %s", c.a, c.lines, got, c.want)
		}
	}
	// Scaleless integrals are zero and reported.
	got, info, err := Loop1(1, []Line{{expr.RFInt(0), 2}})
	if err != nil || !got.IsZero() || len(info.Scaleless) == 0 {
		t.Errorf("scaleless: %v %v %v", got, info, err)
	}
}

// TestB0ZeroMomentum compares the ε-expansion of ∫1/((k²−m0²)(k²−m1²)) with the closed form
// B0(0; m0, m1) = 1/ε + 1 − (m0² ln(m0²/μ²) − m1² ln(m1²/μ²))/(m0² − m1²) (PHYSICS.md) and with
// the package loops at m0 = 0 (massless line: B0(0; 0, m) = 1/ε + 1 − ln(m²/μ²)).
func TestB0ZeroMomentum(t *testing.T) {
	for _, m := range [][2]float64{{1, 2}, {0, 3}, {5, 0.5}} {
		m0, m1 := expr.RFRat(new(big.Rat).SetFloat64(m[0])), rf("b")
		e, _, err := Loop1(0, []Line{{m0.Mul(m0), 1}, {m1.Mul(m1), 1}})
		if err != nil {
			t.Fatal(err)
		}
		s, err := ExpandEps(e, 1, PositiveMasses)
		if err != nil {
			t.Fatal(err)
		}
		vals := map[string]complex128{"b": complex(m[1], 0), "mu": 1.5}
		got := evalSeries(t, s, vals)
		ref, err := loops.B0(0, m[0]*m[0], m[1]*m[1], 2.25)
		if err != nil {
			t.Fatal(err)
		}
		if cmplx.Abs(got[1]-ref.Pole1) > 1e-13 || cmplx.Abs(got[2]-ref.Finite) > 1e-12 {
			t.Errorf("B0(0; %v, %v): vacuum %v, loops %v", m[0], m[1], got, ref)
		}
	}
}

// TestC0D0ZeroMomentum compares vacuum reductions with three and four different masses with the
// independent numerical C0 and D0 of package loops at zero external momenta (finite integrals).
func TestC0D0ZeroMomentum(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 5))
	for range 10 {
		ms := []float64{0.5 + 2*r.Float64(), 0.5 + 2*r.Float64(), 0.5 + 2*r.Float64(), 0.5 + 2*r.Float64()}
		names := []string{"m0", "m1", "m2", "m3"}
		vals := map[string]complex128{"mu": 1.3}
		var lines []Line
		for i, n := range names {
			lines = append(lines, Line{sq(n), 1})
			vals[n] = complex(ms[i], 0)
		}
		for _, n := range []int{3, 4} {
			e, _, err := Loop1(0, lines[:n])
			if err != nil {
				t.Fatal(err)
			}
			s, err := ExpandEps(e, 1, PositiveMasses)
			if err != nil {
				t.Fatal(err)
			}
			got := evalSeries(t, s, vals)
			var ref loops.Value
			if n == 3 {
				ref, err = loops.C0(0, 0, 0, ms[0]*ms[0], ms[1]*ms[1], ms[2]*ms[2], 1.69)
			} else {
				ref, err = loops.D0(0, 0, 0, 0, 0, 0, ms[0]*ms[0], ms[1]*ms[1], ms[2]*ms[2], ms[3]*ms[3], 1.69)
			}
			if err != nil {
				t.Fatal(err)
			}
			if cmplx.Abs(got[0])+cmplx.Abs(got[1]) > 1e-12 || cmplx.Abs(got[2]-ref.Finite) > 1e-9*cmplx.Abs(ref.Finite) {
				t.Errorf("%d-point at zero momenta, masses %v: vacuum %v, loops %v", n, ms[:n], got, ref)
			}
		}
	}
}
