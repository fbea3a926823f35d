package match

import (
	"strings"
	"testing"

	"loopmatch/expr/notation"
)

func TestKinematics(t *testing.T) {
	p, err := notation.ParseFile("../testdata/dipole_vlf.lm")
	if err != nil {
		t.Fatal(err)
	}
	k, err := NewKinematics(p.Legs)
	if err != nil {
		t.Fatal(err)
	}
	// p² = m1², (p − q)² = 0, q² = 0, eA·q = 0 ⇒ p.q = m1²/2.
	got := strings.Join(k.Rules(), "; ")
	want := "eA.q = 0; p.p = m1^2; p.q = m1^2/2; q.q = 0"
	if got != want {
		t.Errorf("rules %q, want %q", got, want)
	}
	// 2 → 2 massless scattering keeps two invariants.
	q, err := notation.ParseFile("../testdata/tree_scalar.lm")
	if err != nil {
		t.Fatal(err)
	}
	k2, err := NewKinematics(q.Legs)
	if err != nil {
		t.Fatal(err)
	}
	if len(k2.Free()) != 2 {
		t.Errorf("free invariants %v, rules %v", k2.Free(), k2.Rules())
	}
}
