package loops

import (
	"fmt"
	"math"
	"math/big"
	"strings"
)

// Arity of each integral name in Eval: invariants first, then masses (not squared), in the order
// of the package comment.
var evalArity = map[string]struct{ inv, mass int }{
	"A0":      {0, 1},
	"B0":      {1, 2},
	"B0prime": {1, 2},
	"C0":      {3, 3},
	"D0":      {6, 4},
}

// EvalNames lists the names Eval accepts.
func EvalNames() []string { return []string{"A0", "B0", "B0prime", "C0", "D0"} }

// evalSignature describes the expected arguments of name for error messages.
func evalSignature(name string) string {
	switch name {
	case "A0":
		return "A0(m)"
	case "B0":
		return "B0(p2; m0, m1)"
	case "B0prime":
		return "B0prime(p2; m0, m1)"
	case "C0":
		return "C0(s1, s2, s3; m0, m1, m2)"
	}
	return "D0(s1, s2, s3, s4, s5, s6; m0, m1, m2, m3)"
}

func lookupName(name string) (string, error) {
	if _, ok := evalArity[name]; ok {
		return name, nil
	}
	if name == "B0'" {
		return "B0prime", nil
	}
	return "", fmt.Errorf("unknown integral %q (want one of %s)", name, strings.Join(EvalNames(), ", "))
}

// Eval evaluates the scalar integral called name (A0, B0, B0prime — also written B0' —, C0, D0)
// at the notation's arguments: the invariants first, then the internal masses NOT squared, in
// Denner's order (package comment), with the MS-bar scale squared mu2 = μ². Errors name the
// expected signature for a wrong number of arguments, and reject NaN or infinite arguments,
// negative masses and a non-positive μ².
func Eval(name string, args []float64, mu2 float64) (Value, error) {
	key, err := lookupName(name)
	if err != nil {
		return Value{}, err
	}
	ar := evalArity[key]
	if len(args) != ar.inv+ar.mass {
		return Value{}, fmt.Errorf("%s takes %d arguments, got %d: %s", key, ar.inv+ar.mass, len(args), evalSignature(key))
	}
	for i, a := range args {
		if math.IsNaN(a) || math.IsInf(a, 0) {
			return Value{}, fmt.Errorf("%s: argument %d is %v, want a finite number: %s", key, i+1, a, evalSignature(key))
		}
	}
	if math.IsNaN(mu2) || math.IsInf(mu2, 0) || mu2 <= 0 {
		return Value{}, fmt.Errorf("%s: the scale μ² = %v must be positive and finite", key, mu2)
	}
	inv := args[:ar.inv]
	m2 := make([]float64, ar.mass)
	for i, m := range args[ar.inv:] {
		if m < 0 {
			return Value{}, fmt.Errorf("%s: mass m%d = %g is negative (masses are given, not squared, and must be ≥ 0): %s", key, i, m, evalSignature(key))
		}
		m2[i] = m * m
	}
	switch key {
	case "A0":
		return A0(m2[0], mu2)
	case "B0":
		return B0(inv[0], m2[0], m2[1], mu2)
	case "B0prime":
		return B0Prime(inv[0], m2[0], m2[1], mu2)
	case "C0":
		return C0(inv[0], inv[1], inv[2], m2[0], m2[1], m2[2], mu2)
	}
	return D0(inv[0], inv[1], inv[2], inv[3], inv[4], inv[5], m2[0], m2[1], m2[2], m2[3], mu2)
}

// EvalBig is Eval in arbitrary precision: arguments as *big.Float (invariants, then masses not
// squared), μ² and the precision in bits of the result.
func EvalBig(name string, args []*big.Float, mu2 *big.Float, prec uint) (BigValue, error) {
	key, err := lookupName(name)
	if err != nil {
		return BigValue{}, err
	}
	ar := evalArity[key]
	if len(args) != ar.inv+ar.mass {
		return BigValue{}, fmt.Errorf("%s takes %d arguments, got %d: %s", key, ar.inv+ar.mass, len(args), evalSignature(key))
	}
	for i, a := range args {
		if a == nil || a.IsInf() {
			return BigValue{}, fmt.Errorf("%s: argument %d is %v, want a finite number: %s", key, i+1, a, evalSignature(key))
		}
	}
	if mu2 == nil || mu2.IsInf() || mu2.Sign() <= 0 {
		return BigValue{}, fmt.Errorf("%s: the scale μ² = %v must be positive and finite", key, mu2)
	}
	inv := args[:ar.inv]
	m2 := make([]*big.Float, ar.mass)
	for i, m := range args[ar.inv:] {
		if m.Sign() < 0 {
			return BigValue{}, fmt.Errorf("%s: mass m%d = %s is negative (masses are given, not squared, and must be ≥ 0): %s", key, i, m.Text('g', 10), evalSignature(key))
		}
		q := 2*m.Prec() + 64
		if q < prec+64 {
			q = prec + 64
		}
		m2[i] = new(big.Float).SetPrec(q).Mul(m, m) // exact square
	}
	switch key {
	case "A0":
		return A0Big(m2[0], mu2, prec)
	case "B0":
		return B0Big(inv[0], m2[0], m2[1], mu2, prec)
	case "B0prime":
		return B0PrimeBig(inv[0], m2[0], m2[1], mu2, prec)
	case "C0":
		return C0Big(inv[0], inv[1], inv[2], m2[0], m2[1], m2[2], mu2, prec)
	}
	return D0Big(inv[0], inv[1], inv[2], inv[3], inv[4], inv[5], m2[0], m2[1], m2[2], m2[3], mu2, prec)
}
