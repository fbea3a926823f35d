package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestReduceGeneral checks the general route of reduce (no --expand): ∫ k·p /((k² − M²)((k + p)² − m²))
// with p² = m² is p² B1 = [A0(M) − A0(m) − M² B0(m²; M, m)]/2 times i/(16π²), from
// B1 = [A0(m0) − A0(m1) − (p² − m1² + m0²) B0]/(2p²) (A. Denner, Fortschr. Phys. 41 (1993) 307,
// eq. (4.18), as in PHYSICS.md); a raised propagator with two distinct momenta is refused with
// the amplitude's position.
func TestReduceGeneral(t *testing.T) {
	dir := t.TempDir()
	f := filepath.Join(dir, "b1.lm")
	src := `masses M
light m
momenta p
external x : scalar in momentum p mass m
external y : scalar out momentum p mass m
amplitude b1 = loop k { k.p / ((k^2 - M^2)*((k + p)^2 - m^2)) }
`
	if err := os.WriteFile(f, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	out, errOut, code := runCLI("reduce", f)
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	for _, want := range []string{
		"[Bub(m^2; M^2, m^2)]\n    - M^2/32*I/pi^2",
		"[Tad(M^2)]\n      1/32*I/pi^2",
		"[Tad(m^2)]\n    - 1/32*I/pi^2",
	} {
		if !strings.Contains(out, want) {
			t.Errorf("output lacks %q:\n%s", want, out)
		}
	}
	out, _, code = runCLI("reduce", f, "--format", "json")
	if code != exitOK || !strings.Contains(out, `"integral": "Bub(m^2; M^2, m^2)"`) {
		t.Errorf("json: exit %d\n%s", code, out)
	}
	bad := filepath.Join(dir, "raised.lm")
	src = `masses M
momenta p
external x : scalar in momentum p mass 0
external y : scalar out momentum p mass 0
amplitude r = loop k { 1/((k^2 - M^2)^2*((k + p)^2 - M^2)) }
`
	if err := os.WriteFile(bad, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	_, errOut, code = runCLI("reduce", bad)
	if code != exitBadInput || !strings.Contains(errOut, bad+":5:1: amplitude r:") || !strings.Contains(errOut, "raised propagator power") {
		t.Errorf("raised power: exit %d, %q", code, errOut)
	}
}
