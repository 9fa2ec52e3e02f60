package themes

import (
	"math"
	"regexp"
	"strconv"
	"strings"
	"testing"
)

// relLuminance is the relative luminance of an sRGB colour as WCAG 2.1
// defines it (Understanding SC 1.4.3, "relative luminance": linearise each
// channel with the sRGB transfer function, weights 0.2126, 0.7152, 0.0722).
func relLuminance(t *testing.T, hex string) float64 {
	t.Helper()
	if len(hex) != 7 || hex[0] != '#' {
		t.Fatalf("colour %q is not #rrggbb", hex)
	}
	var c [3]float64
	for i := range 3 {
		v, err := strconv.ParseUint(hex[1+2*i:3+2*i], 16, 8)
		if err != nil {
			t.Fatalf("colour %q: %v", hex, err)
		}
		s := float64(v) / 255
		if s <= 0.04045 {
			c[i] = s / 12.92
		} else {
			c[i] = math.Pow((s+0.055)/1.055, 2.4)
		}
	}
	return 0.2126*c[0] + 0.7152*c[1] + 0.0722*c[2]
}

// contrast is the WCAG 2.1 contrast ratio (L1 + 0.05) / (L2 + 0.05).
func contrast(t *testing.T, a, b string) float64 {
	t.Helper()
	la, lb := relLuminance(t, a), relLuminance(t, b)
	if la < lb {
		la, lb = lb, la
	}
	return (la + 0.05) / (lb + 0.05)
}

func TestContrastFormula(t *testing.T) {
	// Check the formula itself before trusting it on the themes.
	cases := []struct {
		a, b string
		want float64
		tol  float64
		src  string
	}{
		{"#000000", "#ffffff", 21, 1e-9, "WCAG 2.1 definition: the maximum ratio is 21:1"},
		{"#ffffff", "#ffffff", 1, 1e-9, "WCAG 2.1 definition: the minimum ratio is 1:1"},
		{"#767676", "#ffffff", 4.54, 0.005, "#767676 on white 4.54:1, the widely quoted lightest AA grey (from memory)"},
	}
	for _, tc := range cases {
		if got := contrast(t, tc.a, tc.b); math.Abs(got-tc.want) > tc.tol {
			t.Errorf("contrast(%s, %s) = %.4f, want %.4f (%s)", tc.a, tc.b, got, tc.want, tc.src)
		}
	}
}

// textPairs are the foreground/background property pairs that carry text.
var textPairs = [][2]string{
	{"fg", "bg"}, {"muted", "bg"}, {"accent", "bg"},
	{"fg", "stripe"}, {"muted", "stripe"}, {"accent", "stripe"},
	{"panel-fg", "panel"}, {"head-fg", "head-bg"},
	{"limit-fg", "limit-bg"}, {"caution-fg", "caution-bg"},
	{"ok-fg", "ok-bg"}, {"bad-fg", "bad-bg"}, {"fg", "code-bg"},
	{"chart-ink", "chart-bg"}, {"chart-muted", "chart-bg"},
}

// markProps are chart marks (points, lines, flags): WCAG 2.1 SC 1.4.11 asks
// 3:1 for graphical objects needed to understand the content.
var markProps = []string{"chart-point", "chart-fit", "chart-lowess", "chart-curve", "chart-flag",
	"chart-group-1", "chart-group-2", "chart-group-3", "chart-group-4", "chart-group-5", "chart-group-6"}

func TestThemeContrast(t *testing.T) {
	for _, name := range Names() {
		t.Run(name, func(t *testing.T) {
			p, err := Properties(name)
			if err != nil {
				t.Fatal(err)
			}
			for _, pr := range textPairs {
				fg, bg := p[pr[0]], p[pr[1]]
				if fg == "" || bg == "" {
					t.Errorf("--%s or --%s not defined", pr[0], pr[1])
					continue
				}
				if c := contrast(t, fg, bg); c < 4.5 {
					t.Errorf("text --%s %s on --%s %s: contrast %.2f:1, want >= 4.5:1 (WCAG 2.1 SC 1.4.3)", pr[0], fg, pr[1], bg, c)
				}
			}
			for _, m := range markProps {
				if c := contrast(t, p[m], p["chart-bg"]); c < 3 {
					t.Errorf("chart mark --%s %s on %s: contrast %.2f:1, want >= 3:1 (WCAG 2.1 SC 1.4.11)", m, p[m], p["chart-bg"], c)
				}
			}
		})
	}
}

// okabeIto is the palette of Okabe & Ito (2008), as published on
// https://jfly.uni-koeln.de/color/ (RGB 0-255 given there, written as hex).
var okabeIto = map[string]bool{
	"#000000": true, "#e69f00": true, "#56b4e9": true, "#009e73": true,
	"#f0e442": true, "#0072b2": true, "#d55e00": true, "#cc79a7": true,
}

func TestColouredMarksFromPalette(t *testing.T) {
	for _, name := range []string{"paper", "night"} {
		p, _ := Properties(name)
		for _, m := range markProps {
			if v := p[m]; !okabeIto[v] && !isGrey(v) {
				t.Errorf("%s: --%s = %s is neither an Okabe & Ito (2008) colour nor a neutral grey", name, m, v)
			}
		}
	}
	// contrast: black and greys only, so it prints in black and white.
	p, _ := Properties("contrast")
	for k, v := range p {
		if !isGrey(v) {
			t.Errorf("contrast: --%s = %s is not a grey", k, v)
		}
	}
}

var varUse = regexp.MustCompile(`var\(--([a-z0-9-]+)\)`)

func TestBaseUsesOnlyThemeProperties(t *testing.T) {
	base := read("base")
	if m := regexp.MustCompile(`#[0-9a-fA-F]{3,6}\b|rgba?\(|hsla?\(`).FindString(base); m != "" {
		t.Errorf("base.css has the colour literal %q; colours belong in the theme files", m)
	}
	for _, name := range Names() {
		p, _ := Properties(name)
		for _, m := range varUse.FindAllStringSubmatch(base, -1) {
			if _, ok := p[m[1]]; !ok {
				t.Errorf("base.css uses var(--%s), which theme %s does not define", m[1], name)
			}
		}
	}
}

func TestCSSAndPalette(t *testing.T) {
	if Names()[0] != Default {
		t.Errorf("Names()[0] = %q, want the default %q", Names()[0], Default)
	}
	if len(Names()) < 3 {
		t.Errorf("%d themes, want at least 3", len(Names()))
	}
	for _, name := range Names() {
		css, err := CSS(name)
		if err != nil {
			t.Fatalf("CSS(%q): %v", name, err)
		}
		for _, want := range []string{"@media print", ".study > header { break-after: avoid", "--chart-bg"} {
			if !strings.Contains(css, want) {
				t.Errorf("CSS(%q) lacks %q", name, want)
			}
		}
		if strings.Contains(css, "url(") || strings.Contains(css, "@import") {
			t.Errorf("CSS(%q) refers to another resource", name)
		}
		pal, err := ChartPalette(name)
		if err != nil {
			t.Fatal(err)
		}
		if len(pal.Groups) < 6 || pal.Background == "" {
			t.Errorf("ChartPalette(%q) = %+v: want 6 group colours and a background", name, pal)
		}
	}
	_, err := CSS("sepia")
	if err == nil || !strings.Contains(err.Error(), "paper, night, contrast") {
		t.Errorf("CSS(\"sepia\") error = %v, want one listing the themes", err)
	}
}

func isGrey(v string) bool { return len(v) == 7 && v[1:3] == v[3:5] && v[3:5] == v[5:7] }
