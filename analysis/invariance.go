package analysis

// This file holds the unit-invariance table and the predictions.

import (
	"fmt"

	"bivar/analysis/report"
	"bivar/analysis/stats"
	"bivar/analysis/units"
	"bivar/internal/hugepage"
)

// unitInvariance recomputes r, slope and intercept with x and y converted
// to each also_in unit (one side at a time), and with x and y swapped. The
// first row is in the recorded units. A unit that cannot be converted gives
// a row with undefined numbers and a note saying why.
func unitInvariance(in Input, x, y []float64, r float64, line stats.LineFit) []report.UnitRow {
	rows := []report.UnitRow{{XUnit: in.X.Unit, YUnit: in.Y.Unit, R: report.Float(r),
		Slope: report.Float(line.Slope.Estimate), Intercept: report.Float(line.Intercept.Estimate)}}
	conv := func(v []float64, from, to string) ([]float64, error) {
		if from == "" {
			return nil, fmt.Errorf("no unit is declared for this column in [dataset.units], so it cannot be converted to %q", to)
		}
		scale, offset, err := units.Affine(from, to)
		if err != nil {
			return nil, err
		}
		out := hugepage.Make[float64](len(v))
		for i, a := range v {
			out[i] = scale*a + offset
		}
		return out, nil
	}
	// Recomputed from the converted values (centred sums, as the line's
	// estimates are: slope = Sxy/Sxx, intercept = ȳ − slope·x̄), not
	// derived from the recorded-unit numbers, so the table shows the
	// invariance rather than assuming it.
	fit := func(xu, yu string, u, v []float64) report.UnitRow {
		c, m := stats.PearsonWithMoments(u, v, 0.95)
		slope := m.Sxy / m.Sxx
		return report.UnitRow{XUnit: xu, YUnit: yu, R: report.Float(c.R),
			Slope: report.Float(slope), Intercept: report.Float(m.MeanY - slope*m.MeanX)}
	}
	for _, u := range in.AlsoIn.X {
		cx, err := conv(x, in.X.Unit, u)
		if err != nil {
			rows = append(rows, report.UnitRow{XUnit: u, YUnit: in.Y.Unit, R: report.NaN(), Slope: report.NaN(),
				Intercept: report.NaN(), Note: fmt.Sprintf("x not converted: %v", err)})
			continue
		}
		rows = append(rows, fit(u, in.Y.Unit, cx, y))
	}
	for _, u := range in.AlsoIn.Y {
		cy, err := conv(y, in.Y.Unit, u)
		if err != nil {
			rows = append(rows, report.UnitRow{XUnit: in.X.Unit, YUnit: u, R: report.NaN(), Slope: report.NaN(),
				Intercept: report.NaN(), Note: fmt.Sprintf("y not converted: %v", err)})
			continue
		}
		rows = append(rows, fit(in.X.Unit, u, x, cy))
	}
	sw := fit(in.Y.Unit, in.X.Unit, y, x)
	sw.Swapped = true
	rows = append(rows, sw)
	for i := range rows {
		rows[i].XSymbol, rows[i].YSymbol = units.Symbol(rows[i].XUnit), units.Symbol(rows[i].YUnit)
	}
	return rows
}

// predictions evaluates the line's mean response and prediction interval
// at each requested x; InRange says whether x lies in the observed range.
func predictions(line stats.LineFit, at []float64, dx report.Describe, conf float64) []report.Prediction {
	var out []report.Prediction
	for _, x0 := range at {
		fit, cl, ch, pl, ph := line.Interval(x0, conf)
		out = append(out, report.Prediction{X: report.Float(x0), Fit: report.Float(fit), ConfLow: report.Float(cl),
			ConfHigh: report.Float(ch), PredLow: report.Float(pl), PredHigh: report.Float(ph),
			InRange: x0 >= float64(dx.Min) && x0 <= float64(dx.Max)})
	}
	return out
}
