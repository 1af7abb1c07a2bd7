package demo

import (
	"context"
	"path/filepath"
	"slices"
	"testing"

	"residuum/assess"
	"residuum/assess/sqlite"
)

// TestMembersAreValidInputs: every embedded member is a valid engine input,
// placed on the building, with its label and kind matching the input.
func TestMembersAreValidInputs(t *testing.T) {
	t.Parallel()
	ms, err := Members()
	if err != nil {
		t.Fatal(err)
	}
	if len(ms) != len(locations) {
		t.Errorf("Members() = %d members, want %d (one per location)", len(ms), len(locations))
	}
	labels := map[string]bool{}
	for _, m := range ms {
		in, err := assess.DecodeBytes(m.Input)
		if err != nil {
			t.Errorf("%s: %v", m.File, err)
			continue
		}
		if m.Location == "" {
			t.Errorf("%s has no location", m.File)
		}
		if labels[m.Label] {
			t.Errorf("%s: label %q used twice", m.File, m.Label)
		}
		labels[m.Label] = true
		if in.Member.Label != m.Label || in.Member.Kind != m.Kind {
			t.Errorf("%s: Member label/kind %q/%q, input %q/%q", m.File, m.Label, m.Kind, in.Member.Label, in.Member.Kind)
		}
	}
}

// TestMembersCoverTheFeatures: the demo shows slabs, rectangular beams and a
// T-beam; several fire curves and an evidence-only member; colour depths and
// spalling; and a member with a hogging demand.
func TestMembersCoverTheFeatures(t *testing.T) {
	t.Parallel()
	ms, err := Members()
	if err != nil {
		t.Fatal(err)
	}
	var kinds, curves []string
	var tBeam, evidenceOnly, colour, spall, hogging bool
	for _, m := range ms {
		in, err := assess.DecodeBytes(m.Input)
		if err != nil {
			t.Fatalf("%s: %v", m.File, err)
		}
		kinds = append(kinds, in.Member.Kind)
		if in.Member.FlangeWidthMM > 0 {
			tBeam = true
		}
		if in.Fire != nil {
			curves = append(curves, in.Fire.Curve)
		} else if in.Evidence != nil {
			evidenceOnly = true
		}
		if ev := in.Evidence; ev != nil {
			colour = colour || len(ev.ColourDepths) > 0
			spall = spall || len(ev.Spalling) > 0
		}
		hogging = hogging || in.Demand.HoggingKNm > 0
	}
	slices.Sort(curves)
	curves = slices.Compact(curves)
	for _, k := range []string{assess.KindBeam, assess.KindSlab} {
		if !slices.Contains(kinds, k) {
			t.Errorf("no %s in the demo", k)
		}
	}
	if !tBeam || !evidenceOnly || !colour || !spall || !hogging {
		t.Errorf("T-beam %v, evidence-only %v, colour depths %v, spalling %v, hogging demand %v: want all", tBeam, evidenceOnly, colour, spall, hogging)
	}
	if len(curves) < 3 {
		t.Errorf("fire curves %v, want at least 3 kinds", curves)
	}
}

// TestLoad stores the project and its members, calls the assess function once
// per member and issues the reference member's assessment. The assess
// function here stores a minimal record (the engine itself is exercised by
// the service tests); what is checked is Load's bookkeeping.
func TestLoad(t *testing.T) {
	t.Parallel()
	ctx := context.Background()
	st, err := sqlite.Open(ctx, filepath.Join(t.TempDir(), "demo.db"))
	if err != nil {
		t.Fatal(err)
	}
	defer st.Close()
	if empty, err := IsEmpty(ctx, st); err != nil || !empty {
		t.Fatalf("IsEmpty(new store) = %v, %v; want true", empty, err)
	}
	var ran []string
	record := func(ctx context.Context, m *assess.MemberRecord) (*assess.AssessmentRecord, error) {
		ran = append(ran, m.Label)
		a := &assess.AssessmentRecord{MemberID: m.ID, Input: m.Input, Result: []byte(`{}`), MethodVersion: "test"}
		return a, st.CreateAssessment(ctx, a)
	}
	p, err := Load(ctx, st, record)
	if err != nil {
		t.Fatal(err)
	}
	if p.Name != Project().Name {
		t.Errorf("project name %q, want %q", p.Name, Project().Name)
	}
	stored, err := st.ListMembers(ctx, p.ID, assess.Page{})
	if err != nil {
		t.Fatal(err)
	}
	want, _ := Members()
	if len(stored) != len(want) || len(ran) != len(want) {
		t.Fatalf("stored %d members, assessed %d, want %d each", len(stored), len(ran), len(want))
	}
	latest, err := st.ListLatestAssessments(ctx, p.ID)
	if err != nil {
		t.Fatal(err)
	}
	issued := 0
	for _, a := range latest {
		if a.State == assess.StateIssued {
			issued++
		}
	}
	if len(latest) != len(want) || issued != 1 {
		t.Errorf("latest assessments %d with %d issued, want %d with 1 issued", len(latest), issued, len(want))
	}
	if empty, err := IsEmpty(ctx, st); err != nil || empty {
		t.Errorf("IsEmpty(after Load) = %v, %v; want false", empty, err)
	}
}
