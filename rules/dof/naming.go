package dof

import (
	"bytes"
	"math"
	"strconv"
	"strings"
)

// readableSplit returns motions that, together with k, span s (k ⊂ s, both
// normalised, and already split by splitSpace): a basis of a complement of k in s chosen to read well rather
// than an orthogonal one, which would mix rotations and translations in ways
// that depend on the normalisation. Pure translations come first (they are
// the part of s with ω = 0), snapped to the coordinate axes when an axis lies
// in s; then one rotation per remaining direction of ω(s), again preferring
// the axes, each with as little translation as s allows so that it names as
// a rotation about an axis through a point.
func (f Frame) readableSplit(ss, ks split) []Motion {
	n := max(len(ss.trans)-len(ks.trans), 0) + max(len(ss.rot)-len(ks.rot), 0)
	if n == 0 {
		return nil
	}
	out := make([]Motion, 0, n)
	for _, t := range pick(ss.trans, ks.trans) {
		out = append(out, f.motion(Twist{V: t}))
	}
	for _, w := range pick(ss.rot, ks.rot) {
		tw := f.out(ss.lift(w))
		// Any free translation may be added to the rotation without
		// leaving s; taking away its projection leaves the twist with the
		// smallest translation at the origin: the axis through the point
		// nearest the origin, and no pitch along it when that slide is free.
		for _, t := range ss.trans {
			tw.V = sub(tw.V, scale(t, dot(tw.V[:], t[:])))
		}
		out = append(out, f.motion(tw))
	}
	if len(out) == 0 {
		return nil // as before pre-sizing, when pick finds nothing
	}
	return out
}

// pick chooses len(a) − len(covered) unit vectors in span(a) that, with
// covered, span it: first the coordinate axes x, y, z that lie in span(a)
// and are not yet spanned, then, while more are needed, the axis whose
// projection onto span(a) reaches furthest outside what is already spanned
// (that residual, normalised). The result depends only on the subspaces, not
// on the bases the SVD happened to return, so names are deterministic.
func pick(a, covered [][3]float64) [][3]float64 {
	need := len(a) - len(covered)
	if need <= 0 {
		return nil
	}
	var q [][3]float64 // orthonormal basis of covered + chosen
	for _, c := range covered {
		if r, n := residual(c, q); n > pickTol {
			q = append(q, scale(r, 1/n))
		}
	}
	chosen := make([][3]float64, 0, need)
	axes := [3]Vec{{1, 0, 0}, {0, 1, 0}, {0, 0, 1}}
	for _, e := range axes {
		if len(chosen) == need {
			return chosen
		}
		if _, out := residual(e, a); out > rankTol {
			continue // not in span(a)
		}
		if r, n := residual(e, q); n > pickTol {
			chosen = append(chosen, e)
			q = append(q, scale(r, 1/n))
		}
	}
	for len(chosen) < need {
		best, bestN := Vec{}, 0.0
		for _, e := range axes {
			p := sub(e, mustResidual(e, a)) // projection of e onto span(a)
			if r, n := residual(p, q); n > bestN+1e-12 {
				best, bestN = scale(r, 1/n), n
			}
		}
		if bestN < 1e-9 {
			break // only when the inputs disagree numerically; never loop forever
		}
		chosen = append(chosen, canonical(best))
		q = append(q, best)
	}
	return chosen
}

// residual returns what is left of v after removing its components along
// the orthonormal vectors q, and that remainder's length.
func residual(v Vec, q [][3]float64) (Vec, float64) {
	for _, b := range q {
		v = sub(v, scale(b, dot(v[:], b[:])))
	}
	return v, norm(v)
}

func mustResidual(v Vec, q [][3]float64) Vec {
	r, _ := residual(v, q)
	return r
}

// canonical flips a direction so that its first component that prints as
// non-zero is positive: a basis vector and its opposite name the same line.
func canonical(v Vec) Vec {
	for _, x := range v {
		if math.Abs(x) >= 5e-7 {
			if x < 0 {
				return scale(v, -1)
			}
			return v
		}
	}
	return v
}

// motion names a twist after clearing rounding dust (components below 1e-12
// of the twist's size), so that a caller printing the twist itself sees 0
// rather than 1e-17 or -0.
func (f Frame) motion(t Twist) Motion {
	f = f.sanitized()
	wn := norm(t.W)
	clean(&t.W, 1e-12*wn)
	clean(&t.V, 1e-12*(norm(t.V)+wn*f.Scale))
	return Motion{Twist: t, Name: f.Name(t)}
}

func clean(v *Vec, below float64) {
	for i, x := range v {
		if math.Abs(x) <= below {
			v[i] = 0 // also turns -0 into 0
		}
	}
}

// Name returns the contract's name for a twist given in the part's
// coordinates: "translation x" or "rotation z" for motions along or about
// the part's axes through its origin, "translation (a, b, c)" with a unit
// vector, or "rotation (a, b, c) through (x, y, z)" with the unit axis and
// the axis point nearest the origin. Directions print to six decimals;
// points to about six significant digits of the larger of the point and the
// frame's Scale, so noise far below the part's size prints as 0. A twist
// with both parts zero (or not finite) is "no motion". A screw with a pitch
// (rotation and slide along the same axis) is named by its axis; none of the
// invariance classes produces one.
func (f Frame) Name(t Twist) string {
	f = f.sanitized()
	if !finite(t.W) || !finite(t.V) {
		return "no motion"
	}
	wn, vn := norm(t.W), norm(t.V)
	// Motions along or about an axis are the commonest by far (the bases
	// prefer the axes), and their names are known without formatting: a
	// vector with one non-zero component, divided by its length, is that
	// axis to a few units in the last place, which prints as 1; the
	// zeros print as 0; and with no translation the axis passes through
	// the origin. TestNameShortcutsMatchFormatting holds them to the
	// formatted names.
	if wn == 0 || wn*f.Scale <= 1e-9*vn {
		if k := soleAxis(t.V); k >= 0 {
			return translationAxis[k]
		}
	} else if t.V == (Vec{}) {
		if k := soleAxis(t.W); k >= 0 {
			return rotationAxis[k]
		}
	}
	return f.formattedName(t, wn, vn)
}

// Phrase turns a motion's contract name into the words of the dof text
// table, one way for every motion: "translation along x", "translation
// along (0.6, 0.8, 0)", "rotation about z", "rotation about z through
// (40, 30, 0)", "rotation about (0.6, 0, 0.8) through (1, 2, 3)". An axis
// of the part is named by its letter wherever it stands; the JSON keeps
// the contract's names.
func Phrase(name string) string {
	kind, rest, ok := strings.Cut(name, " ")
	if !ok {
		return name
	}
	switch kind {
	case "translation":
		return "translation along " + rest
	case "rotation":
		dir, through, hasPoint := strings.Cut(rest, " through ")
		if a := axisName(dir); a != "" {
			dir = a
		}
		if hasPoint {
			return "rotation about " + dir + " through " + through
		}
		return "rotation about " + dir
	}
	return name
}

var (
	translationAxis = [3]string{"translation x", "translation y", "translation z"}
	rotationAxis    = [3]string{"rotation x", "rotation y", "rotation z"}
)

// soleAxis returns the index of v's only non-zero component, when it has
// exactly one and its size is far from overflow and underflow (so that
// dividing by the vector's length gives ±1 to rounding); otherwise -1.
func soleAxis(v Vec) int {
	k := -1
	for i, x := range v {
		if x != 0 {
			if k >= 0 {
				return -1
			}
			k = i
		}
	}
	if k < 0 {
		return -1
	}
	if a := math.Abs(v[k]); !(a > 1e-100 && a < 1e100) {
		return -1
	}
	return k
}

// formattedName is Name by formatting, for a sanitised frame and a finite
// twist with the norms wn = |W| and vn = |V|.
func (f Frame) formattedName(t Twist, wn, vn float64) string {
	if wn == 0 || wn*f.Scale <= 1e-9*vn {
		if vn == 0 {
			return "no motion"
		}
		d := formatDir(canonical(scale(t.V, 1/vn)))
		if a := axisName(d); a != "" {
			return "translation " + a
		}
		return "translation " + d
	}
	w := scale(t.W, 1/wn)
	p := cross(w, scale(t.V, 1/wn)) // (W × V)/|W|², the axis point nearest the origin
	d := formatDir(canonical(w))
	pt := formatPoint(p, f.Scale)
	if a := axisName(d); a != "" && pt == "(0, 0, 0)" {
		return "rotation " + a
	}
	return "rotation " + d + " through " + pt
}

func axisName(dir string) string {
	switch dir {
	case "(1, 0, 0)":
		return "x"
	case "(0, 1, 0)":
		return "y"
	case "(0, 0, 1)":
		return "z"
	}
	return ""
}

func formatDir(v Vec) string { return formatVec(steadyVec(v), 6) }

func formatPoint(p Vec, size float64) string {
	p = steadyVec(p)
	ref := math.Max(math.Max(math.Abs(p[0]), math.Abs(p[1])), math.Max(math.Abs(p[2]), size))
	dec := 5 - int(math.Floor(math.Log10(ref)))
	return formatVec(p, min(max(dec, 0), 15))
}

// formatVec prints "(a, b, c)", building the text in one buffer: every
// motion of every frame is named, so this is on the engine's hot path.
// steady rounds x to 12 significant digits before it is printed to at
// most about six. A computed direction or point carries rounding noise of
// about 1e-16 of itself, which any change in how it was computed (another
// but equivalent basis, say) moves; without this, a coordinate that is
// nominally 100000 could come out as 99999.99999999 and print the other
// coordinates with one more decimal, or one ending in 5 just past the
// printed digits could round either way. Rounded first, nearby values
// print alike; only values within 1e-12 of a boundary between 12-digit
// values, which nominal drawing geometry is not, can still differ.
func steady(x float64) float64 {
	if x == 0 || math.IsNaN(x) || math.IsInf(x, 0) {
		return x
	}
	s := math.Pow(10, 11-math.Floor(math.Log10(math.Abs(x))))
	if s == 0 || math.IsInf(s, 0) {
		return x
	}
	if r := math.Round(x*s) / s; !math.IsNaN(r) && !math.IsInf(r, 0) {
		return r
	}
	return x
}

func steadyVec(v Vec) Vec { return Vec{steady(v[0]), steady(v[1]), steady(v[2])} }

func formatVec(v Vec, dec int) string {
	var buf [96]byte
	b := append(buf[:0], '(')
	b = appendNum(b, v[0], dec)
	b = append(b, ", "...)
	b = appendNum(b, v[1], dec)
	b = append(b, ", "...)
	b = appendNum(b, v[2], dec)
	return string(append(b, ')'))
}

// formatNum prints x with dec decimals, trailing zeros trimmed, and never
// as "-0".
func formatNum(x float64, dec int) string {
	var buf [32]byte
	return string(appendNum(buf[:0], x, dec))
}

// appendNum appends formatNum(x, dec) to b.
func appendNum(b []byte, x float64, dec int) []byte {
	start := len(b)
	b = strconv.AppendFloat(b, x, 'f', dec, 64)
	if bytes.IndexByte(b[start:], '.') >= 0 {
		b = bytes.TrimRight(bytes.TrimRight(b, "0"), ".")
	}
	if string(b[start:]) == "-0" {
		b = append(b[:start], '0')
	}
	return b
}
