package qif

import (
	"regexp"
	"strings"
)

func containsFold(s, sub string) bool {
	return strings.Contains(strings.ToLower(s), strings.ToLower(sub))
}

var yearRE = regexp.MustCompile(`(19|20)[0-9]{2}`)

// yearIn finds an edition's year in a designator ("Y14.5 2009", "Y14.5-2018").
func yearIn(s string) string { return yearRE.FindString(s) }
