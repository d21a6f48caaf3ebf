package draw

// Text widths are estimated, since the browser chooses the face: advance
// widths in em of DejaVu Sans, the widest of the faces in FontFamily, so
// that a compartment sized by them holds its text in any of them. The
// values are rounded from the face's metrics (from memory) and err on the
// wide side.
var advance = map[rune]float64{
	' ': 0.32, '.': 0.32, ',': 0.32, '-': 0.37, '+': 0.84, '(': 0.39, ')': 0.39,
	'0': 0.64, '1': 0.64, '2': 0.64, '3': 0.64, '4': 0.64, '5': 0.64, '6': 0.64, '7': 0.64, '8': 0.64, '9': 0.64,
	'A': 0.69, 'B': 0.69, 'C': 0.70, 'D': 0.77, 'E': 0.64, 'F': 0.58, 'G': 0.78, 'H': 0.76, 'I': 0.30,
	'J': 0.30, 'K': 0.66, 'L': 0.56, 'M': 0.87, 'N': 0.75, 'O': 0.79, 'P': 0.61, 'Q': 0.79, 'R': 0.70,
	'S': 0.64, 'T': 0.62, 'U': 0.74, 'V': 0.69, 'W': 0.99, 'X': 0.69, 'Y': 0.62, 'Z': 0.69,
	'a': 0.62, 'b': 0.64, 'c': 0.55, 'd': 0.64, 'e': 0.62, 'f': 0.36, 'g': 0.64, 'h': 0.64, 'i': 0.28,
	'j': 0.28, 'k': 0.58, 'l': 0.28, 'm': 0.98, 'n': 0.64, 'o': 0.62, 'p': 0.64, 'q': 0.64, 'r': 0.42,
	's': 0.53, 't': 0.40, 'u': 0.64, 'v': 0.60, 'w': 0.82, 'x': 0.60, 'y': 0.60, 'z': 0.53,
}

// TextWidth estimates the width of s at a font size.
func TextWidth(s string, size float64) float64 {
	w := 0.0
	for _, r := range s {
		a, ok := advance[r]
		if !ok {
			a = 0.8 // other characters: a wide letter's width
		}
		w += a
	}
	return w * size
}
