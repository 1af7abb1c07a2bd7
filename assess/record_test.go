package assess

import (
	"bytes"
	"encoding/json"
	"testing"
)

func TestNewAssessmentRecord(t *testing.T) {
	res := &Result{MethodVersion: MethodVersion, InputSHA256: "abc", Action: "no-action"}
	res.Capacity.Sagging = Direction{UndamagedKNm: 200, ResidualKNm: 150, Ratio: 0.75}
	res.Capacity.Hogging = Direction{} // no top steel: nothing to compare
	res.Damage.Label = "1 — superficial"
	entered := json.RawMessage(`{"member": {"kind": "beam"}}`)
	rec, err := NewAssessmentRecord(7, entered, res, "tester")
	if err != nil {
		t.Fatal(err)
	}
	want, err := MarshalJSON(res)
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(rec.Result, want) {
		t.Errorf("stored result differs from MarshalJSON's bytes")
	}
	if !bytes.Equal(rec.Input, entered) || rec.MemberID != 7 || rec.Author != "tester" || rec.State != StateDraft {
		t.Errorf("record = %+v, want member 7, input as entered, author tester, draft", rec)
	}
	if rec.SaggingRatio == nil || *rec.SaggingRatio != 0.75 {
		t.Errorf("sagging ratio = %v, want 0.75", rec.SaggingRatio)
	}
	if rec.HoggingRatio != nil {
		t.Errorf("hogging ratio = %v, want nil without hogging capacity", *rec.HoggingRatio)
	}
	if rec.DamageClass != res.Damage.Label || rec.Action != "no-action" || rec.InputHash != "abc" {
		t.Errorf("summary = %q %q %q", rec.DamageClass, rec.Action, rec.InputHash)
	}
}
