package web

import (
	"fmt"
	"math"
	"net/http"
	"strconv"

	"residuum/assess"
)

// compareView sets two revisions' key numbers side by side.
type compareView struct {
	ProjectID   int64
	ProjectName string
	Label       string
	MemberURL   string
	A, B        int
	AURL, BURL  string
	Rows        []compareRow
	InputRows   []compareRow
}

// compareRow is one quantity in both revisions; Change is B − A for numbers.
type compareRow struct {
	Name, A, B, Change string
	Differs            bool
}

// keyNumbers lists the quantities compared between revisions, as (name, value, number) with
// number NaN where the quantity is not numeric.
func keyNumbers(a *assess.AssessmentRecord, res *assess.Result) []struct {
	Name string
	Text string
	Num  float64
} {
	type kv = struct {
		Name string
		Text string
		Num  float64
	}
	n := func(name string, v float64, dec int) kv { return kv{name, fmtNum(v, dec), v} }
	var out []kv
	for _, d := range []struct {
		name string
		c    assess.Direction
	}{{"sagging", res.Capacity.Sagging}, {"hogging", res.Capacity.Hogging}} {
		out = append(out,
			n(d.name+": undamaged capacity (kN·m)", d.c.UndamagedKNm, 1),
			n(d.name+": residual capacity (kN·m)", d.c.ResidualKNm, 1),
			n(d.name+": ratio", d.c.Ratio, 3),
			n(d.name+": residual design resistance (kN·m)", d.c.ResidualDesignKNm, 1))
		if d.c.Utilisation != nil {
			out = append(out, n(d.name+": utilisation", *d.c.Utilisation, 2))
		} else {
			out = append(out, kv{d.name + ": utilisation", "–", math.NaN()})
		}
	}
	maxBar := 0.0
	for _, b := range res.Rebar {
		maxBar = math.Max(maxBar, b.PeakC)
	}
	out = append(out, n("hottest bar (°C)", maxBar, 0), n("hottest concrete (°C)", res.Concrete.MaxPeakC, 0))
	for _, face := range []string{"bottom", "left", "right", "top"} {
		if iso, ok := res.Isotherms[face]; ok {
			if d := iso["300"]; d != nil {
				out = append(out, n("300 °C depth, "+face+" face (mm)", *d, 0))
			} else {
				out = append(out, kv{"300 °C depth, " + face + " face (mm)", "not reached", math.NaN()})
			}
		}
	}
	fire := "–"
	if res.Fire != nil {
		fire = res.Fire.Name
	}
	out = append(out, kv{"fire", fire, math.NaN()},
		kv{"damage class", res.Damage.Label, math.NaN()},
		kv{"recommended action", actionName(res.Action), math.NaN()},
		kv{"state", string(a.State), math.NaN()},
		kv{"method version", a.MethodVersion, math.NaN()},
		kv{"input SHA-256", a.InputHash, math.NaN()})
	return out
}

// compareRevisions builds the rows of a comparison.
func compareRevisions(ra, rb *assess.AssessmentRecord, ia, ib assess.Input, xa, xb *assess.Result, location string) ([]compareRow, []compareRow) {
	ka, kb := keyNumbers(ra, xa), keyNumbers(rb, xb)
	var rows []compareRow
	for i := range ka {
		r := compareRow{Name: ka[i].Name, A: ka[i].Text, B: kb[i].Text, Differs: ka[i].Text != kb[i].Text}
		if !math.IsNaN(ka[i].Num) && !math.IsNaN(kb[i].Num) {
			d := kb[i].Num - ka[i].Num
			if r.Differs {
				r.Change = fmt.Sprintf("%+.3g", d)
			}
		}
		rows = append(rows, r)
	}
	ga, gb := inputGroups(ia, location), inputGroups(ib, location)
	type key struct{ g, n string }
	av := map[key]string{}
	var order []key
	for _, g := range ga {
		for _, r := range g.Rows {
			k := key{g.Title, r.Name}
			av[k] = r.Value
			order = append(order, k)
		}
	}
	bv := map[key]string{}
	for _, g := range gb {
		for _, r := range g.Rows {
			k := key{g.Title, r.Name}
			bv[k] = r.Value
			if _, ok := av[k]; !ok {
				order = append(order, k)
			}
		}
	}
	var ins []compareRow
	for _, k := range order {
		if av[k] != bv[k] {
			ins = append(ins, compareRow{Name: k.g + ": " + k.n, A: orDefault(av[k], "–"), B: orDefault(bv[k], "–"), Differs: true})
		}
	}
	return rows, ins
}

func (s *server) handleCompare() http.HandlerFunc {
	return func(w http.ResponseWriter, r *http.Request) {
		p, m, ok := s.memberFor(w, r)
		if !ok {
			return
		}
		q := r.URL.Query()
		a, errA := strconv.Atoi(q.Get("a"))
		b, errB := strconv.Atoi(q.Get("b"))
		if errA != nil || errB != nil || a <= 0 || b <= 0 {
			s.serveError(w, r, errBadRequestf("a and b must be revision numbers"))
			return
		}
		ra, err := s.Store.GetRevision(r.Context(), m.ID, a)
		if err != nil {
			s.serveError(w, r, fmt.Errorf("get revision %d: %w", a, err))
			return
		}
		rb, err := s.Store.GetRevision(r.Context(), m.ID, b)
		if err != nil {
			s.serveError(w, r, fmt.Errorf("get revision %d: %w", b, err))
			return
		}
		ia, xa, err := decodeRevision(ra)
		if err != nil {
			s.serveError(w, r, err)
			return
		}
		ib, xb, err := decodeRevision(rb)
		if err != nil {
			s.serveError(w, r, err)
			return
		}
		v := compareView{ProjectID: p.ID, ProjectName: p.Name, Label: m.Label, MemberURL: memberURL(p.ID, m.ID), A: a, B: b,
			AURL: revisionURL(p.ID, m.ID, a), BURL: revisionURL(p.ID, m.ID, b)}
		v.Rows, v.InputRows = compareRevisions(ra, rb, ia, ib, xa, xb, m.Location)
		s.render(w, r, http.StatusOK, comparePage(v))
	}
}
