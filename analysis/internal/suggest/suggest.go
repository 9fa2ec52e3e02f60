// Package suggest finds the nearest known name to a misspelt one, for
// error messages that say "did you mean …?". It is shared by the manifest,
// dataset and units packages.
package suggest

import "strings"

// Distance is the optimal-string-alignment edit distance between a and b,
// counted in runes: insertions, deletions, substitutions and swaps of two
// neighbouring runes each cost 1 (Levenshtein distance extended with
// Damerau's transposition; Wagner and Fischer's 1974 dynamic programme with
// three rows), O(len a · len b) time and O(len b) space.
func Distance(a, b string) int {
	ra, rb := []rune(a), []rune(b)
	prev2 := make([]int, len(rb)+1)
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
			if i > 1 && j > 1 && ra[i-1] == rb[j-2] && ra[i-2] == rb[j-1] {
				cur[j] = min(cur[j], prev2[j-2]+1)
			}
		}
		prev2, prev, cur = prev, cur, prev2
	}
	return prev[len(rb)]
}

// Nearest returns the candidate closest to name, or "" when name is itself a
// candidate or none is close enough to be a likely misspelling. A candidate
// that equals name apart from letter case always wins. "Close enough" is an
// edit distance of at most 0 for a one-rune name, 1 for two or three runes,
// 2 up to eight runes and 3 beyond; ties go to the candidate listed first,
// so callers control the order.
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
	var limit int
	switch n := len([]rune(name)); {
	case n <= 1:
		limit = 0
	case n <= 3:
		limit = 1
	case n <= 8:
		limit = 2
	default:
		limit = 3
	}
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
