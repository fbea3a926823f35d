package main

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"loopmatch/expr"
	"loopmatch/expr/notation"
	"loopmatch/match"
	"loopmatch/match/running"
)

// The magic numbers a_i, h_i of A.J. Buras, M. Misiak, M. Münz, S. Pokorski, Nucl. Phys. B424
// (1994) 374 as printed (the four exact fractions, the rest to four decimals; h = −0.0185 for
// a = −0.8994 as in the paper, PHYSICS.md's −0.0186 being a typo), and their formula
// C7(μ_b) = η^{16/23} C7(μ_W) + (8/3)(η^{14/23} − η^{16/23}) C8(μ_W) + Σ h_i η^{a_i} C2(μ_W),
// η = αs(μ_W)/αs(μ_b).
var magicA = []float64{14.0 / 23, 16.0 / 23, 6.0 / 23, -12.0 / 23, 0.4086, -0.4230, -0.8994, 0.1456}
var magicH = []float64{626126.0 / 272277, -56281.0 / 51730, -3.0 / 7, -1.0 / 14, -0.6494, -0.0380, -0.0185, -0.0057}

func magicC7(eta, c7, c8 float64) float64 {
	c := math.Pow(eta, 16.0/23)*c7 + 8.0/3*(math.Pow(eta, 14.0/23)-math.Pow(eta, 16.0/23))*c8
	for i := range magicA {
		c += magicH[i] * math.Pow(eta, magicA[i])
	}
	return c
}

// Standard Model matching at x_t = 4 (PHYSICS.md: C7 = −D'0(4)/2, C8 = −E'0(4)/2, Inami–Lim
// functions in the conventions of A.J. Buras, hep-ph/9806471).
const smC7, smC8 = -0.18578056, -0.09426583

func evolveJSON(t *testing.T, args ...string) jsonEvolution {
	t.Helper()
	out, errOut, code := runCLI(append([]string{"evolve", "--format", "json"}, args...)...)
	if code != exitOK {
		t.Fatalf("evolve %v: exit %d: %s", args, code, errOut)
	}
	var j jsonEvolution
	if err := json.Unmarshal([]byte(out), &j); err != nil {
		t.Fatalf("%v\n%s", err, out)
	}
	return j
}

func coeff(t *testing.T, j jsonEvolution, op string) float64 {
	t.Helper()
	for _, c := range j.Coefficients {
		if c.Operator == op {
			if c.Value[1] != 0 {
				t.Errorf("%s has an imaginary part %g", op, c.Value[1])
			}
			return c.Value[0]
		}
	}
	t.Fatalf("no coefficient %s in %+v", op, j.Coefficients)
	return 0
}

// checkC7 compares C7(μ_b) with the magic-number formula at the η the run reports, to 1e-4
// (issue 8), and the enlargement of |C7| with the loose band of PHYSICS.md (common practice, no
// source: roughly 50 to 60 %, taken as 45 to 65 %). The reported αs are checked against the
// closed one-loop form, so η does not rest on the run alone.
func checkC7(t *testing.T, j jsonEvolution, c7 float64) {
	t.Helper()
	for _, s := range []struct{ mu, got float64 }{{j.From, j.AlphaSFrom}, {j.To, j.AlphaSTo}} {
		want, err := running.AlphaS1Loop(5, 0.118, 91.1876, s.mu)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(s.got-want) > 1e-12 {
			t.Errorf("αs(%g) = %.15f, one-loop closed form %.15f", s.mu, s.got, want)
		}
	}
	eta := j.AlphaSFrom / j.AlphaSTo
	got, want := coeff(t, j, "Q7"), magicC7(eta, c7, smC8)
	t.Logf("η = %.5f: C7(μ_b) = %.6f, magic-number formula %.6f, enlargement %.3f", eta, got, want, got/c7)
	if math.Abs(got-want) > 1e-4 {
		t.Errorf("C7(μ_b) = %.6f, magic-number formula %.6f", got, want)
	}
	if r := got / c7; r < 1.45 || r > 1.65 {
		t.Errorf("|C7| enlarged by %.3f, outside the loose band 1.45 to 1.65", r)
	}
}

// TestEvolveC7: LO evolution of C7 from μ_W = 80.4 GeV to μ_b = 4.8 GeV through the command
// line, with the shipped table, against the magic-number formula (issue 8).
func TestEvolveC7(t *testing.T) {
	j := evolveJSON(t, "--table", "deltaf1_dipole_lo", "--from", "80.4", "--to", "4.8", "--order", "lo",
		"--alphas-mz", "0.118", "--initial", "Q2=1,Q7=-0.18578056,Q8=-0.09426583")
	if j.Order != "LO" || j.AlphaSLoops != 1 || len(j.Flavours) != 1 || j.Flavours[0] != 5 {
		t.Errorf("assumed: order %s, %d-loop αs, flavours %v", j.Order, j.AlphaSLoops, j.Flavours)
	}
	checkC7(t, j, smC7)
}

// TestMatchEvolveTo chains both steps: the Standard Model b → sγ match of testdata/sm/bsgamma.lm
// at μ_W = M_W with x_t = 4, then --evolve-to 4.8 with an anomalous block added to the file
// (the shipped 8×8 table, with C2 = 1 and C8 as initial values), against the magic-number
// formula with the matched C7.
func TestMatchEvolveTo(t *testing.T) {
	src, err := os.ReadFile("../../testdata/sm/bsgamma.lm")
	if err != nil {
		t.Fatal(err)
	}
	table, err := running.TableSource("tables/deltaf1_lo.lm")
	if err != nil {
		t.Fatal(err)
	}
	_, dipole, ok := strings.Cut(string(table), "anomalous deltaf1_dipole_lo onto Q1, Q2, Q3, Q4, Q5, Q6, Q7, Q8:\n")
	if !ok {
		t.Fatal("shipped table: block deltaf1_dipole_lo not found")
	}
	block := "\nanomalous dipole onto Q1, Q2, Q3, Q4, Q5, Q6, Q7, Q8:\n  initial Q2 = 1, Q8 = -0.09426583\n" + dipole
	f := filepath.Join(t.TempDir(), "bsgamma_run.lm")
	if err := os.WriteFile(f, append(src, block...), 0o644); err != nil {
		t.Fatal(err)
	}
	out, errOut, code := runCLI("match", f, "--set", "mt=2*80.4,mW=80.4,mb=4.8,mu=80.4", "--evolve-to", "4.8", "--format", "json")
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	var doc struct {
		Match struct {
			Matches []struct {
				Coefficients []struct {
					Operator string     `json:"operator"`
					Value    [2]float64 `json:"value"`
				} `json:"coefficients"`
			} `json:"matches"`
		} `json:"match"`
		Evolution []jsonEvolution `json:"evolution"`
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatalf("%v\n%s", err, out)
	}
	if len(doc.Evolution) != 1 || len(doc.Match.Matches) != 1 {
		t.Fatalf("%d evolutions, %d matches", len(doc.Evolution), len(doc.Match.Matches))
	}
	c7 := doc.Match.Matches[0].Coefficients[0].Value[0]
	if math.Abs(c7-smC7) > 1e-8 {
		t.Errorf("matched C7 = %.10f, want %.8f", c7, smC7)
	}
	ev := doc.Evolution[0]
	if ev.From != 80.4 || ev.To != 4.8 || ev.Block != "dipole" {
		t.Errorf("evolution from %g to %g with block %s", ev.From, ev.To, ev.Block)
	}
	for _, c := range ev.Coefficients {
		want := map[string]string{"Q2": "file", "Q7": "match", "Q8": "file"}[c.Operator]
		if want == "" {
			want = "zero"
		}
		if c.Origin != want {
			t.Errorf("%s: initial value from %s, want %s", c.Operator, c.Origin, want)
		}
	}
	checkC7(t, ev, c7)
	// The text output prints the match and then the evolution.
	text, _, code := runCLI("match", f, "--set", "mt=2*80.4,mW=80.4,mb=4.8,mu=80.4", "--evolve-to", "4.8")
	if code != exitOK || !strings.Contains(text, "C_Q7 = -0.18578056") || !strings.Contains(text, "evolution (--evolve-to)") ||
		!strings.Contains(text, "initial values: Q2 (file), Q7 (match), Q8 (file); the others 0") {
		t.Errorf("text output:\n%s", text)
	}
}

// TestEvolveCurrentCurrent: LO evolution of (C1, C2) = (0, 1) with the shipped current-current
// table (entries in Nc and nf) against the closed form C±(μ) = η^{γ±/(2β0)} C±(μ0),
// C± = C2 ± C1, γ+ = 4, γ− = −8, 2β0 = 46/3 at nf = 5 (A.J. Buras, hep-ph/9806471, section on
// current-current operators); across the b threshold the windows multiply.
func TestEvolveCurrentCurrent(t *testing.T) {
	cases := []struct {
		to   float64
		flav []int
	}{{4.8, []int{5}}, {2.0, []int{5, 4}}}
	for _, c := range cases {
		j := evolveJSON(t, "--table", "current_current", "--from", "80.4", "--to", strconv.FormatFloat(c.to, 'g', -1, 64), "--order", "lo", "--initial", "Q2=1")
		if len(j.Flavours) != len(c.flav) || j.Flavours[len(j.Flavours)-1] != c.flav[len(c.flav)-1] {
			t.Fatalf("flavours on the path %v, want %v", j.Flavours, c.flav)
		}
		var eta float64
		var cp, cm float64
		if len(c.flav) == 1 {
			eta = j.AlphaSFrom / j.AlphaSTo
			cp, cm = math.Pow(eta, 6.0/23), math.Pow(eta, -12.0/23)
		} else {
			// 1-loop αs is continuous at m_b = 4.18 GeV.
			ab, err := running.AlphaS1Loop(5, 0.118, 91.1876, 4.18)
			if err != nil {
				t.Fatal(err)
			}
			e5, e4 := j.AlphaSFrom/ab, ab/j.AlphaSTo
			cp = math.Pow(e5, 6.0/23) * math.Pow(e4, 6.0/25) // 2β0 = 50/3 at nf = 4
			cm = math.Pow(e5, -12.0/23) * math.Pow(e4, -12.0/25)
		}
		c1, c2 := coeff(t, j, "Q1"), coeff(t, j, "Q2")
		if math.Abs(c1-(cp-cm)/2) > 1e-12 || math.Abs(c2-(cp+cm)/2) > 1e-12 {
			t.Errorf("to %g GeV: (C1, C2) = (%.15f, %.15f), closed form (%.15f, %.15f)", c.to, c1, c2, (cp-cm)/2, (cp+cm)/2)
		}
	}
}

// Complex coefficients run as real and imaginary parts: the map is real-linear.
func TestEvolveComplex(t *testing.T) {
	re := evolveJSON(t, "--table", "deltaf2", "--from", "1000", "--to", "5", "--initial", "QVLL=1")
	z := evolveJSON(t, "--table", "deltaf2", "--from", "1000", "--to", "5", "--initial", "QVLL=2*I")
	if re.Order != "NLO" || re.Scheme != "MSbar NDR" || re.AlphaSLoops != 2 || re.DecouplingLoops != 1 {
		t.Errorf("default for an NLO table: order %s, scheme %q, %d-loop αs, %d-loop decoupling", re.Order, re.Scheme, re.AlphaSLoops, re.DecouplingLoops)
	}
	r, c := re.Coefficients[0].Value, z.Coefficients[0].Value
	if c[0] != 0 || math.Abs(c[1]-2*r[0]) > 1e-14 || r[1] != 0 {
		t.Errorf("1 → %v, 2i → %v", r, c)
	}
}

// degenerateBlock has 2β0 + γ1 − γ2 = 0 at nf = 5 (2β0 = 46/3) and a γ^(1) that mixes the two.
const degenerateBlock = `anomalous deg onto A, B:
  scheme NDR
  initial A = 1, B = 1/2
  row 0 A: 49/3, 0
  row 0 B: 0, 1
  row 1 A: 3, 25
  row 1 B: -40, 7
`

func writeFile(t *testing.T, name, src string) string {
	t.Helper()
	f := filepath.Join(t.TempDir(), name)
	if err := os.WriteFile(f, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	return f
}

// TestEvolveExitCodes: 0 on success, 2 for anything a user can get wrong, with a message that
// says what.
func TestEvolveExitCodes(t *testing.T) {
	dir := t.TempDir()
	write := func(name, src string) string {
		f := filepath.Join(dir, name)
		if err := os.WriteFile(f, []byte(src), 0o644); err != nil {
			t.Fatal(err)
		}
		return f
	}
	deg := write("deg.lm", degenerateBlock)
	two := write("two.lm", degenerateBlock+"anomalous other onto A:\n  row 0 A: 1\n")
	none := write("none.lm", "symbols x\n")
	bad := write("bad.lm", "anomalous g onto A:\n  row 0 A 1\n")
	tree := "../../testdata/tree_scalar.lm"
	withValues := write("values.lm", "symbols c0 c1\nvalues c0 = 1/2\nanomalous g onto A:\n  initial A = 2*c0\n  row 0 A: 4\n")
	noValue := write("novalue.lm", "symbols c0 c1\nanomalous g onto A:\n  initial A = c1\n  row 0 A: 4\n")
	cases := []struct {
		args    []string
		code    int
		errPart string
	}{
		{[]string{deg, "--from", "80", "--to", "10", "--order", "lo"}, exitOK, ""},
		{[]string{deg, "--from", "80", "--to", "10", "--nlo-form", "expanded"}, exitOK, ""},
		{[]string{deg, "--from", "80", "--to", "10"}, exitBadInput, "run with --nlo-form expanded"},
		{[]string{"--tables"}, exitOK, ""},
		{[]string{deg, "--to", "10"}, exitBadInput, "--from is required"},
		{[]string{deg, "--from", "-3", "--to", "10"}, exitBadInput, "--from: expected a positive scale in GeV"},
		{[]string{deg, "--from", "80", "--to", "x"}, exitBadInput, "--to: expected a positive scale"},
		{[]string{"--from", "80", "--to", "10"}, exitBadInput, "expected one FILE argument"},
		{[]string{deg, "--table", "deltaf2", "--from", "80", "--to", "10"}, exitBadInput, "not both"},
		{[]string{"--table", "nosuch", "--from", "80", "--to", "10"}, exitBadInput, "no shipped table"},
		{[]string{filepath.Join(dir, "missing.lm"), "--from", "80", "--to", "10"}, exitBadInput, "cannot read"},
		{[]string{bad, "--from", "80", "--to", "10"}, exitBadInput, "bad.lm:2:11: expected \":\""},
		{[]string{none, "--from", "80", "--to", "10"}, exitBadInput, "has no anomalous block"},
		{[]string{two, "--from", "80", "--to", "10"}, exitBadInput, "2 anomalous blocks (deg, other): choose one with --block"},
		{[]string{two, "--block", "other", "--from", "80", "--to", "10"}, exitOK, ""},
		{[]string{two, "--block", "x", "--from", "80", "--to", "10"}, exitBadInput, "has no anomalous block x (it has deg, other)"},
		{[]string{deg, "--from", "80", "--to", "10", "--initial", "C=1"}, exitBadInput, "--initial: C is not an operator of block deg"},
		{[]string{deg, "--from", "80", "--to", "10", "--initial", "A=y"}, exitBadInput, "--initial A: the value must be a number"},
		{[]string{deg, "--from", "80", "--to", "10", "--initial", "A=1,A=2"}, exitBadInput, "A is given twice"},
		{[]string{"--table", "deltaf1_lo", "--from", "80", "--to", "10", "--order", "nlo"}, exitBadInput, "NLO evolution needs rows 1"},
		{[]string{"--table", "deltaf1_dipole_lo", "--from", "80", "--to", "2", "--initial", "Q2=1"}, exitBadInput, "holds for nf = 5 only, not nf = 4"},
		{[]string{"--table", "deltaf2", "--from", "80", "--to", "0.2"}, exitBadInput, "non-perturbative"},
		{[]string{"--table", "deltaf2", "--from", "80", "--to", "10", "--order", "nlo", "--alphas-loops", "1"}, exitBadInput, "want at least 2 loops"},
		{[]string{"--table", "deltaf2", "--from", "80", "--to", "10", "--alphas-loops", "5"}, exitBadInput, "--alphas-loops: 5 loops"},
		{[]string{"--table", "deltaf2", "--from", "80", "--to", "10", "--alphas-mz", "1.5"}, exitBadInput, "--alphas-mz"},
		{[]string{"--table", "deltaf2", "--from", "80", "--to", "10", "--thresholds", "s=0.1"}, exitBadInput, "unknown quark s"},
		{[]string{"--table", "deltaf2", "--from", "80", "--to", "10", "--thresholds", "b=-1"}, exitBadInput, "b must be a positive number"},
		{[]string{"--table", "deltaf2", "--from", "80", "--to", "10", "--thresholds", "b=120"}, exitBadInput, "thresholds:"},
		{[]string{"--table", "deltaf2", "--from", "80", "--to", "3", "--thresholds", "b=4.5", "--threshold-scales", "b=9"}, exitOK, ""},
		{[]string{"--table", "deltaf2", "--from", "80", "--to", "10", "--order", "nnlo"}, exitBadInput, "unknown format \"nnlo\""},
		{[]string{"--table", "deltaf2", "--from", "80", "--to", "10", "--format", "latex"}, exitBadInput, "unknown format \"latex\""},
		{[]string{tree, "--from", "80", "--to", "10"}, exitBadInput, "has no anomalous block"},
		{[]string{withValues, "--from", "80", "--to", "10"}, exitOK, ""},
		{[]string{noValue, "--from", "80", "--to", "10"}, exitBadInput, "novalue.lm:2:1: initial value of A: no value for the symbol c1"},
	}
	for _, c := range cases {
		out, errOut, code := runCLI(append([]string{"evolve"}, c.args...)...)
		if code != c.code || !strings.Contains(errOut, c.errPart) {
			t.Errorf("evolve %v: exit %d, stderr %q; want exit %d with %q", c.args, code, errOut, c.code, c.errPart)
		}
		if code == exitOK && out == "" {
			t.Errorf("evolve %v: no output", c.args)
		}
	}
	// The initial line is evaluated with the file's values: A = 2*c0 = 1.
	if j := evolveJSON(t, withValues, "--from", "80", "--to", "10"); j.Coefficients[0].Initial != [2]float64{1, 0} {
		t.Errorf("initial value from the file's values: %v", j.Coefficients[0].Initial)
	}
}

// TestEvolveText checks the statements of what a run assumed.
func TestEvolveText(t *testing.T) {
	f := writeFile(t, "deg.lm", degenerateBlock)
	out, errOut, code := runCLI("evolve", f, "--from", "80", "--to", "10", "--nlo-form", "expanded", "--threshold-scales", "b=8")
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	for _, want := range []string{
		"evolve deg (" + f + ":1:1) from mu0 = 80 GeV to mu = 10 GeV",
		"mu dC/dmu = gamma^T C",
		"order NLO: gamma^(0) and gamma^(1), expanded form",
		"scheme of gamma^(1) (and of the coefficients): NDR",
		"alpha_s(M_Z) = 0.118 at M_Z = 91.1876 GeV with 5 flavours; 2-loop running, 1-loop MS-bar decoupling",
		"m_b(m_b) = 4.18 GeV matched at mu = 8 GeV",
		"active flavours from mu0 to mu: 5;",
		"initial values: A (file), B (file); the others 0",
		"operator  C(80 GeV)",
		"A         1",
	} {
		if !strings.Contains(out, want) {
			t.Errorf("output lacks %q:\n%s", want, out)
		}
	}
	out, _, _ = runCLI("evolve", f, "--from", "80", "--to", "10", "--order", "lo")
	if !strings.Contains(out, "order LO: gamma^(0) only (gamma^(1) and its scheme not used)") || !strings.Contains(out, "alpha_s continuous at the thresholds") {
		t.Errorf("LO output:\n%s", out)
	}
}

// TestMatchEvolveToErrors: --evolve-to needs numbers, a scale and a block for the operators.
func TestMatchEvolveToErrors(t *testing.T) {
	tree, err := os.ReadFile("../../testdata/tree_scalar.lm")
	if err != nil {
		t.Fatal(err)
	}
	var ops string
	p, err := loadProgram("../../testdata/tree_scalar.lm")
	if err != nil {
		t.Fatal(err)
	}
	ops = strings.Join(p.Matches[0].Ops, ", ")
	var rows []string
	for i, op := range p.Matches[0].Ops {
		e := make([]string, len(p.Matches[0].Ops))
		for k := range e {
			e[k] = "0"
		}
		e[i] = "4"
		rows = append(rows, "  row 0 "+op+": "+strings.Join(e, ", "))
	}
	withBlock := writeFile(t, "with.lm", string(tree)+"\nanomalous g onto "+ops+":\n"+strings.Join(rows, "\n")+"\n")
	cases := []struct {
		args    []string
		code    int
		errPart string
	}{
		{[]string{"../../testdata/tree_scalar.lm", "--evolve-to", "5"}, exitBadInput, "has no anomalous block with the operators"},
		{[]string{withBlock, "--evolve-to", "-5"}, exitBadInput, "--evolve-to: expected a positive scale"},
		{[]string{withBlock, "--evolve-to", "5"}, exitBadInput, "the coefficients need numerical values"},
		{[]string{withBlock, "--evolve-to", "5", "--set", "gL=1,gR=1,mS=1000"}, exitBadInput, "the match scale is not set"},
		{[]string{withBlock, "--evolve-to", "5", "--set", "gL=1,gR=1,mS=1000,mu=-5"}, exitBadInput, "is not a positive number of GeV"},
		{[]string{withBlock, "--evolve-to", "5", "--set", "gL=1,gR=1,mS=1000,mu=1000"}, exitOK, ""},
	}
	for _, c := range cases {
		_, errOut, code := runCLI(append([]string{"match"}, c.args...)...)
		if code != c.code || !strings.Contains(errOut, c.errPart) {
			t.Errorf("match %v: exit %d, stderr %q; want exit %d with %q", c.args, code, errOut, c.code, c.errPart)
		}
	}
}

// TestTablesAgainstPoles: the shipped γ^(0) of the current-current pair (exact in Nc), γ77 and
// γ88 agree with what match derives from the UV poles of the one-loop matrix elements of the
// project's own files (testdata/sm), a derivation that shares nothing with the tables.
func TestTablesAgainstPoles(t *testing.T) {
	cases := []struct {
		file, table string
		amps, ops   []string
		at          [2]int // row and column of the table block where the derived matrix starts
	}{
		{"../../testdata/sm/current_current.lm", "current_current", []string{"Q1_loop", "Q2_loop"}, []string{"Q1", "Q2"}, [2]int{0, 0}},
		{"../../testdata/sm/dipole77.lm", "deltaf1_dipole_lo", []string{"Q7_loop"}, []string{"Q7"}, [2]int{6, 6}},
		{"../../testdata/sm/dipole88.lm", "deltaf1_dipole_lo", []string{"Q8_loop"}, []string{"Q8"}, [2]int{7, 7}},
	}
	for _, c := range cases {
		p, err := notation.ParseFile(c.file)
		if err != nil {
			t.Fatal(err)
		}
		var ins []expr.Expr
		for _, a := range c.amps {
			amp, ok := p.Amplitude(a)
			if !ok {
				t.Fatalf("%s: no amplitude %s", c.file, a)
			}
			ins = append(ins, amp.Body)
		}
		g, err := match.AnomalousDimension(p, ins, c.ops)
		if err != nil {
			t.Fatal(err)
		}
		tb, err := running.LookupTable(c.table)
		if err != nil {
			t.Fatal(err)
		}
		for i := range g {
			for j := range g[i] {
				want := tb.Block.Gamma[0][c.at[0]+i][c.at[1]+j]
				got, ok := g[i][j].AsRatFunc()
				if _, fixed := tb.Block.Fixed["Nc"]; fixed && ok { // a table at Nc = 3: compare there
					got, _ = got.Subst("Nc", expr.RFInt(3))
				}
				if !ok || !got.Equal(want) {
					t.Errorf("%s: γ^(0)(%s, %s) from the poles %s, table %s %s", c.file, c.ops[i], c.ops[j], g[i][j], c.table, want)
				}
			}
		}
	}
}
