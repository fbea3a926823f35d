package main

import (
	"bytes"
	"encoding/json"
	"flag"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

var update = flag.Bool("update", false, "rewrite the golden files in testdata/golden")

// runCLI runs the command line and returns stdout, stderr and the exit code.
func runCLI(args ...string) (string, string, int) {
	var out, errOut bytes.Buffer
	code := run(args, &out, &errOut)
	return out.String(), errOut.String(), code
}

// TestCheckGolden compares `loopmatch check` on every shipped example with its golden output.
func TestCheckGolden(t *testing.T) {
	files, _ := filepath.Glob("../../testdata/*.lm")
	if len(files) < 3 {
		t.Fatalf("expected at least three example files, found %d", len(files))
	}
	for _, f := range files {
		base := strings.TrimSuffix(filepath.Base(f), ".lm")
		for _, fm := range []string{"text", "json"} {
			out, errOut, code := runCLI("check", f, "--format", fm)
			if code != exitOK {
				t.Fatalf("check %s: exit %d: %s", f, code, errOut)
			}
			golden := filepath.Join("../../testdata/golden", "check-"+base+"."+fm)
			if *update {
				if err := os.MkdirAll(filepath.Dir(golden), 0o755); err != nil {
					t.Fatal(err)
				}
				if err := os.WriteFile(golden, []byte(out), 0o644); err != nil {
					t.Fatal(err)
				}
				continue
			}
			want, err := os.ReadFile(golden)
			if err != nil {
				t.Fatalf("%v (run go test ./cmd/loopmatch -update)", err)
			}
			if out != string(want) {
				t.Errorf("check %s --format %s differs from %s:\n%s", f, fm, golden, out)
			}
		}
	}
}

func TestSimplify(t *testing.T) {
	cases := []struct {
		args []string
		want string
	}{
		// The examples of the project's issue 2.
		{[]string{"simplify", "(x^2-1)/(x-1)"}, "x + 1\n"},
		{[]string{"simplify", "(a^3-b^3)/(a^2-b^2)", "--format", "latex"}, "\\frac{a^{2} + a b + b^{2}}{a + b}\n"},
		{[]string{"simplify", "--format=go", "(a^3-b^3)/(a^2-b^2)"}, "(((a*a) + a*b + (b*b)) / (a + b))\n"},
		{[]string{"simplify", "-x + x"}, "0\n"},
	}
	for _, c := range cases {
		out, errOut, code := runCLI(c.args...)
		if code != exitOK || out != c.want {
			t.Errorf("%v: got %q (exit %d, %s), want %q", c.args, out, code, errOut, c.want)
		}
	}
}

func TestExitCodes(t *testing.T) {
	cases := []struct {
		args    []string
		code    int
		errPart string
	}{
		{nil, exitBadInput, "Usage"},
		{[]string{"nonsense"}, exitBadInput, "unknown command"},
		{[]string{"check"}, exitBadInput, "expected one FILE"},
		{[]string{"check", "no-such-file.lm"}, exitBadInput, "cannot read no-such-file.lm"},
		{[]string{"check", "../../testdata/integrals.lm", "--format", "pdf"}, exitBadInput, "unknown format"},
		{[]string{"simplify", "x +"}, exitBadInput, "<expr>:1:4: expected an expression"},
		{[]string{"simplify", "I*x", "--format", "go"}, exitBadInput, "I has no real float64 form"},
		{[]string{"help", "nonsense"}, exitBadInput, "unknown command"},
		{[]string{"version"}, exitOK, ""},
		{[]string{"help", "simplify"}, exitOK, ""},
	}
	for _, c := range cases {
		_, errOut, code := runCLI(c.args...)
		if code != c.code || !strings.Contains(errOut, c.errPart) {
			t.Errorf("%v: exit %d, stderr %q; want exit %d containing %q", c.args, code, errOut, c.code, c.errPart)
		}
	}
}

// TestBadFileError checks that a malformed file gives file:line:col on stderr and exit 2.
func TestBadFileError(t *testing.T) {
	dir := t.TempDir()
	f := filepath.Join(dir, "bad.lm")
	if err := os.WriteFile(f, []byte("masses M\namplitude X = M *\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	_, errOut, code := runCLI("check", f)
	if code != exitBadInput || !strings.Contains(errOut, f+":3:1: expected an expression, found the end of the file") {
		t.Errorf("exit %d, stderr %q", code, errOut)
	}
}

// TestReduceExpand checks that a tadpole written as a loop and as A0(M) reduce to the same
// ε-expansion, PHYSICS.md's A0(M) = M²(1/ε + 1 − ln(M²/μ²)) + O(ε), and that a non-vacuum
// scalar integral is refused on the heavy route instead of being treated as ε-free.
func TestReduceExpand(t *testing.T) {
	dir := t.TempDir()
	f := filepath.Join(dir, "a0.lm")
	src := "masses M\nmomenta p\namplitude a = A0(M)\namplitude b = loop k { 1/(k^2 - M^2) } * 16*pi^2/I\n"
	if err := os.WriteFile(f, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	out, errOut, code := runCLI("reduce", f, "--expand", "p:0", "--format", "json")
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	var doc struct {
		Amplitudes []struct {
			Coeffs map[string]string `json:"eps_coefficients"`
		} `json:"amplitudes"`
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	a, b := doc.Amplitudes[0].Coeffs, doc.Amplitudes[1].Coeffs
	if a["-1"] != "M^2" || a["0"] != "M^2 - 2*M^2*log(M) + 2*M^2*log(mu)" || a["-1"] != b["-1"] || a["0"] != b["0"] {
		t.Errorf("A0(M) = %v, loop = %v", a, b)
	}
	_, errOut, code = runCLI("reduce", "../../testdata/integrals.lm", "--expand", "p:2")
	if code != exitBadInput || !strings.Contains(errOut, "B0(p.p; m, M) is not a vacuum integral") {
		t.Errorf("exit %d: %s", code, errOut)
	}
}

// TestMatchGolden runs the demo files through `loopmatch match` and compares with golden
// outputs; the demo must pass all its checks (exit 0).
func TestMatchGolden(t *testing.T) {
	for _, name := range []string{"dipole_vlf", "box_vlf", "tree_scalar"} {
		out, errOut, code := runCLI("match", "../../testdata/"+name+".lm")
		if code != exitOK {
			t.Fatalf("match %s: exit %d: %s\n%s", name, code, errOut, out)
		}
		golden := filepath.Join("../../testdata/golden", "match-"+name+".text")
		if *update {
			if err := os.WriteFile(golden, []byte(out), 0o644); err != nil {
				t.Fatal(err)
			}
			continue
		}
		want, err := os.ReadFile(golden)
		if err != nil {
			t.Fatalf("%v (run go test ./cmd/loopmatch -update)", err)
		}
		if out != string(want) {
			t.Errorf("match %s differs from %s:\n%s", name, golden, out)
		}
	}
}
