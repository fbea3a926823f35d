package emit

import (
	"bytes"
	"errors"
	"flag"
	"math"
	"math/big"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"loopmatch/expr"
	"loopmatch/expr/notation"
	"loopmatch/expr/specfun"
)

var update = flag.Bool("update", false, "rewrite the generated package internal/inamilim")

// inamiLim are the Inami–Lim functions in the conventions of A.J. Buras, hep-ph/9806471
// (section on the master functions), as PHYSICS.md quotes them; T. Inami, C.S. Lim, Prog. Theor.
// Phys. 65 (1981) 297. The Go names are ours (they share letters with the scalar integrals).
var inamiLim = []struct{ name, column, formula string }{
	{"IL_B0", "B0", "1/4*(x/(1 - x) + x*log(x)/(x - 1)^2)"},
	{"IL_C0", "C0", "x/8*((x - 6)/(x - 1) + (3*x + 2)*log(x)/(x - 1)^2)"},
	{"IL_D0", "D0", "-4/9*log(x) + (-19*x^3 + 25*x^2)/(36*(x - 1)^3) + x^2*(5*x^2 - 2*x - 6)*log(x)/(18*(x - 1)^4)"},
	{"IL_Dp0", "Dp0", "-(8*x^3 + 5*x^2 - 7*x)/(12*(1 - x)^3) + x^2*(2 - 3*x)*log(x)/(2*(1 - x)^4)"},
	{"IL_Ep0", "Ep0", "-(x^3 - 5*x^2 - 2*x)/(4*(1 - x)^3) + 3*x^2*log(x)/(2*(1 - x)^4)"},
	{"IL_S0", "S0", "(4*x - 11*x^2 + x^3)/(4*(1 - x)^2) - 3*x^3*log(x)/(2*(1 - x)^3)"},
}

func parseExpr(t testing.TB, s string) expr.Expr {
	t.Helper()
	e, err := notation.ParseFreeExpr(s)
	if err != nil {
		t.Fatalf("%s: %v", s, err)
	}
	return e
}

// inamiLimSpec is the spec of the six functions, plus some of our own that exercise the other
// paths: a dilogarithm with a removable singularity, a dipole-type coefficient with real and
// complex couplings times two auxiliary functions (the F structure of the demo's heavy fermion
// and scalar loop), cancellations at x → 0 and x → ∞, and a complex-valued coefficient.
func inamiLimSpec(t testing.TB) Spec {
	spec := Spec{
		Package: "inamilim",
		Source:  "the Inami–Lim functions (A.J. Buras, hep-ph/9806471)",
		Title:   "textbook formulas",
		Params: []Param{{Name: "x", Kind: Ratio, Num: "mt", Den: "mW"}, {Name: "eQF", Kind: Real},
			{Name: "eQS", Kind: Real}, {Name: "y", Kind: Complex}},
		Values: map[string]complex128{"eQF": 0.1, "eQS": -0.2, "y": complex(0.6, 0.8)},
	}
	for _, f := range inamiLim {
		spec.Coeffs = append(spec.Coeffs, Coefficient{Name: f.name, Label: f.column, Operator: f.column + "(x)", Expr: parseExpr(t, f.formula)})
	}
	spec.Coeffs = append(spec.Coeffs, Coefficient{Name: "Li2Check", Label: "L", Operator: "L = (Li2(1 - x) + x - 1)/(x - 1)^2",
		Expr: parseExpr(t, "(Li2(1 - x) + x - 1)/(x - 1)^2")})
	dip := parseExpr(t, "-(yc*y*(eQF*x^2 - 2*eQS*x^2 - 5*eQF*x - 5*eQS*x - 2*eQF + eQS))/(24*(x - 1)^3) - (yc*x*y*(eQS*x + eQF))/(4*(x - 1)^4)*log(x)")
	dip, err := dip.Subst("yc", expr.RFVar("conj(y)"))
	if err != nil {
		t.Fatal(err)
	}
	spec.Coeffs = append(spec.Coeffs, Coefficient{Name: "Dipole", Label: "C_QR", Operator: "QR = bar(q2) sigma(al, be) PR q1 * F(al, be)", Expr: dip})
	// Cancellations at the ends of the domain: (x − log(1 + x))/x² → 1/2 at x → 0, and
	// x² log((x + 1)/x) − x → −1/2 at x → ∞ (the closed forms lose all digits there).
	spec.Coeffs = append(spec.Coeffs, Coefficient{Name: "SmallX", Label: "G", Operator: "G", Expr: parseExpr(t, "(x - log(1 + x))/x^2")})
	spec.Coeffs = append(spec.Coeffs, Coefficient{Name: "LargeX", Label: "H", Operator: "H", Expr: parseExpr(t, "x^2*log((x + 1)/x) - x")})
	ny := parseExpr(t, "y*x/(x + 1)")
	spec.Coeffs = append(spec.Coeffs, Coefficient{Name: "Chiral", Label: "C_Y", Operator: "Y", Expr: ny})
	spec.Coeffs = append(spec.Coeffs, Coefficient{Name: "Imaginary", Label: "C_I", Operator: "Z", Expr: parseExpr(t, "I*eQF*x/(x + 1)")})
	return spec
}

// TestGeneratedUpToDate checks that internal/inamilim holds what the emitter writes today for
// inamiLimSpec: the functions and their reference test. That package's tests (run with the
// rest) then check the emitted functions against arbitrary-precision values at more than 200
// points — near x = 1 down to 1e-12, at the zeros, at the ends 1e-10 and 1e10 — and against
// the reference table testdata/reference/inami-lim.tsv; its benchmarks measure them.
func TestGeneratedUpToDate(t *testing.T) {
	prog, err := Build(inamiLimSpec(t))
	if err != nil {
		t.Fatal(err)
	}
	src, err := prog.Go()
	if err != nil {
		t.Fatal(err)
	}
	test, err := prog.GoTest()
	if err != nil {
		t.Fatal(err)
	}
	if n := strings.Count(string(test), "\n\t{"); n < 200 {
		t.Errorf("the generated test has %d reference rows, want at least 200", n)
	}
	for name, data := range map[string][]byte{"coeffs.go": src, "coeffs_test.go": test} {
		path := filepath.Join("internal", "inamilim", name)
		if *update {
			if err := os.WriteFile(path, data, 0o644); err != nil {
				t.Fatal(err)
			}
			continue
		}
		old, err := os.ReadFile(path)
		if err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(old, data) {
			t.Errorf("%s is not what the emitter writes now; check the change and run go test ./expr/emit -update", path)
		}
	}
}

// TestBranchesOfInamiLim checks the plan for the Inami–Lim functions: one series branch
// around the removable singularity x = 1 each, none at the ends (the closed forms keep their
// digits at small and large x), and an estimate within the target.
func TestBranchesOfInamiLim(t *testing.T) {
	spec := inamiLimSpec(t)
	spec.Coeffs = spec.Coeffs[:len(inamiLim)]
	prog, err := Build(spec)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range prog.Coeffs {
		fn := c.Terms[0].Part.fn
		if len(fn.branches) != 1 || fn.branches[0].kind != around || fn.branches[0].at.Cmp(big.NewRat(1, 1)) != 0 {
			t.Errorf("%s: branches %+v, want one around x = 1", c.Label, fn.branches)
			continue
		}
		b := fn.branches[0]
		if b.terms < 4 || b.terms > 40 || !(b.lo < 0.99 && b.hi > 1.01) {
			t.Errorf("%s: branch %g < x < %g with %d terms", c.Label, b.lo, b.hi, b.terms)
		}
		if fn.worst > 1 {
			t.Errorf("%s: estimated error %g times the target", c.Label, fn.worst)
		}
	}
}

// TestSplit checks the factorisation of a coefficient into couplings times functions of the
// ratio: the dipole-type coefficient is conj(y)·y·(eQF·F1(x) + eQS·F2(x)).
func TestSplit(t *testing.T) {
	prog, err := Build(inamiLimSpec(t))
	if err != nil {
		t.Fatal(err)
	}
	var dip *Coeff
	for _, c := range prog.Coeffs {
		if c.Name == "Dipole" {
			dip = c
		}
	}
	if got := dip.Common.String(); got != "conj(y)*y" {
		t.Errorf("common factor %s, want conj(y)*y", got)
	}
	if len(dip.Terms) != 2 || dip.Terms[0].Factor.String() != "eQF" || dip.Terms[1].Factor.String() != "eQS" {
		t.Fatalf("terms %v", dip.Terms)
	}
	if !dip.Real || !dip.Complex {
		t.Errorf("Real = %v, Complex = %v; want a real value of complex arguments", dip.Real, dip.Complex)
	}
	// F1 + F2 recombine to the coefficient.
	sum := dip.Terms[0].Factor.MustMul(dip.Terms[0].Part.Expr).Add(dip.Terms[1].Factor.MustMul(dip.Terms[1].Part.Expr))
	if !dip.Common.MustMul(sum).Equal(dip.Expr) {
		t.Error("common·Σ factor·F does not give back the coefficient")
	}
	// The evaluator agrees with the exact value at a point inside the series branch.
	v, err := dip.Eval([]complex128{1.1, 0.1, -0.2, complex(0.6, 0.8)})
	if err != nil {
		t.Fatal(err)
	}
	vals := map[string]specfun.Complex{}
	for k, z := range map[string]complex128{"x": 1.1, "eQF": 0.1, "eQS": -0.2, "y": complex(0.6, 0.8)} {
		vals[k] = specfun.NewComplex(real(z), imag(z), 300)
	}
	wb, err := dip.Expr.EvalBig(vals, 300)
	if err != nil {
		t.Fatal(err)
	}
	want, _ := wb.Re.Float64()
	if math.Abs(real(v)-want) > 1e-13*math.Abs(want) || imag(v) != 0 {
		t.Errorf("Eval = %v, exact %v", v, want)
	}
}

// TestNotesAndErrors covers what the emitter reports: a true pole inside the domain, an
// irrational zero of a denominator, a function of two masses without a ratio, and expressions
// without a float64 program.
func TestNotesAndErrors(t *testing.T) {
	params := []Param{{Name: "x", Kind: Ratio}, {Name: "m1", Kind: Mass}, {Name: "m2", Kind: Mass}, {Name: "g", Kind: Real}}
	cases := []struct {
		expr string
		note string // "" when none is expected
		err  bool
	}{
		{"log(x)/(x - 2)", "pole at x = 2", false},
		{"(x^2 - 2 - log(x))/(x^2 - 2)", "not a rational number", false},
		{"log(m1^2/m2^2)/(m1^2 - m2^2)", "depends on m1, m2", false},
		{"g*x/(x + 1)", "", false},
		{"I*g*x/(x + 1)", "", false},
		{"B0(x; m1, m1)", "", true},
		{"h*x", "", true},
	}
	for _, c := range cases {
		e := parseExpr(t, c.expr)
		prog, err := Build(Spec{Package: "p", Params: params, Coeffs: []Coefficient{{Name: "C", Label: "C", Operator: "Q", Expr: e}}})
		if c.err {
			if err == nil {
				t.Errorf("%s: no error", c.expr)
			}
			continue
		}
		if err != nil {
			t.Errorf("%s: %v", c.expr, err)
			continue
		}
		notes := strings.Join(prog.Notes, "; ")
		if c.note == "" && notes != "" || !strings.Contains(notes, c.note) {
			t.Errorf("%s: notes %q, want %q", c.expr, notes, c.note)
		}
		if _, err := prog.Go(); err != nil {
			t.Errorf("%s: Go: %v", c.expr, err)
		}
	}
	_, err := Build(Spec{Package: "p", Params: params, Coeffs: []Coefficient{{Name: "C", Expr: parseExpr(t, "h")}}})
	if !errors.Is(err, ErrUnsupported) {
		t.Errorf("unknown symbol: err = %v, want ErrUnsupported", err)
	}
}

func TestPositiveRoots(t *testing.T) {
	cases := []struct {
		poly       string
		rational   []string
		irrational int
	}{
		{"x^2 - 3*x + 2", []string{"1", "2"}, 0},
		{"4*x^2 - 1", []string{"1/2"}, 0},
		{"x^2 + 1", nil, 0},
		{"x + 3", nil, 0},
		{"x^2 - 2", nil, 1},
		{"x^3 - x", []string{"1"}, 0},
	}
	for _, c := range cases {
		r, ok := parseExpr(t, c.poly).AsRatFunc()
		if !ok {
			t.Fatal(c.poly)
		}
		roots, approx := positiveRoots(r.Num(), "x")
		var got []string
		for _, q := range roots {
			got = append(got, q.RatString())
		}
		if strings.Join(got, " ") != strings.Join(c.rational, " ") || len(approx) != c.irrational {
			t.Errorf("%s: roots %v and %v, want %v and %d irrational", c.poly, got, approx, c.rational, c.irrational)
		}
	}
}
