package running

import (
	"fmt"
	"math"
	"math/cmplx"

	"gonum.org/v1/gonum/mat"
)

// Order is the order of the RG evolution of Wilson coefficients.
type Order int

const (
	LO  Order = 1 // leading logarithms: γ^{(0)}, one-loop αs
	NLO Order = 2 // next-to-leading logarithms: γ^{(0)}, γ^{(1)}, two-loop αs
)

func (o Order) check() error {
	if o != LO && o != NLO {
		return fmt.Errorf("running: evolution order %d: want LO (1) or NLO (2)", int(o))
	}
	return nil
}

// NLOForm selects how the NLO evolution matrix is assembled.
type NLOForm int

const (
	// ProductForm is U = (1 + a J) U0 (1 − a0 J) of A.J. Buras, hep-ph/9806471, section on NLO evolution, and
	// G. Buchalla, A.J. Buras, M.E. Lautenbacher, Rev. Mod. Phys. 68 (1996) 1125, section III:
	// the default. It needs 2β0 + γi − γj ≠ 0 wherever G_ij ≠ 0.
	ProductForm NLOForm = iota
	// ExpandedForm keeps only the terms linear in αs, U0 + a J U0 − a0 U0 J, written in the
	// eigenbasis so that the limit 2β0 + γi − γj → 0 is finite (it becomes a logarithm of η).
	// It differs from ProductForm at O(αs²), beyond NLO.
	ExpandedForm
)

// DegenerateError reports a vanishing 2β0 + γi − γj with G_ij ≠ 0 in the product form.
type DegenerateError struct {
	I, J  int     // eigen-directions (0-based, in the order of Evolver.Eigenvalues)
	Value float64 // 2β0 + γi − γj
}

func (e *DegenerateError) Error() string {
	return fmt.Sprintf("running: 2β0 + γ_%d − γ_%d = %.3g vanishes while G_%d%d ≠ 0: the NLO product form "+
		"is singular; use ExpandedForm, whose limiting formula is finite", e.I+1, e.J+1, e.Value, e.I+1, e.J+1)
}

// Evolution is the anomalous-dimension data of one operator basis at a fixed number of
// active flavours: μ dC/dμ = γ^T C, γ = a G0 + a² G1, a = αs/(4π). G1 may be nil for LO.
type Evolution struct {
	G0, G1 *mat.Dense
	Nf     int
	Form   NLOForm
}

// Evolver is an Evolution prepared for many scale pairs: the eigen-decomposition of G0^T and
// the NLO matrix H in the eigenbasis.
type Evolver struct {
	n            int
	nf           int
	form         NLOForm
	beta0, beta1 float64
	gamma        []float64  // eigenvalues γ_i of G0^T
	v, vinv      *mat.Dense // G0^T = V diag(γ) V⁻¹
	g            *mat.Dense // V⁻¹ G1^T V (nil at LO)
	h            *mat.Dense // H of the product form (nil at LO); entries of degenerate pairs are 0
	degenerate   []*DegenerateError
	g0, g1       *mat.Dense
}

// degeneracyTol is the relative size of 2β0 + γi − γj (in units of 2β0) counted as zero.
const degeneracyTol = 1e-9

// Prepare checks the matrices and diagonalises G0^T. G0 must be square, finite and
// diagonalisable with real eigenvalues; G1, if given, of the same size.
func (e Evolution) Prepare() (*Evolver, error) {
	if e.G0 == nil {
		return nil, fmt.Errorf("running: no γ^(0) given")
	}
	n, m := e.G0.Dims()
	if n != m || n == 0 {
		return nil, fmt.Errorf("running: γ^(0) is %d×%d: want a non-empty square matrix", n, m)
	}
	if e.G1 != nil {
		if r, c := e.G1.Dims(); r != n || c != n {
			return nil, fmt.Errorf("running: γ^(1) is %d×%d, γ^(0) is %d×%d", r, c, n, n)
		}
	}
	if err := finite("γ^(0)", e.G0); err != nil {
		return nil, err
	}
	if e.G1 != nil {
		if err := finite("γ^(1)", e.G1); err != nil {
			return nil, err
		}
	}
	if err := (Beta{Nf: e.Nf, Loops: 2}).Check(); err != nil {
		return nil, err
	}
	if e.Form != ProductForm && e.Form != ExpandedForm {
		return nil, fmt.Errorf("running: unknown NLO form %d", int(e.Form))
	}
	bc := BetaCoeffs(e.Nf)
	ev := &Evolver{n: n, nf: e.Nf, form: e.Form, beta0: bc[0], beta1: bc[1], g0: mat.DenseCopyOf(e.G0)}
	if e.G1 != nil {
		ev.g1 = mat.DenseCopyOf(e.G1)
	}

	var eig mat.Eigen
	if !eig.Factorize(e.G0.T(), mat.EigenRight) {
		return nil, fmt.Errorf("running: the eigen-decomposition of γ^(0)T failed")
	}
	vals := eig.Values(nil)
	var cv mat.CDense
	eig.VectorsTo(&cv)
	scale := mat.Norm(e.G0, math.Inf(1)) + 1
	ev.gamma = make([]float64, n)
	ev.v = mat.NewDense(n, n, nil)
	for j, l := range vals {
		if math.Abs(imag(l)) > 1e-9*scale {
			return nil, fmt.Errorf("running: γ^(0) has the complex eigenvalue %.6g: only real spectra are supported", l)
		}
		ev.gamma[j] = real(l)
		for i := 0; i < n; i++ {
			z := cv.At(i, j)
			if math.Abs(imag(z)) > 1e-9*cmplx.Abs(z)+1e-300 && math.Abs(imag(z)) > 1e-12 {
				return nil, fmt.Errorf("running: complex eigenvector of γ^(0)T for a real eigenvalue")
			}
			ev.v.Set(i, j, real(z))
		}
	}
	ev.vinv = mat.NewDense(n, n, nil)
	if err := ev.vinv.Inverse(ev.v); err != nil {
		return nil, fmt.Errorf("running: γ^(0) is not diagonalisable (its eigenvectors are dependent): %v", err)
	}
	if c := mat.Cond(ev.v, 1); c > 1e10 {
		return nil, fmt.Errorf("running: γ^(0) is nearly defective (eigenvector condition number %.3g)", c)
	}
	if ev.g1 == nil {
		return ev, nil
	}
	ev.g = mat.NewDense(n, n, nil)
	ev.g.Product(ev.vinv, ev.g1.T(), ev.v)
	ev.h = mat.NewDense(n, n, nil)
	b0 := ev.beta0
	for i := 0; i < n; i++ {
		for j := 0; j < n; j++ {
			gij := ev.g.At(i, j)
			if i == j {
				ev.h.Set(i, i, ev.gamma[i]*ev.beta1/(2*b0*b0)-gij/(2*b0))
				continue
			}
			d := 2*b0 + ev.gamma[i] - ev.gamma[j]
			if math.Abs(d) < degeneracyTol*2*b0 {
				if math.Abs(gij) > 1e-12*(mat.Norm(ev.g, math.Inf(1))+1) {
					ev.degenerate = append(ev.degenerate, &DegenerateError{I: i, J: j, Value: d})
				}
				continue // H_ij is not defined; the expanded form uses the limit
			}
			ev.h.Set(i, j, -gij/d)
		}
	}
	return ev, nil
}

func finite(name string, m *mat.Dense) error {
	r, c := m.Dims()
	for i := 0; i < r; i++ {
		for j := 0; j < c; j++ {
			if x := m.At(i, j); math.IsNaN(x) || math.IsInf(x, 0) {
				return fmt.Errorf("running: %s[%d][%d] = %g is not finite", name, i+1, j+1, x)
			}
		}
	}
	return nil
}

// Eigenvalues returns γ_i/(2β0), the powers of η = αs(μ0)/αs(μ) in the LO evolution
// (the "magic numbers" a_i of the ΔF = 1 literature), in the order of the eigen-directions.
func (ev *Evolver) Eigenvalues() []float64 {
	out := make([]float64, ev.n)
	for i, g := range ev.gamma {
		out[i] = g / (2 * ev.beta0)
	}
	return out
}

// Components returns, for the coefficient `to` at the low scale and the initial coefficient
// `from`, the weights w_i of C_to(μ) = Σ_i w_i η^{a_i} C_from(μ0) in LO evolution, in the
// order of Eigenvalues (the "h_i" of the ΔF = 1 literature when from = Q2, to = Q7).
func (ev *Evolver) Components(to, from int) ([]float64, error) {
	if to < 0 || to >= ev.n || from < 0 || from >= ev.n {
		return nil, fmt.Errorf("running: operator index out of range 0…%d", ev.n-1)
	}
	w := make([]float64, ev.n)
	for i := range w {
		w[i] = ev.v.At(to, i) * ev.vinv.At(i, from)
	}
	return w, nil
}

// J returns J = V H V⁻¹ of the NLO product form, or an error at LO or for a degenerate pair.
func (ev *Evolver) J() (*mat.Dense, error) {
	if ev.h == nil {
		return nil, fmt.Errorf("running: J needs γ^(1)")
	}
	if len(ev.degenerate) > 0 {
		return nil, ev.degenerate[0]
	}
	var j mat.Dense
	j.Product(ev.v, ev.h, ev.vinv)
	return &j, nil
}

// Matrix returns the evolution matrix U(μ, μ0), C(μ) = U C(μ0), for αs(μ) = as and
// αs(μ0) = as0 (taken from the caller's running: one loop for LO, two loops for NLO).
func (ev *Evolver) Matrix(order Order, as, as0 float64) (*mat.Dense, error) {
	if err := order.check(); err != nil {
		return nil, err
	}
	if err := checkAlphaS(as); err != nil {
		return nil, err
	}
	if err := checkAlphaS(as0); err != nil {
		return nil, err
	}
	n := ev.n
	eta := as0 / as
	leta := math.Log(eta)
	pow := make([]float64, n)
	for i, g := range ev.gamma {
		pow[i] = math.Exp(g / (2 * ev.beta0) * leta)
	}
	w := mat.NewDense(n, n, nil)
	for i := 0; i < n; i++ {
		w.Set(i, i, pow[i])
	}
	if order == NLO {
		if ev.h == nil {
			return nil, fmt.Errorf("running: NLO evolution needs γ^(1)")
		}
		a, a0 := as/(4*math.Pi), as0/(4*math.Pi)
		switch ev.form {
		case ProductForm:
			if len(ev.degenerate) > 0 {
				return nil, ev.degenerate[0]
			}
			left := mat.NewDense(n, n, nil)
			right := mat.NewDense(n, n, nil)
			for i := 0; i < n; i++ {
				for j := 0; j < n; j++ {
					d := 0.0
					if i == j {
						d = 1
					}
					left.Set(i, j, d+a*ev.h.At(i, j))
					right.Set(i, j, d-a0*ev.h.At(i, j))
				}
			}
			w.Product(left, w, right)
		case ExpandedForm:
			for i := 0; i < n; i++ {
				for j := 0; j < n; j++ {
					var k float64
					if i == j {
						k = ev.h.At(i, i) * pow[i] * (a - a0)
					} else {
						// H_ij (a η^{d_j} − a0 η^{d_i}) = −G_ij a η^{d_j} (1 − η^δ)/(2β0 δ),
						// δ = (2β0 + γi − γj)/(2β0); (1 − η^δ)/δ → −ln η as δ → 0.
						delta := (2*ev.beta0 + ev.gamma[i] - ev.gamma[j]) / (2 * ev.beta0)
						var f float64
						if math.Abs(delta) < degeneracyTol {
							f = -leta
						} else {
							f = -math.Expm1(delta*leta) / delta
						}
						k = -ev.g.At(i, j) * a * pow[j] * f / (2 * ev.beta0)
					}
					w.Set(i, j, w.At(i, j)+k)
				}
			}
		}
	}
	var u mat.Dense
	u.Product(ev.v, w, ev.vinv)
	return &u, nil
}

// Apply returns U(μ, μ0) c0.
func (ev *Evolver) Apply(order Order, as, as0 float64, c0 []float64) ([]float64, error) {
	if len(c0) != ev.n {
		return nil, fmt.Errorf("running: %d initial coefficients for %d operators", len(c0), ev.n)
	}
	u, err := ev.Matrix(order, as, as0)
	if err != nil {
		return nil, err
	}
	out := mat.NewVecDense(ev.n, nil)
	out.MulVec(u, mat.NewVecDense(ev.n, append([]float64(nil), c0...)))
	return out.RawVector().Data, nil
}

// Numeric integrates the coupled RGEs μ dC/dμ = γ^T(a) C, da/d ln μ² = β(a) directly from
// (μ0, αs(μ0) = as0, C(μ0) = c0) to μ, with γ and β truncated at the given order (γ^{(0)} and a
// one-loop β at LO; γ^{(1)} and a two-loop β at NLO): an independent cross-check of Matrix,
// which it must match up to terms of O(αs²) beyond the order. It returns C(μ) and αs(μ).
func (e Evolution) Numeric(order Order, as0, mu0, mu float64, c0 []float64) ([]float64, float64, error) {
	if err := order.check(); err != nil {
		return nil, 0, err
	}
	if e.G0 == nil {
		return nil, 0, fmt.Errorf("running: no γ^(0) given")
	}
	n, _ := e.G0.Dims()
	if len(c0) != n {
		return nil, 0, fmt.Errorf("running: %d initial coefficients for %d operators", len(c0), n)
	}
	if order == NLO && e.G1 == nil {
		return nil, 0, fmt.Errorf("running: NLO evolution needs γ^(1)")
	}
	for _, s := range []struct {
		n string
		v float64
	}{{"μ0", mu0}, {"μ", mu}} {
		if err := checkScale(s.n, s.v); err != nil {
			return nil, 0, err
		}
	}
	if err := checkAlphaS(as0); err != nil {
		return nil, 0, err
	}
	b := Beta{Nf: e.Nf, Loops: int(order)}
	if err := b.Check(); err != nil {
		return nil, 0, err
	}
	g0 := mat.DenseCopyOf(e.G0)
	var g1 *mat.Dense
	if order == NLO {
		g1 = mat.DenseCopyOf(e.G1)
	}
	y := make([]float64, n+1)
	y[0] = as0 / (4 * math.Pi)
	copy(y[1:], c0)
	f := func(_ float64, y, dy []float64) {
		a := y[0]
		dy[0] = 2 * b.DaDlnMu2(a)
		for j := 0; j < n; j++ {
			s := 0.0
			for i := 0; i < n; i++ {
				g := a * g0.At(i, j)
				if g1 != nil {
					g += a * a * g1.At(i, j)
				}
				s += g * y[1+i]
			}
			dy[1+j] = s
		}
	}
	guard := func(t float64, y []float64) error { return guardA(y[0], math.Exp(t)) }
	if err := integrate(f, math.Log(mu0), math.Log(mu), y, 1e-13, guard); err != nil {
		return nil, 0, err
	}
	return y[1:], 4 * math.Pi * y[0], nil
}

// ADM gives the anomalous dimensions of an operator basis for nf active flavours.
type ADM func(nf int) (g0, g1 *mat.Dense, err error)

// Evolve runs the Wilson coefficients c0 at mu0 to mu with αs from the coupling c, changing
// the number of flavours at the thresholds of c between the two scales. The coefficients are
// continuous at a threshold (the threshold corrections of the matching of the effective theories,
// which start at NLO for penguin operators, are not included). NLO needs c.Loops ≥ 2.
func Evolve(adm ADM, c Coupling, order Order, form NLOForm, mu0, mu float64, c0 []float64) ([]float64, error) {
	if err := order.check(); err != nil {
		return nil, err
	}
	if err := c.Validate(); err != nil {
		return nil, err
	}
	if c.Loops < int(order) {
		return nil, fmt.Errorf("running: %s evolution with %d-loop αs: want at least %d loops", orderName(order), c.Loops, int(order))
	}
	for _, s := range []struct {
		n string
		v float64
	}{{"μ0", mu0}, {"μ", mu}} {
		if err := checkScale(s.n, s.v); err != nil {
			return nil, err
		}
	}
	// Segment boundaries: the threshold scales strictly between mu0 and mu.
	lo, hi := math.Min(mu0, mu), math.Max(mu0, mu)
	bounds := []float64{mu0}
	var cuts []float64
	for _, t := range c.sorted() {
		if s := t.scale(); s > lo && s < hi {
			cuts = append(cuts, s)
		}
	}
	if mu < mu0 {
		for i := len(cuts) - 1; i >= 0; i-- {
			bounds = append(bounds, cuts[i])
		}
	} else {
		bounds = append(bounds, cuts...)
	}
	bounds = append(bounds, mu)
	cur := append([]float64(nil), c0...)
	evolvers := map[int]*Evolver{}
	for k := 0; k+1 < len(bounds); k++ {
		from, to := bounds[k], bounds[k+1]
		nf := c.NfAt(math.Sqrt(from * to)) // the flavour number inside the segment
		ev := evolvers[nf]
		if ev == nil {
			g0, g1, err := adm(nf)
			if err != nil {
				return nil, err
			}
			if order == LO {
				g1 = nil
			}
			if ev, err = (Evolution{G0: g0, G1: g1, Nf: nf, Form: form}).Prepare(); err != nil {
				return nil, err
			}
			evolvers[nf] = ev
		}
		asFrom, err := c.AlphaSNf(from, nf)
		if err != nil {
			return nil, err
		}
		asTo, err := c.AlphaSNf(to, nf)
		if err != nil {
			return nil, err
		}
		if cur, err = ev.Apply(order, asTo, asFrom, cur); err != nil {
			return nil, err
		}
	}
	return cur, nil
}

func orderName(o Order) string {
	if o == LO {
		return "LO"
	}
	return "NLO"
}
