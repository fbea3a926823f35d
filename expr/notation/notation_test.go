package notation

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

const header = `couplings g
masses M m
light ml
index al be rh
momenta p q
external a : fermion in momentum p mass m
external b : fermion out momentum p - q mass 0
external A : photon out momentum q polarization eA
`

// TestErrors checks that malformed files give positioned errors that say what was expected
// and what was found.
func TestErrors(t *testing.T) {
	cases := []struct {
		name, src, want string
	}{
		{"undeclared", header + "amplitude X = g*x\n", "t.lm:9:17: undeclared name x"},
		{"duplicate", "masses M\ncouplings M\n", "t.lm:2:11: M is already declared as a heavy mass at t.lm:1:8"},
		{"builtin", "couplings pi\n", "t.lm:1:11: pi is a built-in name"},
		{"loop outside", header + "amplitude X = loop k { 1/(k^2 - M^2) } * k.p\n", "t.lm:9:42: k is the loop momentum of the loop at 9:15 and is used outside that loop's braces"},
		{"index thrice", header + "amplitude X = ubar(b) gamma(al) u(a) * p[al] * q[al]\n", "t.lm:9:46: index al is used 3 times in one product"},
		{"conservation", "momenta p q\nexternal a : scalar in momentum p\nexternal b : scalar out momentum q\n", "t.lm:3:1: momentum is not conserved at the external legs"},
		{"syntax", header + "amplitude X g\n", "t.lm:9:13: expected \"=\", found \"g\""},
		{"eof", header + "amplitude X = (g\n", "t.lm:10:1: expected an expression, found the end of the file"},
		{"keyword as name", "couplings match\n", "t.lm:1:11: expected a name, found the keyword \"match\""},
		{"wrong spinor", header + "amplitude X = u(b) u(a)\n", "t.lm:9:17: u(b): b is an outgoing fermion, whose spinor is ubar(b)"},
		{"C0 arity", header + "amplitude X = C0(0, 0; M, M, M)\n", "t.lm:9:18: C0 takes (3 invariants; 3 masses), found 2 arguments in group 1"},
		{"vector product", header + "amplitude X = p*q\n", "t.lm:9:16: product of two vectors: write p.q"},
		{"bad denominator", header + "amplitude X = loop k { 1/(k.p) }\n", "cannot divide by"},
		{"not a function", header + "amplitude X = g(M)\n", "g takes 2 arguments separated by commas (g is also declared as a coupling; to multiply write g*(…))"},
		{"bad character", header + "amplitude X = g $ M\n", "t.lm:9:17: unexpected character"},
		{"free index mismatch", header + "amplitude X = ubar(b) (gamma(al) + M) u(a)\n", "different free indices"},
		{"match unknown", header + "operator Q = bar(b) a\nmatch Y onto Q:\n", "t.lm:10:7: match: Y is not an amplitude of this file"},
		{"expand order", header + "amplitude X = g\noperator Q = bar(b) a\nmatch X onto Q:\n expand p to order x\n", "expected a number"},
		{"empty values", header + "values\n", "t.lm:10:1: expected NAME = value, found the end of the file"},
		{"onshell of a non-amplitude", header + "define dm = onshell(g)\namplitude X = dm\n", "onshell(g): g is not an amplitude defined before this point"},
		{"expand nothing wrong order", header + "amplitude X = g\noperator Q = bar(b) a\nmatch X onto Q:\n expand to order p\n", "expected a number"},
		{"recursive define", header + "define V = V\namplitude X = V\n", "nest more than 50 levels"},
		{"big exponent", header + "amplitude X = g^100\n", "exponent 100 is larger than the limit 64"},
		{"vector power", header + "amplitude X = p^3\n", "a vector can only be squared"},
		{"field strength outside operator", header + "amplitude X = F(al, be)\n", "may appear only in an operator definition"},
		{"index as value", header + "amplitude X = al\n", "al is a Lorentz index"},
		{"open dirac", header + "amplitude X = gamma(al) p[al]\n", "outside a spinor chain"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := Parse("t.lm", []byte(c.src))
			if err == nil {
				t.Fatalf("no error for %q", c.src)
			}
			if !strings.Contains(err.Error(), c.want) {
				t.Errorf("error %q does not contain %q", err.Error(), c.want)
			}
			var ne *Error
			if !errors.As(err, &ne) {
				t.Errorf("error %q is not a positioned *Error", err)
			} else if ne.Pos.Line == 0 || ne.Pos.Col == 0 || ne.Pos.File != "t.lm" {
				t.Errorf("error %q lacks file:line:col", err)
			}
		})
	}
}

// TestRoundTrip parses every amplitude of the shipped examples, prints it in canonical text
// and parses that text back: the result must be the same expression.
func TestRoundTrip(t *testing.T) {
	files, _ := filepath.Glob("../../testdata/*.lm")
	if len(files) == 0 {
		t.Fatal("no example files")
	}
	for _, f := range files {
		p, err := ParseFile(f)
		if err != nil {
			t.Fatalf("%s: %v", f, err)
		}
		for _, a := range p.Amplitudes {
			text := a.Body.String()
			back, err := p.ParseExpr(text)
			if err != nil {
				t.Fatalf("%s: %s: reparse of %q: %v", f, a.Name, text, err)
			}
			if !back.Equal(a.Body) {
				t.Errorf("%s: %s: round trip changed the expression:\n%s\n%s", f, a.Name, text, back)
			}
		}
	}
}

func TestFreeExpr(t *testing.T) {
	cases := []struct{ in, want string }{
		{"(x^2-1)/(x-1)", "x + 1"},
		{"(a^3-b^3)/(a^2-b^2)", "(a^2 + a*b + b^2)/(a + b)"},
		{"80.4/2", "201/5"},
		{"2 x y - x*y", "x*y"},
		{"log(4) - 2*log(2)", "0"},
		{"log(-1)", "I*pi"},
		{"log(-1 - i0)", "-I*pi"},
		{"Li2(1)", "1/6*pi^2"},
		{"sqrt(12)", "2*sqrt(3)"},
		{"I^2", "-1"},
		{"x^-2*x^3", "x"},
		{"(1+x)^2", "x^2 + 2*x + 1"},
		{"log(x)*2 - log(x)", "log(x)"},
	}
	for _, c := range cases {
		e, err := ParseFreeExpr(c.in)
		if err != nil {
			t.Fatalf("%s: %v", c.in, err)
		}
		if got := e.String(); got != c.want {
			t.Errorf("%s = %q, want %q", c.in, got, c.want)
		}
		back, err := ParseFreeExpr(e.String())
		if err != nil || !back.Equal(e) {
			t.Errorf("round trip of %q: %v %v", e, back, err)
		}
	}
}

// TestPropagators checks recognition of denominators as propagators K² − M².
func TestPropagators(t *testing.T) {
	p, err := Parse("t.lm", []byte(header+`
amplitude A1 = loop k { 1/((k - p)^2 - M^2) }
amplitude A2 = loop k { 1/(k^2 - 2*k.p + p^2 - M^2) }
amplitude A3 = loop k { 2/(2*(p - k)^2 - 2*M^2) }
amplitude A4 = loop k { 1/((k^2 - M^2)^2 * k^2) }
amplitude A5 = loop k { (k^2 - M^2)^-2 / k^2 }
`))
	if err != nil {
		t.Fatal(err)
	}
	a := func(n string) string { x, _ := p.Amplitude(n); return x.Body.String() }
	if a("A1") != a("A2") || a("A1") != a("A3") {
		t.Errorf("equal propagators differ: %s | %s | %s", a("A1"), a("A2"), a("A3"))
	}
	if want := "loop k { 1/((k - p)^2 - M^2) }"; a("A1") != want {
		t.Errorf("A1 = %s, want %s", a("A1"), want)
	}
	if a("A4") != a("A5") {
		t.Errorf("A4 %s != A5 %s", a("A4"), a("A5"))
	}
}

func TestContraction(t *testing.T) {
	p, err := Parse("t.lm", []byte(header+`
amplitude C1 = p[al]*q[al]
amplitude C2 = g(al, be)*g(al, be)
amplitude C3 = g(al, be)*p[be]*eA[al]
amplitude C4 = ubar(b) gamma(al) u(a) * q[al]
amplitude C5 = levi(al, be, p, q) * levi(p, q, al, be) - levi(al, be, p, q)*levi(al, be, p, q)
`))
	if err != nil {
		t.Fatal(err)
	}
	want := map[string]string{
		"C1": "p.q", "C2": "d", "C3": "eA.p", "C4": "(ubar(b) slash(q) u(a))", "C5": "0",
	}
	for n, w := range want {
		x, _ := p.Amplitude(n)
		if got := x.Body.String(); got != w {
			t.Errorf("%s = %s, want %s", n, got, w)
		}
	}
}

func TestExamplesParse(t *testing.T) {
	files, _ := filepath.Glob("../../testdata/*.lm")
	for _, f := range files {
		if _, err := ParseFile(f); err != nil {
			t.Errorf("%v", err)
		}
	}
	if _, err := os.Stat("../../testdata"); err != nil {
		t.Fatal(err)
	}
}

// TestMatrixElement checks the tree-level matrix elements of operators: fields become the
// spinors of their legs, F(al, be) of an outgoing photon of momentum q and polarisation eA
// becomes i(q[al] eA[be] − q[be] eA[al]) (A_μ ∝ ε* e^{+iqx} for a created photon), and D(al) on
// the field of an incoming particle of momentum p gives −i p[al] (e^{−ipx}).
func TestMatrixElement(t *testing.T) {
	src := header + `
operator O1 = bar(b) PR a
operator O2 = bar(b) gamma(al) D(al) a
operator O3 = bar(b) sigma(al, be) a * F(al, be)
operator O4 = bar(a) b
operator O5 = D(al) bar(b) gamma(al) a
`
	p, err := Parse("t.lm", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	want := map[string]string{
		"O1": "(ubar(b) PR u(a))",
		"O2": "-I*(ubar(b) slash(p) u(a))",
		"O3": "-I*eA[al]*q[be]*(ubar(b) sigma(al, be) u(a)) + I*eA[be]*q[al]*(ubar(b) sigma(al, be) u(a))",
		"O5": "I*(ubar(b) slash(p) u(a)) - I*(ubar(b) slash(q) u(a))",
	}
	for _, o := range p.Operators {
		m, err := p.MatrixElement(o)
		if o.Name == "O4" {
			if err == nil || !strings.Contains(err.Error(), "leg a is an incoming fermion: its field in the operator is a") {
				t.Errorf("O4: error %v", err)
			}
			continue
		}
		if err != nil {
			t.Fatalf("%s: %v", o.Name, err)
		}
		if got := m.String(); got != want[o.Name] {
			t.Errorf("%s = %s, want %s", o.Name, got, want[o.Name])
		}
	}
}

// TestJuxtapositionAfterName checks that "PR (…)" with a space multiplies, while "PR(…)" and
// "mF(…)" without one are calls (and errors for names that are not functions).
func TestJuxtapositionAfterName(t *testing.T) {
	a, err := Parse("t.lm", []byte(header+"amplitude X = ubar(b) PR (slash(p) + M) u(a)\namplitude Y = ubar(b) PR*(slash(p) + M) u(a)\n"))
	if err != nil {
		t.Fatal(err)
	}
	x, _ := a.Amplitude("X")
	y, _ := a.Amplitude("Y")
	if !x.Body.Equal(y.Body) {
		t.Errorf("PR (…) = %s, PR*(…) = %s", x.Body, y.Body)
	}
	for _, src := range []string{"amplitude X = ubar(b) PR(slash(p)) u(a)\n", "amplitude X = M(g)\n"} {
		if _, err := Parse("t.lm", []byte(header+src)); err == nil {
			t.Errorf("%q accepted", src)
		}
	}
}

func TestTraces(t *testing.T) {
	p, err := Parse("t.lm", []byte(header+"adjoint c1 c2\namplitude T1 = tr(slash(q) slash(p) + M)\namplitude T2 = ctr(T(c1) T(c1))\n"))
	if err != nil {
		t.Fatal(err)
	}
	want := map[string]string{"T1": "M*tr() + tr(slash(q) slash(p))", "T2": "Nc^2/2 - 1/2"}
	for n, w := range want {
		a, _ := p.Amplitude(n)
		if a.Body.String() != w {
			t.Errorf("%s = %s, want %s", n, a.Body, w)
		}
	}
	for _, src := range []string{"amplitude X = tr(ubar(b) u(a))\n", "adjoint c1\namplitude X = tr(T(c1))\n", "amplitude X = ctr(gamma(al) gamma(al))\n"} {
		if _, err := Parse("t.lm", []byte(header+src)); err == nil {
			t.Errorf("%q accepted", src)
		}
	}
}

// TestExpandNothing checks that "expand to order 0" names no small quantity while the lists of
// names keep working.
func TestExpandNothing(t *testing.T) {
	for _, c := range []struct {
		line  string
		names []string
		order int
	}{
		{"expand to order 0", nil, 0},
		{"expand p, q to order 2", []string{"p", "q"}, 2},
		{"expand ml to order 1", []string{"ml"}, 1},
	} {
		p, err := Parse("t.lm", []byte(header+"amplitude X = g\noperator Q = bar(b) a\nmatch X onto Q:\n "+c.line+"\n"))
		if err != nil {
			t.Fatalf("%s: %v", c.line, err)
		}
		mb := p.Matches[0]
		if !mb.HasExpand || mb.Order != c.order || strings.Join(mb.Expand, ",") != strings.Join(c.names, ",") {
			t.Errorf("%s: expand %v to order %d (set %v)", c.line, mb.Expand, mb.Order, mb.HasExpand)
		}
	}
}

// TestParameterComponents checks K[mu] inside a define whose parameters K and mu stand for a
// combination of momenta and an index: (p − 2q)[al] = p[al] − 2 q[al], and a bare momentum
// argument with an index parameter.
func TestParameterComponents(t *testing.T) {
	p, err := Parse("t.lm", []byte(header+`
define V(K, m) = K[m]
amplitude X1 = ubar(b) gamma(al) u(a) * V(p - 2*q, al)
amplitude X2 = ubar(b) gamma(al) u(a) * V(q, al)
amplitude X3 = V(p - q, al) * V(p + q, al)
`))
	if err != nil {
		t.Fatal(err)
	}
	want := map[string]string{
		"X1": "(ubar(b) slash(p) u(a)) - 2*(ubar(b) slash(q) u(a))",
		"X2": "(ubar(b) slash(q) u(a))",
		"X3": "p.p - q.q",
	}
	for n, w := range want {
		x, _ := p.Amplitude(n)
		if got := x.Body.String(); got != w {
			t.Errorf("%s = %s, want %s", n, got, w)
		}
	}
	if _, err := Parse("t.lm", []byte(header+"define V(K, m) = K[m]\namplitude X = V(2*g, al)\n")); err == nil || !strings.Contains(err.Error(), "scalar expression and cannot take an index") {
		t.Errorf("index on a scalar parameter: %v", err)
	}
}

// TestNestingLimit checks the documented bound: brackets nest up to 200 deep.
func TestNestingLimit(t *testing.T) {
	nest := func(n int) string {
		return header + "amplitude X = " + strings.Repeat("(", n) + "g" + strings.Repeat(")", n) + "\n"
	}
	if _, err := Parse("t.lm", []byte(nest(200))); err != nil {
		t.Errorf("200 levels: %v", err)
	}
	if _, err := Parse("t.lm", []byte(nest(201))); err == nil || !strings.Contains(err.Error(), "nested more than 200 levels") {
		t.Errorf("201 levels: %v", err)
	}
}
