package specfun

import (
	"fmt"
	"math"
	"math/big"
	"sync"
)

// constCache keeps the most precise value computed so far of a constant; lower precisions are
// served by rounding it.
type constCache struct {
	sync.Mutex
	v *big.Float
}

func (c *constCache) get(prec uint, compute func(uint) *big.Float) *big.Float {
	c.Lock()
	defer c.Unlock()
	if c.v == nil || c.v.Prec() < prec+32 {
		c.v = compute(prec + 64)
	}
	return new(big.Float).SetPrec(prec).Set(c.v)
}

var piCache, gammaCache constCache

// Pi returns π rounded to prec bits, from Machin's formula π = 16 atan(1/5) − 4 atan(1/239).
func Pi(prec uint) *big.Float {
	return piCache.get(prec, func(p uint) *big.Float {
		a := atanInvInt(5, p)
		a.Mul(a, big.NewFloat(16))
		b := atanInvInt(239, p)
		b.Mul(b, big.NewFloat(4))
		return a.Sub(a, b)
	})
}

// atanInvInt returns atan(1/k) = Σ (−1)^n / ((2n+1) k^{2n+1}) at precision p.
func atanInvInt(k int64, p uint) *big.Float {
	q := p + 16
	kk := newFloat(q).SetInt64(k * k)
	term := newFloat(q).Quo(newFloat(q).SetInt64(1), newFloat(q).SetInt64(k)) // 1/k^{2n+1}
	sum := newFloat(q).Set(term)
	t := newFloat(q)
	for n := int64(1); ; n++ {
		term.Quo(term, kk)
		t.Quo(term, newFloat(q).SetInt64(2*n+1))
		if n%2 == 1 {
			sum.Sub(sum, t)
		} else {
			sum.Add(sum, t)
		}
		if t.Sign() == 0 || t.MantExp(nil) < sum.MantExp(nil)-int(q) {
			break
		}
	}
	return sum.SetPrec(p)
}

// EulerGamma returns Euler's constant γ_E rounded to prec bits, by the Brent–McMillan
// algorithm B1 (Math. Comp. 34 (1980) 305): γ ≈ U/V with U = Σ A_k, V = Σ B_k,
// B_k = B_{k−1} n²/k², A_k = (A_{k−1} n²/k + B_k)/k, A_0 = −ln n, B_0 = 1, error < π e^{−4n}.
func EulerGamma(prec uint) *big.Float {
	return gammaCache.get(prec, func(p uint) *big.Float {
		n := int64(math.Ceil(float64(p+8)*math.Ln2/4)) + 1
		q := p + 32
		nn := newFloat(q).SetInt64(n * n)
		a := lnReal(newFloat(q).SetInt64(n), q)
		a.Neg(a)
		b := newFloat(q).SetInt64(1)
		u := newFloat(q).Set(a)
		v := newFloat(q).SetInt64(1)
		kf := newFloat(q)
		for k := int64(1); ; k++ {
			kf.SetInt64(k)
			b.Mul(b, nn)
			b.Quo(b, kf)
			b.Quo(b, kf)
			a.Mul(a, nn)
			a.Quo(a, kf)
			a.Add(a, b)
			a.Quo(a, kf)
			u.Add(u, a)
			v.Add(v, b)
			if k > n && b.MantExp(nil) < v.MantExp(nil)-int(q)-8 && (a.Sign() == 0 || a.MantExp(nil) < v.MantExp(nil)-int(q)-8) {
				break
			}
		}
		return newFloat(p).Quo(u, v)
	})
}

var zetaCache struct {
	sync.Mutex
	v map[int]*big.Float
}

// Zeta returns the Riemann zeta value ζ(n) for integer n ≥ 2, rounded to prec bits, by Borwein's
// algorithm 2 (P. Borwein, CMS Conf. Proc. 27 (2000) 29): with d_k = N Σ_{i≤k} (N+i−1)! 4^i /
// ((N−i)! (2i)!), ζ(s) = −1/(d_N (1−2^{1−s})) Σ_{k<N} (−1)^k (d_k − d_N)/(k+1)^s up to a relative
// error below 3/(3+√8)^N.
func Zeta(n int, prec uint) (*big.Float, error) {
	if n < 2 {
		return nil, fmt.Errorf("specfun.Zeta: need an integer argument n ≥ 2, got %d", n)
	}
	zetaCache.Lock()
	defer zetaCache.Unlock()
	if zetaCache.v == nil {
		zetaCache.v = map[int]*big.Float{}
	}
	if v, ok := zetaCache.v[n]; ok && v.Prec() >= prec+32 {
		return new(big.Float).SetPrec(prec).Set(v), nil
	}
	v := zetaBorwein(n, prec+64)
	zetaCache.v[n] = v
	return new(big.Float).SetPrec(prec).Set(v), nil
}

func zetaBorwein(s int, p uint) *big.Float {
	N := int(math.Ceil(float64(p+16)*math.Ln2/math.Log(3+math.Sqrt(8)))) + 2
	// e_i = N (N+i−1)! 4^i / ((N−i)! (2i)!), e_0 = 1, e_i/e_{i−1} = 2(N+i−1)(N−i+1)/(i(2i−1)).
	d := make([]*big.Rat, N+1)
	e := big.NewRat(1, 1)
	acc := new(big.Rat).Set(e)
	d[0] = new(big.Rat).Set(acc)
	for i := 1; i <= N; i++ {
		num := big.NewInt(int64(2 * (N + i - 1) * (N - i + 1)))
		den := big.NewInt(int64(i * (2*i - 1)))
		e.Mul(e, new(big.Rat).SetFrac(num, den))
		acc.Add(acc, e)
		d[i] = new(big.Rat).Set(acc)
	}
	q := p + 32
	dN := newFloat(q).SetRat(d[N])
	sum := newFloat(q)
	t := newFloat(q)
	pw := new(big.Int)
	for k := 0; k < N; k++ {
		diff := new(big.Rat).Sub(d[k], d[N])
		t.SetRat(diff)
		pw.Exp(big.NewInt(int64(k+1)), big.NewInt(int64(s)), nil)
		t.Quo(t, newFloat(q).SetInt(pw))
		if k%2 == 0 {
			sum.Add(sum, t)
		} else {
			sum.Sub(sum, t)
		}
	}
	// 1 − 2^{1−s}
	f := newFloat(q).SetMantExp(newFloat(q).SetInt64(1), 1-s)
	f.Sub(newFloat(q).SetInt64(1), f)
	den := newFloat(q).Mul(dN, f)
	res := newFloat(q).Quo(sum, den)
	res.Neg(res)
	return res.SetPrec(p)
}
