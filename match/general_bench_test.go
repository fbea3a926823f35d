package match

import (
	"os"
	"strings"
	"testing"

	"loopmatch/expr/notation"
)

// benchRoute measures the whole match of one block of a source (parsing included), with the
// source rewritten by the replacements (old, new pairs) first.
func benchRoute(b *testing.B, path string, block int, repl ...string) {
	src, err := os.ReadFile(path)
	if err != nil {
		b.Fatal(err)
	}
	s := string(src)
	for i := 0; i+1 < len(repl); i += 2 {
		if !strings.Contains(s, repl[i]) {
			b.Fatalf("%s: %q not found", path, repl[i])
		}
		s = strings.Replace(s, repl[i], repl[i+1], 1)
	}
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		p, err := notation.Parse(path, []byte(s))
		if err != nil {
			b.Fatal(err)
		}
		if _, err := Run(p, p.Matches[block], Options{}); err != nil {
			b.Fatal(err)
		}
	}
}

// The same diagrams on the two routes: the demo dipole (on-shell legs, m1 kept exactly on the
// general route), the Standard Model b → sγ (m_b kept exactly, regulator checks at m_b/10 and
// m_b/100), and the model of general_offshell.lm (off-shell momenta against their expansion).

func BenchmarkRouteDipoleHeavy(b *testing.B) { benchRoute(b, "../testdata/dipole_vlf.lm", 0) }
func BenchmarkRouteDipoleGeneral(b *testing.B) {
	benchRoute(b, "../testdata/dipole_vlf.lm", 0, "  expand         p, q, m1 to order 2\n", "  route general\n")
}
func BenchmarkRouteBsGammaHeavy(b *testing.B) { benchRoute(b, "../testdata/sm/bsgamma.lm", 0) }
func BenchmarkRouteBsGammaGeneral(b *testing.B) {
	benchRoute(b, "../testdata/sm/bsgamma.lm", 0,
		"  expand         p, q, mb to order 2\n", "  route          general\n  regulator      mb\n  scale          mu = mW\n",
		"operator Q7", "values mW = 80.4, mt = 160.8, mb = 0.0048\noperator Q7")
}
func BenchmarkRouteOffShellGeneral(b *testing.B) { benchRoute(b, "../testdata/general_offshell.lm", 0) }
func BenchmarkRouteOffShellHeavy(b *testing.B)   { benchRoute(b, "../testdata/general_offshell.lm", 1) }
func BenchmarkRouteLightGeneral(b *testing.B)    { benchRoute(b, "../testdata/general_light.lm", 0) }
func BenchmarkRouteLightHeavy(b *testing.B)      { benchRoute(b, "../testdata/general_light.lm", 1) }
