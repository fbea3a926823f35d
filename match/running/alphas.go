package running

import (
	"fmt"
	"math"
)

// odeTol is the local relative tolerance of the RGE integrations.
const odeTol = 1e-14

// AlphaS runs αs from αs(mu0) = as0 to the scale mu with the flavour number fixed, by
// numerical integration of the truncated RGE da/d ln μ² = β(a) in t = ln μ².
func (b Beta) AlphaS(as0, mu0, mu float64) (float64, error) {
	if err := b.Check(); err != nil {
		return 0, err
	}
	if err := checkScale("μ0", mu0); err != nil {
		return 0, err
	}
	if err := checkScale("μ", mu); err != nil {
		return 0, err
	}
	if err := checkAlphaS(as0); err != nil {
		return 0, err
	}
	y := []float64{as0 / (4 * math.Pi)}
	f := func(_ float64, y, dy []float64) { dy[0] = b.DaDlnMu2(y[0]) }
	guard := func(t float64, y []float64) error { return guardA(y[0], math.Exp(t/2)) }
	if err := integrate(f, 2*math.Log(mu0), 2*math.Log(mu), y, odeTol, guard); err != nil {
		return 0, err
	}
	return 4 * math.Pi * y[0], nil
}

func guardA(a, mu float64) error {
	as := 4 * math.Pi * a
	if !(as > 0) || as > PerturbativeLimit || math.IsNaN(as) {
		return fmt.Errorf("running: αs reaches %g at μ = %g GeV (limit %g): %w", as, mu, PerturbativeLimit, ErrNonPerturbative)
	}
	return nil
}

// AlphaS1Loop is the closed-form one-loop solution with nf fixed:
// αs(μ) = αs(μ0) / (1 + β0 αs(μ0)/(4π) ln(μ²/μ0²)).
func AlphaS1Loop(nf int, as0, mu0, mu float64) (float64, error) {
	if err := (Beta{Nf: nf, Loops: 1}).Check(); err != nil {
		return 0, err
	}
	if err := checkScale("μ0", mu0); err != nil {
		return 0, err
	}
	if err := checkScale("μ", mu); err != nil {
		return 0, err
	}
	if err := checkAlphaS(as0); err != nil {
		return 0, err
	}
	b0 := BetaCoeffs(nf)[0]
	den := 1 + b0*as0/(4*math.Pi)*2*math.Log(mu/mu0)
	if den <= 0 {
		return 0, fmt.Errorf("running: one-loop Landau pole between %g and %g GeV: %w", mu0, mu, ErrNonPerturbative)
	}
	as := as0 / den
	if as > PerturbativeLimit {
		return 0, fmt.Errorf("running: one-loop αs(%g GeV) = %g exceeds %g: %w", mu, as, PerturbativeLimit, ErrNonPerturbative)
	}
	return as, nil
}

// AlphaSLambda is the asymptotic expansion of αs(μ) in 1/ln(μ²/Λ²) with the MS-bar Λ of nf
// flavours, truncated after loops terms (1 to 4): the formula of the QCD review of the Particle
// Data Group (section on the running coupling; from memory, and checked against the exact
// solution in the tests), with b_i = β_i/(4π)^{i+1}.
func AlphaSLambda(nf, loops int, lambda, mu float64) (float64, error) {
	if err := (Beta{Nf: nf, Loops: loops}).Check(); err != nil {
		return 0, err
	}
	if err := checkScale("Λ", lambda); err != nil {
		return 0, err
	}
	if err := checkScale("μ", mu); err != nil {
		return 0, err
	}
	if mu <= lambda {
		return 0, fmt.Errorf("running: μ = %g GeV is not above Λ = %g GeV: %w", mu, lambda, ErrNonPerturbative)
	}
	as := lambdaExpansion(lambdaB(BetaCoeffs(nf)), loops, 2*math.Log(mu/lambda))
	if !(as > 0) || as > PerturbativeLimit {
		return 0, fmt.Errorf("running: Λ-expansion gives αs = %g at μ = %g GeV: %w", as, mu, ErrNonPerturbative)
	}
	return as, nil
}

// MassRun runs an MS-bar quark mass m(mu0) = m0 to mu with nf fixed, integrating the coupled
// RGEs of a and ln m in t = ln μ²; as0 = αs(mu0) in the same nf-flavour theory. The mass
// anomalous dimension is kept to the loop order of the β function.
func (b Beta) MassRun(m0, as0, mu0, mu float64) (float64, error) {
	if err := b.Check(); err != nil {
		return 0, err
	}
	if !(m0 > 0) || math.IsInf(m0, 0) {
		return 0, fmt.Errorf("running: mass %g GeV: want a finite positive value", m0)
	}
	if err := checkScale("μ0", mu0); err != nil {
		return 0, err
	}
	if err := checkScale("μ", mu); err != nil {
		return 0, err
	}
	if err := checkAlphaS(as0); err != nil {
		return 0, err
	}
	g := MassGammaCoeffs(b.Nf)
	for i := b.Loops; i < 4; i++ {
		g[i] = 0
	}
	y := []float64{as0 / (4 * math.Pi), math.Log(m0)}
	f := func(_ float64, y, dy []float64) {
		a := y[0]
		dy[0] = b.DaDlnMu2(a)
		dy[1] = -a * (g[0] + a*(g[1]+a*(g[2]+a*g[3])))
	}
	guard := func(t float64, y []float64) error { return guardA(y[0], math.Exp(t/2)) }
	if err := integrate(f, 2*math.Log(mu0), 2*math.Log(mu), y, odeTol, guard); err != nil {
		return 0, err
	}
	return math.Exp(y[1]), nil
}

// MassRun1Loop is the closed-form one-loop mass running with nf fixed:
// m(μ) = m(μ0) [αs(μ)/αs(μ0)]^{γm0/β0}, with the one-loop αs(μ).
func MassRun1Loop(nf int, m0, as0, mu0, mu float64) (float64, error) {
	if !(m0 > 0) || math.IsInf(m0, 0) {
		return 0, fmt.Errorf("running: mass %g GeV: want a finite positive value", m0)
	}
	as, err := AlphaS1Loop(nf, as0, mu0, mu)
	if err != nil {
		return 0, err
	}
	return m0 * math.Pow(as/as0, MassGammaCoeffs(nf)[0]/BetaCoeffs(nf)[0]), nil
}

// lambdaB converts β_i (a = αs/4π) to the b_i = β_i/(4π)^{i+1} of the αs convention.
func lambdaB(c [4]float64) [4]float64 {
	var b [4]float64
	for i := range b {
		b[i] = c[i] / math.Pow(4*math.Pi, float64(i+1))
	}
	return b
}

// lambdaExpansion evaluates the truncated asymptotic expansion at t = ln(μ²/Λ²).
func lambdaExpansion(b [4]float64, loops int, t float64) float64 {
	lt := math.Log(t)
	s := 1.0
	if loops >= 2 {
		s -= b[1] * lt / (b[0] * b[0] * t)
	}
	if loops >= 3 {
		s += (b[1]*b[1]*(lt*lt-lt-1) + b[0]*b[2]) / (math.Pow(b[0], 4) * t * t)
	}
	if loops >= 4 {
		s -= (b[1]*b[1]*b[1]*(lt*lt*lt-2.5*lt*lt-2*lt+0.5) + 3*b[0]*b[1]*b[2]*lt - 0.5*b[0]*b[0]*b[3]) /
			(math.Pow(b[0], 6) * t * t * t)
	}
	return s / (b[0] * t)
}
