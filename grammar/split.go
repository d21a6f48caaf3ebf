package grammar

import (
	"strings"
	"unicode/utf8"
)

// A rawStmt is one logical statement before parsing: its physical lines with
// comments removed and continuation backslashes blanked, joined by newlines,
// so that a position inside it is (first line + line - 1, column).
type rawStmt struct {
	first, last int // physical lines, 1-based, inclusive
	offset      int // byte offset of the first line in the file
	text        string
}

// physLine is one physical line of the file.
type physLine struct {
	num     int
	offset  int
	code    string // the line without its comment and line end
	comment string // "# ..." or ""
	cmtCol  int    // column of '#', 1-based
}

// splitLines cuts src into physical lines, separating code from comments.
// A '#' inside a string literal does not start a comment. The lines' texts
// are cut from one copy of src, not copied one by one.
func splitLines(src []byte) []physLine {
	text := string(src)
	out := make([]physLine, 0, strings.Count(text, "\n")+1)
	num, off := 0, 0
	for off <= len(text) {
		end := strings.IndexByte(text[off:], '\n')
		var raw string
		next := 0
		if end < 0 {
			raw = text[off:]
			next = len(text) + 1
		} else {
			raw = text[off : off+end]
			next = off + end + 1
		}
		num++
		raw = strings.TrimSuffix(raw, "\r")
		line := physLine{num: num, offset: off}
		cut := commentStart(raw)
		if cut >= 0 {
			line.code = raw[:cut]
			line.comment = raw[cut:]
			line.cmtCol = utf8.RuneCountInString(raw[:cut]) + 1
		} else {
			line.code = raw
		}
		out = append(out, line)
		if end < 0 {
			break
		}
		off = next
	}
	// A file that ends in a newline has no empty last line.
	if n := len(out); n > 1 && out[n-1].code == "" && out[n-1].comment == "" && len(src) > 0 && src[len(src)-1] == '\n' {
		out = out[:n-1]
	}
	return out
}

func commentStart(b string) int {
	inString := false
	for i := 0; i < len(b); i++ {
		switch c := b[i]; {
		case inString && c == '\\':
			i++
		case c == '"':
			inString = !inString
		case !inString && c == '#':
			return i
		}
	}
	return -1
}

// startsComposite reports whether a line's code opens with the word composite.
func startsComposite(code string) bool {
	t := strings.TrimLeft(code, " \t")
	if !strings.HasPrefix(t, "composite") {
		return false
	}
	rest := t[len("composite"):]
	return rest == "" || !isNameByte(rest[0])
}

func isNameByte(c byte) bool {
	return c == '_' || c == '-' || c >= '0' && c <= '9' || c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z'
}

// continues reports whether a line's code ends in a continuation backslash,
// and returns the code with that backslash blanked (columns stay put).
func continues(code string) (string, bool) {
	t := strings.TrimRight(code, " \t")
	if strings.HasSuffix(t, `\`) {
		return t[:len(t)-1] + " ", true
	}
	return code, false
}

// splitStatements groups physical lines into statements: a backslash at the
// end of a line continues the statement, and a line that starts with
// "composite" joins the statement above it (the frame it belongs to), even
// across blank and comment lines. A statement of one line is that line's
// code, not a copy of it; only statements of several lines are built.
func splitStatements(lines []physLine) []rawStmt {
	out := make([]rawStmt, 0, len(lines))
	var cur *rawStmt
	var text stmtText
	open := false // the current statement continues onto the next line
	flush := func() {
		if cur != nil {
			cur.text = text.String()
			out = append(out, *cur)
			cur = nil
		}
	}
	for _, ln := range lines {
		code, cont := continues(ln.code)
		blank := strings.TrimSpace(code) == ""
		switch {
		case open && cur != nil:
			// continuation line: always part of the current statement
			text.addLine(ln.num-cur.last, code)
			cur.last = ln.num
		case blank:
			continue
		case startsComposite(code) && (cur != nil || len(out) > 0 && startsFrame(out[len(out)-1].text)):
			if cur == nil {
				// reopen the previous statement
				prev := out[len(out)-1]
				out = out[:len(out)-1]
				cur = &prev
				text.start(prev.text)
			}
			text.addLine(ln.num-cur.last, code)
			cur.last = ln.num
		default:
			flush()
			cur = &rawStmt{first: ln.num, last: ln.num, offset: ln.offset}
			text.start(code)
		}
		open = cont
		if !cont {
			// keep cur open: a composite line may still join it
			out = append(out, rawStmt{first: cur.first, last: cur.last, offset: cur.offset, text: text.String()})
			cur = nil
		}
	}
	flush()
	return out
}

// stmtText is the text of the statement being grouped: the one line's
// code as it is, or the lines joined in a builder once there are several.
type stmtText struct {
	one   string
	many  strings.Builder
	multi bool
}

func (t *stmtText) start(code string) {
	t.one, t.multi = code, false
	t.many.Reset()
}

// addLine adds code on the line step lines below the last one added, each
// line between them kept as an empty line.
func (t *stmtText) addLine(step int, code string) {
	if !t.multi {
		t.multi = true
		t.many.Reset()
		t.many.WriteString(t.one)
	}
	for range step {
		t.many.WriteByte('\n')
	}
	t.many.WriteString(code)
}

func (t *stmtText) String() string {
	if t.multi {
		return t.many.String()
	}
	return t.one
}

func startsFrame(text string) bool {
	t := strings.TrimLeft(text, " \t")
	return strings.HasPrefix(t, "frame") && (len(t) == 5 || !isNameByte(t[5]))
}
