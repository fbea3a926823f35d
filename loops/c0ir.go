package loops

import (
	"math"
	"math/cmplx"

	"loopmatch/expr/specfun"
)

// c0Divergent recognises the infrared-divergent triangles (in dimensional regularisation) and
// returns their Laurent coefficients; ok is false for infrared-finite triangles. The cases, with
// derivations in docs/INTEGRALS.md (Feynman parameters in d = 4 − 2ε; our normalisation has
// e^{γε}Γ(1+ε) = 1 + π²ε²/12 + O(ε³) in front of the parametric integral):
//
//	soft:  one massless line a between two on-shell legs, s_ab = m_b², s_ac = m_c² (m_b, m_c > 0);
//	coll.: two massless lines a, b with a light-like leg between them, s_ab = 0, third mass M ≥ 0;
//	       with s_ac = M² and/or s_bc = M² the soft singularities add (1/ε² when one of them);
//	three massless lines with one or two light-like legs (three light-like legs: scaleless, 0).
//
// An invariant within snapTol of an on-shell value counts as on-shell; masses must be exactly 0
// to count as massless (a small non-zero mass is a regulator and gets the finite formula).
func c0Divergent(t *tri, mu2 float64) (Value, bool, error) {
	sc := t.scale()
	var zero []int
	var massive []int
	for i := 0; i < 3; i++ {
		if t.m2[i] == 0 {
			zero = append(zero, i)
		} else {
			massive = append(massive, i)
		}
	}
	switch len(zero) {
	case 1:
		a := zero[0]
		b, c := massive[0], massive[1]
		if same(t.s[a][b], t.m2[b], sc) && same(t.s[a][c], t.m2[c], sc) {
			return c0Soft(t.m2[b], t.m2[c], t.s[b][c], mu2), true, nil
		}
	case 2:
		a, b := zero[0], zero[1]
		c := massive[0]
		if same(t.s[a][b], 0, sc) {
			M2 := t.m2[c]
			al, be := M2-t.s[a][c], M2-t.s[b][c]
			if same(al, 0, sc) {
				al = 0
			}
			if same(be, 0, sc) {
				be = 0
			}
			return c0Collinear(M2, al, be, mu2), true, nil
		}
	case 3:
		var zs, nz []int
		pairs := [][2]int{{0, 1}, {1, 2}, {0, 2}}
		for k, p := range pairs {
			if same(t.s[p[0]][p[1]], 0, sc) {
				zs = append(zs, k)
			} else {
				nz = append(nz, k)
			}
		}
		switch len(zs) {
		case 3:
			return Value{}, true, nil // scaleless
		case 2:
			p := pairs[nz[0]]
			return c0TwoLightlike(t.s[p[0]][p[1]], mu2), true, nil
		case 1:
			// light-like leg between lines a and b; the third line c is the other vertex
			p := pairs[zs[0]]
			c := 3 - p[0] - p[1]
			return c0Collinear(0, -t.s[p[0]][c], -t.s[p[1]][c], mu2), true, nil
		}
	}
	return Value{}, false, nil
}

// c0Soft returns C0 with a massless line between two on-shell legs (masses mb², mc² > 0, third
// invariant s): with ρ = x_b + x_c, y = x_b/ρ, F = ρ² Q(y), Q(y) = s y² + (mb² − mc² − s) y + mc²,
// and ∫₀¹ ρ^{−1−2ε} dρ = −1/(2ε):
//
//	C0 = (1/2ε) ∫₀¹ dy/Q − ½ ∫₀¹ ln(Q/μ²)/Q dy + O(ε).
func c0Soft(mb2, mc2, s, mu2 float64) Value {
	lmu := math.Log(mu2)
	if s == 0 {
		// Q linear between mc² (y=0) and mb² (y=1)
		lb, lc := math.Log(mb2/mu2), math.Log(mc2/mu2)
		var i1 float64
		if mb2 == mc2 {
			i1 = 1 / mb2
		} else {
			d := (mb2 - mc2) / mc2
			i1 = math.Log1p(d) / (mc2 * d)
		}
		i2 := 0.5 * (lb + lc) * i1
		return Value{Pole1: complex(0.5*i1, 0), Finite: complex(-0.5*i2, 0)}
	}
	A, B, C := s, sum3(mb2, -mc2, -s), mc2
	roots, lnLead, _ := quadRootsI0(A, B, C, kallen(s, mb2, mc2))
	y1, y2 := roots[0], roots[1]
	L := func(y complex128) complex128 { return clog(1-y) - clog(-y) }
	pre := 1 / (complex(A, 0) * (y1 - y2))
	i1 := pre * (L(y1) - L(y2))
	J := func(ya, yb complex128) complex128 {
		la := L(ya)
		sq := 0.5 * (sqr(clog(1-ya)) - sqr(clog(-ya)))
		r, _ := rfun(ya, yb)
		return (lnLead-complex(lmu, 0))*la + sq + r + clog(ya-yb)*la
	}
	i2 := pre * (J(y1, y2) - J(y2, y1))
	return Value{Pole1: 0.5 * i1, Finite: -0.5 * i2}
}

func sqr(z complex128) complex128 { return z * z }

// c0Collinear returns C0 with two massless lines around a light-like leg and a third line of mass
// M (M2 = M² ≥ 0), al = M² − s_ac and be = M² − s_bc for the legs at the third line (each − i0).
// With F = x_c (al x_a + be x_b + M² x_c):
//
//	al, be ≠ 0: C0 = (1/ε) ln(be/al)/(be−al) − [ln²(be/μ²) − ln²(al/μ²)]/(2(be−al))
//	                 − [Li2(1 − M²/al) − Li2(1 − M²/be)]/(be − al)  (al = be: the limit);
//	al = 0:     C0 = (1/be)[−1/(2ε²) + (L_be − L_M/2)/ε − L_be²/2 + L_M²/4 + Li2(1 − M²/be) − π²/24];
//	al = be = 0: C0 = −1/(2M² ε) + (1 + L_M/2)/M²,
//
// L_x = ln((x − i0)/μ²); the Li2 terms vanish for M = 0 (Li2(1) − Li2(1)).
func c0Collinear(M2, al, be, mu2 float64) Value {
	if al == 0 && be == 0 {
		lm := math.Log(M2 / mu2)
		return Value{Pole1: complex(-0.5/M2, 0), Finite: complex((1+0.5*lm)/M2, 0)}
	}
	if be == 0 {
		al, be = be, al
	}
	lnmu := complex(math.Log(mu2), 0)
	lnx := func(x float64) complex128 { return lnMinusI0(x) - lnmu }
	li := func(x float64) complex128 {
		if M2 == 0 {
			return complex(math.Pi*math.Pi/6, 0)
		}
		return specfun.Li2(complex(1-M2/x, 0)) // real argument > 1 is taken as x − i0, as needed
	}
	if al == 0 {
		lb := lnx(be)
		lm := complex(math.Log(M2/mu2), 0)
		if M2 == 0 {
			// massless third line with al = 0 is a two-light-like-leg triangle (handled elsewhere)
			return Value{Pole1: cmplx.NaN(), Finite: cmplx.NaN()}
		}
		ib := complex(1/be, 0)
		return Value{
			Pole2:  complex(-0.5/be, 0),
			Pole1:  (lb - 0.5*lm) * ib,
			Finite: (-0.5*lb*lb + 0.25*lm*lm + li(be) - complex(math.Pi*math.Pi/24, 0)) * ib,
		}
	}
	la, lb := lnx(al), lnx(be)
	if math.Abs(be-al) <= 1e-6*math.Max(math.Abs(al), math.Abs(be)) && (al > 0) == (be > 0) {
		// equal (or nearly equal) arguments: derivatives at the midpoint, error O((be−al)²)
		a := 0.5 * (al + be)
		lx := lnx(a)
		// the limit of the difference quotients: with g(a) = ½ ln²(a/μ²), h(a) = Li2(1 − M²/a),
		// Finite = −g′(a) + h′(a) = −ln(a/μ²)/a − M² ln(M²/a)/(a(a − M²)) (→ (1 − ln(a/μ²))/a at a = M²)
		var fin complex128
		switch {
		case M2 == 0:
			fin = -lx / complex(a, 0)
		case a == M2:
			fin = (1 - lx) / complex(a, 0)
		default:
			fin = -lx/complex(a, 0) - complex(M2, 0)*(complex(math.Log(M2), 0)-lnMinusI0(a))/complex(a*(a-M2), 0)
		}
		return Value{Pole1: complex(1/a, 0), Finite: fin}
	}
	d := complex(be-al, 0)
	return Value{
		Pole1:  (lb - la) / d,
		Finite: -(lb*lb-la*la)/(2*d) - (li(al)-li(be))/d,
	}
}

// c0TwoLightlike returns C0 with three massless lines and two light-like legs, the third
// invariant s ≠ 0: F = −s x_a x_c, the Dirichlet integral gives C0 = (1/s)(−s/μ²)^{−ε} e^{γε} r_Γ/ε²
// with e^{γε} r_Γ = 1 − π²ε²/12 + O(ε³).
func c0TwoLightlike(s, mu2 float64) Value {
	L := lnMinusI0(-s) - complex(math.Log(mu2), 0)
	is := complex(1/s, 0)
	return Value{
		Pole2:  is,
		Pole1:  -L * is,
		Finite: (0.5*L*L - complex(math.Pi*math.Pi/12, 0)) * is,
	}
}
