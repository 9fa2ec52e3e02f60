package manifest

import (
	"strings"
	"testing"
)

// The manifests here are invented for the tests; testdata/cell4.csv only
// needs to exist.

const gaugeHead = `[[dataset]]
id   = "g"
file = "cell4.csv"
units = { a1 = "[lb_av]", b1 = "kg", a2 = "[lb_av]", b2 = "kg", c = "kg" }
`

func TestAgreementUnitsRefused(t *testing.T) {
	t.Parallel()
	src := gaugeHead + `
[[study]]
id = "ab"
dataset = "g"
kind = "agreement"
x = "a1"
y = "b1"
`
	_, err := parse(t, src)
	if err == nil {
		t.Fatal("an agreement study of columns in different units was accepted")
	}
	want := `bivar.toml:9:1: study "ab": an agreement study compares two measurements of the same quantity in the same unit, but x "a1" is in "[lb_av]" and y "b1" is in "kg" ([dataset.units] of dataset "g"): declare the same unit for both columns (convert one column first if the gauges read in different units)`
	if got := err.Error(); got != want {
		t.Errorf("error:\n got %s\nwant %s", got, want)
	}
}

func TestMeasureKeys(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name, study, want string // want: "" for no error, else a part of the message
	}{
		{"agreement ok", `kind = "agreement"
x = "b1"
y = "c"
x_replicates = ["b2"]
agreement = { acceptable = 500, unit = "g", delta = 2 }
expect = { agree = true }`, ""},
		{"relationship default with gauge_sd", `x = "a1"
y = "b1"
gauge_sd = { x = 0.5 }
plan = { r_half_width = 0.05, power = 0.9, smallest_r = 0.3, slope_half_width = 0.2 }`, ""},
		{"unknown kind", `kind = "agreemnt"
x = "a1"
y = "b1"`, `(did you mean "agreement"?)`},
		{"replicate in another unit", `kind = "agreement"
x = "b1"
y = "c"
x_replicates = ["a2"]`, `x_replicates column "a2" is in "[lb_av]" but x "b1" is in "kg"`},
		{"replicate is y", `x = "a1"
y = "b1"
x_replicates = ["b1"]`, `which is x or y itself`},
		{"agreement table without the kind", `x = "a1"
y = "b1"
agreement = { acceptable = 1 }`, `applies to agreement studies only`},
		{"negative acceptable", `kind = "agreement"
x = "b1"
y = "c"
agreement = { acceptable = -1 }`, `must be a positive number`},
		{"unit of another quantity", `kind = "agreement"
x = "b1"
y = "c"
agreement = { acceptable = 1, unit = "m" }`, `cannot convert "m"`},
		{"expect.agree without acceptable", `kind = "agreement"
x = "b1"
y = "c"
expect = { agree = true }`, `expect.agree needs the acceptable difference`},
		{"gauge_sd and replicates", `x = "a1"
y = "b1"
x_replicates = ["a2"]
gauge_sd = { x = 0.5 }`, `keep one`},
		{"negative gauge SD", `x = "a1"
y = "b1"
gauge_sd = { y = -0.5 }`, `gauge_sd.y = -0.5 must be a finite SD`},
		{"relationship plan on an agreement study", `kind = "agreement"
x = "b1"
y = "c"
plan = { r_half_width = 0.05 }`, `plan.r_half_width plans a relationship study; an agreement study plans the width of its limits of agreement: use plan.limits_half_width`},
		{"limits plan on an agreement study", `kind = "agreement"
x = "b1"
y = "c"
plan = { limits_half_width = 0.2 }`, ""},
		{"power of 1", `x = "a1"
y = "b1"
plan = { power = 1 }`, `plan.power = 1 is outside (0, 1)`},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			m, err := parse(t, gaugeHead+"\n[[study]]\nid = \"s\"\ndataset = \"g\"\n"+tc.study+"\n")
			switch {
			case tc.want == "" && err != nil:
				t.Fatalf("unexpected error: %v", err)
			case tc.want == "" && m.Studies[0].Kind == "":
				t.Errorf("kind left empty; want a default")
			case tc.want != "" && err == nil:
				t.Fatalf("accepted; want an error with %q", tc.want)
			case tc.want != "" && !strings.Contains(err.Error(), tc.want):
				t.Errorf("error %q lacks %q", err, tc.want)
			}
		})
	}
}

func TestAcceptableIn(t *testing.T) {
	t.Parallel()
	v, u := 500.0, "g"
	a := &Agreement{Acceptable: &v, Unit: u}
	// 500 g = 0.5 kg exactly (UCUM: g is the base, k = 10³).
	if got, ok := a.AcceptableIn("kg"); !ok || got != 0.5 {
		t.Errorf("AcceptableIn(kg) = %v, %v; want 0.5, true", got, ok)
	}
	c, cel := 2.0, "K"
	// A difference of 2 K is a difference of 2 °C: the offset cancels.
	if got, ok := (&Agreement{Acceptable: &c, Unit: cel}).AcceptableIn("Cel"); !ok || got != 2 {
		t.Errorf("AcceptableIn(Cel) = %v, %v; want 2, true", got, ok)
	}
}

func TestScaleWithMeasurementRefused(t *testing.T) {
	t.Parallel()
	src := gaugeHead + `
[[study]]
id = "ab"
dataset = "g"
kind = "agreement"
x = "b1"
y = "c"
y_scale = "log"
`
	_, err := parse(t, src)
	if err == nil {
		t.Fatal("an agreement study on a log scale was accepted")
	}
	want := `bivar.toml:12:1: study "ab": y_scale = "log" cannot be used with kind = "agreement": agreement and the correction for measurement error work on the recorded values (a gauge SD or a within-item SD in the recorded unit does not carry over to a transformed scale, where the spread depends on the level); remove y_scale, or make a separate relationship study for the transformed scale`
	if got := err.Error(); got != want {
		t.Errorf("error:\n got %s\nwant %s", got, want)
	}
	for _, c := range []struct{ name, keys, want string }{
		{"gauge_sd", "gauge_sd = { x = 0.5 }\nx_scale = \"sqrt\"", `x_scale = "sqrt" cannot be used with gauge_sd:`},
		{"replicates", "x_replicates = [\"a2\"]\nx_scale = \"log10\"", `x_scale = "log10" cannot be used with replicate columns (x_replicates, y_replicates):`},
	} {
		src := gaugeHead + "\n[[study]]\nid = \"r\"\ndataset = \"g\"\nx = \"a1\"\ny = \"b1\"\n" + c.keys + "\n"
		_, err := parse(t, src)
		if err == nil || !strings.Contains(err.Error(), c.want) || !strings.Contains(err.Error(), "bivar.toml:12:1:") {
			t.Errorf("%s: error %v, want bivar.toml:12:1: … %s", c.name, err, c.want)
		}
	}
	// A scale alone on a relationship study stays allowed.
	if _, err := parse(t, gaugeHead+"\n[[study]]\nid = \"r\"\ndataset = \"g\"\nx = \"a1\"\ny = \"b1\"\nx_scale = \"log\"\n"); err != nil {
		t.Errorf("a scaled relationship study was refused: %v", err)
	}
}
