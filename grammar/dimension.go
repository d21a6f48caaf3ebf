package grammar

import (
	"errors"
	"fmt"

	"github.com/datumlint/datumlint/grammar/model"
	"github.com/datumlint/datumlint/grammar/source"
)

// ReadDimension reads one `basic` or `dim` statement written for a part
// that is already read, whatever its reader (a dimension the part's nominal
// geometry implies, worked out as the notation's text), and returns the
// dimension: its names looked up in the part, every span set to at, which
// is where it stands in the part's own file. It changes nothing in the
// part; a statement that does not parse or resolve is an error.
func ReadDimension(p *model.Part, text string, at source.Span) (*model.Dimension, error) {
	f := Parse("", []byte(text))
	if len(f.Errors) > 0 {
		return nil, fmt.Errorf("%q: %s", text, f.Errors[0].Msg)
	}
	if len(f.Stmts) != 1 {
		return nil, fmt.Errorf("%q is not one statement", text)
	}
	dims, refs, problems := len(p.Dims), len(p.Refs), len(p.Problems)
	src := p.Source
	p.Source = source.NewFile("", f.Src) // the spans the resolver reads text by
	r := &resolver{p: p}
	switch s := f.Stmts[0].(type) {
	case *BasicStmt:
		r.basic(s)
	case *DimStmt:
		r.dim(s)
	}
	p.Source = src
	var err error
	switch {
	case len(p.Problems) > problems:
		err = fmt.Errorf("%q: %s", text, p.Problems[problems].Message)
	case len(p.Dims) != dims+1:
		err = fmt.Errorf("%q is not a basic or dim statement", text)
	}
	var d *model.Dimension
	if err == nil {
		d = p.Dims[dims]
	}
	for _, t := range p.Refs[refs:] {
		if err == nil && !t.Resolved() {
			err = fmt.Errorf("%q: %s", text, t.Problem)
		}
	}
	p.Dims, p.Refs, p.Problems = p.Dims[:dims], p.Refs[:refs], p.Problems[:problems]
	if err != nil {
		return nil, err
	}
	if d == nil {
		return nil, errors.New("no dimension")
	}
	d.Span, d.ValueSpan = at, at
	d.From.Span, d.To.Span = at, at
	if d.Tol != nil {
		d.Tol.Span = at
	}
	if d.About != nil {
		d.About.Span = at
	}
	if c := d.Circle; c != nil {
		c.Pattern.Span, c.About.Span = at, at
	}
	return d, nil
}
