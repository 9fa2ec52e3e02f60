package chart

import (
	"io"

	"bivar/analysis/report"
	"bivar/themes"
)

// DensityAbove is the number of points above which point clouds are drawn
// as density cells rather than one mark per point ("a few thousand": the
// SVG of a figure then stays under a few hundred kB whatever n is).
const DensityAbove = report.PlotPointsMax

// Role says how a line or band is drawn.
type Role int

const (
	RoleFit     Role = iota // least-squares line: solid, heavy
	RoleLowess              // LOWESS: dash-dot
	RoleCurve               // curved model (quadratic): dotted
	RoleConf                // confidence band: darker fill
	RolePred                // prediction band: lighter fill, dashed edges
	RoleZero                // reference line at zero: thin
	RoleGroup               // the line within one group: thin, in the group's colour
	RoleOld                 // an earlier run's line in a comparison: muted, dashed
	RoleOldBand             // an earlier run's confidence band: muted fill
)

// Figure describes one chart. It holds only data to draw and words to show;
// how it looks is the Drawer's business.
type Figure struct {
	ID      string // unique within a page; prefixes the SVG's element ids
	Title   string // the SVG <title>
	Desc    string // the SVG <desc>: what the figure shows, in words
	Caption string // shown under the figure by the renderers
	XLabel  string // axis titles, with units
	YLabel  string
	Width   int
	Height  int
	Bands   []Band
	Lines   []Line
	Points  []Series // drawn as marks; empty when Dense
	Marked  []Mark   // named rows, drawn on top; labelled where Label is set
	Dense   bool     // draw Density instead of points
	Density *report.Grid
	// Levels names the group levels, in the order of their colours, when
	// the points are coloured by group; in a dense figure it still gives
	// the group lines their colours.
	Levels []string
	Join   bool // join each series' points in the order given (run order)
	// XScale and YScale say the axis's values are on a transformed scale
	// ("log", "log10", "sqrt", as report.Variable.Scale): the points are
	// placed by those values and the ticks labelled in recorded units.
	XScale, YScale string
	// TickRoom is the least width, in pixels, kept for the y axis's tick
	// labels, so that two figures stacked at the same width (the
	// scatterplot and the distances from its line) share their x axis
	// pixel for pixel; 0 leaves it to the labels.
	TickRoom float64
}

// Band is a filled area between Low and High over X (X ascending).
type Band struct {
	Name         string
	X, Low, High []float64
	Role         Role
}

// Line is a polyline; a non-finite value breaks it.
type Line struct {
	Name  string
	X, Y  []float64
	Role  Role
	Group int // for RoleGroup: index of the series whose colour it takes
	// Heavy draws a group's line as the main fit (a reversal within
	// groups, where the pooled line is only for comparison).
	Heavy bool
}

// Series is one set of points: one group level, or all points.
type Series struct {
	Name  string
	Level string // the group level; "" for all points and for Other
	X, Y  []float64
	// Other: the points of the group levels beyond GroupLooks − 1, drawn
	// alike in the muted colour with a marker shape no level uses.
	Other bool
}

// GroupLooks is the number of group levels the charts can draw each with a
// look of its own: every theme has six group colours and there are six
// marker shapes, and level i takes colour i mod 6 and shape i mod 6. With
// more levels, the GroupLooks − 1 largest keep their own look and the rest
// are drawn as one grey series (Series.Other), so no two levels share a
// look.
const GroupLooks = 6

// Mark is a named row with its label (the row name; "" for a mark
// without a label).
type Mark struct {
	X, Y  float64
	Label string
}

// Drawer turns a Figure into a complete SVG document.
type Drawer interface {
	Draw(w io.Writer, f *Figure) error
}

// NewSVG returns the Drawer that writes plain SVG with the theme's colours.
func NewSVG(p themes.Palette) Drawer { return &svgDrawer{pal: p} }
