package chart

import (
	"strings"
	"testing"

	"bivar/analysis/report"
)

// agreementStudy is an invented agreement study: the figures only need to
// be drawn, not to be right.
func agreementStudy(n int) *report.Study {
	f := func(v float64) report.Float { return report.Float(v) }
	s := &report.Study{ID: "ab", X: report.Variable{Column: "a", Label: "Tester A", Symbol: "HRC"}, Y: report.Variable{Column: "b", Label: "Tester B", Symbol: "HRC"}}
	a := &report.Agreement{N: n, XReadings: 2, YReadings: 2, Acceptable: f(1.5),
		Bias: f(0.2), BiasLow: f(0.1), BiasHigh: f(0.3), SD: f(0.5), K: f(1.96),
		Lower: f(-0.78), LowerLow: f(-0.9), LowerHigh: f(-0.66), Upper: f(1.18), UpperLow: f(1.06), UpperHigh: f(1.3),
		Deming: &report.MethodLine{Intercept: f(0.5), Slope: f(0.99)}}
	p := &report.AgreementPlot{N: n, Lo: 40, Hi: 60}
	if n <= report.PlotPointsMax {
		for i := range n {
			x := 40 + 20*float64(i)/float64(n)
			p.Points = append(p.Points, report.XY{X: x, Y: 0.2 + 0.3*float64(i%5-2)})
			p.Pairs = append(p.Pairs, report.XY{X: x, Y: x + 0.2})
		}
	} else {
		g := &report.Grid{XLo: 40, XHi: 60, YLo: -1, YHi: 1.4, NX: 60, NY: 40, Counts: make([]int, 2400)}
		for i := range g.Counts {
			g.Counts[i] = i % 7
		}
		p.Grid, p.PairGrid = g, g
	}
	a.Plot = p
	s.Agreement = a
	return s
}

func TestAgreementCharts(t *testing.T) {
	if DifferenceMean(&report.Study{}, "x", "95") != nil || MethodPair(&report.Study{}, "x") != nil {
		t.Error("a study without agreement figures has agreement charts")
	}
	for _, n := range []int{20, 200000} {
		s := agreementStudy(n)
		dm, mp := DifferenceMean(s, "dm", "95"), MethodPair(s, "mp")
		if dm == nil || mp == nil {
			t.Fatalf("n = %d: no chart", n)
		}
		if dense := n > report.PlotPointsMax; dm.Dense != dense || mp.Dense != dense {
			t.Errorf("n = %d: dense %v, %v; want %v", n, dm.Dense, mp.Dense, dense)
		}
		for _, f := range []*Figure{dm, mp} {
			svg := draw(t, f)
			if len(svg) > 300_000 {
				t.Errorf("n = %d: %s is %d bytes", n, f.Title, len(svg))
			}
		}
		names := map[string]bool{}
		for _, l := range append(dm.Lines, mp.Lines...) {
			names[l.Name] = true
		}
		for _, want := range []string{"bias (mean difference)", "limits of agreement", "acceptable ±1.5 HRC", "identity (y = x)", "Deming line"} {
			if !names[want] {
				t.Errorf("n = %d: no line %q", n, want)
			}
		}
		if !strings.Contains(dm.YLabel, "Tester B - Tester A") || !strings.Contains(dm.YLabel, "HRC") {
			t.Errorf("difference axis %q", dm.YLabel)
		}
	}
}

// TestUnnamedBandNoLegend: the second limit's interval shares the legend
// entry of the first; an unnamed band adds no empty entry.
func TestUnnamedBandNoLegend(t *testing.T) {
	svg := draw(t, DifferenceMean(agreementStudy(20), "dm", "95"))
	if n := strings.Count(svg, `width="20" height="10"`); n != 1 {
		t.Errorf("%d band swatches in the legend, want 1", n)
	}
}
