package specfun

import (
	"math/big"
	"sync"
)

// bernoulli caches the even Bernoulli numbers B_2, B_4, … as exact rationals.
var bernoulli struct {
	sync.Mutex
	b []*big.Rat // b[k] = B_{2k+2}
}

// BernoulliEven returns the Bernoulli number B_{2k} (k ≥ 1) as an exact rational, e.g. B_2 = 1/6,
// B_4 = −1/30. It returns nil for k < 1. The values come from the tangent numbers T_k by
// B_{2k} = (−1)^{k−1} 2k T_k / (4^k (4^k − 1)), with T_k from the integer recurrence of Brent and
// Harvey (arXiv:1108.0286, algorithm TangentNumbers). The result must not be modified.
func BernoulliEven(k int) *big.Rat {
	if k < 1 {
		return nil
	}
	bernoulli.Lock()
	defer bernoulli.Unlock()
	if k > len(bernoulli.b) {
		n := 2 * k
		if n < 64 {
			n = 64
		}
		bernoulli.b = computeBernoulliEven(n)
	}
	return bernoulli.b[k-1]
}

// computeBernoulliEven returns B_2 … B_{2n}.
func computeBernoulliEven(n int) []*big.Rat {
	t := make([]*big.Int, n+1) // t[1..n] tangent numbers
	t[1] = big.NewInt(1)
	for k := 2; k <= n; k++ {
		t[k] = new(big.Int).Mul(big.NewInt(int64(k-1)), t[k-1])
	}
	tmp := new(big.Int)
	for k := 2; k <= n; k++ {
		for j := k; j <= n; j++ {
			// t[j] = (j−k) t[j−1] + (j−k+2) t[j]
			tmp.Mul(big.NewInt(int64(j-k)), t[j-1])
			t[j].Mul(t[j], big.NewInt(int64(j-k+2)))
			t[j].Add(t[j], tmp)
		}
	}
	out := make([]*big.Rat, n)
	for k := 1; k <= n; k++ {
		num := new(big.Int).Mul(big.NewInt(int64(2*k)), t[k])
		if k%2 == 0 {
			num.Neg(num)
		}
		four := new(big.Int).Lsh(big.NewInt(1), uint(2*k)) // 4^k
		den := new(big.Int).Sub(four, big.NewInt(1))
		den.Mul(den, four)
		out[k-1] = new(big.Rat).SetFrac(num, den)
	}
	return out
}

// factorial returns n! exactly.
func factorial(n int) *big.Int {
	return new(big.Int).MulRange(1, int64(n))
}
