package manifest

import (
	"testing"
)

// TestScaleKeys: x_scale and y_scale are read, their places recorded for
// the messages about data, and bad values answered at file:line:col
// (invented manifests; study and head are in manifest_test.go).
func TestScaleKeys(t *testing.T) {
	t.Parallel()
	m, err := parse(t, head+study+"x_scale = \"log\"\ny_scale = \"log10\"\npredict_at = [2, 40]\n")
	if err != nil {
		t.Fatal(err)
	}
	s := m.Studies[0]
	if s.XScale != "log" || s.YScale != "log10" || s.XScaleAt != (Pos{9, 1}) || s.YScaleAt != (Pos{10, 1}) {
		t.Errorf("scales %q %q at %v %v; want log, log10 at {9 1} {10 1}", s.XScale, s.YScale, s.XScaleAt, s.YScaleAt)
	}
	if _, err := parse(t, head+study+"x_scale = \"linear\"\n"); err != nil {
		t.Errorf("x_scale = \"linear\": %v", err)
	}

	cases := []struct {
		name, src string
		want      []Error
	}{
		{"a word for the natural log", head + study + "y_scale = \"logarithm\"\n",
			[]Error{{Line: 9, Col: 1, Key: "study.y_scale", Msg: `y_scale = "logarithm" is not allowed; use one of "linear", "log", "log10", "sqrt" — for the natural logarithm write "log"`}}},
		{"unknown scale", head + study + "x_scale = \"cube\"\n",
			[]Error{{Line: 9, Col: 1, Key: "study.x_scale", Msg: `study.x_scale = "cube" is not allowed; use one of "linear", "log", "log10", "sqrt"`}}},
		{"ln", head + study + "x_scale = \"ln\"\n",
			[]Error{{Line: 9, Col: 1, Key: "study.x_scale", Msg: `x_scale = "ln" is not allowed; use one of "linear", "log", "log10", "sqrt" — for the natural logarithm write "log"`}}},
		{"predict_at outside the domain", head + study + "x_scale = \"log\"\npredict_at = [3, 0]\n",
			[]Error{{Line: 10, Col: 1, Key: "study.predict_at", Msg: `study "s1": predict_at holds 0, but x_scale = "log" and the natural logarithm is defined only above 0: give x values, in x's recorded units, that the scale can take`}}},
		{"also_in on a scaled axis", head + "[dataset.units]\nb = \"g\"\n" + study + "y_scale = \"sqrt\"\nalso_in = { y = \"kg\" }\n",
			[]Error{{Line: 12, Col: 13, Key: "study.also_in.y", Msg: `study "s1": also_in.y cannot be used with y_scale = "sqrt": the unit-invariance table converts recorded values, not values on a transformed scale (on a log scale another unit only shifts the values, so r and the slope stay the same); remove one of the two`}}},
		{"thousands equal to decimal", head + "decimal = \",\"\nthousands = \",\"\n" + study,
			[]Error{{Line: 5, Col: 1, Key: "dataset.thousands", Msg: `dataset "nov": thousands = "," is also the decimal mark (decimal = ","), so 1,234 could be either; give the file's decimal mark in decimal and the other character in thousands`}}},
		{"thousands not a separator", head + "thousands = \"_\"\n" + study,
			[]Error{{Line: 4, Col: 1, Key: "dataset.thousands", Msg: `dataset "nov": thousands = "_" is not allowed; use one of ",", ".", "'", " ", "\u00a0", "\u202f" (comma, point, apostrophe, space, no-break space, narrow no-break space), or leave the key out when the numbers have no separator`}}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			t.Parallel()
			checkErrors(t, c.src, c.want)
		})
	}
	if m, err := parse(t, head+"thousands = \".\"\n"+study); err != nil || m.Datasets[0].Thousands != "." {
		t.Errorf("thousands = \".\": %v", err)
	}
}
