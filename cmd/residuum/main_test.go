package main

import (
	"strings"
	"testing"
)

func TestRunDispatch(t *testing.T) {
	if code, _, errs := runCmd(t, ""); code != 2 || !strings.Contains(errs, "Commands:") {
		t.Errorf("no command: exit %d, stderr %q", code, errs)
	}
	if code, _, _ := runCmd(t, "", "frobnicate"); code != 2 {
		t.Errorf("unknown command: exit %d, want 2", code)
	}
	if code, _, _ := runCmd(t, "", "help"); code != 0 {
		t.Errorf("help: exit %d, want 0", code)
	}
}
