package changes

import (
	"bytes"
	"strings"
	"testing"

	"bivar/analysis/compare"
	"bivar/analysis/report"
)

// The figures here are hand-made; only their rendering is tested.
func TestAgreementChangesShown(t *testing.T) {
	t.Parallel()
	f := func(v float64) report.Float { return report.Float(v) }
	res := &compare.Result{Schema: compare.Schema, Alpha: 0.05, Adjust: "holm",
		Tests: compare.Tests{Correlation: compare.CorrelationTest, Slope: compare.SlopeTest, Bias: compare.BiasTest, Spread: compare.SpreadTest},
		Studies: []compare.StudyChange{{ID: "testers", X: "Tester A", Y: "Tester B", OldN: 30, NewN: 30, Significant: true,
			Statement: "The limits of agreement moved.",
			Agreement: &compare.AgreementChange{OldBias: f(0.1), NewBias: f(1.2), DeltaBias: f(1.1), BiasSE: f(0.2), BiasDF: f(57.5), BiasP: f(1e-6), BiasPAdj: f(4e-6),
				OldSD: f(0.5), NewSD: f(0.55), VarianceRatio: f(1.21), SDP: f(0.6), SDPAdj: f(0.6),
				OldLower: f(-0.88), NewLower: f(0.12), OldUpper: f(1.08), NewUpper: f(2.28), Unit: "HRC"}}}}
	var md, html bytes.Buffer
	if err := Markdown(&md, res); err != nil {
		t.Fatal(err)
	}
	if err := HTML(&html, res); err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"## Change in agreement", "| `testers` | 0.1 → 1.2 HRC | +1.1 ± 0.2 HRC | 5.50 (57.5) | **< 0.0001** |", "-0.88 to 1.08 → 0.12 to 2.28 HRC"} {
		if !strings.Contains(md.String(), want) {
			t.Errorf("Markdown lacks %q:\n%s", want, md.String())
		}
	}
	for _, want := range []string{"<h2>Change in agreement</h2>", `<td class="n bad">&lt; 0.0001</td>`} {
		if !strings.Contains(html.String(), want) {
			t.Errorf("HTML lacks %q", want)
		}
	}
	res.Studies[0].Agreement = nil
	md.Reset()
	if err := Markdown(&md, res); err != nil {
		t.Fatal(err)
	}
	if strings.Contains(md.String(), "Change in agreement") {
		t.Error("a diff without agreement studies has an agreement section")
	}
}
