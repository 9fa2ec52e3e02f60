// Package chart draws bivar's figures as SVG: the scatterplot with the
// least-squares line, its confidence band, the prediction band, the LOWESS
// curve, the curved model and the flagged rows; residuals against fitted
// values; residuals against run order.
//
// The renderers see two things: a Figure (a description of what to draw,
// built from a report.Study by Scatter, ResidualsX and ResidualsOrder)
// and the Drawer interface that turns a Figure into SVG. The only Drawer is
// SVG, written here by hand; a drawing library could stand behind the same
// interface without the renderers noticing.
//
// # Why our own SVG and not a charting library
//
// Both go-chart v2 (github.com/wcharczuk/go-chart/v2 v2.1.2) and its
// maintained fork (github.com/go-analyze/charts v0.6.4, package chartdraw)
// were tried on the same small scatter before this package was written:
//
//   - go-chart writes an axis title containing "&" unescaped, so the SVG
//     is not well-formed XML; chartdraw escapes it.
//   - both refuse a series containing NaN ("nan y-range delta");
//   - a constant y gave go-chart 2071 stacked tick labels (895 kB of SVG);
//     chartdraw draws labels 1.00, 1.23, 1.45, … — not round numbers;
//   - neither writes width and height on the root <svg>, nor <title> or
//     <desc>, and neither fills the area between two curves, which the
//     confidence and prediction bands need;
//   - both round coordinates to whole pixels and measure text with an
//     embedded TrueType font.
//
// What is left for a library after our own ticks, ranges, escaping, NaN
// handling, bands, density cells and labels is drawing dots and polylines,
// which is a few lines of SVG. So the figures are plain SVG of our own:
// deterministic (coordinates at two decimals, fixed order), valid XML for
// any label, and small.
//
// Every SVG has width and height on the root element, a <title> and a
// <desc> for screen readers, and carries its own colours (from a
// themes.Palette), because an SVG shown as an image in Markdown cannot see
// the page's stylesheet. Above DensityAbove points the point clouds are
// drawn as density cells, with the flagged rows on top, so a figure stays
// small whatever n is.
package chart
