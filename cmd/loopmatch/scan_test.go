package main

import (
	"bufio"
	"bytes"
	"image/color"
	"image/png"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"gonum.org/v1/plot/plotutil"
)

// scanTable parses a scan table: the column names and the rows.
func scanTable(t *testing.T, s string) ([]string, [][]float64) {
	t.Helper()
	var cols []string
	var rows [][]float64
	sc := bufio.NewScanner(strings.NewReader(s))
	for sc.Scan() {
		line := sc.Text()
		if strings.HasPrefix(line, "#") {
			continue
		}
		fs := strings.Split(line, "\t")
		if cols == nil {
			cols = fs
			continue
		}
		if len(fs) != len(cols) {
			t.Fatalf("row %q has %d fields, the header %d", line, len(fs), len(cols))
		}
		row := make([]float64, len(fs))
		for i, f := range fs {
			v, err := strconv.ParseFloat(f, 64)
			if err != nil {
				t.Fatalf("field %q: %v", f, err)
			}
			row[i] = v
		}
		rows = append(rows, row)
	}
	return cols, rows
}

// TestScanAgainstReferenceTable scans S0(x_t) = C_QVLL and checks the rows at x_t = 0.01, 1,
// 10 and 100 against testdata/reference/inami-lim.tsv (mpmath, 20 digits) and the limit
// S0(1) = 3/4 (by hand from the closed form of A.J. Buras, hep-ph/9806471).
func TestScanAgainstReferenceTable(t *testing.T) {
	out, errOut, code := runCLI("scan", "../../testdata/sm/deltaf2_box.lm", "--vary", "xt=0.01:100:log:5")
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	cols, rows := scanTable(t, out)
	if len(cols) != 2 || cols[0] != "xt" || cols[1] != "C_QVLL" || len(rows) != 5 {
		t.Fatalf("columns %v, %d rows:\n%s", cols, len(rows), out)
	}
	want := map[float64]float64{0.01: 0.0099298311708854509147, 1: 0.75, 10: 4.552644224267583712, 100: 29.831170885450914669}
	for _, r := range rows {
		w, ok := want[r[0]]
		if !ok {
			continue
		}
		delete(want, r[0])
		if math.Abs(r[1]-w) > 1e-13*math.Abs(w) {
			t.Errorf("S0(%v) = %.17g, want %.17g", r[0], r[1], w)
		}
	}
	if len(want) > 0 {
		t.Errorf("grid points %v missing from the table", want)
	}
	for _, h := range []string{"# scheme: MSbar NDR", "# xt = mt^2/mW^2", "xt\tC_QVLL"} {
		if !strings.Contains(out, h) {
			t.Errorf("the table lacks %q:\n%s", h, out)
		}
	}
}

// TestScanGrid checks a two-parameter grid (the first parameter varies fastest), that scanning
// the masses gives the same coefficient as scanning their ratio x = mF²/mS² (the dipole
// coefficient depends on the masses only through x), and that the number of workers does not
// change the table.
func TestScanGrid(t *testing.T) {
	byMass, errOut, code := runCLI("scan", "../../testdata/dipole_vlf.lm", "--vary", "mF=500:3000:6", "--vary", "mS=1000:2000:3", "--workers", "3")
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	cols, rows := scanTable(t, byMass)
	if strings.Join(cols, " ") != "mF mS C_QR C_QL" || len(rows) != 18 {
		t.Fatalf("columns %v, %d rows", cols, len(rows))
	}
	if rows[1][0] != 1000 || rows[1][1] != 1000 || rows[6][1] != 1500 {
		t.Errorf("grid order: rows %v, %v", rows[1], rows[6])
	}
	// The same points through the ratio: x = mF²/mS² varied, mS from the file.
	dip := "../../testdata/dipole_vlf.lm"
	m := programsFor(t, dip)[dip]
	vals, err := numericValues(m.file, nil)
	if err != nil {
		t.Fatal(err)
	}
	for _, r := range rows {
		x := r[0] * r[0] / (r[1] * r[1])
		var xs varyList
		if err := xs.Set("x=" + strconv.FormatFloat(x, 'g', -1, 64) + ":1:1"); err != nil {
			t.Fatal(err)
		}
		g, err := newScanGrid(m.prog, m.file, m.block, xs, vals, nil)
		if err != nil {
			t.Fatal(err)
		}
		res, err := g.run(1, func(int) {})
		if err != nil {
			t.Fatal(err)
		}
		if got := real(res[0][0]); math.Abs(got-r[2]) > 1e-13*math.Abs(r[2]) || r[3] != 0 {
			t.Errorf("mF = %v, mS = %v: %v by the masses, %v by the ratio", r[0], r[1], r[2], got)
		}
	}
	serial, _, _ := runCLI("scan", "../../testdata/dipole_vlf.lm", "--vary", "mF=500:3000:6", "--vary", "mS=1000:2000:3", "--workers", "1")
	if serial != byMass {
		t.Error("one worker and three workers give different tables")
	}
}

// TestScanPlotPNG writes a PNG and checks its size and that the curve is drawn: many pixels
// have the first curve's colour.
func TestScanPlotPNG(t *testing.T) {
	dir := t.TempDir()
	img := filepath.Join(dir, "s0.png")
	tsv := filepath.Join(dir, "s0.tsv")
	stdout, errOut, code := runCLI("scan", "../../testdata/sm/deltaf2_box.lm", "--vary", "xt=0.1:10:log:60", "--plot", img, "--size", "640x400", "--out", tsv)
	if code != exitOK || stdout != "" {
		t.Fatalf("exit %d, stdout %q: %s", code, stdout, errOut)
	}
	f, err := os.Open(img)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	m, err := png.Decode(f)
	if err != nil {
		t.Fatal(err)
	}
	if b := m.Bounds(); b.Dx() != 640 || b.Dy() != 400 {
		t.Fatalf("PNG is %dx%d, want 640x400", b.Dx(), b.Dy())
	}
	cr, cg, cb, _ := plotutil.Color(0).RGBA()
	curve, ink := 0, 0
	b := m.Bounds()
	for y := b.Min.Y; y < b.Max.Y; y++ {
		for x := b.Min.X; x < b.Max.X; x++ {
			r, g, bl, _ := m.At(x, y).RGBA()
			if near(r, cr) && near(g, cg) && near(bl, cb) {
				curve++
			}
			if c := color.GrayModel.Convert(m.At(x, y)).(color.Gray); c.Y < 200 {
				ink++
			}
		}
	}
	if curve < 300 {
		t.Errorf("%d pixels of the curve's colour, want at least 300 (a curve across the plot)", curve)
	}
	if ink < 1000 {
		t.Errorf("%d dark pixels: axes and labels missing", ink)
	}
	if data, err := os.ReadFile(tsv); err != nil || !bytes.Contains(data, []byte("xt\tC_QVLL")) {
		t.Errorf("table not written with the plot: %v", err)
	}
}

func near(a, b uint32) bool { return a>>8 >= (b>>8)-12 && a>>8 <= (b>>8)+12 }

func TestScanPlotSVG(t *testing.T) {
	img := filepath.Join(t.TempDir(), "s0.svg")
	if _, errOut, code := runCLI("scan", "../../testdata/sm/deltaf2_box.lm", "--vary", "xt=0.1:10:log:20", "--plot", img); code != exitOK {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	data, err := os.ReadFile(img)
	if err != nil || !bytes.Contains(data, []byte("<svg")) || !bytes.Contains(data, []byte("C_QVLL")) {
		t.Errorf("not an SVG with the legend (%v):\n%.300s", err, data)
	}
}

func TestScanErrors(t *testing.T) {
	dir := t.TempDir()
	input := filepath.Join(dir, "box.lm")
	data, err := os.ReadFile("../../testdata/sm/deltaf2_box.lm")
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(input, data, 0o644); err != nil {
		t.Fatal(err)
	}
	dip := "../../testdata/dipole_vlf.lm"
	cases := []struct {
		args []string
		msg  string
	}{
		{[]string{"scan", input}, "nothing to scan"},
		{[]string{"scan", input, "--vary", "xt"}, "expected NAME=FROM:TO"},
		{[]string{"scan", input, "--vary", "xt=a:2"}, "not a number"},
		{[]string{"scan", input, "--vary", "xt=-1:2:log"}, "positive ends"},
		{[]string{"scan", input, "--vary", "xt=1:2:0"}, "between 1 and 1000000"},
		{[]string{"scan", input, "--vary", "xt=1:2", "--vary", "xt=1:3"}, "varied twice"},
		{[]string{"scan", input, "--vary", "nosuch=1:2"}, "not declared"},
		{[]string{"scan", input, "--vary", "xt=1:2", "--out", input}, "refusing to overwrite an input file"},
		{[]string{"scan", input, "--vary", "xt=1:2", "--out", filepath.Join(dir, "no", "t.tsv")}, "does not exist"},
		{[]string{"scan", input, "--vary", "xt=1:2", "--plot", filepath.Join(dir, "a.jpg")}, ".svg or .png"},
		{[]string{"scan", input, "--vary", "xt=1:2", "--plot", filepath.Join(dir, "a.png"), "--size", "10x10"}, "--size"},
		{[]string{"scan", input, "--vary", "xt=1:2", "--set", "xt=3"}, "both varied and set"},
		{[]string{"scan", dip, "--vary", "x=0.5:2", "--vary", "mF=100:200"}, "follows from it"},
		{[]string{"scan", dip, "--vary", "x=1:2", "--vary", "eQF=0:1:2", "--vary", "eQS=0:1:2", "--plot", filepath.Join(dir, "b.png")}, "one parameter"},
	}
	for _, c := range cases {
		_, errOut, code := runCLI(c.args...)
		if code != exitBadInput || !strings.Contains(errOut, c.msg) {
			t.Errorf("%v: exit %d, stderr %q; want exit 2 and %q", c.args[2:], code, errOut, c.msg)
		}
	}
	if after, _ := os.ReadFile(input); !bytes.Equal(after, data) {
		t.Error("the input file was modified")
	}
}

// TestScanGolden compares a small table with testdata/golden/scan-deltaf2_box.tsv: the header
// exactly, the numbers to 1e-13 relative (the last printed digit may differ between
// platforms that fuse multiply-adds).
func TestScanGolden(t *testing.T) {
	out, errOut, code := runCLI("scan", "../../testdata/sm/deltaf2_box.lm", "--vary", "xt=0.1:10:log:9")
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	golden := "../../testdata/golden/scan-deltaf2_box.tsv"
	if *update {
		if err := os.WriteFile(golden, []byte(out), 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	want, err := os.ReadFile(golden)
	if err != nil {
		t.Fatalf("%v (run go test ./cmd/loopmatch -update)", err)
	}
	gl, wl := strings.Split(out, "\n"), strings.Split(string(want), "\n")
	if len(gl) != len(wl) {
		t.Fatalf("%d lines, golden %d:\n%s", len(gl), len(wl), out)
	}
	for i := range gl {
		if strings.HasPrefix(wl[i], "#") || !strings.ContainsAny(wl[i], "0123456789") {
			if gl[i] != wl[i] {
				t.Errorf("line %d: %q, golden %q", i+1, gl[i], wl[i])
			}
			continue
		}
		gf, wf := strings.Split(gl[i], "\t"), strings.Split(wl[i], "\t")
		if len(gf) != len(wf) {
			t.Errorf("line %d: %q, golden %q", i+1, gl[i], wl[i])
			continue
		}
		for j := range gf {
			g, err1 := strconv.ParseFloat(gf[j], 64)
			w, err2 := strconv.ParseFloat(wf[j], 64)
			if err1 != nil || err2 != nil || math.Abs(g-w) > 1e-13*math.Abs(w) {
				t.Errorf("line %d: %q, golden %q", i+1, gl[i], wl[i])
			}
		}
	}
}
