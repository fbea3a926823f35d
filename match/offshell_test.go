package match

import (
	"strings"
	"testing"

	"loopmatch/expr/notation"
)

// TestOffShellEOM is the "done when" item 4: an off-shell match (amputated Green function, no
// Dirac equation and no mass shell at the legs) onto a basis with the operator QE, which the
// equations of motion reduce on shell, gives after the equations of motion the coefficients of
// the on-shell heavy-mass match (testdata/offshell_vector.lm: heavy vector exchange between
// non-conserved currents). The two matches share no step that knows about the equations of
// motion: the on-shell one applies the Dirac equation to the amplitude, the off-shell one
// projects QE's on-shell matrix element onto the physical operators. The expected values are
// derived by hand in the file (expect lines), and the statement that operators vanishing by
// the equations of motion only shift on-shell coefficients is H.D. Politzer, Nucl. Phys. B172
// (1980) 349 (cited from memory; common practice).
func TestOffShellEOM(t *testing.T) {
	_, rs := runBlocks(t, "../testdata/offshell_vector.lm")
	on, off := rs[0], rs[1]
	byName := map[string]Coefficient{}
	for _, c := range off.Coeffs {
		byName[c.Operator] = c
	}
	for _, c := range on.Coeffs {
		o, ok := byName[c.Operator]
		if !ok {
			t.Errorf("C_%s missing after the equations of motion", c.Operator)
			continue
		}
		if !o.Value.Equal(c.Value) {
			t.Errorf("C_%s: off shell after EOM %s, on shell %s", c.Operator, o.Value, c.Value)
		}
	}
	// the off-shell basis is reported on request, with QE nonzero and QS zero there
	qe, ok1 := byName["QE (off shell)"]
	qs, ok2 := byName["QS (off shell)"]
	if !ok1 || !ok2 || qe.Value.IsZero() || !qs.Value.IsZero() {
		t.Errorf("off-shell coefficients: %+v", off.Coeffs)
	}
	if len(off.Coeffs) != 3+4 {
		t.Errorf("%d coefficients, want 3 on shell and 4 off shell", len(off.Coeffs))
	}
	found := false
	for _, n := range off.Notes {
		found = found || strings.HasPrefix(n, "equations of motion (on-shell matrix elements): QE = ")
	}
	if !found {
		t.Errorf("no note of the equations of motion: %v", off.Notes)
	}
}

// TestOffShellEOMErrors checks the error for an eom operator whose on-shell matrix element the
// remaining operators do not span.
func TestOffShellEOMErrors(t *testing.T) {
	p, err := notation.ParseFile("../testdata/offshell_vector.lm")
	if err != nil {
		t.Fatal(err)
	}
	mb := *p.Matches[1]
	mb.Ops = []string{"QV", "QD", "QE"} // QS missing: QE's on-shell matrix element is not spanned
	if _, err := Run(p, &mb, Options{}); err == nil || !strings.Contains(err.Error(), "the on-shell matrix element of the eom operator QE is not a combination of QV, QD") {
		t.Errorf("error %v", err)
	}
}
