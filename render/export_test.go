package render

// Exported for the external test package (sample_test.go).
var (
	Golden  = golden
	Outline = outline
)

// Browser helpers for the sample-project browser test.
var (
	StartChromium = startChromium
	PageProblems  = pageProblems
)
