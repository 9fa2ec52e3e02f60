// Package themes holds bivar's CSS themes, embedded in the binary with
// go:embed so that a report needs nothing from the network or the disk.
//
// A theme is one file of custom properties (colours) and a few rules of its
// own; base.css holds the layout every theme shares and takes its colours
// only through those properties. The chart colours live in the same file
// (the --chart-* properties) so that a theme is one place to edit, and are
// read back by Palette for the SVG charts, which carry their own colours
// because a chart shown as an image (in Markdown) cannot see the page's CSS.
//
// Themes:
//
//	paper     light, the default
//	night     dark, for screens (prints on white)
//	contrast  black and white only; groups and flags told apart by shape
//
// Colours are from Okabe & Ito (2008), "Color Universal Design (CUD): how to
// make figures and presentations that are friendly to colorblind people",
// https://jfly.uni-koeln.de/color/ — a palette published for readers with
// the common colour-vision deficiencies. Text contrast is at least 4.5:1
// (WCAG 2.1 success criterion 1.4.3); themes_test.go computes it.
package themes

import (
	"embed"
	"fmt"
	"regexp"
	"slices"
	"strings"
)

//go:embed *.css
var files embed.FS

// Default is the theme used when the manifest names none.
const Default = "paper"

// names lists the themes in the order Names reports them.
var names = []string{"paper", "night", "contrast"}

// Names returns the theme names, the default first.
func Names() []string { return slices.Clone(names) }

func known(name string) error {
	if slices.Contains(names, name) {
		return nil
	}
	return fmt.Errorf("unknown theme %q: want one of %s", name, strings.Join(names, ", "))
}

func read(name string) string {
	b, err := files.ReadFile(name + ".css")
	if err != nil {
		// The files are embedded at build time; a missing one is a build mistake.
		panic("themes: embedded file missing: " + name + ".css")
	}
	return string(b)
}

// CSS returns the complete stylesheet of the named theme: its colours, the
// shared layout, then the theme's own rules. An unknown name is an error
// that lists the valid ones.
func CSS(name string) (string, error) {
	if err := known(name); err != nil {
		return "", err
	}
	return read(name) + "\n" + read("base"), nil
}

// Palette is a theme's colours for charts, as #rrggbb.
type Palette struct {
	Background, Ink, Muted, Grid string
	Point, Fit, Conf, Pred       string
	Lowess, Curve, Flag          string
	Groups                       []string // one per group level, reused in turn
	Monochrome                   bool     // groups differ by shape only (the contrast theme)
}

var propRE = regexp.MustCompile(`(?m)^\s*--([a-z0-9-]+):\s*(#[0-9a-fA-F]{6})\s*;`)

// Properties returns the custom properties of the theme's first :root
// block (the screen colours), name without the leading "--".
func Properties(name string) (map[string]string, error) {
	if err := known(name); err != nil {
		return nil, err
	}
	css := read(name)
	if i := strings.Index(css, "@media"); i >= 0 {
		css = css[:i]
	}
	props := map[string]string{}
	for _, m := range propRE.FindAllStringSubmatch(css, -1) {
		props[m[1]] = strings.ToLower(m[2])
	}
	return props, nil
}

// ChartPalette returns the chart colours of the named theme.
func ChartPalette(name string) (Palette, error) {
	p, err := Properties(name)
	if err != nil {
		return Palette{}, err
	}
	get := func(k string) string {
		v, ok := p["chart-"+k]
		if !ok {
			panic("themes: " + name + ".css lacks --chart-" + k)
		}
		return v
	}
	pal := Palette{
		Background: get("bg"), Ink: get("ink"), Muted: get("muted"), Grid: get("grid"),
		Point: get("point"), Fit: get("fit"), Conf: get("conf"), Pred: get("pred"),
		Lowess: get("lowess"), Curve: get("curve"), Flag: get("flag"),
		Monochrome: name == "contrast",
	}
	for i := 1; ; i++ {
		v, ok := p[fmt.Sprintf("chart-group-%d", i)]
		if !ok {
			break
		}
		pal.Groups = append(pal.Groups, v)
	}
	return pal, nil
}
