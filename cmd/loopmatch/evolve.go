package main

import (
	"bytes"
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"io"
	"math"
	"slices"
	"strconv"
	"strings"

	"loopmatch/expr"
	"loopmatch/expr/notation"
	"loopmatch/match/running"
)

var evolveCmd = &command{
	name:    "evolve",
	summary: "run Wilson coefficients between two scales with an anomalous-dimension block",
	usage:   "FILE|--table NAME|--tables --from MU0 --to MU [--block NAME] [--initial Q=value,…] [--alphas-mz 0.1180] [--order lo|nlo] [--format text|json]",
	help: `evolve takes the anomalous block of FILE (or the shipped table NAME), the coefficients at
MU0 (the block's initial line, overridden and completed by --initial; operators not named start
at 0) and runs them to MU with the LO or NLO evolution matrix, in the convention
mu dC/dmu = gamma^T C, gamma = a gamma^(0) + a^2 gamma^(1), a = alpha_s/(4 pi), Nc = 3.
alpha_s runs from alpha_s(M_Z) (M_Z = 91.1876 GeV, 5 flavours) with the flavour number changed
at the heavy-quark thresholds (MS-bar masses m(m), matched at mu = m unless --threshold-scales
says otherwise) and MS-bar decoupling one loop below the running. Coefficients are continuous
at the thresholds. Scales are in GeV. The output states everything assumed.

The shipped tables (docs/RUNNING.md) are listed by loopmatch evolve --tables.

Exit codes: 0 success, 2 bad input (including a scale where alpha_s is non-perturbative).`,
}

// Defaults of the running (Particle Data Group values, from memory: M_Z, alpha_s(M_Z) and the
// MS-bar masses m_c(m_c), m_b(m_b), m_t(m_t) in GeV).
const (
	defaultMZ      = 91.1876
	defaultAlphaSZ = 0.1180
)

var defaultThresholds = []quarkThreshold{{"c", 4, 1.27}, {"b", 5, 4.18}, {"t", 6, 162.5}}

// quarkThreshold names a heavy-quark threshold by its quark.
type quarkThreshold struct {
	quark string
	nf    int     // active flavours above the threshold
	mass  float64 // MS-bar mass m(m) in GeV
}

// runSettings are the choices of the running shared by evolve and match --evolve-to.
type runSettings struct {
	alphasMZ   float64
	order      string // "", "lo" or "nlo"; "" means the highest order of the block
	loops      int    // loops of the alpha_s running; 0 means the evolution order
	thresholds string // "c=1.27,b=4.18,t=162.5" (overrides the defaults named)
	scales     string // "b=9.6": matching scales of thresholds
	form       string // "product" or "expanded"
}

func defaultSettings() runSettings {
	return runSettings{alphasMZ: defaultAlphaSZ, form: "product"}
}

type evolveOpts struct {
	runSettings
	from, to   string
	block      string
	table      string
	initial    string
	format     *format
	order      *format
	form       *format
	listTables bool
}

func evolveFlags() (*flag.FlagSet, *evolveOpts) {
	fs := flag.NewFlagSet("evolve", flag.ContinueOnError)
	o := &evolveOpts{runSettings: defaultSettings(), format: newFormat("text", "json"),
		order: newFormat("auto", "lo", "nlo"), form: newFormat("product", "expanded")}
	fs.StringVar(&o.from, "from", "", "starting scale MU0 in GeV (required)")
	fs.StringVar(&o.to, "to", "", "final scale MU in GeV (required)")
	fs.StringVar(&o.block, "block", "", "the anomalous block of FILE to use (needed when FILE has several)")
	fs.StringVar(&o.table, "table", "", "use the shipped table NAME instead of a FILE")
	fs.BoolVar(&o.listTables, "tables", false, "list the shipped tables and stop")
	fs.StringVar(&o.initial, "initial", "", "coefficients at MU0, e.g. Q2=1,Q7=-0.19 (override the block's initial line)")
	fs.Float64Var(&o.alphasMZ, "alphas-mz", defaultAlphaSZ, "alpha_s(M_Z) with 5 flavours")
	fs.Var(o.order, "order", "evolution order: lo or nlo; auto is the highest the block gives")
	fs.IntVar(&o.loops, "alphas-loops", 0, "loops of the alpha_s running, 1 to 4 (default: 1 at LO, 2 at NLO)")
	fs.StringVar(&o.thresholds, "thresholds", "", "MS-bar masses m(m) of the heavy quarks in GeV (default c=1.27,b=4.18,t=162.5)")
	fs.StringVar(&o.scales, "threshold-scales", "", "matching scales of thresholds in GeV, e.g. b=9.6 (default: at mu = m)")
	fs.Var(o.form, "nlo-form", "NLO evolution matrix: product or expanded (finite where 2 beta0 + gamma_i - gamma_j = 0)")
	fs.Var(o.format, "format", "output format: text or json")
	return fs, o
}

func init() {
	register(evolveCmd)
	flagSets["evolve"] = func() *flag.FlagSet { fs, _ := evolveFlags(); return fs }
	evolveCmd.run = runEvolve
}

// writeTables lists the shipped tables.
func writeTables(w io.Writer) error {
	ts, err := running.Tables()
	if err != nil {
		return err
	}
	fmt.Fprintln(w, "shipped anomalous-dimension tables (use with --table NAME; the source is in each file)")
	for _, t := range ts {
		b := t.Block
		orders := "gamma^(0)"
		if b.Orders() == 2 {
			orders = "gamma^(0), gamma^(1) " + strings.Join(b.Scheme, " ")
		}
		var fixed []string
		for _, k := range []string{"Nc", "nf"} {
			if v, ok := b.Fixed[k]; ok {
				fixed = append(fixed, fmt.Sprintf("%s = %d", k, v))
			}
		}
		holds := "any Nc, nf"
		if len(fixed) > 0 {
			holds = strings.Join(fixed, ", ")
		}
		fmt.Fprintf(w, "  %-18s %s: %s; %s; onto %s\n", b.Name, t.File, orders, holds, strings.Join(b.Ops, ", "))
	}
	return nil
}

// evolution is the result of one run, with everything it assumed.
type evolution struct {
	File, Block, BlockPos string
	Ops                   []string
	From, To              float64
	Order                 running.Order
	Form                  string
	AlphaSMZ              float64
	Loops, MatchLoops     int
	Thresholds            []running.Threshold
	Quarks                []string // the quark of each threshold
	Flavours              []int    // active flavours on the path, from MU0 to MU
	AlphaSFrom, AlphaSTo  float64
	Scheme                string
	C0, C                 []complex128
	Origin                []string // where each initial value came from
}

func runEvolve(args []string, out, errOut io.Writer) int {
	fs, o := evolveFlags()
	pos, ok := parseFlags(fs, args, errOut)
	if !ok {
		return exitBadInput
	}
	fail := func(format string, a ...any) int {
		fmt.Fprintf(errOut, "loopmatch evolve: "+format+"\n", a...)
		return exitBadInput
	}
	if o.listTables {
		if err := writeTables(out); err != nil {
			return fail("%v", err)
		}
		return exitOK
	}
	if o.order.value != "auto" {
		o.runSettings.order = o.order.value
	}
	o.runSettings.form = o.form.value
	from, err := positiveScale("--from", o.from)
	if err != nil {
		return fail("%v", err)
	}
	to, err := positiveScale("--to", o.to)
	if err != nil {
		return fail("%v", err)
	}
	var b *notation.ADMBlock
	var file string
	values := map[string]complex128{}
	switch {
	case o.table != "" && len(pos) > 0:
		return fail("give a FILE or --table NAME, not both")
	case o.table != "":
		t, err := running.LookupTable(o.table)
		if err != nil {
			return fail("%v", err)
		}
		b, file = t.Block, t.File
	case len(pos) != 1:
		return fail("expected one FILE argument (or --table NAME)")
	default:
		p, err := loadProgram(pos[0])
		if err != nil {
			fmt.Fprintln(errOut, err)
			return exitBadInput
		}
		if b, err = chooseBlock(p, o.block); err != nil {
			return fail("%v", err)
		}
		if values, err = numericValues(p, nil); err != nil {
			return fail("%v", err)
		}
		file = p.File
	}
	c0, origin, err := initialValues(b, values, o.initial)
	if err != nil {
		return fail("%v", err)
	}
	ev, err := evolveBlock(b, file, o.runSettings, from, to, c0, origin)
	if err != nil {
		return fail("%v", err)
	}
	if o.format.value == "json" {
		writeJSON(out, ev.toJSON())
	} else {
		writeEvolutionText(out, ev, "")
	}
	return exitOK
}

// positiveScale reads a scale in GeV.
func positiveScale(flagName, s string) (float64, error) {
	if s == "" {
		return 0, fmt.Errorf("%s is required (a scale in GeV)", flagName)
	}
	v, err := strconv.ParseFloat(strings.TrimSpace(s), 64)
	if err != nil || !(v > 0) || math.IsInf(v, 0) {
		return 0, fmt.Errorf("%s: expected a positive scale in GeV, found %q", flagName, s)
	}
	return v, nil
}

// chooseBlock picks the anomalous block of a file: the named one, or the only one.
func chooseBlock(p *notation.Program, name string) (*notation.ADMBlock, error) {
	bs := p.ADMs()
	var names []string
	for _, b := range bs {
		names = append(names, b.Name)
	}
	if name != "" {
		if b, ok := p.ADM(name); ok {
			return b, nil
		}
		if len(names) == 0 {
			return nil, fmt.Errorf("%s has no anomalous block", p.File)
		}
		return nil, fmt.Errorf("%s has no anomalous block %s (it has %s)", p.File, name, strings.Join(names, ", "))
	}
	switch len(bs) {
	case 0:
		return nil, fmt.Errorf("%s has no anomalous block (write one: anomalous NAME onto Q1, …: with rows of gamma^(0))", p.File)
	case 1:
		return bs[0], nil
	}
	return nil, fmt.Errorf("%s has %d anomalous blocks (%s): choose one with --block", p.File, len(bs), strings.Join(names, ", "))
}

// initialValues gathers the coefficients at the starting scale: the block's initial line
// (evaluated with the file's values), then --initial, which overrides and completes it.
func initialValues(b *notation.ADMBlock, values map[string]complex128, flagValue string) ([]complex128, []string, error) {
	c0 := make([]complex128, len(b.Ops))
	origin := make([]string, len(b.Ops))
	for i := range origin {
		origin[i] = "zero"
	}
	for _, name := range b.InitialOrder {
		v, err := b.Initial[name].Eval(values)
		if err != nil {
			return nil, nil, fmt.Errorf("%s: initial value of %s: %v", b.Pos, name, err)
		}
		i := b.Index(name)
		c0[i], origin[i] = v, "file"
	}
	set, err := parseNumbers("--initial", flagValue)
	if err != nil {
		return nil, nil, err
	}
	for _, kv := range set {
		i := b.Index(kv.name)
		if i < 0 {
			return nil, nil, fmt.Errorf("--initial: %s is not an operator of block %s (onto %s)", kv.name, b.Name, strings.Join(b.Ops, ", "))
		}
		c0[i], origin[i] = kv.value, "--initial"
	}
	return c0, origin, nil
}

type namedNumber struct {
	name  string
	value complex128
}

// parseNumbers reads "a=1,b=-0.5" (values may be expressions of numbers) for a flag.
func parseNumbers(flagName, s string) ([]namedNumber, error) {
	var out []namedNumber
	if strings.TrimSpace(s) == "" {
		return nil, nil
	}
	for _, kv := range strings.Split(s, ",") {
		k, v, ok := strings.Cut(kv, "=")
		k = strings.TrimSpace(k)
		if !ok || k == "" {
			return nil, fmt.Errorf("%s: expected name=value, found %q", flagName, kv)
		}
		if slices.ContainsFunc(out, func(n namedNumber) bool { return n.name == k }) {
			return nil, fmt.Errorf("%s: %s is given twice", flagName, k)
		}
		e, err := notation.ParseFreeExpr(v)
		if err != nil {
			return nil, fmt.Errorf("%s %s: %v", flagName, k, err)
		}
		z, err := e.Eval(nil)
		if err != nil || len(e.Vars()) > 0 {
			return nil, fmt.Errorf("%s %s: the value must be a number, found %q", flagName, k, strings.TrimSpace(v))
		}
		out = append(out, namedNumber{k, z})
	}
	return out, nil
}

// coupling builds the running αs of the settings.
func (s runSettings) coupling(order running.Order) (running.Coupling, []string, error) {
	loops := s.loops
	if loops == 0 {
		loops = int(order)
	}
	if loops < 1 || loops > 4 {
		return running.Coupling{}, nil, fmt.Errorf("--alphas-loops: %d loops: want 1 to 4", loops)
	}
	if !(s.alphasMZ > 0 && s.alphasMZ < 1) {
		return running.Coupling{}, nil, fmt.Errorf("--alphas-mz: %g: want a value between 0 and 1", s.alphasMZ)
	}
	th := slices.Clone(defaultThresholds)
	masses, err := parseNumbers("--thresholds", s.thresholds)
	if err != nil {
		return running.Coupling{}, nil, err
	}
	scales, err := parseNumbers("--threshold-scales", s.scales)
	if err != nil {
		return running.Coupling{}, nil, err
	}
	find := func(flagName, q string) (int, error) {
		i := slices.IndexFunc(th, func(t quarkThreshold) bool { return t.quark == q })
		if i < 0 {
			return 0, fmt.Errorf("%s: unknown quark %s (c, b or t)", flagName, q)
		}
		return i, nil
	}
	positive := func(flagName string, n namedNumber) (float64, error) {
		if imag(n.value) != 0 || !(real(n.value) > 0) {
			return 0, fmt.Errorf("%s: %s must be a positive number of GeV", flagName, n.name)
		}
		return real(n.value), nil
	}
	for _, m := range masses {
		i, err := find("--thresholds", m.name)
		if err != nil {
			return running.Coupling{}, nil, err
		}
		if th[i].mass, err = positive("--thresholds", m); err != nil {
			return running.Coupling{}, nil, err
		}
	}
	c := running.Coupling{AlphaS0: s.alphasMZ, Mu0: defaultMZ, Nf0: 5, Loops: loops, MatchLoops: loops - 1}
	var quarks []string
	for _, t := range th {
		c.Thresholds = append(c.Thresholds, running.Threshold{Nf: t.nf, Mass: t.mass})
		quarks = append(quarks, t.quark)
	}
	for _, sc := range scales {
		i, err := find("--threshold-scales", sc.name)
		if err != nil {
			return running.Coupling{}, nil, err
		}
		if c.Thresholds[i].Scale, err = positive("--threshold-scales", sc); err != nil {
			return running.Coupling{}, nil, err
		}
	}
	if err := c.Validate(); err != nil {
		return running.Coupling{}, nil, fmt.Errorf("thresholds: %v", err)
	}
	return c, quarks, nil
}

// evolveBlock runs c0 from `from` to `to` with the block's anomalous dimensions at three
// colours. Complex coefficients are run as real and imaginary parts (γ is real).
func evolveBlock(b *notation.ADMBlock, file string, s runSettings, from, to float64, c0 []complex128, origin []string) (*evolution, error) {
	order := running.Order(b.Orders())
	switch s.order {
	case "lo":
		order = running.LO
	case "nlo":
		if b.Orders() < 2 {
			return nil, fmt.Errorf("block %s (%s) gives gamma^(0) only: NLO evolution needs rows 1 (gamma^(1))", b.Name, b.Pos)
		}
		order = running.NLO
	}
	form := running.ProductForm
	if s.form == "expanded" {
		form = running.ExpandedForm
	}
	c, quarks, err := s.coupling(order)
	if err != nil {
		return nil, err
	}
	ev := &evolution{File: file, Block: b.Name, BlockPos: b.Pos.String(), Ops: b.Ops, From: from, To: to,
		Order: order, Form: s.form, AlphaSMZ: s.alphasMZ, Loops: c.Loops, MatchLoops: c.MatchLoops,
		Thresholds: c.Thresholds, Quarks: quarks, Scheme: strings.Join(b.Scheme, " "), C0: c0, Origin: origin}
	if ev.AlphaSFrom, err = c.AlphaS(from); err != nil {
		return nil, err
	}
	if ev.AlphaSTo, err = c.AlphaS(to); err != nil {
		return nil, err
	}
	ev.Flavours = flavoursOnPath(c, from, to)
	re, im := make([]float64, len(c0)), make([]float64, len(c0))
	for i, z := range c0 {
		re[i], im[i] = real(z), imag(z)
	}
	adm := running.FromBlock(b, 3)
	run := func(x []float64) ([]float64, error) {
		out, err := running.Evolve(adm, c, order, form, from, to, x)
		var de *running.DegenerateError
		if errors.As(err, &de) {
			return nil, fmt.Errorf("%v (run with --nlo-form expanded for the limiting formula)", err)
		}
		return out, err
	}
	cr, err := run(re)
	if err != nil {
		return nil, err
	}
	ci := make([]float64, len(c0))
	if slices.ContainsFunc(im, func(x float64) bool { return x != 0 }) {
		if ci, err = run(im); err != nil {
			return nil, err
		}
	}
	for i := range cr {
		ev.C = append(ev.C, complex(cr[i], ci[i]))
	}
	return ev, nil
}

// flavoursOnPath lists the active flavours of the segments between the thresholds crossed.
func flavoursOnPath(c running.Coupling, from, to float64) []int {
	lo, hi := math.Min(from, to), math.Max(from, to)
	bounds := []float64{lo, hi}
	for _, t := range c.Thresholds {
		s := t.Scale
		if s == 0 {
			s = t.Mass
		}
		if s > lo && s < hi {
			bounds = append(bounds, s)
		}
	}
	slices.Sort(bounds)
	var nfs []int
	for k := 0; k+1 < len(bounds); k++ {
		nfs = append(nfs, c.NfAt(math.Sqrt(bounds[k]*bounds[k+1])))
	}
	if len(nfs) == 0 { // from == to
		nfs = []int{c.NfAt(from)}
	}
	if from > to {
		slices.Reverse(nfs)
	}
	return nfs
}

func orderWord(o running.Order) string {
	if o == running.NLO {
		return "NLO"
	}
	return "LO"
}

// assumptions lists what a run assumed, one statement a line.
func (ev *evolution) assumptions() []string {
	out := []string{
		"mu dC/dmu = gamma^T C, gamma = a gamma^(0) + a^2 gamma^(1), a = alpha_s/(4 pi); row i, column j of gamma: Q_i mixes into Q_j; Nc = 3",
	}
	if ev.Order == running.NLO {
		out = append(out, fmt.Sprintf("order NLO: gamma^(0) and gamma^(1), %s form of the evolution matrix", ev.Form))
		scheme := ev.Scheme
		if scheme == "" {
			scheme = "not stated in the file"
		}
		out = append(out, "scheme of gamma^(1) (and of the coefficients): "+scheme)
	} else {
		out = append(out, "order LO: gamma^(0) only (gamma^(1) and its scheme not used)")
	}
	decoupling := "alpha_s continuous at the thresholds"
	if ev.MatchLoops > 0 {
		decoupling = fmt.Sprintf("%d-loop MS-bar decoupling at the thresholds", ev.MatchLoops)
	}
	out = append(out, fmt.Sprintf("alpha_s(M_Z) = %g at M_Z = %g GeV with 5 flavours; %d-loop running, %s",
		ev.AlphaSMZ, defaultMZ, ev.Loops, decoupling))
	var th []string
	for i, t := range ev.Thresholds {
		s := fmt.Sprintf("m_%s(m_%s) = %g GeV", ev.Quarks[i], ev.Quarks[i], t.Mass)
		if t.Scale != 0 {
			s += fmt.Sprintf(" matched at mu = %g GeV", t.Scale)
		} else {
			s += " matched at mu = m"
		}
		th = append(th, s)
	}
	out = append(out, "thresholds: "+strings.Join(th, ", "))
	var nfs []string
	for _, n := range ev.Flavours {
		nfs = append(nfs, strconv.Itoa(n))
	}
	out = append(out, "active flavours from mu0 to mu: "+strings.Join(nfs, " -> ")+"; coefficients continuous at thresholds (no threshold corrections)")
	out = append(out, fmt.Sprintf("alpha_s(mu0) = %.6g, alpha_s(mu) = %.6g", ev.AlphaSFrom, ev.AlphaSTo))
	var given []string
	for i, o := range ev.Origin {
		if o != "zero" {
			given = append(given, ev.Ops[i]+" ("+o+")")
		}
	}
	if len(given) == 0 {
		out = append(out, "initial values: all zero")
	} else {
		out = append(out, "initial values: "+strings.Join(given, ", ")+"; the others 0")
	}
	return out
}

// writeEvolutionText prints a run; indent prefixes every line (for match --evolve-to).
func writeEvolutionText(w io.Writer, ev *evolution, indent string) {
	fmt.Fprintf(w, "%sevolve %s (%s) from mu0 = %g GeV to mu = %g GeV\n", indent, ev.Block, ev.BlockPos, ev.From, ev.To)
	fmt.Fprintf(w, "%sassumed\n", indent)
	for _, a := range ev.assumptions() {
		fmt.Fprintf(w, "%s  %s\n", indent, a)
	}
	fmt.Fprintf(w, "%sWilson coefficients (%s)\n", indent, orderWord(ev.Order))
	width := len("operator")
	for _, op := range ev.Ops {
		width = max(width, len(op))
	}
	fmt.Fprintf(w, "%s  %-*s  %-20s  %s\n", indent, width, "operator", fmt.Sprintf("C(%g GeV)", ev.From), fmt.Sprintf("C(%g GeV)", ev.To))
	for i, op := range ev.Ops {
		fmt.Fprintf(w, "%s  %-*s  %-20s  %s\n", indent, width, op, formatComplex(ev.C0[i]), formatComplex(ev.C[i]))
	}
}

// jsonEvolution is the JSON form of a run.
type jsonEvolution struct {
	File            string          `json:"file"`
	Block           string          `json:"block"`
	Position        string          `json:"position"`
	Operators       []string        `json:"operators"`
	From            float64         `json:"from"`
	To              float64         `json:"to"`
	Order           string          `json:"order"`
	NLOForm         string          `json:"nlo_form,omitempty"`
	Scheme          string          `json:"scheme,omitempty"`
	Colours         int             `json:"colours"`
	AlphaSMZ        float64         `json:"alphas_mz"`
	MZ              float64         `json:"mz"`
	AlphaSLoops     int             `json:"alphas_loops"`
	DecouplingLoops int             `json:"decoupling_loops"`
	Thresholds      []jsonThreshold `json:"thresholds"`
	Flavours        []int           `json:"flavours"`
	AlphaSFrom      float64         `json:"alphas_from"`
	AlphaSTo        float64         `json:"alphas_to"`
	Assumed         []string        `json:"assumed"`
	Coefficients    []jsonCoeff     `json:"coefficients"`
}

type jsonThreshold struct {
	Quark    string  `json:"quark"`
	Mass     float64 `json:"mass"`
	Scale    float64 `json:"scale"`
	Flavours int     `json:"flavours_above"`
}

type jsonCoeff struct {
	Operator string     `json:"operator"`
	Initial  [2]float64 `json:"initial"`
	Origin   string     `json:"initial_from"`
	Value    [2]float64 `json:"value"`
}

func (ev *evolution) toJSON() jsonEvolution {
	j := jsonEvolution{File: ev.File, Block: ev.Block, Position: ev.BlockPos, Operators: ev.Ops,
		From: ev.From, To: ev.To, Order: orderWord(ev.Order), Colours: 3, AlphaSMZ: ev.AlphaSMZ, MZ: defaultMZ,
		AlphaSLoops: ev.Loops, DecouplingLoops: ev.MatchLoops, Flavours: ev.Flavours,
		AlphaSFrom: ev.AlphaSFrom, AlphaSTo: ev.AlphaSTo, Assumed: ev.assumptions()}
	if ev.Order == running.NLO {
		j.NLOForm, j.Scheme = ev.Form, ev.Scheme
	}
	for i, t := range ev.Thresholds {
		s := t.Scale
		if s == 0 {
			s = t.Mass
		}
		j.Thresholds = append(j.Thresholds, jsonThreshold{ev.Quarks[i], t.Mass, s, t.Nf})
	}
	for i, op := range ev.Ops {
		j.Coefficients = append(j.Coefficients, jsonCoeff{op, [2]float64{real(ev.C0[i]), imag(ev.C0[i])}, ev.Origin[i],
			[2]float64{real(ev.C[i]), imag(ev.C[i])}})
	}
	return j
}

// finishEvolveTo is the end of `match --evolve-to MU`: it runs the numerical coefficients of
// every match block from the match scale to MU with the file's anomalous block for those
// operators, then prints the match and the evolution.
func finishEvolveTo(out, errOut io.Writer, p *notation.Program, rs []matchOut, set map[string]expr.Expr, to, formatName string, code int) int {
	fail := func(format string, a ...any) int {
		fmt.Fprintf(errOut, "loopmatch match --evolve-to: "+format+"\n", a...)
		return exitBadInput
	}
	mu, err := positiveScale("--evolve-to", to)
	if err != nil {
		return fail("%v", err)
	}
	vals, err := numericValues(p, set)
	if err != nil {
		return fail("%v", err)
	}
	var evs []*evolution
	for _, mo := range rs {
		ev, err := evolveMatch(p, mo, vals, mu)
		if err != nil {
			return fail("%v", err)
		}
		evs = append(evs, ev)
	}
	switch formatName {
	case "json":
		var buf bytes.Buffer
		writeMatchJSON(&buf, p, rs)
		var js []jsonEvolution
		for _, ev := range evs {
			js = append(js, ev.toJSON())
		}
		writeJSON(out, struct {
			Match     json.RawMessage `json:"match"`
			Evolution []jsonEvolution `json:"evolution"`
		}{buf.Bytes(), js})
	case "latex":
		writeMatchLaTeX(out, p, rs)
		for _, ev := range evs {
			fmt.Fprintf(out, "%% loopmatch match --evolve-to: block %s from %g GeV to %g GeV\n", ev.Block, ev.From, ev.To)
			for _, a := range ev.assumptions() {
				fmt.Fprintf(out, "%% %s\n", a)
			}
			fmt.Fprintln(out, "\\begin{align}")
			for i, op := range ev.Ops {
				sep := " \\\\"
				if i == len(ev.Ops)-1 {
					sep = ""
				}
				fmt.Fprintf(out, "  C_{\\mathrm{%s}}(%g\\,\\mathrm{GeV}) &= %s%s\n", strings.ReplaceAll(op, "_", `\_`), ev.To, formatComplex(ev.C[i]), sep)
			}
			fmt.Fprintln(out, "\\end{align}")
		}
	default:
		writeMatchText(out, p, rs)
		for _, ev := range evs {
			fmt.Fprintln(out, "evolution (--evolve-to)")
			writeEvolutionText(out, ev, "  ")
		}
	}
	return code
}

// evolveMatch evolves the coefficients of one match block.
func evolveMatch(p *notation.Program, mo matchOut, vals map[string]complex128, mu float64) (*evolution, error) {
	mb := mo.res.Block
	where := fmt.Sprintf("match %s onto %s (%s)", strings.Join(mb.Amps, ", "), strings.Join(mb.Ops, ", "), mb.Pos)
	var b *notation.ADMBlock
	for _, cand := range p.ADMs() {
		if !slices.ContainsFunc(mb.Ops, func(op string) bool { return cand.Index(op) < 0 }) {
			b = cand
			break
		}
	}
	if b == nil {
		return nil, fmt.Errorf("%s: %s has no anomalous block with the operators %s (write anomalous NAME onto %s: with rows of gamma^(0))",
			where, p.File, strings.Join(mb.Ops, ", "), strings.Join(mb.Ops, ", "))
	}
	if mo.numErr != nil {
		return nil, fmt.Errorf("%s: the coefficients have no numerical values (%v)", where, mo.numErr)
	}
	if len(mo.numbers) != len(mo.res.Coeffs) {
		return nil, fmt.Errorf("%s: the coefficients need numerical values: give them with --set or a values line", where)
	}
	if !mb.ScaleSet {
		return nil, fmt.Errorf("%s: the match scale is not set (write scale mu = … in the match block or give --set mu=…)", where)
	}
	z, err := mb.Scale.Eval(vals)
	if err != nil {
		return nil, fmt.Errorf("%s: the match scale %s has no numerical value: %v", where, mb.Scale, err)
	}
	if imag(z) != 0 || !(real(z) > 0) {
		return nil, fmt.Errorf("%s: the match scale %s = %s is not a positive number of GeV", where, mb.Scale, formatComplex(z))
	}
	c0, origin, err := initialValues(b, vals, "")
	if err != nil {
		return nil, err
	}
	for k, c := range mo.res.Coeffs {
		i := b.Index(c.Operator)
		c0[i], origin[i] = mo.numbers[k], "match"
	}
	return evolveBlock(b, p.File, defaultSettings(), real(z), mu, c0, origin)
}
