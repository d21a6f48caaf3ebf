package gen

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// drawing collects the statements of one generated part, written in design
// coordinates (x from datum C, y from datum B, z up from datum A) and
// printed in the model's coordinates: turned by a rotation when the part is
// drawn turned in its coordinates, and in the part's units.
type drawing struct {
	title, units, standard string
	comments               []string
	feats, datums, frames  []string
	dims                   []string
	// turn maps design coordinates to the model's; nil for none.
	turn *[3][3]float64
	// located counts the located features written so far: each hole, pin
	// or width under position or located profile, and each member of a
	// pattern.
	located int
}

func (d *drawing) feature(format string, args ...any) {
	d.feats = append(d.feats, "feature "+fmt.Sprintf(format, args...))
}
func (d *drawing) datum(format string, args ...any) {
	d.datums = append(d.datums, "datum "+fmt.Sprintf(format, args...))
}
func (d *drawing) frame(format string, args ...any) {
	d.frames = append(d.frames, "frame "+fmt.Sprintf(format, args...))
}
func (d *drawing) dim(format string, args ...any) {
	d.dims = append(d.dims, fmt.Sprintf(format, args...))
}

// bytes prints the part: header, features, datums, frames, dimensions.
func (d *drawing) bytes() []byte {
	var b strings.Builder
	for _, c := range d.comments {
		b.WriteString("# " + c + "\n")
	}
	fmt.Fprintf(&b, "part %q\nunits %s\nstandard %s\n", d.title, d.units, d.standard)
	for _, block := range [][]string{d.feats, d.datums, d.frames, d.dims} {
		b.WriteString("\n")
		for _, l := range block {
			b.WriteString(l + "\n")
		}
	}
	return []byte(b.String())
}

// rotation returns the rotation by a degrees about z, then b degrees about
// the x axis that results.
func rotation(a, b float64) *[3][3]float64 {
	ca, sa := math.Cos(a*math.Pi/180), math.Sin(a*math.Pi/180)
	cb, sb := math.Cos(b*math.Pi/180), math.Sin(b*math.Pi/180)
	rz := [3][3]float64{{ca, -sa, 0}, {sa, ca, 0}, {0, 0, 1}}
	rx := [3][3]float64{{1, 0, 0}, {0, cb, -sb}, {0, sb, cb}}
	var m [3][3]float64
	for i := range 3 {
		for j := range 3 {
			for k := range 3 {
				m[i][j] += rx[i][k] * rz[k][j]
			}
		}
	}
	return &m
}

func (d *drawing) apply(v [3]float64) [3]float64 {
	if d.turn == nil {
		return v
	}
	var out [3]float64
	for i := range 3 {
		for j := range 3 {
			out[i] += d.turn[i][j] * v[j]
		}
	}
	return out
}

// pt writes a design point in the model's coordinates.
func (d *drawing) pt(x, y, z float64) string {
	v := d.apply([3]float64{x, y, z})
	return "(" + coord(v[0]) + ", " + coord(v[1]) + ", " + coord(v[2]) + ")"
}

// dir writes a design direction: +x … -z where the model has it along an
// axis, else a vector with six decimals.
func (d *drawing) dir(x, y, z float64) string {
	v := d.apply([3]float64{x, y, z})
	for i, name := range []string{"x", "y", "z"} {
		if v[i] == 1 && v[(i+1)%3] == 0 && v[(i+2)%3] == 0 {
			return "+" + name
		}
		if v[i] == -1 && v[(i+1)%3] == 0 && v[(i+2)%3] == 0 {
			return "-" + name
		}
	}
	return "(" + coord(v[0]) + ", " + coord(v[1]) + ", " + coord(v[2]) + ")"
}

// coord writes a computed coordinate as an export would: six decimals at
// most, no trailing zeros, no "-0".
func coord(v float64) string {
	r := math.Round(v*1e6) / 1e6
	if r == 0 {
		r = 0
	}
	return strconv.FormatFloat(r, 'f', -1, 64)
}
