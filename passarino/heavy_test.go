package passarino

import (
	"math"
	"math/cmplx"
	"testing"

	"loopmatch/expr"
	"loopmatch/expr/notation"
	"loopmatch/loops"
	"loopmatch/loops/vacuum"
)

// amp parses one amplitude from a small .lm text.
func amp(t *testing.T, src, name string) expr.Expr {
	t.Helper()
	p, err := notation.Parse("t.lm", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	a, ok := p.Amplitude(name)
	if !ok {
		t.Fatalf("no amplitude %s", name)
	}
	return a.Body
}

// laurentOf reduces an amplitude on the heavy route, strips the i/(16π²) measure, replaces the
// invariant p.p by the symbol pp and evaluates the ε-expansion numerically.
func laurentOf(t *testing.T, e expr.Expr, s Small, vals map[string]complex128) [3]complex128 {
	t.Helper()
	r, _, err := Heavy(e, s)
	if err != nil {
		t.Fatal(err)
	}
	// Remove the measure i/(16π²).
	inv := expr.FromAtom(expr.I, -1).MustMul(expr.FromAtom(expr.Pi, 2)).Scale(expr.RFInt(16))
	r = r.MustMul(inv)
	r, err = r.MapAtoms(func(a expr.Atom) (expr.Expr, bool) {
		if d, ok := a.(expr.Dot); ok && d.A == "p" && d.B == "p" {
			return expr.Sym("pp"), true
		}
		return expr.Expr{}, false
	})
	if err != nil {
		t.Fatal(err)
	}
	ser, err := vacuum.ExpandEps(r, 1, vacuum.PositiveMasses)
	if err != nil {
		t.Fatal(err)
	}
	var out [3]complex128
	for k := -2; k <= 0; k++ {
		v, err := ser.Coef(k).Eval(vals)
		if err != nil {
			t.Fatal(err)
		}
		out[k+2] = v
	}
	return out
}

// TestHeavyExpansionConverges expands B0(p²; M, M) — both lines heavy — in p to orders 0, 2, 4
// and compares with the exact numerical B0 of package loops: the error must fall like
// (p²/M²)^{n/2+1}, shown by the slope between two values of p².
func TestHeavyExpansionConverges(t *testing.T) {
	src := `masses M
momenta p
amplitude b = loop k { 1/((k^2 - M^2)*((k + p)^2 - M^2)) }
`
	e := amp(t, src, "b")
	M := 2.0
	for _, n := range []int{0, 2, 4} {
		var errs []float64
		ps := []float64{-0.4, -0.2}
		for _, p2 := range ps {
			got := laurentOf(t, e, Small{Momenta: []string{"p"}, Order: n}, map[string]complex128{"M": complex(M, 0), "mu": 1, "pp": complex(p2, 0)})
			ref, err := loops.B0(p2, M*M, M*M, 1)
			if err != nil {
				t.Fatal(err)
			}
			if cmplx.Abs(got[1]-ref.Pole1) > 1e-14 {
				t.Errorf("order %d: pole %v, want %v", n, got[1], ref.Pole1)
			}
			errs = append(errs, cmplx.Abs(got[2]-ref.Finite))
		}
		slope := math.Log(errs[0]/errs[1]) / math.Log(ps[0]/ps[1])
		if want := float64(n/2 + 1); math.Abs(slope-want) > 0.15 {
			t.Errorf("order %d: error falls like (p^2)^%.2f, want %v (errors %v)", n, slope, want, errs)
		}
	}
}

// TestHardPlusSoft checks the method of regions on B0(0; m, M) with a light mass m: the heavy
// route gives the hard region (the light propagator expanded in m²); the soft region is the
// effective-theory integral (the heavy propagator expanded in k²/M²),
// Σ_j ∫ (k²)^j/(k² − m²) · (−1/M²)^{j+1}. Their sum reproduces the exact
// B0(0; m, M) = 1/ε + 1 − (m² ln(m²/μ²) − M² ln(M²/μ²))/(m² − M²) (PHYSICS.md) up to the
// truncation.
func TestHardPlusSoft(t *testing.T) {
	src := `masses M
light m
amplitude b = loop k { 1/((k^2 - m^2)*(k^2 - M^2)) }
`
	e := amp(t, src, "b")
	const order = 6
	vals := map[string]complex128{"M": 3, "m": 0.4, "mu": 1.2}
	hard := laurentOf(t, e, Small{Masses: []string{"m"}, Order: order}, vals)
	// Soft region: the EFT side.
	m2 := expr.RFVar("m").Mul(expr.RFVar("m"))
	M2 := expr.RFVar("M").Mul(expr.RFVar("M"))
	soft := expr.Zero()
	for j := 0; j < order/2; j++ { // m^{2j+2} ≤ m^order, the order of the hard region
		v, _, err := vacuum.Loop1(j, []vacuum.Line{{M2: m2, Pow: 1}})
		if err != nil {
			t.Fatal(err)
		}
		c, _ := M2.Pow(-(j + 1))
		soft = soft.Add(v.Scale(c.Neg()))
	}
	ss, err := vacuum.ExpandEps(soft, 1, vacuum.PositiveMasses)
	if err != nil {
		t.Fatal(err)
	}
	var total [3]complex128
	for k := -2; k <= 0; k++ {
		v, _ := ss.Coef(k).Eval(vals)
		total[k+2] = hard[k+2] + v
	}
	ref, _ := loops.B0(0, 0.16, 9, 1.44)
	// Both regions are truncated at (m²/M²)^{order/2}: the remainder is O((m²/M²)^4) ≈ 1e-7.
	if cmplx.Abs(total[1]-ref.Pole1) > 1e-6 || cmplx.Abs(total[2]-ref.Finite) > 1e-6 {
		t.Errorf("hard + soft = %v, exact %v (hard alone %v)", total, ref, hard)
	}
	if cmplx.Abs(hard[2]-ref.Finite) < 1e-3 {
		t.Errorf("the hard region alone should miss the m^2 log m terms: %v vs %v", hard, ref)
	}
}

// TestTensorReduction checks symmetric integration on k.p k.q/(k^2 − M^2)^3 = p.q/d · ∫k²/(k²−M²)³
// and that odd ranks vanish.
func TestTensorReduction(t *testing.T) {
	src := `masses M
momenta p q
index al be
amplitude t2 = loop k { k.p * k.q / (k^2 - M^2)^3 }
amplitude t1 = loop k { k.p / (k^2 - M^2)^2 }
amplitude t4 = loop k { k.p^2 * k.q^2 / (k^2 - M^2)^5 }
amplitude tg = loop k { k[al]*k[be] / (k^2 - M^2)^3 }
`
	for name, want := range map[string]string{
		"t1": "0",
		// ∫ k²/(k²−M²)³ = (d/4)·Tad/M²·… : from Loop1; here only the tensor structure is checked.
		"t2": "p.q",
		"tg": "g(al, be)",
	} {
		e := amp(t, src, name)
		r, _, err := ReduceVacuum(e)
		if err != nil {
			t.Fatal(err)
		}
		if want == "0" {
			if !r.IsZero() {
				t.Errorf("%s = %s, want 0", name, r)
			}
			continue
		}
		gs := r.Collect(func(a expr.Atom) bool {
			switch a.(type) {
			case expr.Dot, expr.Metric:
				return true
			}
			return false
		})
		if len(gs) != 1 || gs[0].Atoms[0].A.Key() != want {
			t.Errorf("%s = %s, want a multiple of %s", name, r, want)
		}
	}
	// Rank 4: (k.p)² (k.q)² → (k²)² [p² q² + 2 (p.q)²]/(d(d+2)).
	r, _, err := ReduceVacuum(amp(t, src, "t4"))
	if err != nil {
		t.Fatal(err)
	}
	gs := r.Collect(func(a expr.Atom) bool { _, ok := a.(expr.Dot); return ok })
	if len(gs) != 2 {
		t.Fatalf("t4 = %s", r)
	}
	q0, _ := gs[0].Coef.Pow(1)
	ratio, _ := q0.Terms()[0].Coef.Div(gs[1].Coef.Terms()[0].Coef)
	// groups sorted by key: p.p*q.q before p.q^2 → ratio 1/2
	if c, ok := ratio.ConstValue(); !ok || c.RatString() != "1/2" {
		t.Errorf("t4 structure ratio = %v (%s)", ratio, r)
	}
}

// TestUVPole checks UV poles against the known one-loop functions: B0 has the UV pole 1/ε,
// A0(M) the pole M², C0 none, and the UV pole of B1(p²; m0, m1) = −1/(2ε) (Denner 1993, eq.
// (4.18) with the poles of A0, B0), all times the loop factor i/(16π²); an IR-divergent but
// UV-finite integral has no UV pole.
func TestUVPole(t *testing.T) {
	src := `masses M m
momenta p q
amplitude b0 = loop k { 1/((k^2 - m^2)*((k + p)^2 - M^2)) }
amplitude a0 = loop k { 1/(k^2 - M^2) }
amplitude c0 = loop k { 1/((k^2 - m^2)*((k + p)^2 - M^2)*((k + q)^2)) }
amplitude b1 = loop k { k.p/((k^2 - m^2)*((k + p)^2 - M^2)) }
amplitude ir = loop k { 1/(k^2 * (k+p)^2 * (k+q)^2) }
`
	factor := "1/16*I/pi^2"
	want := map[string]string{
		"b0": factor, "a0": "M^2/16*I/pi^2", "c0": "0", "b1": "-1/32*I*p.p/pi^2", "ir": "0",
	}
	for name, w := range want {
		got, err := UVPole(amp(t, src, name), []string{"M", "m"}, nil)
		if err != nil {
			t.Fatal(err)
		}
		if got, err = got.Subst(expr.DimSymbol, expr.RFInt(4)); err != nil {
			t.Fatal(err)
		}
		if got.String() != w {
			t.Errorf("UV pole of %s = %s, want %s", name, got, w)
		}
	}
}
