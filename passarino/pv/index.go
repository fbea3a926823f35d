package pv

import (
	"fmt"
	"slices"
	"strconv"
	"strings"
)

// MaxRank is the highest tensor rank the reduction accepts; it bounds the recursion depth.
const MaxRank = 6

// label is a coefficient index in counted form: j pairs of 0 (metric tensors) and a[i−1]
// momenta P_i, i = 1 … N−1.
type label struct {
	j int
	a [MaxPoints - 1]int
}

func (l label) rank() int {
	r := 2 * l.j
	for _, x := range l.a {
		r += x
	}
	return r
}

// parseIndex checks a coefficient index of an N-point function (entries 0 … N−1, an even
// number of 0s, rank ≤ MaxRank) and counts it.
func parseIndex(n int, idx []int) (label, error) {
	var l label
	if len(idx) > MaxRank {
		return l, fmt.Errorf("pv: rank %d exceeds the supported maximum %d", len(idx), MaxRank)
	}
	zeros := 0
	for _, i := range idx {
		switch {
		case i == 0:
			zeros++
		case i >= 1 && i < n:
			l.a[i-1]++
		default:
			return l, fmt.Errorf("pv: index %d out of range for a %d-point function (0 for g, 1 … %d for the momenta): %v", i, n, n-1, idx)
		}
	}
	if zeros%2 != 0 {
		return l, fmt.Errorf("pv: index %v has an odd number of 0s; metric indices come in pairs", idx)
	}
	l.j = zeros / 2
	return l, nil
}

// Name returns the usual name of the coefficient T^N_idx: A, B, C or D by N, then the sorted
// indices, 0 for a scalar integral (A0, B1, B00, C12, D0012).
func Name(n int, idx []int) string {
	var sb strings.Builder
	if n >= 1 && n <= MaxPoints {
		sb.WriteByte("ABCD"[n-1])
	} else {
		sb.WriteString("T" + strconv.Itoa(n) + "_")
	}
	if len(idx) == 0 {
		sb.WriteByte('0')
		return sb.String()
	}
	s := slices.Clone(idx)
	slices.Sort(s)
	for _, i := range s {
		sb.WriteString(strconv.Itoa(i))
	}
	return sb.String()
}

// Indices lists the indices of all tensor coefficients of rank r of an N-point function, each
// sorted (pairs of 0 first), in lexicographic order: for N = 3, r = 2 these are [0 0], [1 1],
// [1 2], [2 2].
func Indices(n, r int) [][]int {
	var out [][]int
	var rec func(prefix []int, next, left int)
	rec = func(prefix []int, next, left int) {
		if left == 0 {
			out = append(out, slices.Clone(prefix))
			return
		}
		for i := next; i < n; i++ {
			rec(append(prefix, i), i, left-1)
		}
	}
	rec(nil, 0, r)
	// drop those with an odd number of 0s
	res := out[:0]
	for _, idx := range out {
		z := 0
		for _, i := range idx {
			if i == 0 {
				z++
			}
		}
		if z%2 == 0 {
			res = append(res, idx)
		}
	}
	return res
}
