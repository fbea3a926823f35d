package specfun

import (
	"math"
	"math/big"
)

const (
	cl2Terms = 20
	// 2π and π split into a float64 head and tail for argument reduction.
	twoPiHi = 6.283185307179586
	twoPiLo = 2.4492935982947064e-16
	piHi    = 3.141592653589793
	piLo    = 1.2246467991473532e-16
)

// cl2A[k-1] = |B_2k| / (2k (2k+1)!) and cl2B[k-1] = (2^{2k}−1)|B_2k| / (2k (2k+1)!): the series
//
//	Cl2(θ)   = θ − θ ln θ + Σ_k cl2A θ^{2k+1},      0 < θ < 2π,
//	Cl2(π−φ) = φ ln 2 − Σ_k cl2B φ^{2k+1},          |φ| < π,
//
// from integrating Cl2'(θ) = −ln|2 sin(θ/2)| term by term with the Bernoulli series of
// ln(sin x / x) and ln cos x (Lewin 1981, ch. 4).
var cl2A, cl2B [cl2Terms]float64

func init() {
	for k := 1; k <= cl2Terms; k++ {
		b := new(big.Rat).Abs(BernoulliEven(k))
		d := new(big.Int).Mul(big.NewInt(int64(2*k)), factorial(2*k+1))
		a := new(big.Rat).Quo(b, new(big.Rat).SetInt(d))
		cl2A[k-1], _ = a.Float64()
		f := new(big.Int).Sub(new(big.Int).Lsh(big.NewInt(1), uint(2*k)), big.NewInt(1))
		c := new(big.Rat).Mul(a, new(big.Rat).SetInt(f))
		cl2B[k-1], _ = c.Float64()
	}
}

// Cl2 returns the Clausen function Cl2(θ) = −∫₀^θ ln|2 sin(t/2)| dt = Σ_{k≥1} sin(kθ)/k² for any
// real θ. It is odd and 2π-periodic; the argument is reduced with a two-part 2π, so the absolute
// accuracy for large |θ| is limited by that of θ itself. Cl2(π/2) is Catalan's constant.
func Cl2(theta float64) float64 {
	if math.IsNaN(theta) || math.IsInf(theta, 0) {
		return math.NaN()
	}
	// t = θ − 2πk ∈ [−π, π] with a single rounding (FMA) and the tail of 2π.
	k := math.Round(theta / twoPiHi)
	t := math.FMA(-k, twoPiHi, theta) - k*twoPiLo
	sign := 1.0
	if t < 0 {
		sign = -1
	}
	at := math.Abs(t)
	if at == 0 {
		return 0
	}
	if at <= 2*math.Pi/3 {
		t2 := at * at
		p := cl2A[cl2Terms-1]
		for k := cl2Terms - 2; k >= 0; k-- {
			p = p*t2 + cl2A[k]
		}
		return sign * (at - at*math.Log(at) + at*t2*p)
	}
	// φ = π − |t| straight from θ, so that it keeps its relative accuracy near θ = π (mod 2π).
	var phi float64
	if t > 0 {
		m := 2*k + 1 // φ = (2k+1)π − θ
		phi = math.FMA(m, piHi, -theta) + m*piLo
	} else {
		m := 2*k - 1 // φ = θ − (2k−1)π
		phi = math.FMA(-m, piHi, theta) - m*piLo
	}
	f2 := phi * phi
	p := cl2B[cl2Terms-1]
	for k := cl2Terms - 2; k >= 0; k-- {
		p = p*f2 + cl2B[k]
	}
	return sign * (phi*math.Ln2 - phi*f2*p)
}
