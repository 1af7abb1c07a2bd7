package assess

import (
	"bytes"
	"encoding/json"
	"fmt"
)

// NewAssessmentRecord prepares the stored revision of one engine run: the
// input exactly as entered, the result as MarshalJSON prints it (the same
// bytes as `residuum assess -format json`), the method version, input hash
// and the triage summary (capacity ratios, damage class label, action). The
// store assigns the ID, revision number and times. Both the API and the web
// pages record runs through it, so their stored revisions cannot differ.
func NewAssessmentRecord(memberID int64, entered json.RawMessage, res *Result, author string) (*AssessmentRecord, error) {
	raw, err := MarshalJSON(res)
	if err != nil {
		return nil, fmt.Errorf("encode result of member %d: %w", memberID, err)
	}
	return &AssessmentRecord{
		MemberID:      memberID,
		Input:         bytes.Clone(entered),
		Result:        raw,
		MethodVersion: res.MethodVersion,
		InputHash:     res.InputSHA256,
		Author:        author,
		State:         StateDraft,
		SaggingRatio:  summaryRatio(res.Capacity.Sagging),
		HoggingRatio:  summaryRatio(res.Capacity.Hogging),
		DamageClass:   res.Damage.Label,
		Action:        res.Action,
	}, nil
}

// summaryRatio is the triage column of one direction: residual over
// undamaged capacity, or nil where the section has no capacity in that
// direction (nothing to compare, e.g. hogging of a member without top steel).
func summaryRatio(d Direction) *float64 {
	if !(d.UndamagedKNm > 0) || d.Ratio < 0 || d.Ratio > 100 {
		return nil
	}
	r := d.Ratio
	return &r
}
