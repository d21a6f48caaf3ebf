// Package gen writes synthetic repositories of .callouts files for
// benchmarks and robustness tests. Plate writes the original benchmark
// plate: a datum reference frame of three planes (A flat, B and C
// perpendicular), a located bore that is itself datum D, and hole and pin
// patterns under composite position, every location fixed by basic
// dimensions. Part writes every other shape (see Shape) at any number of
// located features: composite-heavy plates, plates of every kind of
// located feature, the same drawn turned in their coordinates or in
// inches, and turned flanges with bolt circles. Every part is clean by
// construction: `datumlint check` reports nothing for it, and the tests
// hold every shape to that.
//
// The parts are invented; their names, codes and sizes come from a seeded
// generator, so the same arguments always give the same part.
package gen

import (
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strconv"
	"strings"
)

// PerFolder is how many plates Write puts in one folder, so that a large
// repository looks like one (product lines, assemblies) rather than one
// flat folder of thousands of files.
const PerFolder = 50

var (
	nouns     = []string{"Mounting", "Adapter", "Cover", "Base", "Spacer", "Clamp", "Bearing", "Motor", "Sensor", "Valve", "Pump", "Gearbox"}
	prefixes  = []string{"MP", "AP", "CP", "BP", "SP", "KP", "RP", "XP", "VP", "GP"}
	materials = []string{"aluminium alloy 6082-T6", "steel S355", "stainless steel 1.4301", "aluminium alloy 5083"}
	patNames  = []string{"bolts", "mount", "clamp", "tap", "vent", "cable", "lift", "cover", "flange", "rail"}
)

// pattern is a rectangular grid of holes or pins on the plate's top face.
type pattern struct {
	name       string
	kind       string // hole or pin
	size, tol  float64
	pos, comp  float64 // position tolerance of the upper and lower segment
	x0, y0     float64 // first member
	dx, dy     float64 // grid pitch
	cols, rows int
	toBore     bool // located to A, D(M), B instead of A, B, C
}

func (p *pattern) members() [][2]float64 {
	var out [][2]float64
	for r := 0; r < p.rows; r++ {
		for c := 0; c < p.cols; c++ {
			out = append(out, [2]float64{p.x0 + float64(c)*p.dx, p.y0 + float64(r)*p.dy})
		}
	}
	return out
}

// num writes a length the way a drafter would: no trailing zeros.
func num(v float64) string { return strconv.FormatFloat(v, 'f', -1, 64) }

// Plate returns the text of plate number i (any i >= 0). Plates are about
// 150 lines long; the exact length varies with the number and shape of the
// patterns.
func Plate(i int) []byte {
	rng := rand.New(rand.NewPCG(uint64(i)+1, 0x9e3779b97f4a7c15))
	pick := func(xs []string) string { return xs[rng.IntN(len(xs))] }
	// Plate outline and thickness, in millimetres, on 5 mm steps.
	w := float64(200 + 10*rng.IntN(21)) // 200..400
	h := float64(160 + 10*rng.IntN(15)) // 160..300
	t := float64(10 + 2*rng.IntN(8))    // 10..24
	std := []string{"asme-2018", "asme-2018", "asme-2009"}[rng.IntN(3)]
	code := fmt.Sprintf("%s-%d", pick(prefixes), 100+i)
	noun := pick(nouns)

	var b strings.Builder
	line := func(format string, args ...any) { fmt.Fprintf(&b, format+"\n", args...) }
	line("# %s plate %s, revision %c.", noun, code, 'A'+rune(rng.IntN(6)))
	line("# Synthetic part written by datumlint's benchmark generator (rules/lint/internal/gen).")
	line("# Datum frame: A the bottom face, B the rear edge, C the left edge; D the central bore.")
	line("# Material: %s. Unless otherwise specified, all frames apply in the free state at 20 C.", pick(materials))
	line("# Drawn by the synthetic drafter; checked by nobody: this part exists only to be linted.")
	line("")
	line("part %q", fmt.Sprintf("%s plate %s", noun, code))
	line("units mm")
	line("standard %s", std)
	line("")
	line("# --- outline %s x %s x %s", num(w), num(h), num(t))
	line("feature base  plane normal -z at (0, 0, 0)")
	line("feature rear  plane normal -y at (0, 0, 0)")
	line("feature left  plane normal -x at (0, 0, 0)")
	line("feature top   plane normal +z at (0, 0, %s)", num(t))
	line("feature front plane normal +y at (0, %s, 0)", num(h))
	line("feature right plane normal +x at (%s, 0, 0)", num(w))

	// The bore sits in the middle band of the plate; patterns go in the
	// cells around it, so nothing overlaps.
	bx, by := w/2, h/2
	bd := float64(20 + 5*rng.IntN(5))
	line("")
	line("# --- central bore, datum D")
	line("feature bore  hole size %s +0.05 -0 axis +z at (%s, %s, 0)", num(bd), num(bx), num(by))

	// Cells: left and right of the bore, each split into an upper and a
	// lower half; one pattern per cell that is used.
	cellW, cellH := w/2-bd, h/2
	corners := [][2]float64{{8, 8}, {w/2 + bd, 8}, {8, h / 2}, {w/2 + bd, h / 2}}
	npat := len(corners)
	var pats []*pattern
	used := map[string]bool{}
	for k := 0; k < npat; k++ {
		name := pick(patNames)
		for used[name] {
			name = pick(patNames)
		}
		used[name] = true
		p := &pattern{name: name, kind: "hole", cols: 2 + rng.IntN(5), rows: 2 + rng.IntN(3)}
		if k == npat-1 && rng.IntN(3) == 0 {
			p.kind, p.cols, p.rows = "pin", 2, 1 // a pair of locating pins
		}
		p.pos, p.comp = 0.4, 0.1
		p.toBore = k%2 == 1
		// Fit the grid in its cell with a 5 mm margin and whole-mm pitches.
		c := corners[k]
		p.x0, p.y0 = c[0]+5, c[1]+5
		p.dx = float64(int((cellW - 18) / float64(max(1, p.cols-1))))
		p.dy = float64(int((cellH - 26) / float64(max(1, p.rows-1))))
		// Clearance holes for M4 to M10 (common practice), no larger than
		// the pitch leaves room for.
		sizes := []float64{4.5, 5.5, 6.6, 9, 11}
		p.size = sizes[0]
		for _, s := range sizes[:1+rng.IntN(len(sizes))] {
			if s <= min(p.dx, p.dy)-4 {
				p.size = s
			}
		}
		p.tol = 0.1
		if p.kind == "pin" {
			p.size, p.tol = 6, 0.01
		}
		pats = append(pats, p)
	}

	line("")
	line("# --- hole and pin patterns")
	for _, p := range pats {
		var pts []string
		for _, m := range p.members() {
			pts = append(pts, fmt.Sprintf("(%s, %s, 0)", num(m[0]), num(m[1])))
		}
		n := p.cols * p.rows
		tol := "+-" + num(p.tol)
		if p.kind == "pin" {
			tol = "-0 -" + num(p.tol)
		}
		line("feature %s %s %dx size %s %s axis +z at %s", p.name, p.kind, n, num(p.size), tol, strings.Join(pts, " "))
	}

	line("")
	line("# --- datum features")
	line("datum A on base")
	line("datum B on rear")
	line("datum C on left")
	line("datum D on bore")

	line("")
	line("# --- datum feature qualification: A flat, B perpendicular to A, C to A and B")
	line("frame base: flatness %s", num([]float64{0.01, 0.02, 0.05}[rng.IntN(3)]))
	line("frame rear: perpendicularity 0.05 datums A")
	line("frame left: perpendicularity 0.05 datums A, B")
	line("frame top: parallelism 0.1 datums A")
	line("frame front: perpendicularity 0.1 datums A, B")
	line("frame right: perpendicularity 0.1 datums A, B")
	line("frame bore: position dia 0.05 (M) datums A, B, C")
	line("frame bore: perpendicularity dia 0.02 (M) datums A")
	line("frame bore: cylindricity 0.01")
	line("frame top: flatness 0.05")

	for _, p := range pats {
		line("")
		line("# --- %s: %d x %d %s pattern", p.name, p.cols, p.rows, p.kind)
		if p.kind == "hole" {
			line("# clearance holes for M%d screws, pitch %s x %s", screw(p.size), num(p.dx), num(p.dy))
		} else {
			line("# locating pins, pressed in, pitch %s", num(p.dx))
		}
		refs := "A, B, C"
		if p.toBore {
			refs = "A, D(M), B"
		}
		line("frame %s: position dia %s (M) datums %s", p.name, num(p.pos), refs)
		line("    composite dia %s (M) datums A", num(p.comp))
		ms := p.members()
		if p.toBore {
			line("basic %s from bore to %s.1 along +x", num(abs(bx-ms[0][0])), p.name)
			line("basic %s from bore to %s.1 along +y", num(abs(by-ms[0][1])), p.name)
		} else {
			line("basic %s from left to %s.1", num(ms[0][0]), p.name)
			line("basic %s from rear to %s.1", num(ms[0][1]), p.name)
		}
		for j := 1; j < len(ms); j++ {
			dx, dy := ms[j][0]-ms[0][0], ms[j][1]-ms[0][1]
			if dx != 0 {
				line("basic %s from %s.1 to %s.%d along +x", num(dx), p.name, p.name, j+1)
			}
			if dy != 0 {
				line("basic %s from %s.1 to %s.%d along +y", num(dy), p.name, p.name, j+1)
			}
		}
	}

	line("")
	line("# --- outline and bore locations")
	line("dim %s +-0.1 from base to top", num(t))
	line("dim %s +-0.2 from rear to front", num(h))
	line("dim %s +-0.2 from left to right", num(w))
	line("basic %s from left to bore", num(bx))
	line("basic %s from rear to bore", num(by))
	return []byte(b.String())
}

// screw is the metric screw a clearance hole is for (ISO 273, medium series).
func screw(hole float64) int {
	switch hole {
	case 4.5:
		return 4
	case 5.5:
		return 5
	case 6.6:
		return 6
	case 9:
		return 8
	}
	return 10
}

func abs(v float64) float64 {
	if v < 0 {
		return -v
	}
	return v
}

// Stats says what Write wrote.
type Stats struct {
	Files, Lines int
	Bytes        int64
}

// Write writes n plates under dir, PerFolder to a folder
// (dir/line-000/plate-00000.callouts ...), and returns what it wrote.
func Write(dir string, n int) (Stats, error) { return WriteShape(dir, n, ShapePlate, 0) }

// WriteShape writes parts 0 to n-1 of a shape, each with the given number
// of located features (0: the shape's own size), PerFolder to a folder
// (dir/line-000/plate-00000.callouts ...), and returns what it wrote.
func WriteShape(dir string, n int, s Shape, features int) (Stats, error) {
	var st Stats
	for i := 0; i < n; i++ {
		sub := filepath.Join(dir, fmt.Sprintf("line-%03d", i/PerFolder))
		if i%PerFolder == 0 {
			if err := os.MkdirAll(sub, 0o755); err != nil {
				return st, err
			}
		}
		src := Part(s, i, features)
		if err := os.WriteFile(filepath.Join(sub, fmt.Sprintf("plate-%05d.callouts", i)), src, 0o644); err != nil {
			return st, err
		}
		st.Files++
		st.Bytes += int64(len(src))
		st.Lines += strings.Count(string(src), "\n")
	}
	return st, nil
}

// Row returns a clean part with one straight row of n >= 2 holes, every hole
// located from the first by a basic dimension: the input of the scaling
// benchmark, which shows whether the cost of a part grows linearly with the
// number of its features.
func Row(n int) []byte {
	var b strings.Builder
	b.WriteString("part \"Perforated strip PS-1\"\nunits mm\nstandard asme-2018\n\n")
	b.WriteString("feature base plane normal -z at (0, 0, 0)\nfeature rear plane normal -y at (0, 0, 0)\nfeature left plane normal -x at (0, 0, 0)\n")
	fmt.Fprintf(&b, "feature row hole %dx size 4.5 +-0.1 axis +z at", n)
	for i := 0; i < n; i++ {
		fmt.Fprintf(&b, " (%d, 10, 0)", 10+10*i)
	}
	b.WriteString("\n\ndatum A on base\ndatum B on rear\ndatum C on left\n\n")
	b.WriteString("frame base: flatness 0.02\nframe rear: perpendicularity 0.05 datums A\nframe left: perpendicularity 0.05 datums A, B\n")
	b.WriteString("frame row: position dia 0.4 (M) datums A, B, C\n    composite dia 0.1 (M) datums A\n\n")
	b.WriteString("basic 10 from left to row.1\nbasic 10 from rear to row.1\n")
	for i := 2; i <= n; i++ {
		fmt.Fprintf(&b, "basic %d from row.1 to row.%d along +x\n", 10*(i-1), i)
	}
	return []byte(b.String())
}
