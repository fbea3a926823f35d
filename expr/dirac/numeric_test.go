package dirac

import (
	"math"
	"math/cmplx"
	"math/rand/v2"
	"slices"
	"testing"

	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/cblas128"
	"gonum.org/v1/gonum/mat"

	"loopmatch/expr"
)

// This file evaluates expressions with Dirac chains, traces, Levi-Civita symbols and colour
// numerically, with explicit matrices that share nothing with the algebra of the package:
// Dirac matrices in the chiral representation (M.E. Peskin, D.V. Schroeder, An Introduction to
// Quantum Field Theory, eq. (3.25)), γ5 = iγ⁰γ¹γ²γ³ (P&S eq. (3.68)), ε^{0123} = −1 (P&S
// convention, PHYSICS.md), and the Gell-Mann matrices T^a = λ^a/2 for SU(3).

var metric = [4]float64{1, -1, -1, -1}

func cdense(rows [4][4]complex128) *mat.CDense {
	data := make([]complex128, 0, 16)
	for _, r := range rows {
		data = append(data, r[:]...)
	}
	return mat.NewCDense(4, 4, data)
}

var gammaMat = func() [4]*mat.CDense {
	I := complex(0, 1)
	// σ^1, σ^2, σ^3
	s := [3][2][2]complex128{{{0, 1}, {1, 0}}, {{0, -I}, {I, 0}}, {{1, 0}, {0, -1}}}
	var g [4]*mat.CDense
	g[0] = cdense([4][4]complex128{{0, 0, 1, 0}, {0, 0, 0, 1}, {1, 0, 0, 0}, {0, 1, 0, 0}})
	for k := 0; k < 3; k++ {
		var r [4][4]complex128
		for i := 0; i < 2; i++ {
			for j := 0; j < 2; j++ {
				r[i][2+j] = s[k][i][j]
				r[2+i][j] = -s[k][i][j]
			}
		}
		g[k+1] = cdense(r)
	}
	return g
}()

// mmul multiplies with the complex BLAS of gonum (cblas128.Gemm).
func mmul(ms ...*mat.CDense) *mat.CDense {
	out := identity4()
	for _, m := range ms {
		r := mat.NewCDense(4, 4, nil)
		cblas128.Gemm(blas.NoTrans, blas.NoTrans, 1, out.RawCMatrix(), m.RawCMatrix(), 0, r.RawCMatrix())
		out = r
	}
	return out
}

func identity4() *mat.CDense {
	return cdense([4][4]complex128{{1, 0, 0, 0}, {0, 1, 0, 0}, {0, 0, 1, 0}, {0, 0, 0, 1}})
}

func scaleM(c complex128, m *mat.CDense) *mat.CDense {
	r := mat.NewCDense(4, 4, nil)
	for i := 0; i < 4; i++ {
		for j := 0; j < 4; j++ {
			r.Set(i, j, c*m.At(i, j))
		}
	}
	return r
}

func addM(a, b *mat.CDense) *mat.CDense {
	r := mat.NewCDense(4, 4, nil)
	for i := 0; i < 4; i++ {
		for j := 0; j < 4; j++ {
			r.Set(i, j, a.At(i, j)+b.At(i, j))
		}
	}
	return r
}

var gamma5Mat = scaleM(complex(0, 1), mmul(gammaMat[0], gammaMat[1], gammaMat[2], gammaMat[3]))

func slashMat(p [4]float64) *mat.CDense {
	out := scaleM(0, identity4())
	for mu := 0; mu < 4; mu++ {
		out = addM(out, scaleM(complex(metric[mu]*p[mu], 0), gammaMat[mu]))
	}
	return out
}

// levi4 is ε^{μνρσ} with ε^{0123} = −1.
func levi4(i [4]int) float64 {
	for a := 0; a < 4; a++ {
		for b := a + 1; b < 4; b++ {
			if i[a] == i[b] {
				return 0
			}
		}
	}
	s := -1.0
	p := i
	for a := 0; a < 4; a++ {
		for b := 0; b < 3-a; b++ {
			if p[b] > p[b+1] {
				p[b], p[b+1] = p[b+1], p[b]
				s = -s
			}
		}
	}
	return s
}

// gellMann are T^a = λ^a/2.
var gellMann = func() [8][3][3]complex128 {
	I := complex(0, 1)
	var l [8][3][3]complex128
	l[0] = [3][3]complex128{{0, 1, 0}, {1, 0, 0}, {0, 0, 0}}
	l[1] = [3][3]complex128{{0, -I, 0}, {I, 0, 0}, {0, 0, 0}}
	l[2] = [3][3]complex128{{1, 0, 0}, {0, -1, 0}, {0, 0, 0}}
	l[3] = [3][3]complex128{{0, 0, 1}, {0, 0, 0}, {1, 0, 0}}
	l[4] = [3][3]complex128{{0, 0, -I}, {0, 0, 0}, {I, 0, 0}}
	l[5] = [3][3]complex128{{0, 0, 0}, {0, 0, 1}, {0, 1, 0}}
	l[6] = [3][3]complex128{{0, 0, 0}, {0, 0, -I}, {0, I, 0}}
	s := complex(1/math.Sqrt(3), 0)
	l[7] = [3][3]complex128{{s, 0, 0}, {0, s, 0}, {0, 0, -2 * s}}
	for a := range l {
		for i := 0; i < 3; i++ {
			for j := 0; j < 3; j++ {
				l[a][i][j] /= 2
			}
		}
	}
	return l
}()

func mul3(a, b [3][3]complex128) [3][3]complex128 {
	var r [3][3]complex128
	for i := 0; i < 3; i++ {
		for j := 0; j < 3; j++ {
			for k := 0; k < 3; k++ {
				r[i][j] += a[i][k] * b[k][j]
			}
		}
	}
	return r
}

// structF is f^{abc} = −2i tr([T^a, T^b] T^c).
func structF(a, b, c int) complex128 {
	ab := mul3(gellMann[a], gellMann[b])
	ba := mul3(gellMann[b], gellMann[a])
	var tr complex128
	for i := 0; i < 3; i++ {
		for k := 0; k < 3; k++ {
			tr += (ab[i][k] - ba[i][k]) * gellMann[c][k][i]
		}
	}
	return -2i * tr
}

// numPoint is a numerical phase-space point: momentum components (upper index), symbol values
// (d = 4, Nc = 3, masses), random spinor seeds per leg, and the legs' colour values.
type numPoint struct {
	mom    map[string][4]float64
	vals   map[string]complex128
	kin    Kinematics
	seedL  map[string][4]complex128
	colour map[string]int
}

func newPoint(rng *rand.Rand, kin Kinematics, mom map[string][4]float64, vals map[string]complex128) *numPoint {
	p := &numPoint{mom: mom, vals: map[string]complex128{"d": 4, "Nc": 3}, kin: kin, seedL: map[string][4]complex128{}, colour: map[string]int{}}
	for k, v := range vals {
		p.vals[k] = v
	}
	for _, l := range kin.Legs {
		var s [4]complex128
		for i := range s {
			s[i] = complex(rng.NormFloat64(), rng.NormFloat64())
		}
		p.seedL[l.Name] = s
	}
	return p
}

func (p *numPoint) vec(m expr.Mom) [4]float64 {
	var v [4]float64
	for _, t := range m {
		c, _ := t.Coef.Float64()
		x, ok := p.mom[t.Name]
		if !ok {
			panic("no numerical value for momentum " + t.Name)
		}
		for i := range v {
			v[i] += c * x[i]
		}
	}
	return v
}

func dot4(a, b [4]float64) float64 {
	return a[0]*b[0] - a[1]*b[1] - a[2]*b[2] - a[3]*b[3]
}

// spinor returns the row (bar) or column spinor of a leg: u = (P̸ + m)ξ, ū = ηᵀ(P̸ + m),
// v = (P̸ − m)ξ, v̄ = ηᵀ(P̸ − m); these satisfy the Dirac equation exactly (P̸² = P² = m²).
func (p *numPoint) spinor(n expr.NC) []complex128 {
	leg, ok := p.kin.leg(n.Args[0])
	if !ok {
		panic("no leg " + n.Args[0])
	}
	P := p.vec(leg.Mom)
	m, err := leg.Mass.Eval(p.vals)
	if err != nil {
		panic(err)
	}
	if n.Op == expr.NCV || n.Op == expr.NCVBar {
		m = -m
	}
	M := addM(slashMat(P), scaleM(m, identity4()))
	seed := p.seedL[leg.Name]
	out := make([]complex128, 4)
	bar := n.IsBar()
	if bar {
		// use a different seed for the bar spinor of the same leg
		for i := range seed {
			seed[i] = cmplx.Conj(seed[3-i]) + 0.5
		}
	}
	for i := 0; i < 4; i++ {
		for j := 0; j < 4; j++ {
			if bar {
				out[i] += seed[j] * M.At(j, i)
			} else {
				out[i] += M.At(i, j) * seed[j]
			}
		}
	}
	return out
}

// evalNum evaluates e with the free Lorentz indices given in free (values 0…3) and free adjoint
// indices in freeC (0…7); contracted indices are summed with the metric.
func (p *numPoint) evalNum(t *testing.T, e expr.Expr, free map[string]int) complex128 {
	t.Helper()
	var sum complex128
	for _, term := range e.Terms() {
		if len(term.NC) > 0 || len(term.Loops) > 0 {
			t.Fatalf("cannot evaluate %s", term)
		}
		lc, cc := termIndexCounts(term)
		for _, a := range term.Atoms {
			if c, ok := a.A.(expr.Colour); ok && c.Name == "delta" && (cc[c.Args[0]] > 0 || cc[c.Args[1]] > 0) {
				cc[c.Args[0]]++
				cc[c.Args[1]]++
			}
		}
		var dl, dc []string
		for n, c := range lc {
			if c >= 2 {
				dl = append(dl, n)
			} else if _, ok := free[n]; !ok {
				t.Fatalf("free index %s has no value", n)
			}
		}
		for n, c := range cc {
			if c >= 2 {
				dc = append(dc, n)
			} else if _, ok := free[n]; !ok {
				t.Fatalf("free colour index %s has no value", n)
			}
		}
		// adjoint deltas whose indices are otherwise absent
		for _, a := range term.Atoms {
			if c, ok := a.A.(expr.Colour); ok && c.Name == "delta" {
				for _, x := range c.Args {
					if _, ok := free[x]; !ok && !slices.Contains(dc, x) && cc[x] == 1 {
						dc = append(dc, x)
					}
				}
			}
		}
		slices.Sort(dl)
		slices.Sort(dc)
		coef, err := term.Coef.Eval(p.vals)
		if err != nil {
			t.Fatal(err)
		}
		asg := map[string]int{}
		for k, v := range free {
			asg[k] = v
		}
		var rec func(i int, w float64)
		rec = func(i int, w float64) {
			if i < len(dl) {
				for mu := 0; mu < 4; mu++ {
					asg[dl[i]] = mu
					rec(i+1, w*metric[mu])
				}
				return
			}
			if j := i - len(dl); j < len(dc) {
				for a := 0; a < 8; a++ {
					asg[dc[j]] = a
					rec(i+1, w)
				}
				return
			}
			v := coef * complex(w, 0)
			for _, a := range term.Atoms {
				x := p.atom(t, a.A, asg)
				for range a.Pow {
					v *= x
				}
				for range -a.Pow {
					v /= x
				}
			}
			sum += v
		}
		rec(0, 1)
	}
	return sum
}

func (p *numPoint) atom(t *testing.T, a expr.Atom, asg map[string]int) complex128 {
	switch x := a.(type) {
	case expr.Const:
		if x == expr.I {
			return 1i
		}
	case expr.Dot:
		return complex(dot4(p.mom[x.A], p.mom[x.B]), 0)
	case expr.Vec:
		return complex(p.mom[x.P][asg[x.Mu]], 0)
	case expr.Metric:
		if asg[x.Mu] == asg[x.Nu] {
			return complex(metric[asg[x.Mu]], 0)
		}
		return 0
	case expr.Levi:
		// momentum slots are contracted: ε^{..μ..} p_μ
		var sum float64
		var rec func(k int, idx [4]int, w float64)
		rec = func(k int, idx [4]int, w float64) {
			if k == 4 {
				sum += w * levi4(idx)
				return
			}
			s := x.S[k]
			if s.Index {
				idx[k] = asg[s.Name]
				rec(k+1, idx, w)
				return
			}
			for mu := 0; mu < 4; mu++ {
				idx[k] = mu
				rec(k+1, idx, w*metric[mu]*p.mom[s.Name][mu])
			}
		}
		rec(0, [4]int{}, 1)
		return complex(sum, 0)
	case expr.Colour:
		switch x.Name {
		case "f":
			return structF(asg[x.Args[0]], asg[x.Args[1]], asg[x.Args[2]])
		case "delta":
			if asg[x.Args[0]] == asg[x.Args[1]] {
				return 1
			}
			return 0
		}
	case expr.Chain:
		return p.chain(t, x, asg)
	case expr.Fn:
		v, err := expr.FromAtom(x, 1).Eval(p.vals)
		if err != nil {
			t.Fatal(err)
		}
		return v
	}
	t.Fatalf("cannot evaluate atom %s", a.Key())
	return 0
}

func (p *numPoint) diracMat(t *testing.T, e expr.NC, asg map[string]int) *mat.CDense {
	switch e.Op {
	case expr.NCGamma:
		return gammaMat[asg[e.Args[0]]]
	case expr.NCSlash:
		v, ok := p.mom[e.Args[0]]
		if !ok {
			t.Fatalf("no momentum %s", e.Args[0])
		}
		return slashMat(v)
	case expr.NCG5:
		return gamma5Mat
	case expr.NCPL:
		return scaleM(0.5, addM(identity4(), scaleM(-1, gamma5Mat)))
	case expr.NCPR:
		return scaleM(0.5, addM(identity4(), gamma5Mat))
	case expr.NCSigma:
		a, b := gammaMat[asg[e.Args[0]]], gammaMat[asg[e.Args[1]]]
		return scaleM(0.5i, addM(mmul(a, b), scaleM(-1, mmul(b, a))))
	}
	t.Fatalf("no matrix for %s", e.Key())
	return nil
}

func (p *numPoint) chain(t *testing.T, c expr.Chain, asg map[string]int) complex128 {
	el := c.Elems
	M := identity4()
	col := [3][3]complex128{{1, 0, 0}, {0, 1, 0}, {0, 0, 1}}
	for _, e := range el[1 : len(el)-1] {
		if e.Op == expr.NCT {
			col = mul3(col, gellMann[asg[e.Args[0]]])
			continue
		}
		M = mmul(M, p.diracMat(t, e, asg))
	}
	bar := p.spinor(el[0])
	sp := p.spinor(el[len(el)-1])
	var v complex128
	for i := 0; i < 4; i++ {
		for j := 0; j < 4; j++ {
			v += bar[i] * M.At(i, j) * sp[j]
		}
	}
	return v * col[p.colour[el[0].Args[0]]][p.colour[el[len(el)-1].Args[0]]]
}

// traceNum is the numerical trace of a string of elements (Dirac and colour).
func (p *numPoint) traceNum(t *testing.T, el []expr.NC, asg map[string]int) complex128 {
	M := identity4()
	col := [3][3]complex128{{1, 0, 0}, {0, 1, 0}, {0, 0, 1}}
	hasColour := false
	for _, e := range el {
		if e.Op == expr.NCT {
			hasColour = true
			col = mul3(col, gellMann[asg[e.Args[0]]])
			continue
		}
		M = mmul(M, p.diracMat(t, e, asg))
	}
	var tr, tc complex128
	for i := 0; i < 4; i++ {
		tr += M.At(i, i)
	}
	for i := 0; i < 3; i++ {
		tc += col[i][i]
	}
	if hasColour {
		return tr * tc
	}
	return tr
}

// assignments enumerates all values of the free indices (Lorentz 0…3, colour 0…7).
func assignments(lorentz, colour []string) []map[string]int {
	out := []map[string]int{{}}
	for _, n := range lorentz {
		var next []map[string]int
		for _, m := range out {
			for v := 0; v < 4; v++ {
				c := map[string]int{n: v}
				for k, x := range m {
					c[k] = x
				}
				next = append(next, c)
			}
		}
		out = next
	}
	for _, n := range colour {
		var next []map[string]int
		for _, m := range out {
			for v := 0; v < 8; v++ {
				c := map[string]int{n: v}
				for k, x := range m {
					c[k] = x
				}
				next = append(next, c)
			}
		}
		out = next
	}
	return out
}

func closeTo(a, b complex128, scale float64) bool {
	return cmplx.Abs(a-b) <= 1e-9*math.Max(1, scale)
}

// compareNum checks a = b numerically for all values of the free indices.
func (p *numPoint) compareNum(t *testing.T, name string, a, b expr.Expr, lorentz, colour []string) {
	t.Helper()
	nonzero := false
	for _, asg := range assignments(lorentz, colour) {
		x := p.evalNum(t, a, asg)
		y := p.evalNum(t, b, asg)
		if !closeTo(x, y, cmplx.Abs(x)+cmplx.Abs(y)) {
			t.Errorf("%s: numerically %v ≠ %v at %v\n  a = %s\n  b = %s", name, x, y, asg, a, b)
			return
		}
		if cmplx.Abs(x) > 1e-8 {
			nonzero = true
		}
	}
	if !nonzero && !a.IsZero() {
		t.Logf("%s: both sides vanish numerically at every index value", name)
	}
}

// random vectors
func randVec(rng *rand.Rand) [4]float64 {
	return [4]float64{rng.Float64()*2 - 1, rng.Float64()*2 - 1, rng.Float64()*2 - 1, rng.Float64()*2 - 1}
}

// onShell returns a random vector with p² = m² (m ≥ 0), p⁰ > 0.
func onShell(rng *rand.Rand, m float64) [4]float64 {
	v := randVec(rng)
	v[0] = math.Sqrt(m*m + v[1]*v[1] + v[2]*v[2] + v[3]*v[3])
	return v
}

func sub4(a, b [4]float64) [4]float64 {
	return [4]float64{a[0] - b[0], a[1] - b[1], a[2] - b[2], a[3] - b[3]}
}

func TestMatricesClifford(t *testing.T) {
	// {γ^μ, γ^ν} = 2 g^{μν} (P&S eq. (3.24)) for the matrices of eq. (3.25).
	for mu := 0; mu < 4; mu++ {
		for nu := 0; nu < 4; nu++ {
			ac := addM(mmul(gammaMat[mu], gammaMat[nu]), mmul(gammaMat[nu], gammaMat[mu]))
			for i := 0; i < 4; i++ {
				for j := 0; j < 4; j++ {
					want := complex128(0)
					if i == j && mu == nu {
						want = complex(2*metric[mu], 0)
					}
					if ac.At(i, j) != want {
						t.Fatalf("{γ%d, γ%d} wrong", mu, nu)
					}
				}
			}
		}
	}
	tr := p0().traceNum(t, []expr.NC{{Op: expr.NCGamma, Args: []string{"a"}}, {Op: expr.NCGamma, Args: []string{"b"}}, {Op: expr.NCGamma, Args: []string{"c"}}, {Op: expr.NCGamma, Args: []string{"e"}}, {Op: expr.NCG5}}, map[string]int{"a": 0, "b": 1, "c": 2, "e": 3})
	// γ⁰γ¹γ²γ³ = −iγ5 (P&S eq. (3.68)) fixes tr(γ⁰γ¹γ²γ³γ5) = −4i whatever the sign of ε.
	if want := complex(0, -4); !closeTo(tr, want, 1) {
		t.Fatalf("tr γ0γ1γ2γ3γ5 = %v, want %v", tr, want)
	}
}

func p0() *numPoint {
	return &numPoint{mom: map[string][4]float64{}, vals: map[string]complex128{"d": 4, "Nc": 3}}
}
