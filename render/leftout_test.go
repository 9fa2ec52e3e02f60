package render

import (
	"strings"
	"testing"

	"bivar/analysis/report"
	"bivar/render/internal/fixture"
)

// The rows left out on purpose and the subset are named in both reports.
func TestLeftOutListed(t *testing.T) {
	r := fixture.Report(fixture.Options{})
	s := &r.Studies[0]
	s.LeftOut = []report.LeftOutRow{{Row: "S-117", Reason: "cracked in the grips", Level: "dataset"},
		{Row: "S-120", Reason: "retest", Level: "study", Shared: 2}}
	s.LeftOutMore = 3
	s.Subset = &report.Subset{Expression: `shift == "night"`, Rows: 7, Missing: []report.ColumnCount{{Column: "shift", Count: 1}}}
	page := string(mustHTML(t, r))
	md := string(mustMD(t, r))
	for _, want := range []string{"S-117", "cracked in the grips", "S-120 (one of 2 rows with this id)", "and 3 more",
		"5 rows left out by exclude (listed below)", "7 rows outside the subset", "1 missing in shift"} {
		if !strings.Contains(page, want) && !strings.Contains(page, strings.ReplaceAll(want, `"`, "&#34;")) {
			t.Errorf("report.html lacks %q", want)
		}
		if !strings.Contains(md, want) {
			t.Errorf("report.md lacks %q", want)
		}
	}
	if !strings.Contains(md, `shift == "night"`) && !strings.Contains(md, `shift == \"night\"`) {
		t.Errorf("report.md lacks the subset expression")
	}
	plain := fixture.Report(fixture.Options{})
	if p := string(mustHTML(t, plain)); strings.Contains(p, "Rows left out on purpose") {
		t.Error("a report without exclusions shows the left-out table")
	}
}
