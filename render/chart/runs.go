package chart

import (
	"fmt"

	"bivar/analysis/report"
)

// RunLine is one run's straight line with its confidence band, as the
// comparison of two runs computed it (compare.RunLine): the points are
// drawn as given.
type RunLine struct {
	Name   string // the run for people: "October run (n = 118)"
	Points []report.BandPoint
}

// Runs draws an earlier run's line against a newer one's, each over its
// own observed x range with its confidence band: the new run as the main
// fit, the old one muted and dashed beneath it. level is the confidence
// in percent. It returns nil when either run has fewer than two points.
func Runs(id string, x, y report.Variable, level string, old, new RunLine) *Figure {
	if len(old.Points) < 2 || len(new.Points) < 2 {
		return nil
	}
	f := &Figure{
		ID: id, Width: ResidualW + 80, Height: ResidualH,
		XLabel: AxisTitle(x), YLabel: AxisTitle(y),
		Title: fmt.Sprintf("%s against %s: old run against new", varName(y), varName(x)),
	}
	for _, r := range []struct {
		run        RunLine
		line, band Role
	}{{old, RoleOld, RoleOldBand}, {new, RoleFit, RoleConf}} {
		var bx, fit, lo, hi []float64
		for _, p := range r.run.Points {
			bx, fit, lo, hi = append(bx, p.X), append(fit, p.Fit), append(lo, p.ConfLow), append(hi, p.ConfHigh)
		}
		name := ""
		if r.band == RoleConf {
			name = level + "% confidence band of each line"
		}
		f.Bands = append(f.Bands, Band{Name: name, X: bx, Low: lo, High: hi, Role: r.band})
		f.Lines = append(f.Lines, Line{Name: r.run.Name, X: bx, Y: fit, Role: r.line})
	}
	f.Desc = fmt.Sprintf("Two least-squares lines of %s against %s, each over the x range its run observed, with %s%% confidence bands: %s dashed and grey, %s solid.",
		f.YLabel, f.XLabel, level, old.Name, new.Name)
	f.Caption = fmt.Sprintf("Old run in long dashes, new run solid; each line is drawn over the x range its run observed, with its %s%% confidence band. Where the bands part, the runs' lines differ by more than their uncertainty.", level)
	return f
}
