package grammar

import (
	"strings"

	"github.com/datumlint/datumlint/grammar/model"
)

// The Unicode synonyms of the notation and their ASCII forms. The formatter
// writes the ASCII form; the model compares ASCII forms only.

// CharacteristicWords lists the characteristics in the contract's order,
// as written.
var CharacteristicWords = func() []string {
	out := make([]string, len(model.Characteristics))
	for i, c := range model.Characteristics {
		out[i] = string(c)
	}
	return out
}()

// characteristicSymbols maps the standard characteristic symbols (ASME
// Y14.5-2018 and ISO 1101:2017 symbol tables; code points from the Unicode
// Miscellaneous Technical block) to their words.
var characteristicSymbols = map[string]string{
	"⏤": "straightness",
	"⏥": "flatness",
	"○": "circularity",
	"⌭": "cylindricity",
	"⌒": "line-profile",
	"⌓": "surface-profile",
	"∠": "angularity",
	"⟂": "perpendicularity",
	"⊥": "perpendicularity",
	"∥": "parallelism",
	"⌖": "position",
	"◎": "concentricity",
	"⌯": "symmetry",
	"↗": "circular-runout",
	"⌰": "total-runout",
}

// CanonicalWord returns the ASCII spelling of a word that may have been
// written as a symbol: characteristic symbols, ⌀ for dia and S⌀ for sdia.
func CanonicalWord(w string) string {
	if c, ok := characteristicSymbols[w]; ok {
		return c
	}
	switch w {
	case "⌀", "Ø", "ø":
		return "dia"
	case "S⌀", "SØ", "Sø":
		return "sdia"
	}
	return w
}

// ModifierLetter returns the letter of a modifier token: "(M)", "( M )" and
// "Ⓜ" all give "M".
func ModifierLetter(sym string) string {
	switch sym {
	case "Ⓜ":
		return "M"
	case "Ⓛ":
		return "L"
	case "Ⓔ":
		return "E"
	case "Ⓕ":
		return "F"
	case "Ⓣ":
		return "T"
	case "Ⓟ":
		return "P"
	case "Ⓤ":
		return "U"
	case "Ⓢ":
		return "S"
	}
	s := strings.Trim(sym, "() \t")
	return strings.ToUpper(s)
}
