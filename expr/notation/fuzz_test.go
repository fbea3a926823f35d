package notation

import (
	"errors"
	"os"
	"path/filepath"
	"testing"
)

// FuzzParse feeds arbitrary bytes to the parser: it must never panic, and every failure must be
// a positioned *Error (or a plain I/O-free error naming the file). Seeds: the shipped example
// files and the committed corpus in testdata/fuzz/FuzzParse.
func FuzzParse(f *testing.F) {
	files, _ := filepath.Glob("../../testdata/*.lm")
	for _, name := range files {
		if b, err := os.ReadFile(name); err == nil {
			f.Add(b)
		}
	}
	for _, s := range []string{
		"", "#", "masses M\namplitude X = loop k { 1/(k^2 - M^2)^2 }",
		"amplitude X = ((((", "couplings g\namplitude X = g^-64", "momenta p\namplitude X = p.p.p",
		"index a\namplitude X = g(a, a)*g(a, a)", "amplitude X = log(0)", "amplitude X = 1/0",
		"amplitude X = sqrt(-4) Li2(1/2) Cl2(pi)", "masses M\namplitude X = B0(1; M, M) C0(0,0,0;M,M,M)",
	} {
		f.Add([]byte(s))
	}
	f.Fuzz(func(t *testing.T, src []byte) {
		p, err := Parse("fuzz.lm", src)
		if err != nil {
			var pe *Error
			if !errors.As(err, &pe) {
				t.Fatalf("error without position: %v", err)
			}
			return
		}
		// Everything that parses prints and parses back to itself (small amplitudes only, to
		// keep executions fast; TestRoundTrip covers the large shipped ones).
		for _, a := range p.Amplitudes {
			if a.Body.Len() > 8 {
				continue
			}
			back, err := p.ParseExpr(a.Body.String())
			if err != nil {
				t.Fatalf("reparse of %q: %v", a.Body.String(), err)
			}
			if !back.Equal(a.Body) {
				t.Fatalf("round trip changed %q into %q", a.Body.String(), back.String())
			}
		}
	})
}
