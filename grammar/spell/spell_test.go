package spell

import "testing"

func TestNearest(t *testing.T) {
	words := []string{"flatness", "position", "perpendicularity"}
	for w, want := range map[string]string{
		"flatnes":  "flatness",
		"Positon":  "position",
		"position": "position",
		"cylinder": "",
		"":         "",
	} {
		if got := Nearest(w, words); got != want {
			t.Errorf("Nearest(%q) = %q, want %q", w, got, want)
		}
	}
	if d := Distance("kitten", "sitting"); d != 3 {
		t.Errorf("Distance = %d, want 3", d)
	}
}

func TestOnly(t *testing.T) {
	if got := Only("bor", []string{"bore", "base", "lug"}); got != "bore" {
		t.Errorf("Only = %q, want bore", got)
	}
	if got := Only("bas", []string{"base", "bass"}); got != "" {
		t.Errorf("two near names: Only = %q, want none", got)
	}
}
