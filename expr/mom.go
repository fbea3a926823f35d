package expr

import (
	"math/big"
	"slices"
	"strings"
)

// MomTerm is one momentum with its rational coefficient inside a linear combination.
type MomTerm struct {
	Name string
	Coef *big.Rat
}

// Mom is a linear combination of momenta with rational coefficients, sorted by name, without
// zero coefficients: k − p + q/2. The empty Mom is the zero vector.
type Mom []MomTerm

// MomOf returns the single momentum p.
func MomOf(p string) Mom { return Mom{{p, big.NewRat(1, 1)}} }

// NewMom builds a canonical Mom from arbitrary terms (merging names, dropping zeros).
func NewMom(ts ...MomTerm) Mom {
	cp := make([]MomTerm, len(ts))
	for i, t := range ts {
		cp[i] = MomTerm{t.Name, new(big.Rat).Set(t.Coef)}
	}
	slices.SortStableFunc(cp, func(a, b MomTerm) int { return strings.Compare(a.Name, b.Name) })
	out := cp[:0]
	for _, t := range cp {
		if n := len(out); n > 0 && out[n-1].Name == t.Name {
			out[n-1].Coef.Add(out[n-1].Coef, t.Coef)
			continue
		}
		out = append(out, t)
	}
	res := out[:0]
	for _, t := range out {
		if t.Coef.Sign() != 0 {
			res = append(res, t)
		}
	}
	return res
}

// Add returns a + b.
func (a Mom) Add(b Mom) Mom { return NewMom(append(append([]MomTerm{}, a...), b...)...) }

// Scale returns c·a.
func (a Mom) Scale(c *big.Rat) Mom {
	out := make([]MomTerm, len(a))
	for i, t := range a {
		out[i] = MomTerm{t.Name, new(big.Rat).Mul(t.Coef, c)}
	}
	return NewMom(out...)
}

// Sub returns a − b.
func (a Mom) Sub(b Mom) Mom { return a.Add(b.Scale(big.NewRat(-1, 1))) }

// IsZero reports whether a is the zero vector.
func (a Mom) IsZero() bool { return len(a) == 0 }

// Coef returns the coefficient of p in a.
func (a Mom) Coef(p string) *big.Rat {
	for _, t := range a {
		if t.Name == p {
			return new(big.Rat).Set(t.Coef)
		}
	}
	return new(big.Rat)
}

// Names lists the momenta in a.
func (a Mom) Names() []string {
	out := make([]string, len(a))
	for i, t := range a {
		out[i] = t.Name
	}
	return out
}

// Equal reports whether a and b are the same combination.
func (a Mom) Equal(b Mom) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i].Name != b[i].Name || a[i].Coef.Cmp(b[i].Coef) != 0 {
			return false
		}
	}
	return true
}

// String prints the combination: "k - p + q/2", "2*p", "0".
func (a Mom) String() string {
	if len(a) == 0 {
		return "0"
	}
	var sb strings.Builder
	for i, t := range a {
		neg := t.Coef.Sign() < 0
		abs := new(big.Rat).Abs(t.Coef)
		writeSign(&sb, i == 0, neg)
		writeMonoTerm(&sb, abs, Mono{{t.Name, 1}})
	}
	return sb.String()
}

// isSingle reports whether a is one momentum with coefficient 1.
func (a Mom) isSingle() bool { return len(a) == 1 && a[0].Coef.Cmp(ratOne) == 0 }
