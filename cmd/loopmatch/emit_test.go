package main

import (
	"bufio"
	"bytes"
	"encoding/json"
	"fmt"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"sync"
	"testing"

	"loopmatch/expr/notation"
)

// The match examples whose coefficients are emitted: the Standard Model C7 = −D'0(x_t)/2,
// C8 = −E'0(x_t)/2 and the ΔF = 2 box function S0(x_t) (T. Inami, C.S. Lim, Prog. Theor. Phys.
// 65 (1981) 297; A.J. Buras, hep-ph/9806471), and the demo's dipole coefficients.
var emitExamples = []string{
	"../../testdata/sm/bsgamma.lm",
	"../../testdata/sm/bsg_gluon.lm",
	"../../testdata/sm/deltaf2_box.lm",
	"../../testdata/dipole_vlf.lm",
}

var (
	emitCacheMu sync.Mutex
	emitCache   = map[string]*matched{}
)

// programsFor runs the match blocks of the files once per test binary (in parallel) and
// builds their programs with the default package names.
func programsFor(t *testing.T, files ...string) map[string]*matched {
	t.Helper()
	emitCacheMu.Lock()
	defer emitCacheMu.Unlock()
	var wg sync.WaitGroup
	errs := make([]string, len(files))
	res := make([]*matched, len(files))
	for i, f := range files {
		if m, ok := emitCache[f]; ok {
			res[i] = m
			continue
		}
		wg.Add(1)
		go func() {
			defer wg.Done()
			var errOut bytes.Buffer
			m, _ := matchProgram("emit", f, 0, nil, true, false, packageName(f), &errOut)
			res[i], errs[i] = m, errOut.String()
		}()
	}
	wg.Wait()
	out := map[string]*matched{}
	for i, f := range files {
		if res[i] == nil {
			t.Fatalf("%s: %s", f, errs[i])
		}
		emitCache[f] = res[i]
		out[f] = res[i]
	}
	return out
}

// TestEmitGolden compares the LaTeX, JSON and Go output with testdata/golden/emit-*.
func TestEmitGolden(t *testing.T) {
	cases := []struct {
		file    string
		formats []string
	}{
		{"../../testdata/sm/bsgamma.lm", []string{"latex", "json", "go"}},
		{"../../testdata/dipole_vlf.lm", []string{"latex", "json", "go"}},
	}
	var files []string
	for _, c := range cases {
		files = append(files, c.file)
	}
	progs := programsFor(t, files...)
	ext := map[string]string{"latex": "tex", "json": "json", "go": "go.golden"}
	for _, c := range cases {
		base := strings.TrimSuffix(filepath.Base(c.file), ".lm")
		for _, f := range c.formats {
			data, _, err := emitData(progs[c.file].prog, f, false)
			if err != nil {
				t.Fatalf("%s --format %s: %v", c.file, f, err)
			}
			golden := filepath.Join("../../testdata/golden", "emit-"+base+"."+ext[f])
			if *update {
				if err := os.WriteFile(golden, data, 0o644); err != nil {
					t.Fatal(err)
				}
				continue
			}
			want, err := os.ReadFile(golden)
			if err != nil {
				t.Fatalf("%v (run go test ./cmd/loopmatch -update)", err)
			}
			if !bytes.Equal(data, want) {
				t.Errorf("emit %s --format %s differs from %s (run go test ./cmd/loopmatch -update after checking the change):\n%s", c.file, f, golden, data)
			}
		}
	}
}

// TestEmitLaTeXCompiles runs pdflatex on the golden LaTeX documents where it is installed.
func TestEmitLaTeXCompiles(t *testing.T) {
	pdflatex, err := exec.LookPath("pdflatex")
	if err != nil {
		t.Skip("pdflatex is not installed: the emitted LaTeX was not compiled")
	}
	docs, _ := filepath.Glob("../../testdata/golden/emit-*.tex")
	if len(docs) == 0 {
		t.Fatal("no golden LaTeX files")
	}
	for _, doc := range docs {
		dir := t.TempDir()
		src, err := os.ReadFile(doc)
		if err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(filepath.Join(dir, "doc.tex"), src, 0o644); err != nil {
			t.Fatal(err)
		}
		cmd := exec.Command(pdflatex, "-interaction=nonstopmode", "-halt-on-error", "doc.tex")
		cmd.Dir = dir
		if out, err := cmd.CombinedOutput(); err != nil {
			t.Errorf("pdflatex %s: %v\n%s", doc, err, out)
			continue
		}
		if st, err := os.Stat(filepath.Join(dir, "doc.pdf")); err != nil || st.Size() == 0 {
			t.Errorf("pdflatex %s wrote no PDF", doc)
		}
	}
}

// TestEmittedCoefficientsCompileAndAgree writes the Go of the four examples with their
// generated tests into a temporary module, adds a test against the reference table
// testdata/reference/inami-lim.tsv (mpmath, 20 digits: −2·C7 = D'0, −2·C8 = E'0, C_QVLL = S0),
// and runs go test there. The generated tests compare the functions with arbitrary-precision
// values at 100+ points each: near x = 1 down to 1e-12, at the zeros, at the ends 1e-10 and 1e10.
func TestEmittedCoefficientsCompileAndAgree(t *testing.T) {
	gobin, err := exec.LookPath("go")
	if err != nil {
		t.Skip("the go command is not installed: the emitted code was not compiled")
	}
	progs := programsFor(t, emitExamples...)
	dir := t.TempDir()
	if err := os.WriteFile(filepath.Join(dir, "go.mod"), []byte("module emitcheck\n\ngo 1.26\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	rows := 0
	for _, f := range emitExamples {
		m := progs[f]
		src, test, err := emitData(m.prog, "go", true)
		if err != nil {
			t.Fatalf("%s: %v", f, err)
		}
		rows += strings.Count(string(test), "\n\t{")
		pd := filepath.Join(dir, m.prog.Spec.Package)
		if err := os.MkdirAll(pd, 0o755); err != nil {
			t.Fatal(err)
		}
		for name, data := range map[string][]byte{"coeffs.go": src, "coeffs_test.go": test} {
			if err := os.WriteFile(filepath.Join(pd, name), data, 0o644); err != nil {
				t.Fatal(err)
			}
		}
	}
	if rows < 200 {
		t.Errorf("%d reference rows in the generated tests, want at least 200", rows)
	}
	table := map[string]struct{ pkg, call string }{
		"Dp0": {"bsgamma", "-2 * CQ7(x)"},
		"Ep0": {"bsggluon", "-2 * CQ8(x)"},
		"S0":  {"deltaf2box", "CQVLL(x)"},
	}
	for col, c := range table {
		if _, ok := func() (*matched, bool) {
			for _, m := range progs {
				if m.prog.Spec.Package == c.pkg {
					return m, true
				}
			}
			return nil, false
		}(); !ok {
			t.Fatalf("no emitted package %s", c.pkg)
		}
		src := tableTest(t, c.pkg, col, c.call)
		if err := os.WriteFile(filepath.Join(dir, c.pkg, "table_test.go"), src, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	cmd := exec.Command(gobin, "test", "-count=1", "./...")
	cmd.Dir = dir
	cmd.Env = append(os.Environ(), "GOFLAGS=-mod=mod", "GOWORK=off", "GOPROXY=off", "GOTOOLCHAIN=local")
	if out, err := cmd.CombinedOutput(); err != nil {
		t.Fatalf("go test in the emitted module: %v\n%s", err, out)
	}
}

// tableTest writes a test of one column of the reference table.
func tableTest(t *testing.T, pkg, col, call string) []byte {
	f, err := os.Open("../../testdata/reference/inami-lim.tsv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	var header []string
	var rows []string
	sc := bufio.NewScanner(f)
	for sc.Scan() {
		line := sc.Text()
		if strings.HasPrefix(line, "#") {
			header = strings.Fields(strings.TrimPrefix(line, "#"))
			continue
		}
		cols := strings.Split(line, "\t")
		for i, h := range header {
			if h == col && i < len(cols) {
				rows = append(rows, fmt.Sprintf("\t\t{%s, %s},", cols[0], cols[i]))
			}
		}
	}
	if len(rows) < 10 {
		t.Fatalf("column %s: %d rows in the reference table", col, len(rows))
	}
	return []byte(fmt.Sprintf(`package %s

import (
	"math"
	"testing"
)

// TestReferenceTable compares with %s of testdata/reference/inami-lim.tsv (mpmath, 20 digits).
func TestReferenceTable(t *testing.T) {
	for _, r := range []struct{ x, want float64 }{
%s
	} {
		x := r.x
		if got := %s; !(math.Abs(got-r.want) <= 1e-13*math.Abs(r.want)) {
			t.Errorf("%s at x = %%v: %%.17g, table %%.17g", r.x, got, r.want)
		}
	}
}
`, pkg, col, strings.Join(rows, "\n"), call, col))
}

// TestEmitWritesFiles checks -o: the source and its test are written, no temporary file is
// left behind, and the standard-output form is the same source.
func TestEmitWritesFiles(t *testing.T) {
	dir := t.TempDir()
	out := filepath.Join(dir, "box.go")
	stdout, errOut, code := runCLI("emit", "../../testdata/sm/deltaf2_box.lm", "-o", out, "--package", "box")
	if code != exitOK || stdout != "" {
		t.Fatalf("exit %d, stdout %q, stderr %s", code, stdout, errOut)
	}
	src, err := os.ReadFile(out)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(filepath.Join(dir, "box_test.go")); err != nil {
		t.Errorf("the test file was not written: %v", err)
	}
	entries, _ := os.ReadDir(dir)
	if len(entries) != 2 {
		var names []string
		for _, e := range entries {
			names = append(names, e.Name())
		}
		t.Errorf("files in the output directory: %v, want box.go and box_test.go", names)
	}
	again, _, _ := runCLI("emit", "../../testdata/sm/deltaf2_box.lm", "--package", "box")
	if again != string(src) {
		t.Error("standard output and -o differ")
	}
	if !strings.Contains(string(src), "package box") || !strings.Contains(string(src), "func CQVLL(xt float64) float64") {
		t.Errorf("unexpected source:\n%s", src)
	}
}

func TestEmitErrors(t *testing.T) {
	dir := t.TempDir()
	input := filepath.Join(dir, "copy.lm")
	data, err := os.ReadFile("../../testdata/sm/deltaf2_box.lm")
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(input, data, 0o644); err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		args []string
		code int
		msg  string
	}{
		{[]string{"emit", input, "-o", input}, exitBadInput, "refusing to overwrite an input file"},
		{[]string{"emit", input, "-o", filepath.Join(dir, ".", "copy.lm")}, exitBadInput, "refusing"},
		{[]string{"emit", input, "--package", "Not-a-name"}, exitBadInput, "not a Go package name"},
		{[]string{"emit", input, "--format", "pdf"}, exitBadInput, "unknown format"},
		{[]string{"emit", filepath.Join(dir, "missing.lm")}, exitBadInput, "cannot read"},
		{[]string{"emit", input, "--match", "2"}, exitBadInput, "has 1 match block"},
		{[]string{"emit", input, "--set", "xt=pi"}, exitBadInput, "not a rational number"},
		{[]string{"emit", input, "--set", "nosuch=1"}, exitBadInput, "not declared"},
		{[]string{"emit"}, exitBadInput, "expected one FILE"},
	}
	for _, c := range cases {
		_, errOut, code := runCLI(c.args...)
		if code != c.code || !strings.Contains(errOut, c.msg) {
			t.Errorf("%v: exit %d, stderr %q; want exit %d and %q", c.args, code, errOut, c.code, c.msg)
		}
	}
	if after, _ := os.ReadFile(input); !bytes.Equal(after, data) {
		t.Error("the input file was modified")
	}
}

// TestEmitSetSubstitutes checks that --set removes an argument: with xt = 4 the coefficient
// is the number S0(4) = 2.2623799506484999781 (testdata/reference/inami-lim.tsv).
func TestEmitSetSubstitutes(t *testing.T) {
	out, errOut, code := runCLI("emit", "../../testdata/sm/deltaf2_box.lm", "--set", "xt=4", "--format", "json")
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	var doc struct {
		Coeffs []struct {
			Text string   `json:"text"`
			Args []string `json:"arguments"`
		} `json:"coefficients"`
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil || len(doc.Coeffs) != 1 {
		t.Fatalf("JSON: %v\n%s", err, out)
	}
	if len(doc.Coeffs[0].Args) != 0 {
		t.Errorf("arguments %v, want none", doc.Coeffs[0].Args)
	}
	e, err := notation.ParseFreeExpr(doc.Coeffs[0].Text)
	if err != nil {
		t.Fatal(err)
	}
	v, err := e.Eval(nil)
	if err != nil || math.Abs(real(v)-2.2623799506484999781) > 1e-14 {
		t.Errorf("C_QVLL(xt = 4) = %v (%v), want 2.2623799506484999781", v, err)
	}
	src, _, _ := runCLI("emit", "../../testdata/sm/deltaf2_box.lm", "--set", "xt=4")
	if !strings.Contains(src, "func CQVLL() float64") {
		t.Errorf("expected a function without arguments:\n%s", src)
	}
}
