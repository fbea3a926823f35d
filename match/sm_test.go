package match

import (
	"bufio"
	"math"
	"os"
	"strconv"
	"strings"
	"testing"

	"loopmatch/expr/notation"
)

// runFile matches the first block of a file and returns the result.
func runFile(t *testing.T, path string) (*notation.Program, *Result) {
	t.Helper()
	p, err := notation.ParseFile(path)
	if err != nil {
		t.Fatal(err)
	}
	r, err := Run(p, p.Matches[0], Options{})
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range r.Checks {
		if !c.Passed {
			t.Errorf("check failed: %s: %s", c.Name, c.Detail)
		}
	}
	return p, r
}

// inamiLim reads testdata/reference/inami-lim.tsv (mpmath, 20 digits): x and the columns
// B0 C0 D0 D'0 E'0 S0.
func inamiLim(t *testing.T) [][7]float64 {
	t.Helper()
	f, err := os.Open("../testdata/reference/inami-lim.tsv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	var rows [][7]float64
	sc := bufio.NewScanner(f)
	for sc.Scan() {
		if strings.HasPrefix(sc.Text(), "#") {
			continue
		}
		var r [7]float64
		for i, s := range strings.Split(sc.Text(), "\t") {
			r[i], _ = strconv.ParseFloat(s, 64)
		}
		rows = append(rows, r)
	}
	return rows
}

// TestDeltaF2BoxS0 matches the Standard Model ΔF=2 box diagrams (W and Goldstone bosons,
// Feynman gauge, GIM with massless light quarks) onto (b̄γ^μP_L d)(b̄γ_μP_L d) and compares the
// coefficient with the Inami–Lim function S0(x_t) = (4x − 11x² + x³)/(4(1 − x)²) − 3x³ ln x/(2(1 − x)³)
// (T. Inami, C.S. Lim, Prog. Theor. Phys. 65 (1981) 297; A.J. Buras, hep-ph/9806471, eq. for S0):
// exactly as an expression in x_t = m_t²/M_W², and numerically with the reference table.
func TestDeltaF2BoxS0(t *testing.T) {
	_, r := runFile(t, "../testdata/sm/deltaf2_box.lm")
	got := r.Coeffs[0].InRatios
	want, err := notation.ParseFreeExpr("(4*xt - 11*xt^2 + xt^3)/(4*(1 - xt)^2) - 3*xt^3*log(xt)/(2*(1 - xt)^3)")
	if err != nil {
		t.Fatal(err)
	}
	if !got.Equal(want) {
		t.Errorf("C = %s\nwant S0 = %s", got.Pretty(), want.Pretty())
	}
	// Numerically, in masses, away from x = 1: there the closed form itself cancels in float64
	// (stable evaluation near x = 1 is the code emitter's job, tested there).
	n := 0
	for _, row := range inamiLim(t) {
		x := row[0]
		if math.Abs(x-1) < 0.5 {
			continue
		}
		v, err := r.Coeffs[0].Value.Eval(map[string]complex128{"mt": complex(math.Sqrt(x)*80.4, 0), "mW": 80.4})
		if err != nil {
			t.Fatal(err)
		}
		if d := math.Abs(real(v) - row[6]); d > 1e-12*math.Abs(row[6]) {
			t.Errorf("S0(%g): %.15g, table %.15g", x, real(v), row[6])
		}
		n++
	}
	if n < 6 {
		t.Errorf("only %d table rows compared", n)
	}
}
