package passarino

import (
	"testing"

	"loopmatch/expr/notation"
)

// BenchmarkHeavyExpansion expands a three-propagator integrand with two heavy masses (a vertex
// with a fermion line, rank 2 in the numerator) to second order in two external momenta and
// reduces it to vacuum integrals exactly in d (issue aim: under 50 ms).
func BenchmarkHeavyExpansion(b *testing.B) {
	p, err := notation.Parse("b.lm", []byte(`
masses M1 M2
index al
momenta p q
amplitude V = loop k { (k + p).(k + p + q) * k.q / ((k^2 - M1^2) * ((k + p)^2 - M2^2) * ((k + p + q)^2 - M1^2)) }
`))
	if err != nil {
		b.Fatal(err)
	}
	a, _ := p.Amplitude("V")
	s := Small{Momenta: []string{"p", "q"}, Order: 2}
	for b.Loop() {
		if _, _, err := Heavy(a.Body, s); err != nil {
			b.Fatal(err)
		}
	}
}
