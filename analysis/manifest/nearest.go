package manifest

import "bivar/analysis/internal/suggest"

// Nearest returns the candidate nearest to a misspelt name, or "" when name
// is one of them or none is close enough: the rule behind the manifest's
// own "did you mean" hints (analysis/internal/suggest), exported so that
// the command line's hints for its commands and options follow it too.
func Nearest(name string, candidates []string) string {
	return suggest.Nearest(name, candidates)
}
