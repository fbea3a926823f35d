package dirac

import (
	"errors"
	"math/rand/v2"
	"slices"
	"testing"

	"loopmatch/expr"
)

// none marks a test without an exact expected value (only the numerical check).
var none = expr.Sym("none")

// traceRaw evaluates tr(el) with explicit matrices, summing indices that occur twice.
func (p *numPoint) traceRaw(t *testing.T, el []expr.NC, free map[string]int) complex128 {
	cnt := map[string]int{}
	for _, e := range el {
		if e.Op == expr.NCGamma || e.Op == expr.NCSigma {
			for _, a := range e.Args {
				cnt[a]++
			}
		}
	}
	var dum []string
	for n, c := range cnt {
		if c == 2 {
			dum = append(dum, n)
		}
	}
	slices.Sort(dum)
	asg := map[string]int{}
	for k, v := range free {
		asg[k] = v
	}
	var sum complex128
	var rec func(i int, w float64)
	rec = func(i int, w float64) {
		if i == len(dum) {
			sum += complex(w, 0) * p.traceNum(t, el, asg)
			return
		}
		for mu := 0; mu < 4; mu++ {
			asg[dum[i]] = mu
			rec(i+1, w*metric[mu])
		}
	}
	rec(0, 1)
	return sum
}

// Traces: P&S appendix A.3 eqs. (A.27)–(A.30) in four dimensions and the d-dimensional forms
// of P&S eq. (A.53) (tr 1 = 4 kept in d dimensions, the usual convention). The γ5-odd sign
// follows γ5 = iγ⁰γ¹γ²γ³ with ε^{0123} = −1 (see Trace). Every trace is also compared at d = 4
// with the trace of explicit matrices at random momenta and all index values.
func TestTraces(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	d := sym("d")
	four := func(a, b, c, e string) expr.Expr {
		return mul(num(4), gmn(a, b), gmn(c, e)).Sub(mul(num(4), gmn(a, c), gmn(b, e))).Add(mul(num(4), gmn(a, e), gmn(b, c)))
	}
	ii := [4]bool{true, true, true, true}
	tests := []struct {
		name string
		el   string
		want expr.Expr
		free []string
		read int
	}{
		{"tr 1 = 4 (A.27)", "", num(4), nil, 0},
		{"tr γ^μγ^ν = 4g^{μν} (A.27)", "g:mu g:nu", mul(num(4), gmn("mu", "nu")), []string{"mu", "nu"}, 0},
		{"tr γ^μγ^νγ^ργ^σ (A.27)", "g:mu g:nu g:rho g:sg", four("mu", "nu", "rho", "sg"), []string{"mu", "nu", "rho", "sg"}, 0},
		{"tr of an odd number vanishes (A.27)", "g:mu g:nu g:rho", expr.Zero(), []string{"mu", "nu", "rho"}, 0},
		{"tr γ5 = 0 (A.30)", "G5", expr.Zero(), nil, 0},
		{"tr γ^μγ^νγ5 = 0 (A.30)", "g:mu g:nu G5", expr.Zero(), []string{"mu", "nu"}, 0},
		{"tr γ^μγ^νγ^ργ^σγ5 = 4iε^{μνρσ} for ε^{0123} = −1 (A.30 with the sign of PHYSICS.md's definitions)", "g:mu g:nu g:rho g:sg G5",
			mul(num(4), iunit(), levi("mu", "nu", "rho", "sg", ii)), []string{"mu", "nu", "rho", "sg"}, 1},
		{"tr γ^μγ_μ = 4d (A.53)", "g:mu g:mu", mul(num(4), d), nil, 0},
		{"tr γ^μγ^νγ_μγ_ν = −4d(d−2) (A.53)", "g:mu g:nu g:mu g:nu", mul(num(-4), d, d.Sub(num(2))), nil, 0},
		{"tr p̸k̸ = 4p·k", "s:p s:k", mul(num(4), dotp("p", "k")), nil, 0},
		{"tr p̸γ^μk̸γ^ν = 4(p^μk^ν + p^νk^μ − p·k g^{μν})", "s:p g:mu s:k g:nu",
			mul(num(4), vec("p", "mu"), vec("k", "nu")).Add(mul(num(4), vec("p", "nu"), vec("k", "mu"))).Sub(mul(num(4), dotp("p", "k"), gmn("mu", "nu"))), []string{"mu", "nu"}, 0},
		{"tr σ^{μν}σ^{ρσ} = 4(g^{μρ}g^{νσ} − g^{μσ}g^{νρ})", "sig:mu:nu sig:rho:sg",
			mul(num(4), gmn("mu", "rho"), gmn("nu", "sg")).Sub(mul(num(4), gmn("mu", "sg"), gmn("nu", "rho"))), []string{"mu", "nu", "rho", "sg"}, 0},
		{"tr PL γ^μγ^ν = 2g^{μν}", "PL g:mu g:nu", mul(num(2), gmn("mu", "nu")), []string{"mu", "nu"}, 0},
		{"tr γ^μ p̸ γ^ν k̸ γ^ρ q̸ γ5 read from the first element", "g:mu s:p g:nu s:k g:rho s:q G5", none, []string{"mu", "nu", "rho"}, 1},
		{"tr of eight matrices", "g:mu s:p g:nu s:k g:mu s:q g:nu s:p", none, nil, 0},
		{"tr PR with six matrices and one contraction, read from element 3", "PR g:mu s:p g:nu s:k g:mu s:q", none, []string{"nu"}, 3},
	}
	mom := map[string][4]float64{}
	randMoms(rng, mom, "p", "k", "q")
	p := newPoint(rng, Kinematics{}, mom, nil)
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got, _, err := Trace(el(tc.el), expr.Int(1), Options{ReadingPoint: tc.read})
			if err != nil {
				t.Fatal(err)
			}
			if !tc.want.Equal(none) && !got.Equal(tc.want) {
				t.Fatalf("got %s, want %s", got, tc.want)
			}
			for _, asg := range assignments(tc.free, nil) {
				x := p.evalNum(t, got, asg)
				y := p.traceRaw(t, el(tc.el), asg)
				if !closeTo(x, y, 10) {
					t.Fatalf("at %v: algebra %v, matrices %v (%s)", asg, x, y, got)
				}
			}
		})
	}
}

// The γ5 policy: a surviving γ5-odd term is refused without a reading point; one that
// vanishes on contraction is accepted.
func TestTraceG5Policy(t *testing.T) {
	_, _, err := Trace(el("g:mu g:nu g:rho g:sg G5"), expr.Int(1), Options{})
	if !errors.Is(err, ErrG5Reading) {
		t.Fatalf("want ErrG5Reading, got %v", err)
	}
	// contracted with the symmetric p^ρ p^σ the Levi-Civita term vanishes
	got, _, err := Trace(el("g:mu g:nu g:rho g:sg G5"), mul(vec("p", "rho"), vec("p", "sg")), Options{})
	if err != nil || !got.IsZero() {
		t.Fatalf("want 0, got %s, %v", got, err)
	}
	// the γ5-even part of PL passes without a reading point
	got, _, err = Trace(el("PL g:mu g:nu"), expr.Int(1), Options{})
	if err != nil || got.IsZero() {
		t.Fatalf("tr PL γγ: %s, %v", got, err)
	}
	if _, _, err := Trace(el("g:mu G5"), expr.Int(1), Options{ReadingPoint: 3}); err == nil {
		t.Fatal("a reading point beyond the trace must be refused")
	}
	if _, _, err := Trace(el("g:mu T:a"), expr.Int(1), Options{}); err == nil {
		t.Fatal("colour generators in a Dirac trace must be refused")
	}
}
