package basics

import (
	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/rules/dof"
	"github.com/datumlint/datumlint/rules/kinematics"
)

// This file is the per-part result the rules read: the engine built once,
// each frame segment asked once. What a frame needs is decided in
// policy.go, whether it is fixed in solve.go and factor.go.

// Analysis is the basic-dimension result of one part: the engine, built
// once on first use, and each frame segment's missing quantities, asked
// once. One goroutine uses it at a time.
type Analysis struct {
	part       *model.Part
	kin        *kinematics.Result
	engine     *Engine
	toleranced []Toleranced
	tolDone    bool
	missing    map[segmentKey]missingResult
}

type segmentKey struct {
	frame *model.Frame
	index int
}

type missingResult struct {
	ms []Missing
	ok bool
}

// Analyze returns the basic-dimension result of a part, given its
// kinematic result (which motions each frame's datums leave free).
func Analyze(part *model.Part, kin *kinematics.Result) *Analysis {
	return &Analysis{part: part, kin: kin, missing: map[segmentKey]missingResult{}}
}

// Engine returns the part's engine. A toleranced dimension that locates a
// feature under position or located profile (basic-toleranced's finding)
// still counts as locating it, so that one problem is not also reported
// as a missing basic dimension.
func (a *Analysis) Engine() *Engine {
	if a.engine == nil {
		var counted []*model.Dimension
		for _, t := range a.Toleranced() {
			counted = append(counted, t.Dim)
		}
		a.engine = Build(a.part, counted)
	}
	return a.engine
}

// Missing returns what segment seg of a frame needs that no basic
// dimension fixes; ok is false when the frame cannot be analysed (an
// unresolved name, unknown geometry), which other rules report.
func (a *Analysis) Missing(fr *model.Frame, seg int) ([]Missing, bool) {
	k := segmentKey{fr, seg}
	if r, ok := a.missing[k]; ok {
		return r.ms, r.ok
	}
	r := a.ask(fr, seg)
	a.missing[k] = r
	return r.ms, r.ok
}

func (a *Analysis) ask(fr *model.Frame, seg int) missingResult {
	if seg >= len(fr.Segments) {
		return missingResult{}
	}
	s := fr.Segments[seg]
	if ask, _ := Asks(fr, s); !ask {
		return missingResult{ok: true}
	}
	if a.part.Basis == model.ModelBasis {
		// Every nominal location and angle of the model is basic (ASME
		// Y14.41-2019, model values are basic; from memory): nothing is
		// missing. Written basic dimensions are still checked against the
		// model (Mismatches).
		return missingResult{ok: true}
	}
	an := a.kin.Segment(fr, seg)
	if !an.Resolved || an.DRF == nil {
		return missingResult{}
	}
	q, ok := FrameQuery(fr, s, an.DRF)
	if !ok {
		return missingResult{}
	}
	q.Refs = targetFeatures(s, q.Refs)
	q.Free = zoneInvariance(fr, q.Free)
	return missingResult{a.Engine().Missing(q), true}
}

// targetFeatures adds, to each reference's members, the members of the
// features its datums' targets lie on: a datum established by targets on
// more than its own feature (two faces of a vee) holds all of them.
func targetFeatures(seg *model.Segment, refs [][]*model.Member) [][]*model.Member {
	for k, r := range seg.Refs {
		if k >= len(refs) {
			break
		}
		for _, d := range r.Datums {
			if d == nil {
				continue
			}
			for _, t := range d.Targets {
				if !t.On.Resolved() {
					continue
				}
				ms := t.On.Feature.Members
				if t.On.Member != nil {
					ms = []*model.Member{t.On.Member}
				}
				for _, m := range ms {
					if !containsMember(refs[k], m) {
						refs[k] = append(refs[k], m)
					}
				}
			}
		}
	}
	return refs
}

func containsMember(ms []*model.Member, m *model.Member) bool {
	for _, x := range ms {
		if x == m {
			return true
		}
	}
	return false
}

// zoneInvariance adds to the free motions those that leave a position
// zone with a direction unchanged, for a hole or pin: a parallel-planes
// zone normal to u about the axis does not care where the axis is along
// the planes (across u) or how it leans within them (a turn about u), so
// basic dimensions are asked only along u (bidirectional positional
// tolerancing: each frame locates the feature in its direction; ASME
// Y14.5-2018, from memory).
func zoneInvariance(fr *model.Frame, free [][]dof.Twist) [][]dof.Twist {
	u := fr.Upper().ZoneDir
	if u == nil || fr.Characteristic != model.Position || !fr.Target.Resolved() || !fr.Target.Feature.Kind.IsCylinder() {
		return free
	}
	axis := fr.Target.Feature.Dir.Unit()
	along := axis.Cross(*u)
	if along.Norm() == 0 {
		return free // a direction along the axis: zone-shape reports it
	}
	extra := []dof.Twist{{V: dof.Vec(along.Unit())}, {W: dof.Vec(u.Unit())}}
	out := make([][]dof.Twist, len(free))
	for k, f := range free {
		out[k] = append(append([]dof.Twist(nil), f...), extra...)
	}
	return out
}

// Located reports whether a frame's datums and basic dimensions fix the
// place of its target: no free translation moves its zone, and no basic
// dimension it needs is missing. modifier-illegal asks it of a planar datum
// feature referenced at MMB or LMB (ASME Y14.5-2018, datum features at MMB
// applied to surfaces).
func (a *Analysis) Located(fr *model.Frame) bool {
	if an := a.kin.Segment(fr, 0); an.Resolved && an.Zone.TranslationMoves {
		return false
	}
	ms, ok := a.Missing(fr, 0)
	return !ok || len(ms) == 0
}

// Toleranced is a toleranced dimension that locates a feature whose place
// is basic: the feature is under position or located profile (Char).
type Toleranced struct {
	Dim     *model.Dimension
	Feature *model.Feature
	Char    model.Characteristic
}

// Toleranced returns the toleranced dimensions that locate a feature under
// position or located profile, in file order.
func (a *Analysis) Toleranced() []Toleranced {
	if a.tolDone {
		return a.toleranced
	}
	a.tolDone = true
	for _, d := range a.part.Dims {
		if d.Basic || d.Circle != nil || d.Reference {
			continue // a reference dimension locates nothing
		}
		for i, t := range []*model.Target{&d.To, &d.From} {
			if !t.Resolved() || t.Feature.Broken {
				continue
			}
			if fromDatum(a.part, t, []*model.Target{&d.From, &d.To}[i]) {
				continue
			}
			if c, ok := locatedBy(a.part, t.Feature); ok {
				a.toleranced = append(a.toleranced, Toleranced{d, t.Feature, c})
				break
			}
		}
	}
	return a.toleranced
}

// fromDatum reports whether a toleranced dimension between t and other
// measures from t as a datum feature: t carries a datum, and other is
// neither located by a frame nor a datum feature itself, so the dimension
// locates other from the datum (dimensioning from a datum as the origin:
// common practice) and leaves t's own location, which its frames give,
// alone.
func fromDatum(part *model.Part, t, other *model.Target) bool {
	if len(part.DatumsOn(t.Feature)) == 0 || !other.Resolved() || other.Feature.Broken {
		return false
	}
	if _, ok := locatedBy(part, other.Feature); ok {
		return false
	}
	return len(part.DatumsOn(other.Feature)) == 0
}

// locatedBy returns the characteristic of the first frame that places a
// feature at a true position (Frame.Located).
func locatedBy(part *model.Part, f *model.Feature) (model.Characteristic, bool) {
	for _, fr := range part.FramesOn(f) {
		if fr.Located() {
			return fr.Characteristic, true
		}
	}
	return "", false
}
