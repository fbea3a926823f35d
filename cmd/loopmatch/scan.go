package main

import (
	"bytes"
	"flag"
	"fmt"
	"io"
	"math"
	"math/cmplx"
	"os"
	"path/filepath"
	"runtime"
	"strconv"
	"strings"
	"sync"
	"time"

	"github.com/schollz/progressbar/v3"
	"golang.org/x/term"
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/plotutil"
	"gonum.org/v1/plot/vg"

	"loopmatch/expr"
	"loopmatch/expr/emit"
	"loopmatch/expr/notation"
)

var scanCmd = &command{
	name:    "scan",
	summary: "tabulate and plot the Wilson coefficients of a .lm file over parameter ranges",
	usage:   "FILE --vary NAME=FROM:TO[:lin|log][:N] [--vary …] [--set name=value,…] [--out TABLE.tsv] [--plot OUT.svg|OUT.png]",
	help: `scan runs a match block of FILE once and evaluates its Wilson coefficients on a grid: each
--vary NAME=FROM:TO:SPACING:N gives N points from FROM to TO, evenly (lin, the default) or
evenly in the logarithm (log); several --vary flags make a grid (the first varies fastest).
The other symbols take the file's values, overridden by --set. A mass ratio of a ratio line
(x = mF^2/mS^2) may be varied directly; it is otherwise computed from the masses. Varying or
setting mu makes the scale a parameter even where the block fixes it.

The coefficients are evaluated with the same numerically stable programs that emit writes as
Go (float64, series branches near removable singularities), in parallel on all cores. The
table (tab-separated, a commented header with the conventions and fixed values) goes to
--out or to standard output; --plot draws the coefficients against the first varied
parameter (SVG or PNG by the extension; one curve per value of a second varied parameter).
Output files are written atomically and never over FILE.

Exit codes: 0 written, 1 the match block failed its checks, 2 bad input.`,
}

// vary is one --vary range.
type vary struct {
	name   string
	from   float64
	to     float64
	log    bool
	n      int
	values []float64
}

type varyList []vary

func (v *varyList) String() string { return "" }

func (v *varyList) Set(s string) error {
	name, rng, ok := strings.Cut(s, "=")
	name = strings.TrimSpace(name)
	if !ok || name == "" {
		return fmt.Errorf("expected NAME=FROM:TO[:lin|log][:N], found %q", s)
	}
	parts := strings.Split(rng, ":")
	if len(parts) < 2 || len(parts) > 4 {
		return fmt.Errorf("%s: expected FROM:TO[:lin|log][:N], found %q", name, rng)
	}
	r := vary{name: name, n: 101}
	var err error
	if r.from, err = strconv.ParseFloat(strings.TrimSpace(parts[0]), 64); err != nil {
		return fmt.Errorf("%s: FROM %q is not a number", name, parts[0])
	}
	if r.to, err = strconv.ParseFloat(strings.TrimSpace(parts[1]), 64); err != nil {
		return fmt.Errorf("%s: TO %q is not a number", name, parts[1])
	}
	for _, p := range parts[2:] {
		switch p = strings.TrimSpace(p); p {
		case "log":
			r.log = true
		case "lin":
		default:
			n, err := strconv.Atoi(p)
			if err != nil {
				return fmt.Errorf("%s: %q is neither lin, log nor a number of points", name, p)
			}
			r.n = n
		}
	}
	switch {
	case math.IsInf(r.from, 0) || math.IsInf(r.to, 0) || math.IsNaN(r.from) || math.IsNaN(r.to):
		return fmt.Errorf("%s: the range must be finite", name)
	case r.n < 1 || r.n > 1_000_000:
		return fmt.Errorf("%s: the number of points must be between 1 and 1000000, found %d", name, r.n)
	case r.log && (r.from <= 0 || r.to <= 0):
		return fmt.Errorf("%s: a log range needs positive ends, found %g:%g", name, r.from, r.to)
	}
	for _, o := range *v {
		if o.name == name {
			return fmt.Errorf("%s is varied twice", name)
		}
	}
	r.values = make([]float64, r.n)
	for i := range r.values {
		t := 0.0
		if r.n > 1 {
			t = float64(i) / float64(r.n-1)
		}
		switch {
		case i == 0:
			r.values[i] = r.from
		case i == r.n-1:
			r.values[i] = r.to
		case r.log:
			lf, lt := math.Log10(r.from), math.Log10(r.to)
			r.values[i] = round14(math.Pow(10, lf+t*(lt-lf)))
		default:
			r.values[i] = round14(r.from + t*(r.to-r.from))
		}
	}
	*v = append(*v, r)
	return nil
}

// round14 rounds to 14 significant digits, so that grid points print as the decimal numbers
// they stand for (1, not 1.0000000000000002).
func round14(x float64) float64 {
	v, _ := strconv.ParseFloat(strconv.FormatFloat(x, 'g', 14, 64), 64)
	return v
}

type scanOpts struct {
	vary    varyList
	set     string
	out     string
	plot    string
	size    string
	block   int
	workers int
}

func scanFlags() (*flag.FlagSet, *scanOpts) {
	fs := flag.NewFlagSet("scan", flag.ContinueOnError)
	o := &scanOpts{}
	fs.Var(&o.vary, "vary", "a range NAME=FROM:TO[:lin|log][:N] (repeatable; several make a grid)")
	fs.StringVar(&o.set, "set", "", "fixed values, e.g. mS=1500,eQF=0.1 (override the file's values)")
	fs.StringVar(&o.out, "out", "", "write the table to this file (default: standard output unless --plot is given)")
	fs.StringVar(&o.plot, "plot", "", "write a plot to this .svg or .png file")
	fs.StringVar(&o.size, "size", "800x500", "plot size in pixels, WIDTHxHEIGHT")
	fs.IntVar(&o.block, "match", 0, "which match block of FILE (1, 2, …; needed when there are several)")
	fs.IntVar(&o.workers, "workers", 0, "parallel workers (default: the number of cores)")
	return fs, o
}

func init() {
	flagSets["scan"] = func() *flag.FlagSet { fs, _ := scanFlags(); return fs }
	scanCmd.run = runScan
	register(scanCmd)
}

// maxScanPoints bounds the grid.
const maxScanPoints = 10_000_000

func runScan(args []string, out, errOut io.Writer) int {
	fs, o := scanFlags()
	pos, ok := parseFlags(fs, args, errOut)
	if !ok {
		return exitBadInput
	}
	bad := func(format string, a ...any) int {
		fmt.Fprintf(errOut, "loopmatch scan: "+format+"\n", a...)
		return exitBadInput
	}
	if len(pos) != 1 {
		return bad("expected one FILE argument")
	}
	file := pos[0]
	if len(o.vary) == 0 {
		return bad("nothing to scan: give at least one --vary NAME=FROM:TO[:lin|log][:N]")
	}
	total := 1
	for _, v := range o.vary {
		total *= v.n
		if total > maxScanPoints {
			return bad("the grid has more than %d points", maxScanPoints)
		}
	}
	var w, h int
	if o.plot != "" {
		ext := strings.ToLower(filepath.Ext(o.plot))
		if ext != ".svg" && ext != ".png" {
			return bad("--plot %s: the extension must be .svg or .png", o.plot)
		}
		if _, err := fmt.Sscanf(o.size, "%dx%d", &w, &h); err != nil || w < 100 || h < 100 || w > 10000 || h > 10000 {
			return bad("--size %q: expected WIDTHxHEIGHT in pixels between 100 and 10000", o.size)
		}
		if len(o.vary) > 2 {
			return bad("--plot draws against one parameter (with curves for a second one); %d are varied", len(o.vary))
		}
		if err := checkNotInput(o.plot, file); err != nil {
			return bad("%v", err)
		}
	}
	if o.out != "" {
		if err := checkNotInput(o.out, file); err != nil {
			return bad("%v", err)
		}
	}
	if o.out != "" && o.out == o.plot {
		return bad("--out and --plot name the same file")
	}
	set, _, err := parseSet(o.set)
	if err != nil {
		return bad("%v", err)
	}
	freeMu := false
	for _, v := range o.vary {
		if _, dup := set[v.name]; dup {
			return bad("%s is both varied and set", v.name)
		}
		freeMu = freeMu || v.name == "mu"
	}
	_, muSet := set["mu"]
	m, code := matchProgram("scan", file, o.block, set, false, freeMu || muSet, "scan", errOut)
	if m == nil {
		return code
	}
	prog, p, mb := m.prog, m.file, m.block
	vals, err := numericValues(p, set)
	if err != nil {
		return bad("%v", err)
	}
	g, err := newScanGrid(prog, p, mb, o.vary, vals, set)
	if err != nil {
		return bad("%v", err)
	}
	workers := o.workers
	if workers <= 0 {
		workers = runtime.NumCPU()
	}
	res, err := g.run(workers, progressFor(errOut, total))
	if err != nil {
		return bad("%v", err)
	}
	table := g.table(res)
	if o.out != "" {
		if err := writeOutput(o.out, table, file); err != nil {
			return bad("%v", err)
		}
	} else if o.plot == "" {
		out.Write(table)
	}
	if o.plot != "" {
		img, err := g.plot(res, strings.ToLower(filepath.Ext(o.plot))[1:], w, h)
		if err != nil {
			return bad("plot: %v", err)
		}
		if err := writeOutput(o.plot, img, file); err != nil {
			return bad("%v", err)
		}
	}
	return exitOK
}

// progressFor returns a progress callback drawing a bar on errOut when it is a terminal.
func progressFor(errOut io.Writer, total int) func(int) {
	f, ok := errOut.(*os.File)
	if !ok || !term.IsTerminal(int(f.Fd())) || total < 1000 {
		return func(int) {}
	}
	bar := progressbar.NewOptions(total, progressbar.OptionSetWriter(f), progressbar.OptionSetDescription("scan"),
		progressbar.OptionShowCount(), progressbar.OptionThrottle(100*time.Millisecond), progressbar.OptionClearOnFinish())
	var mu sync.Mutex
	return func(n int) {
		mu.Lock()
		bar.Add(n)
		mu.Unlock()
	}
}

// scanGrid is the set of points and how each coefficient's arguments are filled in.
type scanGrid struct {
	prog   *emit.Program
	file   string
	block  *notation.MatchBlock
	varies []vary
	fixed  map[string]complex128
	// per coefficient: for each argument, the index of the varied parameter or -1 (fixed), and
	// for a ratio or mass derived from others, how.
	args  [][]argSource
	shown []string // fixed values named in the header
}

type argSource struct {
	vary  int        // index into varies, or -1
	value complex128 // fixed value
	ratio *notation.Ratio
	// derived: ratio from its masses (mass == ""), or a mass from a varied ratio
	derived bool
	num     bool // the numerator mass of ratio, from the ratio and the denominator
}

func newScanGrid(prog *emit.Program, p *notation.Program, mb *notation.MatchBlock, varies []vary, vals map[string]complex128, set map[string]expr.Expr) (*scanGrid, error) {
	g := &scanGrid{prog: prog, file: p.File, block: mb, varies: varies, fixed: vals}
	varied := map[string]int{}
	for i, v := range varies {
		if _, ok := p.Decls[v.name]; !ok && v.name != "mu" && !isRatio(mb, v.name) {
			return nil, fmt.Errorf("--vary %s: %s is not declared in %s", v.name, v.name, p.File)
		}
		varied[v.name] = i
	}
	given := func(n string) bool {
		_, v := varied[n]
		_, s := set[n]
		return v || s
	}
	ratioOf := map[string]*notation.Ratio{}
	for i := range mb.Ratios {
		ra := &mb.Ratios[i]
		ratioOf[ra.Name] = ra
		if given(ra.Name) && given(ra.Num) {
			return nil, fmt.Errorf("%s = %s^2/%s^2 is given, so %s follows from it: do not vary or set %s as well", ra.Name, ra.Num, ra.Den, ra.Num, ra.Num)
		}
	}
	shown := map[string]bool{}
	for _, c := range prog.Coeffs {
		srcs := make([]argSource, len(c.Args))
		for i, a := range c.Args {
			s := argSource{vary: -1}
			if k, ok := varied[a.Name]; ok {
				s.vary = k
				srcs[i] = s
				continue
			}
			if ra, ok := ratioOf[a.Name]; ok && !given(a.Name) {
				// x = Num^2/Den^2 from the masses' values
				s.ratio, s.derived = ra, true
				srcs[i] = s
				continue
			}
			numOf := func(m string) *notation.Ratio {
				for _, ra := range ratioOf {
					if ra.Num == m && given(ra.Name) {
						return ra
					}
				}
				return nil
			}
			if ra := numOf(a.Name); ra != nil {
				s.ratio, s.derived, s.num = ra, true, true
				srcs[i] = s
				continue
			}
			v, ok := vals[a.Name]
			if !ok {
				return nil, fmt.Errorf("%s needs a value for %s: give it with --set %s=… or --vary", c.Label, a.Name, a.Name)
			}
			s.value = v
			if !shown[a.Name] {
				shown[a.Name] = true
				g.shown = append(g.shown, fmt.Sprintf("%s = %s", a.Name, formatComplex(v)))
			}
			srcs[i] = s
		}
		g.args = append(g.args, srcs)
	}
	// Check that derived values can be computed.
	if _, err := g.argsAt(0, 0, make([]complex128, len(prog.Coeffs[0].Args))); err != nil && len(prog.Coeffs) > 0 {
		return nil, err
	}
	return g, nil
}

// point returns the varied values at grid index k (the first parameter varies fastest).
func (g *scanGrid) point(k int, out []float64) {
	for i, v := range g.varies {
		out[i] = v.values[k%v.n]
		k /= v.n
	}
}

func (g *scanGrid) size() int {
	n := 1
	for _, v := range g.varies {
		n *= v.n
	}
	return n
}

// value returns a named value at grid point k: varied, or fixed.
func (g *scanGrid) value(name string, pt []float64) (complex128, bool) {
	for i, v := range g.varies {
		if v.name == name {
			return complex(pt[i], 0), true
		}
	}
	v, ok := g.fixed[name]
	return v, ok
}

// argsAt fills the arguments of coefficient ci at grid point k.
func (g *scanGrid) argsAt(ci, k int, args []complex128) ([]complex128, error) {
	pt := make([]float64, len(g.varies))
	g.point(k, pt)
	for i, s := range g.args[ci] {
		switch {
		case s.vary >= 0:
			args[i] = complex(pt[s.vary], 0)
		case s.derived && !s.num:
			a, ok1 := g.value(s.ratio.Num, pt)
			b, ok2 := g.value(s.ratio.Den, pt)
			if !ok1 || !ok2 {
				return nil, fmt.Errorf("%s = %s^2/%s^2 needs values for %s and %s (or --vary/--set %s)", s.ratio.Name, s.ratio.Num, s.ratio.Den, s.ratio.Num, s.ratio.Den, s.ratio.Name)
			}
			args[i] = a * a / (b * b)
		case s.derived:
			x, ok1 := g.value(s.ratio.Name, pt)
			b, ok2 := g.value(s.ratio.Den, pt)
			if !ok1 || !ok2 {
				return nil, fmt.Errorf("%s follows from %s and %s, which need values", s.ratio.Num, s.ratio.Name, s.ratio.Den)
			}
			args[i] = cmplx.Sqrt(x) * b
		default:
			args[i] = s.value
		}
	}
	return args, nil
}

// run evaluates every coefficient at every point with the given number of workers.
func (g *scanGrid) run(workers int, progress func(int)) ([][]complex128, error) {
	n := g.size()
	res := make([][]complex128, n)
	var wg sync.WaitGroup
	var once sync.Once
	var firstErr error
	const chunk = 256
	next := make(chan int)
	go func() {
		for k := 0; k < n; k += chunk {
			next <- k
		}
		close(next)
	}()
	for w := 0; w < workers; w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			args := make([][]complex128, len(g.prog.Coeffs))
			for i, c := range g.prog.Coeffs {
				args[i] = make([]complex128, len(c.Args))
			}
			for start := range next {
				end := min(start+chunk, n)
				for k := start; k < end; k++ {
					row := make([]complex128, len(g.prog.Coeffs))
					for i, c := range g.prog.Coeffs {
						a, err := g.argsAt(i, k, args[i])
						if err == nil {
							row[i], err = c.Eval(a)
						}
						if err != nil {
							once.Do(func() { firstErr = fmt.Errorf("%s: %v", c.Label, err) })
						}
					}
					res[k] = row
				}
				progress(end - start)
			}
		}()
	}
	wg.Wait()
	return res, firstErr
}

// complexColumn reports whether coefficient i gets real and imaginary columns.
func (g *scanGrid) complexColumn(i int, res [][]complex128) bool {
	if g.prog.Coeffs[i].Real {
		return false
	}
	for _, r := range res {
		if imag(r[i]) != 0 {
			return true
		}
	}
	return false
}

func (g *scanGrid) scaleText() string {
	if v, ok := g.fixed["mu"]; ok && !g.block.ScaleSet {
		for _, vr := range g.varies {
			if vr.name == "mu" {
				return "mu varied"
			}
		}
		return "mu = " + formatComplex(v)
	}
	if g.block.ScaleSet {
		return "mu = " + g.block.Scale.String()
	}
	for _, vr := range g.varies {
		if vr.name == "mu" {
			return "mu varied"
		}
	}
	return "mu free"
}

func (g *scanGrid) table(res [][]complex128) []byte {
	var b bytes.Buffer
	fmt.Fprintf(&b, "# loopmatch scan %s: match %s\n", g.file, g.prog.Spec.Title)
	fmt.Fprintf(&b, "# scheme: %s; scale: %s\n", strings.Join(g.block.Scheme, " "), g.scaleText())
	for _, c := range g.prog.Spec.Conventions {
		fmt.Fprintf(&b, "# %s\n", c)
	}
	for _, par := range g.prog.Spec.Params {
		if par.Kind == emit.Ratio {
			fmt.Fprintf(&b, "# %s\n", par.Doc())
		}
	}
	if len(g.shown) > 0 {
		fmt.Fprintf(&b, "# fixed: %s (masses in the units of the file's values)\n", strings.Join(g.shown, ", "))
	}
	fmt.Fprintf(&b, "# float64 evaluation with series branches near removable singularities; target accuracy %g relative\n", emit.Tolerance.Rel)
	var cols []string
	for _, v := range g.varies {
		cols = append(cols, v.name)
	}
	cplx := make([]bool, len(g.prog.Coeffs))
	for i, c := range g.prog.Coeffs {
		cplx[i] = g.complexColumn(i, res)
		if cplx[i] {
			cols = append(cols, "Re "+c.Label, "Im "+c.Label)
		} else {
			cols = append(cols, c.Label)
		}
	}
	b.WriteString(strings.Join(cols, "\t") + "\n")
	pt := make([]float64, len(g.varies))
	for k, row := range res {
		g.point(k, pt)
		var fs []string
		for _, x := range pt {
			fs = append(fs, strconv.FormatFloat(x, 'g', -1, 64))
		}
		for i, z := range row {
			fs = append(fs, strconv.FormatFloat(real(z), 'g', 15, 64))
			if cplx[i] {
				fs = append(fs, strconv.FormatFloat(imag(z), 'g', 15, 64))
			}
		}
		b.WriteString(strings.Join(fs, "\t") + "\n")
	}
	return b.Bytes()
}

// plot draws the coefficients against the first varied parameter: one curve per coefficient
// (the imaginary part dashed when it is not zero) and per value of a second varied parameter.
func (g *scanGrid) plot(res [][]complex128, format string, wpx, hpx int) ([]byte, error) {
	pl := plot.New()
	scheme := strings.Join(g.block.Scheme, " ")
	pl.Title.Text = fmt.Sprintf("Wilson coefficients at %s, %s (%s)", strings.Replace(g.scaleText(), "mu", "μ", 1), scheme, filepath.Base(g.file))
	x := g.varies[0]
	pl.X.Label.Text = x.name
	for _, par := range g.prog.Spec.Params {
		if par.Name == x.name && par.Kind == emit.Ratio && par.Num != "" {
			pl.X.Label.Text = par.Doc()
		}
	}
	pl.Y.Label.Text = "C"
	if len(g.prog.Coeffs) == 1 {
		pl.Y.Label.Text = g.prog.Coeffs[0].Label
	}
	if x.log {
		pl.X.Scale = plot.LogScale{}
		pl.X.Tick.Marker = plot.LogTicks{Prec: -1}
	}
	pl.Add(plotter.NewGrid())
	outer := 1
	if len(g.varies) > 1 {
		outer = g.varies[1].n
	}
	type curve struct {
		label string
		pts   plotter.XYs
		dash  bool
	}
	var curves []curve
	for i, c := range g.prog.Coeffs {
		if c.Expr.IsZero() {
			continue // an identically vanishing coefficient would only hide the axis
		}
		parts := []bool{false}
		if g.complexColumn(i, res) {
			parts = []bool{false, true}
		}
		for _, im := range parts {
			for o := 0; o < outer; o++ {
				label := c.Label
				if im {
					label = "Im " + label
				} else if len(parts) > 1 {
					label = "Re " + label
				}
				if outer > 1 {
					label += fmt.Sprintf(", %s = %.4g", g.varies[1].name, g.varies[1].values[o])
				}
				cv := curve{label: label, dash: im}
				for j := 0; j < x.n; j++ {
					z := res[o*x.n+j][i]
					y := real(z)
					if im {
						y = imag(z)
					}
					if math.IsNaN(y) || math.IsInf(y, 0) {
						continue
					}
					cv.pts = append(cv.pts, plotter.XY{X: x.values[j], Y: y})
				}
				curves = append(curves, cv)
			}
		}
	}
	if len(curves) > 16 {
		return nil, fmt.Errorf("%d curves are too many for one plot; vary a second parameter over fewer values", len(curves))
	}
	for k, cv := range curves {
		if len(cv.pts) == 0 {
			continue
		}
		l, err := plotter.NewLine(cv.pts)
		if err != nil {
			return nil, err
		}
		l.Color = plotutil.Color(k)
		l.Width = vg.Points(1.5)
		if cv.dash {
			l.Dashes = []vg.Length{vg.Points(5), vg.Points(3)}
		}
		pl.Add(l)
		pl.Legend.Add(cv.label, l)
	}
	pl.Legend.Top = true
	wt, err := pl.WriterTo(vg.Length(wpx)*vg.Inch/96, vg.Length(hpx)*vg.Inch/96, format)
	if err != nil {
		return nil, err
	}
	var buf bytes.Buffer
	if _, err := wt.WriteTo(&buf); err != nil {
		return nil, err
	}
	return buf.Bytes(), nil
}
