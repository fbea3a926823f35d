package emit

import (
	"bufio"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"

	"loopmatch/expr"
	"loopmatch/expr/notation"
)

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

// inamiLimSpec is the spec of the six functions, plus two of our own that exercise the other
// paths: a dilogarithm with a removable singularity, and a dipole-type coefficient with real and
// complex couplings times two auxiliary functions (the F structure of the demo's heavy fermion
// and scalar loop).
func inamiLimSpec(t testing.TB) Spec {
	spec := Spec{
		Package: "inamilim",
		Source:  "the Inami–Lim functions (A.J. Buras, hep-ph/9806471)",
		Title:   "textbook formulas",
		Params: []Param{{Name: "x", Kind: Ratio, Doc: "x = mt^2/mW^2"}, {Name: "eQF", Kind: Real},
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
	ny := parseExpr(t, "y*x/(x + 1)")
	spec.Coeffs = append(spec.Coeffs, Coefficient{Name: "Chiral", Label: "C_Y", Operator: "Y", Expr: ny})
	return spec
}

// writeModule writes files into a new module in dir.
func writeModule(t *testing.T, dir, pkg string, files map[string][]byte) {
	t.Helper()
	if err := os.WriteFile(filepath.Join(dir, "go.mod"), []byte("module emitcheck\n\ngo 1.26\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	pd := filepath.Join(dir, pkg)
	if err := os.MkdirAll(pd, 0o755); err != nil {
		t.Fatal(err)
	}
	for name, src := range files {
		if err := os.WriteFile(filepath.Join(pd, name), src, 0o644); err != nil {
			t.Fatal(err)
		}
	}
}

// goTestModule runs go test (with vet) in a module without network access.
func goTestModule(t *testing.T, dir string, extra ...string) string {
	t.Helper()
	gobin, err := exec.LookPath("go")
	if err != nil {
		t.Skip("the go command is not installed; the emitted code cannot be compiled here")
	}
	cmd := exec.Command(gobin, append([]string{"test", "-count=1"}, append(extra, "./...")...)...)
	cmd.Dir = dir
	cmd.Env = append(os.Environ(), "GOFLAGS=-mod=mod", "GOWORK=off", "GOPROXY=off", "GOTOOLCHAIN=local")
	out, err := cmd.CombinedOutput()
	if err != nil {
		t.Fatalf("go test in the emitted module failed: %v\n%s", err, out)
	}
	return string(out)
}

// tsvTest writes a test comparing the emitted Inami–Lim functions with the reference table
// testdata/reference/inami-lim.tsv (computed with mpmath outside the project, 20 digits).
func tsvTest(t *testing.T, path string, names map[string]string) []byte {
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	var header []string
	var rows []string
	sc := bufio.NewScanner(f)
	for sc.Scan() {
		line := sc.Text()
		if strings.HasPrefix(line, "#") {
			header = strings.Fields(strings.TrimPrefix(line, "#"))
			continue
		}
		cols := strings.Split(line, "\t")
		for i, h := range header {
			if fn, ok := names[h]; ok && i < len(cols) {
				rows = append(rows, fmt.Sprintf("\t{%q, %s, %s, %s},", h, "func(x float64) float64 { return "+fn+"(x) }", cols[0], cols[i]))
			}
		}
	}
	if len(rows) < 60 {
		t.Fatalf("read %d values from %s, expected the six functions at 15 points", len(rows), path)
	}
	return []byte(`package inamilim

import (
	"math"
	"testing"
)

// TestReferenceTable compares with testdata/reference/inami-lim.tsv (mpmath, 20 digits).
func TestReferenceTable(t *testing.T) {
	for _, r := range []struct {
		name string
		f    func(float64) float64
		x, want float64
	}{
` + strings.Join(rows, "\n") + `
	} {
		if got := r.f(r.x); !(math.Abs(got-r.want) <= 1e-13*math.Abs(r.want)) {
			t.Errorf("%s(%v) = %.17g, table %.17g (relative difference %.2g)", r.name, r.x, got, r.want, math.Abs(got/r.want-1))
		}
	}
}
`)
}

// TestEmittedGoCompilesAndAgrees emits the Inami–Lim functions and our two extra coefficients,
// compiles them with their generated reference test and the reference-table test in a temporary
// module, and runs both: the emitted functions must agree with the arbitrary-precision values
// (near x = 1 down to 1e-12, at the zeros, at the ends 1e-10 and 1e10) within the tolerance of
// the package, and with the table within 1e-13.
func TestEmittedGoCompilesAndAgrees(t *testing.T) {
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
	n := strings.Count(string(test), "\n\t{")
	if n < 200 {
		t.Errorf("the generated test has %d reference rows, want at least 200", n)
	}
	names := map[string]string{}
	for _, f := range inamiLim {
		names[f.column] = f.name
	}
	dir := t.TempDir()
	writeModule(t, dir, "inamilim", map[string][]byte{
		"inamilim.go":      src,
		"inamilim_test.go": test,
		"table_test.go":    tsvTest(t, "../../testdata/reference/inami-lim.tsv", names),
	})
	goTestModule(t, dir)
}
