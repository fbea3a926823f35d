package notation

import (
	"errors"
	"math/big"
	"strings"
	"testing"
)

// admHeader declares one operator, so that blocks can mix operators of the file and labels.
const admHeader = `momenta p
external a : fermion in momentum p mass 0
external b : fermion out momentum p mass 0
operator Q1 = bar(b) a
`

// The current-current block in Nc and nf: γ±^{(0)} = ±6(N∓1)/N, γ±^{(1)} =
// (N∓1)/(2N)(−21 ± 57/N ∓ 19N/3 ± 4nf/3) in Q± = (Q2 ± Q1)/2 (G. Buchalla, A.J. Buras,
// M.E. Lautenbacher, Rev. Mod. Phys. 68 (1996) 1125, section VI; from memory), written in
// (Q1, Q2) as γ11 = γ22 = (γ+ + γ−)/2, γ12 = γ21 = (γ+ − γ−)/2.
const admBlockSrc = admHeader + `
define unused = 1
anomalous cc onto Q1, Q2:
  scheme  MSbar NDR
  initial Q2 = 1, Q1 = 1/10
  row 0 Q1: -6/Nc, 6
  row 0 Q2: 6, -6/Nc
  row 1 Q1: ((Nc-1)/(2*Nc)*(-21 + 57/Nc - 19*Nc/3 + 4*nf/3) + (Nc+1)/(2*Nc)*(-21 - 57/Nc + 19*Nc/3 - 4*nf/3))/2,
            ((Nc-1)/(2*Nc)*(-21 + 57/Nc - 19*Nc/3 + 4*nf/3) - (Nc+1)/(2*Nc)*(-21 - 57/Nc + 19*Nc/3 - 4*nf/3))/2
  row 1 Q2: ((Nc-1)/(2*Nc)*(-21 + 57/Nc - 19*Nc/3 + 4*nf/3) - (Nc+1)/(2*Nc)*(-21 - 57/Nc + 19*Nc/3 - 4*nf/3))/2,
            ((Nc-1)/(2*Nc)*(-21 + 57/Nc - 19*Nc/3 + 4*nf/3) + (Nc+1)/(2*Nc)*(-21 - 57/Nc + 19*Nc/3 - 4*nf/3))/2
anomalous one onto Q3:
  for nf = 5, Nc = 3
  row 0 Q3: 32/3
`

// TestADMBlock parses a block and evaluates it exactly: at Nc = 3 the two-loop entries are
// γ11 = −21/2 − 2nf/9 and γ12 = 7/2 + 2nf/3, the values printed by Buchalla, Buras,
// Lautenbacher (same section; from memory), and the LO eigenvalues are γ+ = 4, γ− = −8.
func TestADMBlock(t *testing.T) {
	p, err := Parse("t.lm", []byte(admBlockSrc))
	if err != nil {
		t.Fatal(err)
	}
	if n := len(p.ADMs()); n != 2 {
		t.Fatalf("%d blocks, want 2", n)
	}
	b, ok := p.ADM("cc")
	if !ok {
		t.Fatal("block cc not found")
	}
	if b.Orders() != 2 || strings.Join(b.Ops, ",") != "Q1,Q2" || strings.Join(b.Scheme, " ") != "MSbar NDR" {
		t.Errorf("block: orders %d, ops %v, scheme %v", b.Orders(), b.Ops, b.Scheme)
	}
	if strings.Join(b.InitialOrder, ",") != "Q2,Q1" || b.Initial["Q1"].String() != "1/10" {
		t.Errorf("initial: %v %v", b.InitialOrder, b.Initial)
	}
	if b.Pos.String() != "t.lm:7:1" {
		t.Errorf("position %s", b.Pos)
	}
	cases := []struct {
		order, nc, nf int
		want          [][]string
	}{
		{0, 3, 5, [][]string{{"-2", "6"}, {"6", "-2"}}},
		{0, 4, 0, [][]string{{"-3/2", "6"}, {"6", "-3/2"}}},
		{1, 3, 5, [][]string{{"-209/18", "41/6"}, {"41/6", "-209/18"}}}, // −21/2 − 10/9, 7/2 + 10/3
		{1, 3, 0, [][]string{{"-21/2", "7/2"}, {"7/2", "-21/2"}}},
	}
	for _, c := range cases {
		g, err := b.At(c.order, c.nc, c.nf)
		if err != nil {
			t.Fatal(err)
		}
		for i := range c.want {
			for j := range c.want[i] {
				want, _ := new(big.Rat).SetString(c.want[i][j])
				if g[i][j].Cmp(want) != 0 {
					t.Errorf("γ^(%d)[%d][%d] at Nc=%d nf=%d: %s, want %s", c.order, i, j, c.nc, c.nf, g[i][j].RatString(), c.want[i][j])
				}
			}
		}
	}
	one, _ := p.ADM("one")
	if one.Orders() != 1 || one.Fixed["nf"] != 5 || one.Fixed["Nc"] != 3 {
		t.Errorf("block one: %d orders, fixed %v", one.Orders(), one.Fixed)
	}
	if _, err := one.At(0, 3, 4); err == nil || !strings.Contains(err.Error(), "holds for nf = 5 only, not nf = 4") {
		t.Errorf("block one at nf = 4: %v", err)
	}
	if _, err := one.At(1, 3, 5); err == nil || !strings.Contains(err.Error(), "no rows of order 1") {
		t.Errorf("block one at order 1: %v", err)
	}
	// A block name is not a declaration: using it in an expression is an undeclared name.
	if _, err := Parse("t.lm", []byte(admBlockSrc+"amplitude A = cc\n")); err == nil || !strings.Contains(err.Error(), "undeclared name cc") {
		t.Errorf("block name in an expression: %v", err)
	}
}

// A singular entry is reported at the entry when the block is evaluated there.
func TestADMSingular(t *testing.T) {
	p, err := Parse("t.lm", []byte(admHeader+"anomalous g onto Q1:\n  row 0 Q1: 1/(nf - 3)\n"))
	if err != nil {
		t.Fatal(err)
	}
	b, _ := p.ADM("g")
	if _, err := b.At(0, 3, 4); err != nil {
		t.Fatal(err)
	}
	_, err = b.At(0, 3, 3)
	var pe *Error
	if !errors.As(err, &pe) || pe.Pos.String() != "t.lm:6:13" || !strings.Contains(pe.Msg, "singular at Nc = 3, nf = 3") {
		t.Errorf("singular entry: %v", err)
	}
}

// TestADMErrors: every malformed block gives a positioned error that says what is wrong.
func TestADMErrors(t *testing.T) {
	block := func(lines ...string) string {
		return admHeader + "anomalous g onto Q1, Q2:\n" + strings.Join(lines, "\n") + "\n"
	}
	cases := []struct {
		name, src, want string
	}{
		{"missing row", block("  row 0 Q1: 1, 2"), "t.lm:5:1: anomalous: block g has no row 0 for Q2"},
		{"missing NLO row", block("  row 0 Q1: 1, 2", "  row 0 Q2: 1, 2", "  row 1 Q2: 1, 2"), "t.lm:5:1: anomalous: block g has no row 1 for Q1"},
		{"duplicate row", block("  row 0 Q1: 1, 2", "  row 0 Q1: 1, 2"), "t.lm:7:3: anomalous: a second row 0 for Q1 in block g (the first is at 6:3)"},
		{"order 2", block("  row 2 Q1: 1, 2"), "t.lm:6:3: anomalous: expected row 0 (γ^(0)) or row 1 (γ^(1)), found row 2"},
		{"fractional order", block("  row 0.5 Q1: 1, 2"), "found row 0.5"},
		{"unknown row operator", block("  row 0 Q3: 1, 2"), "t.lm:6:9: anomalous: Q3 is not an operator of block g (onto Q1, Q2)"},
		{"entry count", block("  row 0 Q1: 1, 2, 3"), "t.lm:6:3: anomalous: row 0 Q1 has 3 entries, block g has 2 operators"},
		{"symbol entry", "symbols x\n" + block("  row 0 Q1: x, 2"), "t.lm:7:13: anomalous: an entry may depend on Nc and nf only, found x in x"},
		{"transcendental entry", block("  row 0 Q1: pi, 2"), "t.lm:6:13: anomalous: an entry must be a rational number or a rational function of Nc and nf, found pi"},
		{"log entry", block("  row 0 Q1: log(nf), 2"), "found log(nf)"},
		{"vector entry", block("  row 0 Q1: p, 2"), "t.lm:6:13: anomalous: an entry must be a rational number"},
		{"undeclared in entry", block("  row 0 Q1: nff, 2"), "t.lm:6:13: undeclared name nff"},
		{"syntax", block("  row 0 Q1 1, 2"), "t.lm:6:12: expected \":\", found \"1\""},
		{"operator twice", admHeader + "anomalous g onto Q1, Q1:\n", "t.lm:5:22: anomalous: operator Q1 is listed twice in block g"},
		{"not an operator", admHeader + "anomalous g onto p:\n", "t.lm:5:18: anomalous: p is a momentum (declared at t.lm:1:9), not an operator"},
		{"builtin operator", admHeader + "anomalous g onto Nc:\n", "t.lm:5:18: anomalous: Nc is a built-in name"},
		{"nf operator", admHeader + "anomalous g onto nf:\n", "anomalous: nf is the number of active flavours"},
		{"second block", block("  row 0 Q1: 1, 2", "  row 0 Q2: 1, 2") + "anomalous g onto Q1:\n  row 0 Q1: 1\n", "t.lm:8:1: anomalous: a second block named g (the first is at t.lm:5:1)"},
		{"for name", block("  for Nf = 5"), "t.lm:6:7: anomalous: for fixes Nc or nf, found Nf"},
		{"for range", block("  for nf = 7"), "t.lm:6:12: anomalous: nf must be an integer from 0 to 6, found 7"},
		{"for fraction", block("  for Nc = 5/2"), "Nc must be an integer from 2 to 100, found 5/2"},
		{"for twice", block("  for nf = 5, nf = 4"), "t.lm:6:15: anomalous: nf is fixed twice"},
		{"second for", block("  for nf = 5", "  for Nc = 3"), "t.lm:7:3: anomalous: a second for line in block g (the first is at 6:3)"},
		{"scheme word", block("  scheme NDRR"), "t.lm:6:10: anomalous: scheme: unknown word NDRR (known: MSbar, NDR, HV)"},
		{"second scheme", block("  scheme NDR", "  scheme HV"), "a second scheme line"},
		{"initial unknown", block("  initial Q3 = 1"), "t.lm:6:11: anomalous: initial: Q3 is not an operator of block g"},
		{"initial twice", block("  initial Q1 = 1", "  initial Q1 = 2"), "t.lm:7:11: anomalous: initial: a second value for Q1"},
		{"initial loop", block("  initial Q1 = loop k { 1/(k^2 - 1)^3 }"), "a loop integral is not allowed here"},
		{"singular at fixed values", block("  for nf = 3, Nc = 3", "  row 0 Q1: 1/(nf - 3), 2", "  row 0 Q2: 1, 2"), "t.lm:7:13: anomalous: γ^(0) entry (Q1, Q1) of block g is singular at Nc = 3, nf = 3"},
		{"keyword as block name", admHeader + "anomalous for onto Q1:\n", "expected a name, found the keyword \"for\""},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := Parse("t.lm", []byte(c.src))
			if err == nil {
				t.Fatalf("no error for\n%s", c.src)
			}
			if !strings.Contains(err.Error(), c.want) {
				t.Errorf("error %q does not contain %q", err.Error(), c.want)
			}
		})
	}
}
