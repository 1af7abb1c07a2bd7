// Package demo holds Residuum's demonstration project: an invented fire in
// an invented multi-storey car park, with five members (two slabs, two
// rectangular beams, one T-beam) whose inputs cover the fire scenarios and
// kinds of site evidence the engine accepts. Every name, address, reference
// and number in it is made up for the demonstration.
//
// The member inputs are embedded JSON files (members/*.json), the same JSON
// as `residuum assess -in`.
package demo

import (
	"context"
	"embed"
	"encoding/json"
	"fmt"
	"path"

	"residuum/assess"
)

//go:embed members/*.json
var files embed.FS

// Project returns the demo project as it is stored (without the fields the
// store sets).
func Project() assess.Project {
	return assess.Project{
		Name:        "Quayside car park, level 2 vehicle fire (demo)",
		SiteAddress: "Quayside Lane, Eastmere (an invented town)",
		ClientRef:   "EMI-2026-0419 (invented)",
		Notes: "Invented demonstration project. Three parked vans burned on level 2 of a " +
			"four-storey reinforced-concrete car park; the fire service put the fire out " +
			"after about 45 minutes. The deck above is a flat slab on downstand and ribbed " +
			"beams. Site inspection by the fictional assessor J. Marlow: colour change " +
			"measured in cores and broken-out faces, spalling mapped with a tape. All " +
			"names, references and readings are made up.",
	}
}

// Member is one demo member before it is stored.
type Member struct {
	File     string          // the embedded file, e.g. "02-b1-downstand-beam.json"
	Label    string          // from input.member.label
	Kind     string          // from input.member.kind
	Location string          // grid line and level
	Input    json.RawMessage // the assessment input
}

// locations places each member on the invented building.
var locations = map[string]string{
	"01-s1-deck-slab.json":      "level 3 deck over level 2, bay C3",
	"02-b1-downstand-beam.json": "level 3, grid C/3-4",
	"03-t1-ribbed-beam.json":    "level 3, grid D/2-3",
	"04-b2-support-beam.json":   "level 3, grid C, over column C3",
	"05-s2-ramp-slab.json":      "ramp between levels 2 and 3, bay A1",
}

// referenceFile is the member whose first assessment Load issues, so that the
// demo shows an issued revision beside drafts.
const referenceFile = "05-s2-ramp-slab.json"

// Members returns the demo members in file order.
func Members() ([]Member, error) {
	ents, err := files.ReadDir("members")
	if err != nil {
		return nil, fmt.Errorf("demo members: %w", err)
	}
	var out []Member
	for _, e := range ents {
		raw, err := files.ReadFile(path.Join("members", e.Name()))
		if err != nil {
			return nil, fmt.Errorf("demo member %s: %w", e.Name(), err)
		}
		var head struct {
			Member struct {
				Kind  string `json:"kind"`
				Label string `json:"label"`
			} `json:"member"`
		}
		if err := json.Unmarshal(raw, &head); err != nil {
			return nil, fmt.Errorf("demo member %s: %w", e.Name(), err)
		}
		out = append(out, Member{
			File: e.Name(), Label: head.Member.Label, Kind: head.Member.Kind,
			Location: locations[e.Name()], Input: raw,
		})
	}
	return out, nil
}

// AssessFunc runs the engine on a stored member's input and stores the
// result as its next revision (the API's Assess, bound to a store and queue).
type AssessFunc func(ctx context.Context, m *assess.MemberRecord) (*assess.AssessmentRecord, error)

// Load stores the demo project and its members in st, runs run on each
// member to create its first assessment, and issues the reference member's
// one. It returns the stored project. It stops at the first error (a
// cancelled ctx included); what was stored until then stays.
func Load(ctx context.Context, st assess.Store, run AssessFunc) (*assess.Project, error) {
	ms, err := Members()
	if err != nil {
		return nil, err
	}
	p := Project()
	if err := st.CreateProject(ctx, &p); err != nil {
		return nil, fmt.Errorf("demo project: %w", err)
	}
	for _, dm := range ms {
		m := assess.MemberRecord{
			ProjectID: p.ID, Label: dm.Label, Location: dm.Location, Kind: dm.Kind, Input: dm.Input,
		}
		if err := st.CreateMember(ctx, &m); err != nil {
			return &p, fmt.Errorf("demo member %s: %w", dm.Label, err)
		}
		a, err := run(ctx, &m)
		if err != nil {
			return &p, fmt.Errorf("demo assessment of %s: %w", dm.Label, err)
		}
		if dm.File == referenceFile {
			if _, err := st.IssueAssessment(ctx, a.ID); err != nil {
				return &p, fmt.Errorf("issue demo assessment of %s: %w", dm.Label, err)
			}
		}
	}
	return &p, nil
}

// IsEmpty reports whether st holds no project at all, live or deleted: the
// store of a first start, on which the service loads the demo.
func IsEmpty(ctx context.Context, st assess.Store) (bool, error) {
	ps, err := st.ListProjects(ctx, assess.ProjectFilter{IncludeDeleted: true}, assess.Page{Limit: 1})
	if err != nil {
		return false, fmt.Errorf("look for projects: %w", err)
	}
	return len(ps) == 0, nil
}
