package match

import (
	"testing"

	"loopmatch/expr/notation"
)

// benchMatch measures the whole match of the first block of a file, parsing included.
func benchMatch(b *testing.B, path string) {
	for i := 0; i < b.N; i++ {
		p, err := notation.ParseFile(path)
		if err != nil {
			b.Fatal(err)
		}
		if _, err := Run(p, p.Matches[0], Options{}); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkMatchDemoDipole(b *testing.B)   { benchMatch(b, "../testdata/dipole_vlf.lm") }
func BenchmarkMatchDemoBox(b *testing.B)      { benchMatch(b, "../testdata/box_vlf.lm") }
func BenchmarkMatchSMDeltaF2(b *testing.B)    { benchMatch(b, "../testdata/sm/deltaf2_box.lm") }
func BenchmarkMatchSMBsGamma(b *testing.B)    { benchMatch(b, "../testdata/sm/bsgamma.lm") }
func BenchmarkMatchSMRhoTwoLoop(b *testing.B) { benchMatch(b, "../testdata/sm/rho_twoloop.lm") }
