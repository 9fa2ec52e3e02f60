// Package suggest finds the nearest known name to a misspelt one, for
// error messages that say "did you mean …?". It is shared by the manifest,
// dataset and units packages.
package suggest

import "strings"

// Distance is the Levenshtein edit distance between a and b, counted in
// runes (insertions, deletions and substitutions each cost 1). It uses the
// two-row dynamic programme of Wagner and Fischer (1974), O(len a · len b)
// time and O(len b) space.
func Distance(a, b string) int {
	ra, rb := []rune(a), []rune(b)
	prev := make([]int, len(rb)+1)
	cur := make([]int, len(rb)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(ra); i++ {
		cur[0] = i
		for j := 1; j <= len(rb); j++ {
			cost := 1
			if ra[i-1] == rb[j-1] {
				cost = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
		}
		prev, cur = cur, prev
	}
	return prev[len(rb)]
}

// Nearest returns the candidate closest to name, or "" when name is itself a
// candidate or none is close enough to be a likely misspelling. A candidate that equals name apart from
// letter case always wins. "Close enough" is an edit distance of at most
// max(1, len(name)/3) runes, but never more than 3; ties go to the
// candidate listed first, so callers control the order.
func Nearest(name string, candidates []string) string {
	for _, c := range candidates {
		if c == name {
			return ""
		}
	}
	for _, c := range candidates {
		if strings.EqualFold(c, name) && c != name {
			return c
		}
	}
	limit := min(max(1, len([]rune(name))/3), 3)
	best, bestD := "", limit+1
	for _, c := range candidates {
		if c == name {
			continue
		}
		if d := Distance(name, c); d < bestD {
			best, bestD = c, d
		}
	}
	return best
}
