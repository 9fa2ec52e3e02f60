package render

// Exported for the external test package (sample_test.go).
var (
	Golden  = golden
	Outline = outline
)
