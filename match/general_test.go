package match

import (
	"errors"
	"math/cmplx"
	"strings"
	"testing"

	"loopmatch/expr/notation"
)

// runBlocks matches every block of a file and fails on an error or a failed check.
func runBlocks(t *testing.T, path string) (*notation.Program, []*Result) {
	t.Helper()
	p, err := notation.ParseFile(path)
	if err != nil {
		t.Fatal(err)
	}
	var out []*Result
	for _, mb := range p.Matches {
		r, err := Run(p, mb, Options{})
		if err != nil {
			t.Fatal(err)
		}
		for _, c := range append(r.Checks, r.Expectations...) {
			if !c.Passed {
				t.Errorf("%s: check failed: %s: %s", mb.Pos, c.Name, c.Detail)
			}
		}
		out = append(out, r)
	}
	return p, out
}

// TestGeneralRouteAgreesWithHeavy is the "done when" item 2 of the general route: the general
// route (full and effective-theory amplitudes with the same infrared regulator, reduced by
// Passarino–Veltman and subtracted) and the heavy-mass route (Taylor expansion in the small
// quantities, vacuum integrals) give the same Wilson coefficients, once with a light vector mass
// as the regulator (closed form: the coefficients must be equal as expressions) and once with
// off-shell external momenta (numerical: to 1e-8). The reference is the method of regions
// (M. Beneke, V.A. Smirnov, Nucl. Phys. B522 (1998) 321, hep-ph/9711391; cited from memory):
// full = hard + soft, the soft region is the effective theory with the same regulator, the hard
// region is what the heavy-mass route computes — two methods that share no code beyond the
// scalar tadpole. Both must also meet the file's expect line C_QS = yS² (derived by hand there:
// the boxes are proportional to σ⊗σ in d dimensions).
func TestGeneralRouteAgreesWithHeavy(t *testing.T) {
	t.Run("light-mass regulator", func(t *testing.T) {
		_, rs := runBlocks(t, "../testdata/general_light.lm")
		gen, heavy := rs[0], rs[1]
		for i := range gen.Coeffs {
			if !gen.Coeffs[i].Value.Equal(heavy.Coeffs[i].Value) {
				t.Errorf("C_%s: general %s, heavy %s", gen.Coeffs[i].Operator, gen.Coeffs[i].Value, heavy.Coeffs[i].Value)
			}
		}
		// the regulator check must have run and passed
		if !hasCheck(gen, "regulator logarithms cancel") {
			t.Error("no regulator check on the general route")
		}
	})
	t.Run("off-shell momenta", func(t *testing.T) {
		p, rs := runBlocks(t, "../testdata/general_offshell.lm")
		gen, heavy := rs[0], rs[1]
		pt, err := pointOf(p, p.Matches[0])
		if err != nil {
			t.Fatal(err)
		}
		for i := range gen.Coeffs {
			for _, scale := range []float64{1, 0.01} { // P and P/100: leading power reached
				g, err := EvalFinite(gen.Coeffs[i].Value, pt.with(map[string]float64{"P": scale * pt["P"]}))
				if err != nil {
					t.Fatal(err)
				}
				h, err := EvalFinite(heavy.Coeffs[i].Value, pt)
				if err != nil {
					t.Fatal(err)
				}
				if d := cmplx.Abs(g-h) / cmplx.Abs(h); d > 1e-8 {
					t.Errorf("C_%s at P × %g: general %v, heavy %v (relative difference %.3g)", gen.Coeffs[i].Operator, scale, g, h, d)
				}
			}
		}
		if !hasCheck(gen, "regulator logarithms cancel") {
			t.Error("no regulator check on the general route")
		}
	})
}

func hasCheck(r *Result, prefix string) bool {
	for _, c := range r.Checks {
		if strings.HasPrefix(c.Name, prefix) {
			return true
		}
	}
	return false
}

// TestGeneralRouteWithoutSubtraction checks that the infrared logarithm of the light-vector
// mass does not cancel without the effective-theory amplitudes: the regulator check fails and
// names the logarithm (the check can fail).
func TestGeneralRouteWithoutSubtraction(t *testing.T) {
	p, err := notation.ParseFile("../testdata/general_light.lm")
	if err != nil {
		t.Fatal(err)
	}
	mb := *p.Matches[0]
	mb.EFT = nil
	r, err := Run(p, &mb, Options{})
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range r.Checks {
		if strings.HasPrefix(c.Name, "regulator logarithms cancel") {
			if c.Passed || !strings.Contains(c.Detail, "log(mV)") {
				t.Errorf("regulator check without the EFT: passed %v, %s", c.Passed, c.Detail)
			}
			return
		}
	}
	t.Error("no regulator check")
}

// TestGeneralRouteErrors checks the messages of the general route for input it cannot take.
func TestGeneralRouteErrors(t *testing.T) {
	head := `couplings g
masses M
light m
symbols P
momenta p1 p2
external a1 : fermion in momentum p1 mass 0
external a2 : fermion out momentum p1 mass 0
operator Q = bar(a2) PL a1
`
	cases := []struct {
		name, body, want string
	}{
		{"missing invariant", `amplitude A = ubar(a2) PL u(a1) * loop k { 1/((k^2 - M^2)*((k + p2)^2 - M^2)) }
match A onto Q:
  route general
`, "needs the value of p2.p2"},
		{"infrared divergence without regulator", `amplitude A = ubar(a2) PL u(a1) * loop k { 1/(k^2*(k + p1)^2*((k - p2)^2 - M^2)) }
values M = 10, mu = 10
match A onto Q:
  route general
  kinematics p1.p2 = 3
  kinematics p2^2 = 5
`, "infrared-divergent scalar integral"},
		{"raised power", `amplitude A = ubar(a2) PL u(a1) * loop k { 1/((k^2 - M^2)^2*((k + p1)^2 - m^2)) }
match A onto Q:
  route general
`, "raised propagator power"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			p, err := notation.Parse("t.lm", []byte(head+c.body))
			if err != nil {
				t.Fatal(err)
			}
			r, err := Run(p, p.Matches[0], Options{})
			msg := ""
			if err != nil {
				msg = err.Error()
			} else {
				for _, ch := range r.Checks {
					if !ch.Passed {
						msg += ch.Detail
					}
				}
			}
			if !strings.Contains(msg, c.want) {
				t.Errorf("got %q, want it to contain %q", msg, c.want)
			}
		})
	}
}

// TestNotationLinesOfTheGeneralRoute checks the validation of the new match-block lines.
func TestNotationLinesOfTheGeneralRoute(t *testing.T) {
	head := `couplings g
masses M
light m
symbols P
momenta p1 p2
external a1 : fermion in momentum p1 mass 0
external a2 : fermion out momentum p1 mass 0
amplitude A = g*ubar(a2) PL u(a1)
amplitude B = g*ubar(a2) PL u(a1)
operator Q = bar(a2) PL a1
operator R = bar(a2) PR a1
`
	cases := []struct{ lines, want string }{
		{"  eft B\n", "eft amplitudes are subtracted on the general route only"},
		{"  route general\n  eft Q\n", "eft: Q is not an amplitude"},
		{"  route general\n  eft A\n", "eft: A is listed twice"},
		{"  kinematics p1 = 2\n", "write a scalar product"},
		{"  kinematics 2*p1.p2 = 2\n", "expected a scalar product"},
		{"  kinematics p1.p2 = p1.p2\n", "must be a parameter expression"},
		{"  regulator M\n", "regulator: M must be a declared light mass or symbol"},
		{"  invariant C_Q*C_R\n", "must be linear in the coefficients"},
		{"  invariant C_X\n", "undeclared"},
		{"  eom Q\n", "eom operators need an off-shell match"},
		{"  offshell\n  eom Q, R\n", "every operator is marked eom"},
		{"  offshell\n  eom X\n", "eom: X is not an operator of this match"},
	}
	for _, c := range cases {
		_, err := notation.Parse("t.lm", []byte(head+"match A onto Q, R:\n"+c.lines))
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%q: error %v, want %q", c.lines, err, c.want)
		}
		var ne *notation.Error
		if err != nil && !errors.As(err, &ne) {
			t.Errorf("%q: %v is not a positioned error", c.lines, err)
		}
	}
	// a valid block
	p, err := notation.Parse("t.lm", []byte(head+"match A onto Q, R:\n  route general\n  eft B\n  offshell report\n  kinematics p1^2 = -P^2\n  regulator P, m\n  invariant C_Q - 4*C_R\n  eom R\n"))
	if err != nil {
		t.Fatal(err)
	}
	mb := p.Matches[0]
	if len(mb.EFT) != 1 || !mb.OffShell || !mb.ReportOffShell || len(mb.Kinematics) != 1 || len(mb.Regulators) != 2 || len(mb.Invariants) != 1 || len(mb.EOM) != 1 {
		t.Errorf("block read as %+v", mb)
	}
}
