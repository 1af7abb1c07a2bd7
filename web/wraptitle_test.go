package web

import (
	"strings"
	"testing"
	"unicode/utf8"
)

func TestWrapTitle(t *testing.T) {
	long := "EN 1991-1-2 Annex A parametric fire (O = 0.08 m^0.5, b = 1500 J/m²s^0.5K, q_t,d = 350 MJ/m², fast growth; Γ = 2.39, ventilation-controlled, θ_max = 1055 °C at 53 min)"
	got := wrapTitle(long, 60)
	for _, l := range strings.Split(got, "\n") {
		if utf8.RuneCountInString(l) > 60 {
			t.Errorf("line %q has %d characters, want ≤ 60", l, utf8.RuneCountInString(l))
		}
	}
	if strings.Join(strings.Fields(got), " ") != long {
		t.Errorf("wrapTitle lost words: %q", got)
	}
	if wrapTitle("Gas temperature", 60) != "Gas temperature" {
		t.Errorf("a short title must stay on one line")
	}
}
