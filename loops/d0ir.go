package loops

import (
	"fmt"
	"math"
	"math/cmplx"
)

// Infrared-divergent boxes (one or two massless internal lines next to on-shell legs) by
// subtraction of their singular regions with triangles (the idea of S. Dittmaier, Nucl. Phys.
// B675 (2003) 447, hep-ph/0308246, worked out here for the cases covered; docs/INTEGRALS.md):
//
//	D0 = S + (D0 − S),
//
// where S is a combination of infrared-divergent triangles with the same propagators that has
// the same soft and collinear singularities as the box. D0 − S is an infrared-finite integral,
// the same in every regularisation, so it is evaluated with a small mass λ on the massless
// lines (λ² = 1e-32 of the scale, far above the 1e-60 infinitesimals; the remainder vanishes like
// λ² ln²λ), by the finite
// formulas; S is evaluated with the dimensionally regularised triangles.
//
//   - soft line a (massless, both loop neighbours b, d on-shell), opposite line c: near the soft
//     point q + k_a = 0 the fourth propagator is N_c = s_ac − m_c², so S_a = C0(d, a, b)/(s_ac − m_c²);
//   - collinear pair a, b (adjacent massless lines, s_ab = 0): along q + k_a = −x(k_b − k_a) the
//     other two propagators are linear in x, N_c = (1−x)K_ac + x K_bc, N_d = (1−x)K_ad + x K_bd
//     (K_ij = s_ij − m_j², c next to b, d next to a), and partial fractions give
//     S_ab = A_c C0(a, b, c) + A_d C0(d, a, b), A_c = (K_ac − K_bc)/Δ, A_d = (K_bd − K_ad)/Δ,
//     Δ = K_ac K_bd − K_ad K_bc. The soft singularities at the ends of the collinear line are
//     contained in these two triangles with the right weights (A_d = 1/K_ac when K_ad = 0), so a
//     soft line that belongs to a collinear pair gets no separate term.

// irTerm is one subtraction triangle: coef × C0(lines[0], lines[1], lines[2]). kind and the
// indices record how coef was formed so that the arbitrary-precision path can recompute it:
// kind 0: 1/K(a, c); kind 1: (K_ac − K_bc)/Δ; kind 2: (K_bd − K_ad)/Δ (see above).
type irTerm struct {
	coef       float64
	lines      [3]int
	kind       int
	a, b, c, d int
}

// d0Divergent recognises the infrared-divergent boxes; ok reports a divergent box.
func d0Divergent(b0 *box, mu2 float64) (Value, bool, error) {
	sc := b0.scale()
	terms, divergent, err := irSubtraction(b0, sc)
	if !divergent {
		return Value{}, false, nil
	}
	if err != nil {
		return Value{}, true, err
	}
	// Take the legs recognised as on-shell (within snapTol) exactly on-shell, so that the
	// regulator λ alone regulates the remainder (8.1² is not exactly 65.61 in float64).
	sb := snapOnShell(b0, sc)
	b := &sb
	v, cond, err := d0Subtracted(b, terms, sc, mu2)
	if err != nil {
		return Value{}, true, err
	}
	if cond > d0Cond {
		bv, err := converge(53, func(n bnum) (BigValue, error) {
			bb := n.boxFromFloat(b)
			fb := n.toFloatBox(&bb)
			return n.d0Subtracted(&bb, &fb, terms, n.f(mu2))
		})
		return bv.Value(), true, err
	}
	return v, true, nil
}

// snapOnShell returns the box with the invariants of its soft and collinear legs set to their
// on-shell values (s_aj = m_j² next to a soft line a, s_ab = 0 between a collinear pair).
func snapOnShell(b *box, sc float64) box {
	out := *b
	set := func(i, j int, v float64) { out.s[i][j], out.s[j][i] = v, v }
	soft, coll := irStructure(b, sc)
	for _, a := range soft {
		p, n := (a+3)%4, (a+1)%4
		set(a, p, b.m2[p])
		set(a, n, b.m2[n])
	}
	for _, pr := range coll {
		set(pr[0], pr[1], 0)
	}
	out.fillY()
	return out
}

// irStructure lists the soft lines (massless, both loop neighbours on-shell) and the collinear
// pairs (adjacent massless lines with a light-like leg between them) of a box.
func irStructure(b *box, sc float64) (soft []int, coll [][2]int) {
	for a := 0; a < 4; a++ {
		if b.m2[a] != 0 {
			continue
		}
		p, n := (a+3)%4, (a+1)%4
		if same(b.s[a][p], b.m2[p], sc) && same(b.s[a][n], b.m2[n], sc) {
			soft = append(soft, a)
		}
		if b.m2[n] == 0 && same(b.s[a][n], 0, sc) {
			coll = append(coll, [2]int{a, n})
		}
	}
	return soft, coll
}

// irSubtraction returns the subtraction triangles of an infrared-divergent box, whether the box
// is divergent, and an error naming configurations outside the covered set.
func irSubtraction(b *box, sc float64) ([]irTerm, bool, error) {
	soft, coll := irStructure(b, sc)
	if len(soft) == 0 && len(coll) == 0 {
		return nil, false, nil
	}
	nz := 0
	for _, m := range b.m2 {
		if m == 0 {
			nz++
		}
	}
	if nz > 2 {
		return nil, true, fmt.Errorf("%w: infrared-divergent D0 with %d massless internal lines (soft lines %v, collinear pairs %v); covered: one or two massless lines",
			ErrNotCovered, nz, soft, coll)
	}
	K := func(i, j int) float64 { return sum3(b.s[i][j], -b.m2[j], 0) }
	var terms []irTerm
	inPair := map[int]bool{}
	for _, pr := range coll {
		a, bb := pr[0], pr[1]
		c, d := (bb+1)%4, (a+3)%4
		kac, kbc, kad, kbd := K(a, c), K(bb, c), K(a, d), K(bb, d)
		delta := kac*kbd - kad*kbc
		if math.Abs(delta) <= 1e-13*sc*sc {
			return nil, true, fmt.Errorf("%w: infrared-divergent D0 with a collinear pair (%d,%d) whose two other propagators are proportional on the collinear line", ErrNotCovered, a, bb)
		}
		terms = append(terms,
			irTerm{coef: (kac - kbc) / delta, lines: [3]int{a, bb, c}, kind: 1, a: a, b: bb, c: c, d: d},
			irTerm{coef: (kbd - kad) / delta, lines: [3]int{d, a, bb}, kind: 2, a: a, b: bb, c: c, d: d})
		inPair[a], inPair[bb] = true, true
	}
	for _, a := range soft {
		if inPair[a] {
			continue
		}
		c := (a + 2) % 4
		k := K(a, c)
		if same(k, 0, sc) {
			return nil, true, fmt.Errorf("%w: infrared-divergent D0 with soft line %d whose opposite propagator is on-shell at the soft point (s = m² across the diagonal)", ErrNotCovered, a)
		}
		terms = append(terms, irTerm{coef: 1 / k, lines: [3]int{(a + 3) % 4, a, (a + 1) % 4}, kind: 0, a: a, c: c})
	}
	return terms, true, nil
}

// irLambda2 is the squared regulator mass, relative to the scale, put on the massless lines when
// the infrared-finite remainder D0 − S is evaluated.
const irLambda2 = 1e-32

func subTri(b *box, l [3]int, reg float64) tri {
	m := func(i int) float64 {
		if b.m2[i] == 0 {
			return reg
		}
		return b.m2[i]
	}
	return newTri(b.s[l[0]][l[1]], b.s[l[1]][l[2]], b.s[l[0]][l[2]], m(l[0]), m(l[1]), m(l[2]))
}

// d0Subtracted evaluates S (dimensional regularisation) + (D0_λ − S_λ) in float64 and returns the
// ratio of the magnitudes of the regulated parts to the result as a cancellation estimate.
func d0Subtracted(b *box, terms []irTerm, sc, mu2 float64) (Value, float64, error) {
	reg := irLambda2 * sc
	var v Value
	var sLam complex128
	mag := 0.0
	for _, t := range terms {
		tr := subTri(b, t.lines, 0)
		c, err := C0(tr.s[0][1], tr.s[1][2], tr.s[0][2], tr.m2[0], tr.m2[1], tr.m2[2], mu2)
		if err != nil {
			return Value{}, 0, err
		}
		k := complex(t.coef, 0)
		v.Pole2 += k * c.Pole2
		v.Pole1 += k * c.Pole1
		v.Finite += k * c.Finite
		trl := subTri(b, t.lines, reg)
		cl, err := c0Finite(&trl)
		if err != nil {
			return Value{}, 0, err
		}
		sLam += k * cl
		mag += cmplx.Abs(k * cl)
	}
	bl := *b
	for i := range bl.m2 {
		if bl.m2[i] == 0 {
			bl.m2[i] = reg
		}
	}
	bl.fillY()
	dl, err := d0Finite(&bl)
	if err != nil {
		return Value{}, 0, err
	}
	v.Finite += dl - sLam
	mag += cmplx.Abs(dl)
	size := cmplx.Abs(v.Finite) + cmplx.Abs(v.Pole1) + cmplx.Abs(v.Pole2)
	return v, mag / math.Max(size, 1e-300), nil
}
