package running

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"
)

// SchemeADM returns γ^{(1)'} of the scheme reached by the finite change C' = (1 + a r^T) C,
// a = αs/(4π): γ^{(1)'} = γ^{(1)} + [γ^{(0)}, r] − 2β0 r, with γ^{(0)} unchanged.
// Derivation (RG convention μ dC/dμ = γ^T C, μ da/dμ = −2β0 a² + …): μ dC'/dμ =
// [a γ0^T + a² (γ1^T + r^T γ0^T − γ0^T r^T − 2β0 r^T)] C' + O(a³); transposing gives the formula.
// (The change of scheme is discussed in G. Buchalla, A.J. Buras, M.E. Lautenbacher,
// Rev. Mod. Phys. 68 (1996) 1125, section III; checked numerically in TestSchemeChange.)
func SchemeADM(g0, g1, r *mat.Dense, nf int) (*mat.Dense, error) {
	if err := (Beta{Nf: nf, Loops: 2}).Check(); err != nil {
		return nil, err
	}
	n, m := g0.Dims()
	for _, x := range []struct {
		name string
		a    *mat.Dense
	}{{"γ^(1)", g1}, {"r", r}} {
		if x.a == nil {
			return nil, fmt.Errorf("running: scheme change needs %s", x.name)
		}
		if rr, cc := x.a.Dims(); rr != n || cc != m || n != m {
			return nil, fmt.Errorf("running: %s is %d×%d, γ^(0) is %d×%d", x.name, rr, cc, n, m)
		}
	}
	var gr, rg, out mat.Dense
	gr.Mul(g0, r)
	rg.Mul(r, g0)
	out.Sub(&gr, &rg)
	out.Add(&out, g1)
	var sr mat.Dense
	sr.Scale(2*BetaCoeffs(nf)[0], r)
	out.Sub(&out, &sr)
	return &out, nil
}

// SchemeCoefficients returns C' = (1 + αs/(4π) r^T) C.
func SchemeCoefficients(c []float64, r *mat.Dense, as float64) ([]float64, error) {
	n, m := r.Dims()
	if n != m || len(c) != n {
		return nil, fmt.Errorf("running: %d coefficients for a %d×%d scheme change", len(c), n, m)
	}
	if err := checkAlphaS(as); err != nil {
		return nil, err
	}
	a := as / (4 * math.Pi)
	out := make([]float64, n)
	for j := 0; j < n; j++ {
		s := c[j]
		for i := 0; i < n; i++ {
			s += a * r.At(i, j) * c[i]
		}
		out[j] = s
	}
	return out, nil
}
