package running

import (
	"fmt"
	"math"
)

// b4Const is the constant B4 = 16 Li4(1/2) + (2/3) ln⁴2 − (2/3) π² ln²2 − (13/180) π⁴ of the
// three-loop mass decoupling (K.G. Chetyrkin, B.A. Kniehl, M. Steinhauser, Nucl. Phys. B510
// (1998) 61; from memory, value computed with Li4(1/2) = 0.5174790616738993863).
var b4Const = func() float64 {
	const li4half = 0.5174790616738993863307581618988629456223774751413792582443193479
	l2 := math.Ln2
	return 16*li4half + 2.0/3*math.Pow(l2, 4) - 2.0/3*math.Pi*math.Pi*l2*l2 - 13.0/180*math.Pow(math.Pi, 4)
}()

// zetaG2 is the MS-bar decoupling constant of the coupling,
// αs^{(nl)}(μ) = ζg² αs^{(nl+1)}(μ), as a series in x = αs^{(nl+1)}(μ)/π truncated after
// `loops` loops, with L = ln(μ²/m_h²) and m_h = m_h(μ) the MS-bar mass of the heavy quark in
// the (nl+1)-flavour theory. K.G. Chetyrkin, B.A. Kniehl, M. Steinhauser, Nucl. Phys. B510
// (1998) 61 (from memory; the logarithms are checked by RG invariance in
// the tests, the constants against the printed decimals 11/72 = 0.152778 and
// 0.972057 − 0.084651 nl).
func zetaG2(x, L float64, nl, loops int) float64 {
	n := float64(nl)
	z := 1.0
	if loops >= 1 {
		z += x * (-L / 6)
	}
	if loops >= 2 {
		z += x * x * (11.0/72 - 11.0/24*L + L*L/36)
	}
	if loops >= 3 {
		z += x * x * x * (564731.0/124416 - 82043.0/27648*zeta3 - 955.0/576*L + 53.0/576*L*L - L*L*L/216 +
			n*(-2633.0/31104+67.0/576*L-L*L/36))
	}
	return z
}

// zetaM is the MS-bar decoupling constant of a light-quark mass, m^{(nl)}(μ) = ζm m^{(nl+1)}(μ),
// in the same variables as zetaG2 (same paper; from memory; the
// logarithms are checked by RG invariance in the tests, the constants against the printed
// decimals 89/432 = 0.206019 and 1.84763 + 0.0247225 nl).
func zetaM(x, L float64, nl, loops int) float64 {
	n := float64(nl)
	z := 1.0
	if loops >= 2 {
		z += x * x * (89.0/432 - 5.0/36*L + L*L/12)
	}
	if loops >= 3 {
		z += x * x * x * (2951.0/2916 - 407.0/864*zeta3 + 5.0/4*zeta4 - b4Const/36 +
			(-311.0/2592-5.0/6*zeta3)*L + 175.0/432*L*L + 29.0/216*L*L*L +
			n*(1327.0/11664-2.0/27*zeta3-53.0/432*L-L*L*L/108))
	}
	return z
}

func checkDecoupling(nl, loops int, mu, mh float64) error {
	if nl < 0 || nl > 5 {
		return fmt.Errorf("running: %d light flavours at a threshold: want 0 to 5", nl)
	}
	if loops < 0 || loops > 3 {
		return fmt.Errorf("running: %d-loop decoupling: want 0 to 3 loops", loops)
	}
	if err := checkScale("μ", mu); err != nil {
		return err
	}
	return checkScale("m_h", mh)
}

// AlphaSDown returns αs^{(nl)}(μ) from αs^{(nl+1)}(μ) = asHigh when the heavy quark of MS-bar
// mass mh = m_h(μ) (in the (nl+1)-flavour theory) is integrated out at the scale μ, with the
// decoupling relation truncated after `loops` loops (0: continuous; 1: the one-loop logarithm;
// up to 3). With n-loop running the consistent choice is n−1 loops here.
func AlphaSDown(asHigh, mu, mh float64, nl, loops int) (float64, error) {
	if err := checkDecoupling(nl, loops, mu, mh); err != nil {
		return 0, err
	}
	if err := checkAlphaS(asHigh); err != nil {
		return 0, err
	}
	L := 2 * math.Log(mu/mh)
	as := zetaG2(asHigh/math.Pi, L, nl, loops) * asHigh
	if err := checkAlphaS(as); err != nil {
		return 0, fmt.Errorf("running: decoupling at %g GeV: %w", mu, err)
	}
	return as, nil
}

// AlphaSUp is the inverse of AlphaSDown: it returns αs^{(nl+1)}(μ) from αs^{(nl)}(μ) = asLow
// by solving the same truncated relation exactly (Newton's method), so that AlphaSDown
// undoes it to rounding. (Inverting the series instead would differ beyond the kept order.)
func AlphaSUp(asLow, mu, mh float64, nl, loops int) (float64, error) {
	if err := checkDecoupling(nl, loops, mu, mh); err != nil {
		return 0, err
	}
	if err := checkAlphaS(asLow); err != nil {
		return 0, err
	}
	L := 2 * math.Log(mu/mh)
	g := func(as float64) float64 { return zetaG2(as/math.Pi, L, nl, loops)*as - asLow }
	as := asLow
	for range 100 {
		h := 1e-7 * as
		d := (g(as+h) - g(as-h)) / (2 * h)
		if d == 0 || math.IsNaN(d) {
			break
		}
		step := g(as) / d
		as -= step
		if math.Abs(step) < 1e-16*as {
			break
		}
	}
	if math.Abs(g(as)) > 1e-14*asLow || !(as > 0) {
		return 0, fmt.Errorf("running: upward decoupling at %g GeV from αs = %g has no solution: %w", mu, asLow, ErrNonPerturbative)
	}
	if err := checkAlphaS(as); err != nil {
		return 0, err
	}
	return as, nil
}

// MassDown returns m^{(nl)}(μ) from the light-quark mass m^{(nl+1)}(μ) = m at a threshold;
// asHigh = αs^{(nl+1)}(μ), mh = m_h(μ) as for AlphaSDown.
func MassDown(m, asHigh, mu, mh float64, nl, loops int) (float64, error) {
	if err := checkDecoupling(nl, loops, mu, mh); err != nil {
		return 0, err
	}
	if err := checkAlphaS(asHigh); err != nil {
		return 0, err
	}
	return zetaM(asHigh/math.Pi, 2*math.Log(mu/mh), nl, loops) * m, nil
}

// MassUp is the inverse of MassDown; asHigh is again αs^{(nl+1)}(μ) (from AlphaSUp).
func MassUp(m, asHigh, mu, mh float64, nl, loops int) (float64, error) {
	if err := checkDecoupling(nl, loops, mu, mh); err != nil {
		return 0, err
	}
	if err := checkAlphaS(asHigh); err != nil {
		return 0, err
	}
	return m / zetaM(asHigh/math.Pi, 2*math.Log(mu/mh), nl, loops), nil
}
