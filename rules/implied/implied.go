// Package implied adds to a part the basic dimensions its nominal geometry
// implies, for a model-based definition: in a model, every nominal location
// and angle is basic (ASME Y14.41-2019, model values are basic, from
// memory), so a frame asks for no basic dimension a drawing would need.
//
// The QIF reader's parts are read this way (rules/lint), and the importer
// writes the same dimensions as `basic` lines, so that a QIF document and
// its import give the same findings. It stands in for the notation's model
// basis statement (issue 13), under which basic-missing itself will have
// nothing to ask of a model; this package goes when that lands.
package implied

import (
	"github.com/datumlint/datumlint/grammar"
	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/rules/basics"
	"github.com/datumlint/datumlint/rules/kinematics"
)

// rounds bounds how often the frames are asked again after dimensions were
// added (one round settles every part seen; a second catches a quantity
// that the first round's dimensions name differently).
const rounds = 3

// Implied is a basic dimension added for a frame.
type Implied struct {
	Dim   *model.Dimension
	Frame *model.Frame
}

// Basics appends to p.Dims, for every segment of every frame, the basic
// dimensions that the basic-dimension engine finds missing, each with its
// nominal value from the model (the dimension basic-missing suggests),
// placed at the frame's characteristic. It returns the dimensions added, in
// the order added. Quantities for which no dimension can be written (no
// suggestion) are left for basic-missing to report.
func Basics(p *model.Part) []Implied {
	var added []Implied
	seen := map[string]bool{}
	ask := p.Frames // after the first round, only the frames that still asked
	for round := 0; round < rounds && len(ask) > 0; round++ {
		an := basics.Analyze(p, kinematics.Analyze(p))
		var fresh []Implied
		var again []*model.Frame
		for _, fr := range ask {
			asked := false
			for i := range fr.Segments {
				ms, ok := an.Missing(fr, i)
				if !ok {
					continue
				}
				asked = asked || len(ms) > 0
				for _, m := range ms {
					if m.Suggest == "" || seen[m.Suggest] {
						continue
					}
					seen[m.Suggest] = true
					if d, err := grammar.ReadDimension(p, m.Suggest, fr.CharSpan); err == nil {
						fresh = append(fresh, Implied{d, fr})
					}
				}
			}
			if asked {
				again = append(again, fr)
			}
		}
		ask = again
		if len(fresh) == 0 {
			break
		}
		for _, x := range fresh {
			p.Dims = append(p.Dims, x.Dim)
		}
		added = append(added, fresh...)
	}
	return added
}
