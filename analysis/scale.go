package analysis

// This file puts a study's x and y on the scale the manifest gives
// (x_scale, y_scale) before the study runs: every figure of the study is
// then of the transformed values. A row the study uses whose value the
// scale cannot take stops the run, naming the rows.

import (
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"

	"bivar/analysis/dataset"
	"bivar/analysis/manifest"
	"bivar/analysis/report"
	"bivar/internal/hugepage"
)

// scaleFunc is the transform of a scale: math.Log for "log", math.Log10
// for "log10", math.Sqrt for "sqrt" (each correctly rounded or within an
// ulp, as the Go standard library documents); nil for the values as
// recorded.
func scaleFunc(scale string) func(float64) float64 {
	switch scale {
	case "log":
		return math.Log
	case "log10":
		return math.Log10
	case "sqrt":
		return math.Sqrt
	}
	return nil
}

// checkScales says which rows of the study, among those it uses (kept by
// exclude and where, with every column the study reads present), hold a
// value its x_scale or y_scale cannot take. The error names the manifest
// key (file:line:col), the column, the dataset's file and the rows (by
// id_column value and data row number), with what to do.
func checkScales(m *manifest.Manifest, st manifest.Study, ls *loadedSet, keep []bool) error {
	if !manifest.Scaled(st.XScale) && !manifest.Scaled(st.YScale) || ls == nil || ls.table == nil {
		return nil
	}
	in, msg := input(st, ls)
	if msg != "" {
		return nil // the study fails with msg in Run
	}
	in.Keep = keep
	used := usedRows(in)
	for _, a := range []struct {
		axis, scale, column string
		at                  manifest.Pos
		v                   []float64
	}{{"x", st.XScale, st.X, st.XScaleAt, in.XS}, {"y", st.YScale, st.Y, st.YScaleAt, in.YS}} {
		if !manifest.Scaled(a.scale) {
			continue
		}
		var bad []int
		for i, v := range a.v {
			if used(i) && !manifest.InScaleDomain(a.scale, v) {
				bad = append(bad, i)
			}
		}
		if len(bad) == 0 {
			continue
		}
		const most = 10
		var names []string
		for _, i := range bad[:min(len(bad), most)] {
			names = append(names, rowName(in.Rows, i)+" = "+strconv.FormatFloat(a.v[i], 'g', -1, 64))
		}
		list := strings.Join(names, ", ")
		if len(bad) > most {
			list += fmt.Sprintf(" and %d more", len(bad)-most)
		}
		where := m.Path + ": "
		switch {
		case a.at.Line > 0:
			where = fmt.Sprintf("%s:%d:%d: ", m.Path, a.at.Line, a.at.Col)
		case st.Line > 0:
			where = fmt.Sprintf("%s:%d: ", m.Path, st.Line)
		}
		what := "0 or below"
		if a.scale == "sqrt" {
			what = "below 0"
		}
		from := ls.info.File
		if from == "" {
			from = "its query"
		}
		entry := fmt.Sprintf("{data_row = %d, reason = \"…\"}", bad[0]+1)
		if in.Rows.Given() && in.Rows.At(bad[0]) != "" {
			entry = fmt.Sprintf("{row = %q, reason = \"…\"}", strings.TrimSpace(in.Rows.At(bad[0])))
		}
		return fmt.Errorf("%sstudy %q: %s_scale = %q, but %s, and column %q of dataset %q (%s) is %s in %s the study uses: %s. Correct the values, leave the rows out with exclude, each with its reason (exclude = [%s, …]), or choose another scale",
			where, st.ID, a.axis, a.scale, manifest.ScaleDomain(a.scale), a.column, ls.decl.ID, from, what, count(len(bad), "row"), list, entry)
	}
	return nil
}

// usedRows says whether data row i is one of the study's complete cases:
// kept by Keep, with x, y and every group, order and covariate present
// (as completeCases decides).
func usedRows(in Input) func(i int) bool {
	return func(i int) bool {
		if in.Keep != nil && !in.Keep[i] || missing(in.XS[i]) || missing(in.YS[i]) ||
			in.Groups.Given() && in.Groups.At(i) == "" || in.Order != nil && missing(in.Order[i]) {
			return false
		}
		for _, v := range in.Covariates {
			if missing(v[i]) {
				return false
			}
		}
		return true
	}
}

// rowName names data row i (0-based) for a message: `row "A17" (data row
// 14)` with an id_column, else "data row 14".
func rowName(ids dataset.Strings, i int) string {
	if ids.Given() && ids.At(i) != "" {
		return fmt.Sprintf("row %q (data row %d)", strings.TrimSpace(ids.At(i)), i+1)
	}
	return "data row " + strconv.Itoa(i+1)
}

// onScale returns the study's input with x, y and predict_at put on the
// study's scales, and the scales recorded in the variables. checkScales
// has passed, so every value outside a scale's domain is in a row the
// study does not use: it keeps its recorded value there, which no figure
// reads, rather than becoming NaN and being counted as missing.
func onScale(st manifest.Study, in Input) Input {
	put := func(scale string, v []float64) []float64 {
		f := scaleFunc(scale)
		out := hugepage.Make[float64](len(v))
		for i, a := range v {
			out[i] = a
			if manifest.InScaleDomain(scale, a) {
				out[i] = f(a)
			}
		}
		return out
	}
	if manifest.Scaled(st.XScale) {
		in.X.Scale = st.XScale
		in.XS = put(st.XScale, in.XS)
		in.PredictAt = put(st.XScale, in.PredictAt) // checked by the manifest: all in the domain
	}
	if manifest.Scaled(st.YScale) {
		in.Y.Scale = st.YScale
		in.YS = put(st.YScale, in.YS)
	}
	return in
}

// scaledModels drops from a study on a transformed scale what reads the
// recorded values: the side table's log models (they would take logs of
// the values' logs or roots, and the scale the study chose is its model)
// and the unit-invariance table (it names the recorded units; the
// manifest refuses also_in on a scaled axis).
func scaledModels(s *report.Study) {
	if s.X.Scale == "" && s.Y.Scale == "" || s.Error != nil {
		return
	}
	s.Models = slices.DeleteFunc(s.Models, func(f report.Fit) bool { return strings.HasPrefix(f.Name, "log-") })
	s.UnitInvariance = []report.UnitRow{}
}
