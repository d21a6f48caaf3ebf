package gen

import (
	"regexp"
	"strconv"
	"strings"
)

// This file grows QIF documents from a model (the NIST test models in
// testdata/qif/nist) to a size, for benchmarks of the QIF reader and of
// checking QIF files: two shapes, one of what the reader keeps and one of
// what it walks and skips.

var idRE = regexp.MustCompile(`(id="|<Id>)(\d+)`)

// renumber adds off to every id and id reference in s, so that a copy of a
// section names its own elements.
func renumber(s string, off int) string {
	return idRE.ReplaceAllStringFunc(s, func(m string) string {
		sub := idRE.FindStringSubmatch(m)
		n, _ := strconv.Atoi(sub[2])
		return sub[1] + strconv.Itoa(n+off)
	})
}

func inner(src, tag string) (before, body, after string) {
	open := strings.Index(src, "<"+tag)
	start := open + strings.Index(src[open:], ">") + 1
	end := strings.Index(src, "</"+tag+">")
	return src[:start], src[start:end], src[end:]
}

// QIFFeatures repeats a model's feature and characteristic nominals (with
// fresh ids, so each copy is a part of its own beside the others) in a
// file without its B-rep, up to size bytes: the sections the reader keeps
// and the rules check. The model must have a GeometrySet, a TopologySet
// and a VisualizationSet (FTC 06 has).
func QIFFeatures(model string, size int) string {
	base := model
	for _, tag := range []string{"GeometrySet", "TopologySet", "VisualizationSet"} {
		a := strings.Index(base, "<"+tag+">")
		b := strings.Index(base, "</"+tag+">")
		if a < 0 || b < a {
			continue
		}
		base = base[:a] + base[b+len(tag)+3:]
	}
	pre, feats, post := inner(base, "FeatureNominals")
	pre2, chars, post2 := inner(post, "CharacteristicNominals")
	var fb, cb strings.Builder
	fb.WriteString(feats)
	cb.WriteString(chars)
	for k := 1; len(pre)+fb.Len()+len(pre2)+cb.Len()+len(post2) < size; k++ {
		fb.WriteString(renumber(feats, k*100000))
		cb.WriteString(renumber(chars, k*100000))
	}
	return pre + fb.String() + pre2 + cb.String() + post2
}

// QIFBrep repeats a model's geometry, which the reader walks and skips, up
// to size bytes: the part checked stays the model's.
func QIFBrep(model string, size int) string {
	pre, geo, post := inner(model, "GeometrySet")
	var b strings.Builder
	b.WriteString(geo)
	for k := 1; len(pre)+b.Len()+len(post) < size; k++ {
		b.WriteString(geo)
	}
	return pre + b.String() + post
}
