package passarino

import (
	"math"
	"math/cmplx"
	"testing"

	"loopmatch/expr"
	"loopmatch/loops"
	"loopmatch/loops/vacuum"
)

// TestOnShellIntegrals checks the on-shell family against the numerical B0 of package loops:
// ∫ 1/(l² ((l + p)² − m²)) at p² = m² is B0(m²; 0, m) = 1/ε + 2 − ln(m²/μ²), and the tadpole
// limit I(0, 1) = A0(m); the rank-1 integral ∫ l·p/(l² ((l+p)² − m²)) = m² B1 + … follows from
// l·p = (D_b − D_a)/2: −A0(m)/2 + 0 (the massless tadpole vanishes).
func TestOnShellIntegrals(t *testing.T) {
	src := `masses m
momenta p
amplitude i11 = loop l { 1/(l^2 * ((l + p)^2 - m^2)) }
amplitude i11m = loop l { 1/(l^2 * ((l - p)^2 - m^2)) }
amplitude i01 = loop l { 1/((l + p)^2 - m^2) }
amplitude lp = loop l { l.p/(l^2 * ((l + p)^2 - m^2)) }
`
	m2 := expr.RFVar("m").Mul(expr.RFVar("m"))
	eval := func(name string) [3]complex128 {
		r, err := OnShell(amp(t, src, name), "p", m2)
		if err != nil {
			t.Fatal(err)
		}
		r = r.MustMul(expr.FromAtom(expr.I, -1)).MustMul(expr.FromAtom(expr.Pi, 2)).Scale(expr.RFInt(16))
		s, err := vacuum.ExpandEps(r, 1, vacuum.PositiveMasses)
		if err != nil {
			t.Fatal(err)
		}
		var out [3]complex128
		for k := -2; k <= 0; k++ {
			out[k+2], _ = s.Coef(k).Eval(map[string]complex128{"m": 3, "mu": 1.7})
		}
		return out
	}
	b0, _ := loops.B0(9, 0, 9, 1.7*1.7)
	a0, _ := loops.A0(9, 1.7*1.7)
	for _, c := range []struct {
		name string
		want loops.Value
	}{{"i11", b0}, {"i11m", b0}, {"i01", a0}, {"lp", loops.Value{Pole1: -a0.Pole1 / 2, Finite: -a0.Finite / 2}}} {
		got := eval(c.name)
		if cmplx.Abs(got[1]-c.want.Pole1) > 1e-13 || cmplx.Abs(got[2]-c.want.Finite) > 1e-12*math.Max(1, cmplx.Abs(c.want.Finite)) {
			t.Errorf("%s: %v, want %v", c.name, got, c.want)
		}
	}
}
