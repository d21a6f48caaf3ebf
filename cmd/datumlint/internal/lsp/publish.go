package lsp

import (
	"time"

	protocol "github.com/tliron/glsp/protocol_3_16"
)

// After every change a document is checked again, off the connection's
// reading goroutine, and its findings published:
//
//   - debounced: the check starts once the document has rested for
//     Options.Debounce, so a burst of keystrokes costs one check;
//   - one check at a time per document: changes that come while a check
//     runs are taken together by the next one;
//   - the newest version wins: a result is published only while the
//     document is still at the change it checked, so a stale result is
//     dropped rather than shown over a newer one.

// changedLocked records a change and schedules a check; st.mu is held.
func (s *server) changedLocked(d *document) {
	d.gen++
	d.snap = nil
	if d.timer == nil {
		d.timer = time.AfterFunc(s.opt.Debounce, func() { s.checkLoop(d) })
		return
	}
	d.timer.Reset(s.opt.Debounce)
}

// checkLoop checks a document until its newest change has been checked.
// A timer that fires while the loop runs finds it running and leaves: the
// loop sees the newer change when it comes round.
func (s *server) checkLoop(d *document) {
	st := s.docs
	st.mu.Lock()
	if d.running {
		st.mu.Unlock()
		return
	}
	d.running = true
	for !d.closed && d.checked != d.gen {
		gen, version, text := d.gen, d.version, d.text
		sn := d.snap // made by a request since the change, if one came
		st.mu.Unlock()

		if sn == nil || sn.gen != gen {
			sn = nil
			s.safely("checking "+d.uri, func() { sn = analyse(d.uri, d.path, text, gen, version) })
		}

		d.pubMu.Lock()
		st.mu.Lock()
		current := !d.closed && d.gen == gen
		if current {
			d.checked = gen // published, or failed and logged: not tried again
			if sn != nil {
				d.snap = sn
			}
		}
		st.mu.Unlock()
		if current && sn != nil {
			v := protocol.UInteger(max(version, 0))
			s.notify(string(protocol.ServerTextDocumentPublishDiagnostics), protocol.PublishDiagnosticsParams{
				URI: d.uri, Version: &v, Diagnostics: sn.lspDiagnostics(),
			})
		}
		d.pubMu.Unlock()
		st.mu.Lock()
	}
	d.running = false
	st.mu.Unlock()
}

// recheckAll schedules a check of every open document (a configuration
// may have changed).
func (s *server) recheckAll() {
	st := s.docs
	st.mu.Lock()
	defer st.mu.Unlock()
	for _, d := range st.docs {
		s.changedLocked(d)
	}
}

// current returns the analysis of the document's text as it is now, made
// here if the check after the last change has not finished; nil for a
// document that is not open.
func (s *server) current(uri protocol.DocumentUri) *snapshot {
	st := s.docs
	st.mu.Lock()
	d := st.docs[uri]
	if d == nil {
		st.mu.Unlock()
		return nil
	}
	if sn := d.snap; sn != nil && sn.gen == d.gen {
		st.mu.Unlock()
		return sn
	}
	gen, version, text := d.gen, d.version, d.text
	st.mu.Unlock()
	sn := analyse(d.uri, d.path, text, gen, version)
	st.mu.Lock()
	if d.gen == gen && !d.closed {
		d.snap = sn
	}
	st.mu.Unlock()
	return sn
}
