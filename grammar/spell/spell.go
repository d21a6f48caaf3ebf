// Package spell finds the word a typo probably meant, for the did-you-mean
// hints of the notation's messages, the model's unresolved names, rule
// identifiers in configuration and on the command line.
package spell

import "strings"

// Nearest returns the candidate closest to w by edit distance when it is
// near enough to be a likely typo: at most two edits. w is compared in
// lower case (candidates are keywords and identifiers written in lower
// case), so "Flatness" finds "flatness".
func Nearest(w string, candidates []string) string {
	best, bestD := "", 3
	lw := strings.ToLower(w)
	for _, c := range candidates {
		if d := Distance(lw, c); d < bestD {
			best, bestD = c, d
		}
	}
	return best
}

// Distance is the Levenshtein edit distance of a and b, counted in
// characters; words over 64 characters are never near anything.
func Distance(a, b string) int {
	ra, rb := []rune(a), []rune(b)
	if len(ra) > 64 || len(rb) > 64 {
		return 99
	}
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

// Only returns the one candidate within two edits of w, or "" where none
// or several are: a fix may put in a name only when no other is as likely.
func Only(w string, candidates []string) string {
	lw := strings.ToLower(w)
	found := ""
	for _, c := range candidates {
		if Distance(lw, c) < 3 {
			if found != "" && found != c {
				return ""
			}
			found = c
		}
	}
	return found
}
