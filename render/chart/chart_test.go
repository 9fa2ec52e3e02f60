package chart

import (
	"bytes"
	"fmt"
	"io"
	"math"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"bivar/analysis/report"
	"bivar/render/internal/fixture"
	"bivar/themes"
)

// Figures here are drawn from invented data (render/internal/fixture and
// small hand-made series): the tests check drawing, never a statistic.

func draw(t *testing.T, f *Figure) string {
	t.Helper()
	pal, err := themes.ChartPalette("paper")
	if err != nil {
		t.Fatal(err)
	}
	var b bytes.Buffer
	if err := NewSVG(pal).Draw(&b, f); err != nil {
		t.Fatalf("Draw: %v", err)
	}
	if err := fixture.WellFormed(b.Bytes()); err != nil {
		t.Fatalf("SVG is not well-formed XML: %v\n%s", err, b.String())
	}
	return b.String()
}

func TestNiceTicks(t *testing.T) {
	cases := []struct {
		name   string
		lo, hi float64
		want   string // labels joined by spaces; negatives with U+2212
	}{
		{"unit range", 0, 1, "0.0 0.2 0.4 0.6 0.8 1.0"},
		{"hundreds", 400, 600, "400 450 500 550 600"},
		{"negative", -0.9, 0.6, "-0.8 -0.6 -0.4 -0.2 0.0 0.2 0.4 0.6"},
		{"small", 0.0012, 0.0047, "0.0015 0.0020 0.0025 0.0030 0.0035 0.0040 0.0045"},
		{"tiny", 1.2e-5, 4.7e-5, "1.5e-5 2.0e-5 2.5e-5 3.0e-5 3.5e-5 4.0e-5 4.5e-5"},
		{"large", 2.1e6, 2.9e6, "2.2e6 2.4e6 2.6e6 2.8e6"},
		{"constant", 5, 5, "4.8 4.9 5.0 5.1 5.2"},
		{"constant zero", 0, 0, "-0.4 -0.2 0.0 0.2 0.4"},
	}
	for _, tc := range cases {
		var e extent
		e.add(tc.lo, tc.hi)
		a := newAxis(e, 6)
		got := strings.Join(a.Labels, " ")
		if got != tc.want {
			t.Errorf("%s: ticks for [%g, %g] = %q, want %q", tc.name, tc.lo, tc.hi, got, tc.want)
		}
		// Properties for any range: 2 to 12 ticks, inside the axis, equally
		// spaced by 1, 2 or 5 times a power of ten, distinct labels.
		if n := len(a.Ticks); n < 2 || n > 12 {
			t.Errorf("%s: %d ticks", tc.name, n)
		}
		m := a.Step / math.Pow(10, math.Floor(math.Log10(a.Step)))
		if r := math.Round(m); math.Abs(m-r) > 1e-9 || (r != 1 && r != 2 && r != 5) {
			t.Errorf("%s: step %g is not 1, 2 or 5 × 10^k", tc.name, a.Step)
		}
		seen := map[string]bool{}
		for i, v := range a.Ticks {
			if v < a.Lo-1e-12 || v > a.Hi+1e-12 {
				t.Errorf("%s: tick %g outside [%g, %g]", tc.name, v, a.Lo, a.Hi)
			}
			if seen[a.Labels[i]] {
				t.Errorf("%s: label %q repeats", tc.name, a.Labels[i])
			}
			seen[a.Labels[i]] = true
			if strings.HasPrefix(a.Labels[i], "-0") && strings.Trim(a.Labels[i], "-0.") == "" {
				t.Errorf("%s: label %q is a negative zero", tc.name, a.Labels[i])
			}
		}
	}
}

func TestNoFiniteData(t *testing.T) {
	var e extent
	e.add(math.NaN(), math.Inf(1), math.Inf(-1))
	a := newAxis(e, 6)
	if a.Lo != -0.04 || a.Hi != 1.04 || len(a.Ticks) < 2 {
		t.Errorf("axis without finite data = [%g, %g] with %d ticks, want the unit range padded", a.Lo, a.Hi, len(a.Ticks))
	}
}

func TestEscapeAndTitles(t *testing.T) {
	evil := `<script>alert("x")</script> & </svg> 'q' ` + "\x01\xff"
	f := &Figure{ID: `a"b`, Title: evil, Desc: evil, XLabel: evil, YLabel: evil, Width: 300, Height: 200,
		Points: []Series{{Name: evil, X: []float64{1, 2, 3}, Y: []float64{1, 4, 9}}},
		Marked: []Mark{{X: 2, Y: 4, Label: evil}}}
	s := draw(t, f)
	if strings.Contains(s, "<script") || strings.Count(s, "</svg>") != 1 {
		t.Error("label text became markup")
	}
	if !strings.Contains(s, "&lt;script&gt;alert(&quot;x&quot;)") {
		t.Error("label not escaped as text")
	}
	if !regexp.MustCompile(`^<svg [^>]*width="300" height="200"`).MatchString(s) {
		t.Error("root <svg> lacks width and height")
	}
	if !strings.Contains(s, "<title id=") || !strings.Contains(s, "<desc id=") {
		t.Error("no <title> or <desc>")
	}
}

func TestNaNAndConstant(t *testing.T) {
	nan := math.NaN()
	f := &Figure{ID: "n", Title: "t", Desc: "d", Width: 400, Height: 300,
		Points: []Series{{Name: "rows", X: []float64{1, 2, nan, 4, math.Inf(1)}, Y: []float64{3, 3, 3, nan, 3}}},
		Lines:  []Line{{Name: "fit", X: []float64{1, 2, 3, 4}, Y: []float64{3, nan, 3, 3}, Role: RoleFit}},
		Bands:  []Band{{Name: "b", X: []float64{1, 2, 4}, Low: []float64{2, nan, 2}, High: []float64{4, 4, 4}, Role: RoleConf}}}
	s := draw(t, f)
	if strings.Contains(s, "NaN") || strings.Contains(s, "Inf") {
		t.Error("a non-finite value reached the SVG")
	}
	// Two finite points drawn, plus the legend's marker; the line broken
	// at NaN (two M commands).
	if n := strings.Count(s, "<circle cx="); n != 3 {
		t.Errorf("%d circle marks, want 3 (the two finite points and the legend)", n)
	}
	if !regexp.MustCompile(`d="M[^"]*M[^"]*" fill="none" stroke="#000000" stroke-width="2"`).MatchString(s) {
		t.Error("the line is not broken at its NaN")
	}
	// Constant y: a few distinct tick labels, not a flood.
	if n := strings.Count(s, `text-anchor="end">`); n > 14 {
		t.Errorf("%d y tick labels for constant y", n)
	}
}

func TestCoordinatesFixed(t *testing.T) {
	for v, want := range map[float64]string{1.006: "1.01", -0.001: "0", 12: "12", 3.14159: "3.14", -2.5: "-2.5"} {
		if got := coord(v); got != want {
			t.Errorf("coord(%v) = %q, want %q", v, got, want)
		}
	}
	// Sub-pixel coordinates survive (go-chart rounds to whole pixels).
	s := draw(t, Scatter(&fixture.Report(fixture.Options{}).Studies[0], "s", "95"))
	if !regexp.MustCompile(`cx="\d+\.\d+"`).MatchString(s) {
		t.Error("no fractional coordinates")
	}
}

func TestScatterFromStudy(t *testing.T) {
	r := fixture.Report(fixture.Options{})
	s := &r.Studies[0]
	f := Scatter(s, "s1", "95")
	if f == nil {
		t.Fatal("no scatter")
	}
	if len(f.Points) != 3 {
		t.Errorf("%d series, want 3 (one per lot)", len(f.Points))
	}
	if len(f.Marked) != 2 || f.Marked[0].Label != "P0010" || f.Marked[1].Label == "" {
		t.Errorf("marked = %+v, want the two named rows with their names, in the report's ranking", f.Marked)
	}
	roles := map[Role]bool{}
	for _, l := range f.Lines {
		roles[l.Role] = true
	}
	for _, b := range f.Bands {
		roles[b.Role] = true
	}
	// The fixture's first study is curved: its parabola is the main fit
	// (solid), the straight line is drawn for comparison without bands.
	for _, want := range []Role{RoleFit, RoleLowess, RoleOld} {
		if !roles[want] {
			t.Errorf("scatter lacks role %d", want)
		}
	}
	if roles[RoleConf] || roles[RolePred] || roles[RoleCurve] {
		t.Error("a curved study's chart draws the line's bands or the curve as a side line")
	}
	svg := draw(t, f)
	if n := strings.Count(svg, "<polygon "); n != 0 {
		t.Errorf("%d band polygons, want none", n)
	}
	// A straight-line study: the line in its confidence band (one polygon), no prediction band.
	if r.Studies[1].Findings != nil && r.Studies[1].Findings.Form != "curved" {
		lf := Scatter(&r.Studies[1], "s2", "95")
		if lf == nil || len(lf.Bands) != 1 || lf.Bands[0].Role != RoleConf {
			t.Errorf("straight-line study's bands: %+v", lf)
		}
	}
	// Groups differ by shape as well as colour: circles, squares and triangles.
	if !strings.Contains(svg, "<circle cx=") || !strings.Contains(svg, "<rect x=") || !strings.Contains(svg, `<path d="M`) {
		t.Error("group markers do not differ in shape")
	}
	for _, want := range []string{">P0006</text>", ">P0010</text>", "parabola (the main fit)", "straight line, for comparison", "LOWESS curve", "lot B (n = 20)"} {
		if !strings.Contains(svg, want) {
			t.Errorf("scatter lacks %q", want)
		}
	}
	if o := ResidualsOrder(s, "s1o"); o == nil || o.XLabel != "Press sequence (run order)" {
		t.Error("no run-order figure for a study with an order column")
	}
	if o := ResidualsOrder(&r.Studies[1], "s2o"); o != nil {
		t.Error("a run-order figure for a study without order")
	}
	if Scatter(&r.Studies[2], "s3", "95") != nil {
		t.Error("a scatter for a study that did not run")
	}
}

func TestDensity(t *testing.T) {
	r := fixture.Report(fixture.Options{N: 50000})
	s := &r.Studies[0]
	f := Scatter(s, "big", "95")
	if !f.Dense || !strings.Contains(f.Caption, "density cells") || !strings.Contains(f.Desc, "density cells") {
		t.Fatal("a 50000-point scatter is not drawn as density cells, or the caption does not say so")
	}
	svg := draw(t, f)
	if len(svg) > 300_000 {
		t.Errorf("density scatter is %d bytes", len(svg))
	}
	if !strings.Contains(svg, ">P0010</text>") {
		t.Error("flagged rows are not drawn on top of the density cells")
	}
	// Every cell's shade is one of five levels.
	levels := map[string]bool{}
	for _, m := range regexp.MustCompile(`fill-opacity="([0-9.]+)"/>`).FindAllStringSubmatch(svg, -1) {
		levels[m[1]] = true
	}
	if len(levels) < 2 || len(levels) > 8 {
		t.Errorf("%d distinct cell shades, want a handful", len(levels))
	}
}

func TestAxisTitle(t *testing.T) {
	cases := []struct {
		v    report.Variable
		want string
	}{
		{report.Variable{Column: "t", Label: "Temper", Unit: "Cel", Symbol: "°C"}, "Temper (°C)"},
		{report.Variable{Column: "t", Unit: "Cel", Symbol: "°C"}, "t (°C)"},
		{report.Variable{Column: "h", Label: "Hardness (Rockwell C)", Unit: "{HRC}", Symbol: "HRC"}, "Hardness (Rockwell C), HRC"},
		{report.Variable{Column: "r", Label: "Ratio", Unit: "1", Symbol: ""}, "Ratio"},
	}
	for _, tc := range cases {
		if got := AxisTitle(tc.v); got != tc.want {
			t.Errorf("AxisTitle(%+v) = %q, want %q", tc.v, got, tc.want)
		}
	}
	if got := InUnit(report.Variable{Column: "h", Label: "Hardness (Rockwell C)", Symbol: "HRC"}); got != "Hardness (Rockwell C) in HRC" {
		t.Errorf("InUnit = %q", got)
	}
	s := &report.Study{Group: "quench_tank", GroupLabel: "Quench tank", Order: "load_seq"}
	if GroupName(s) != "Quench tank" || OrderName(s) != "load_seq" || OrderName(&report.Study{}) != "run order" {
		t.Errorf("GroupName %q, OrderName %q", GroupName(s), OrderName(s))
	}
}

func TestDeterministicSVG(t *testing.T) {
	a := draw(t, Scatter(&fixture.Report(fixture.Options{}).Studies[0], "s", "95"))
	b := draw(t, Scatter(&fixture.Report(fixture.Options{}).Studies[0], "s", "95"))
	if a != b {
		t.Error("the same figure drawn twice differs")
	}
}

func BenchmarkScatterDense(b *testing.B) {
	r := fixture.Report(fixture.Options{N: 1_000_000})
	s := &r.Studies[0]
	pal, _ := themes.ChartPalette("paper")
	d := NewSVG(pal)
	b.ReportAllocs()
	for b.Loop() {
		if err := d.Draw(io.Discard, Scatter(s, "s", "95")); err != nil {
			b.Fatal(err)
		}
	}
}

var _ = strconv.Itoa

// TestLabelsBounded: a chart marks every named row the Plot carries but
// labels only those the analysis marked for a label (report.LabelMax),
// all of them where they have room (the scatter and the residuals on x,
// where the marks lie apart), fewer where the marks crowd together (on
// the run order the 25 rows take the first 25 of 5000 orders).
func TestLabelsBounded(t *testing.T) {
	r := fixture.Report(fixture.Options{N: 5000})
	s := &r.Studies[0]
	var marked []report.Marked
	for k := range 25 {
		marked = append(marked, report.Marked{Row: fmt.Sprintf("R%02d", k), X: 20 + float64(k), Y: 3, Fitted: 3, Residual: 0.1 * float64(k), Order: float64(k), Label: k < report.LabelMax})
	}
	s.Plot.Marked = marked
	for _, f := range []*Figure{Scatter(s, "s", "95"), ResidualsX(s, "f"), ResidualsOrder(s, "o")} {
		if f == nil || !f.Dense {
			t.Fatal("want a dense figure for n = 5000")
		}
		svg := draw(t, f)
		if got := strings.Count(svg, "<circle"); got != 25+1 { // 25 marks and the legend's mark
			t.Errorf("%s: %d circles, want 25 marks and one in the legend", f.ID, got)
		}
		labels := regexp.MustCompile(`>R\d\d</text>`).FindAllString(svg, -1)
		if want := report.LabelMax; len(labels) > want || f.ID != "o" && len(labels) != want || len(labels) == 0 {
			t.Errorf("%s: %d labels, want %d (at most %[3]d, at least one, on the run order)", f.ID, len(labels), want)
		}
		noOverlap(t, f.ID, svg)
	}
}

// noOverlap fails when two label plates in svg overlap.
func noOverlap(t *testing.T, id, svg string) {
	t.Helper()
	var plates [][4]float64
	for _, m := range regexp.MustCompile(`<rect x="([-\d.]+)" y="([-\d.]+)" width="([\d.]+)" height="([\d.]+)" rx="2"/>`).FindAllStringSubmatch(svg, -1) {
		var b [4]float64
		for k := range 4 {
			v, err := strconv.ParseFloat(m[k+1], 64)
			if err != nil {
				t.Fatal(err)
			}
			b[k] = v
		}
		plates = append(plates, b)
	}
	for i, a := range plates {
		for _, b := range plates[:i] {
			// The plates are the labels' boxes widened by 2.5 and 0.5 on
			// each side; boxes that do not overlap leave plates that may
			// touch by up to that much.
			if a[0]+5 < b[0]+b[2] && b[0]+5 < a[0]+a[2] && a[1]+1 < b[1]+b[3] && b[1]+1 < a[1]+a[3] {
				t.Errorf("%s: label plates %v and %v overlap", id, a, b)
			}
		}
	}
}

// TestLabelsCrowded: ten labelled rows on almost the same spot get as
// many labels as fit around them, none over another, those beyond the
// nearest places joined to their marks by lines (before, each label
// without a free place was printed over the others, and a corner of the
// 10⁷-row push-down chart was an unreadable stack of names).
func TestLabelsCrowded(t *testing.T) {
	r := fixture.Report(fixture.Options{N: 5000})
	s := &r.Studies[0]
	var marked []report.Marked
	for k := range report.LabelMax {
		x := 20 + 0.001*float64(k)
		marked = append(marked, report.Marked{Row: fmt.Sprintf("R%02d", k), X: x, Y: 3, Fitted: 3, Residual: 0.1, Order: 1, Label: true})
	}
	s.Plot.Marked = marked
	svg := draw(t, Scatter(s, "s", "95"))
	labels := regexp.MustCompile(`>R\d\d</text>`).FindAllString(svg, -1)
	lines := regexp.MustCompile(`<path d="M[-\d.]+ [-\d.]+L[-\d.]+ [-\d.]+"/>`).FindAllString(svg, -1)
	if len(labels) < 2 || len(lines) == 0 || len(lines) >= len(labels) {
		t.Errorf("%d labels and %d lines for %d crowded marks, want labels, some on lines, some not", len(labels), len(lines), report.LabelMax)
	}
	if !strings.Contains(svg, ">R00</text>") {
		t.Errorf("the first-ranked row is not labelled")
	}
	noOverlap(t, "s", svg)
}

// The caption of a density chart says how many named rows are drawn on
// top, and when none is named, says so instead of "the 0 named rows".
func TestDenseNoteNoneNamed(t *testing.T) {
	if got := denseNote(1000000, 0); strings.Contains(got, "0 named") || !strings.Contains(got, "no row is named") {
		t.Errorf("denseNote(1000000, 0) = %q", got)
	}
	if got := denseNote(1000000, 3); !strings.Contains(got, "the 3 named rows are drawn individually") || !strings.Contains(got, "With 1000000 rows, more than 3000") {
		t.Errorf("denseNote(1000000, 3) = %q", got)
	}
	// A study left in the database with max_rows = 100 draws its 200 rows
	// as density cells too (no row is fetched one by one): the caption
	// said "With 200 rows, more than 3000".
	if got := denseNote(200, 13); strings.Contains(got, "more than") || !strings.Contains(got, "stayed in the database") {
		t.Errorf("denseNote(200, 13) = %q", got)
	}
}
