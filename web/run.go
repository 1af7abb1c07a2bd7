package web

import (
	"context"
	"errors"
	"fmt"
	"net/http"
	"time"

	"github.com/go-chi/chi/v5"

	"residuum/assess"
	"residuum/internal/runqueue"
)

// actionWords are the short names of the engine's action codes for the triage table, in order of
// severity.
var actionWords = []struct{ Code, Words string }{
	{"no-action", "no structural action"},
	{"clean-and-redecorate", "clean and redecorate"},
	{"reinstate-cover", "repair: reinstate cover"},
	{"structural-repair", "structural repair"},
	{"strengthen", "strengthen"},
	{"replace-or-strengthen", "replace or strengthen"},
}

func actionName(code string) string {
	for _, a := range actionWords {
		if a.Code == code {
			return a.Words
		}
	}
	return code
}

// startRun decodes the member's stored input and starts its assessment on the run queue; the
// result becomes the member's next draft revision. A member already running returns that job.
func (s *server) startRun(p *assess.Project, m *assess.MemberRecord) (*job, error) {
	if j := s.jobs.running(m.ID); j != nil {
		return j, nil
	}
	in, err := assess.DecodeBytes(m.Input)
	if err != nil {
		return nil, fmt.Errorf("decode member %d input: %w", m.ID, err)
	}
	ctx, cancel := context.WithCancel(context.Background())
	j := &job{ProjectID: p.ID, MemberID: m.ID, Label: m.Label, Started: time.Now(), cancel: cancel, stage: "waiting for a worker"}
	s.jobs.add(j)
	entered := m.Input
	go func() {
		defer cancel()
		var res *assess.Result
		err := s.Queue.Do(ctx, func(ctx context.Context) error {
			j.progress("starting", 0)
			r, err := assess.Run(ctx, in, &assess.RunOptions{Progress: j.progress})
			res = r
			return err
		})
		if err != nil {
			if !errors.Is(err, context.Canceled) && !errors.Is(err, runqueue.ErrFull) {
				s.Log.Error("assessment run failed", "member", m.ID, "err", err)
			}
			j.finish(0, 0, err)
			return
		}
		rec, err := assess.NewAssessmentRecord(m.ID, entered, res, "web")
		if err == nil {
			// the run is over; storing it must not be undone by a late cancel
			err = s.Store.CreateAssessment(context.WithoutCancel(ctx), rec)
		}
		if err != nil {
			s.Log.Error("store assessment failed", "member", m.ID, "err", err)
			j.finish(0, 0, fmt.Errorf("store assessment: %w", err))
			return
		}
		j.finish(rec.Revision, rec.ID, nil)
	}()
	return j, nil
}

func (s *server) handleRun() http.HandlerFunc {
	return func(w http.ResponseWriter, r *http.Request) {
		p, m, ok := s.memberFor(w, r)
		if !ok {
			return
		}
		if p.DeletedAt != nil {
			s.serveError(w, r, fmt.Errorf("run in deleted project %d: %w", p.ID, assess.ErrConflict))
			return
		}
		j, err := s.startRun(p, m)
		var inv *assess.InvalidError
		if errors.As(err, &inv) {
			// the stored input no longer passes: send the user to the editor with the messages
			in, lerr := lenientInput(m.Input)
			if lerr != nil {
				s.serveError(w, r, fmt.Errorf("read member %d input: %w", m.ID, lerr))
				return
			}
			s.renderInvalid(w, r, p, m, formFromInput(in, m.Label, m.Location, m.Version), inv)
			return
		}
		if err != nil {
			s.serveError(w, r, err)
			return
		}
		http.Redirect(w, r, "/jobs/"+j.ID, http.StatusSeeOther)
	}
}

// jobView is the progress page of a run.
type jobView struct {
	ID, Label    string
	MemberURL    string
	StatusURL    string
	CancelURL    string
	ResultURL    string
	Stage        string
	Percent      int
	Elapsed      string
	Done, Failed bool
	Cancelled    bool
	Message      string
}

func (s *server) jobView(j *job) jobView {
	st := j.snapshot()
	v := jobView{ID: j.ID, Label: j.Label, MemberURL: memberURL(j.ProjectID, j.MemberID),
		StatusURL: "/jobs/" + j.ID + "/status", CancelURL: "/jobs/" + j.ID + "/cancel",
		Stage: st.Stage, Percent: int(st.Frac*100 + 0.5), Elapsed: time.Since(j.Started).Round(time.Second).String(),
		Done: st.Done, Cancelled: st.Cancelled}
	if st.Done && st.Err == nil {
		v.ResultURL = revisionURL(j.ProjectID, j.MemberID, st.Revision)
	}
	if st.Done && st.Err != nil {
		v.Failed = true
		switch {
		case st.Cancelled || errors.Is(st.Err, context.Canceled):
			v.Message = "The run was cancelled. Nothing was stored."
		case errors.Is(st.Err, runqueue.ErrFull):
			v.Message = "Every worker is busy and the waiting room is full. Try again in a minute."
		case errors.Is(st.Err, runqueue.ErrTimeout):
			v.Message = "The run took longer than the time allowed per run. Try a larger cell size (analysis options)."
		default:
			var inv *assess.InvalidError
			if errors.As(st.Err, &inv) {
				v.Message = "The input was refused: " + inv.Error()
			} else {
				v.Message = "The run failed. The problem has been logged."
			}
		}
	}
	return v
}

func (s *server) jobFor(w http.ResponseWriter, r *http.Request) (*job, bool) {
	j, ok := s.jobs.get(chi.URLParam(r, "jid"))
	if !ok {
		s.serveError(w, r, fmt.Errorf("job %q: %w", chi.URLParam(r, "jid"), assess.ErrNotFound))
	}
	return j, ok
}

func (s *server) handleJob() http.HandlerFunc {
	return func(w http.ResponseWriter, r *http.Request) {
		j, ok := s.jobFor(w, r)
		if !ok {
			return
		}
		v := s.jobView(j)
		if v.ResultURL != "" {
			http.Redirect(w, r, v.ResultURL, http.StatusSeeOther)
			return
		}
		s.render(w, r, http.StatusOK, jobPage(v))
	}
}

// handleJobStatus answers the progress poll with the status fragment. Once the result is stored
// the fragment stops the polling and carries the result's address, which the page script follows
// (an HX-Redirect would race the next poll and abort it).
func (s *server) handleJobStatus() http.HandlerFunc {
	return func(w http.ResponseWriter, r *http.Request) {
		j, ok := s.jobFor(w, r)
		if !ok {
			return
		}
		v := s.jobView(j)
		w.Header().Set("Cache-Control", "no-store")
		s.render(w, r, http.StatusOK, jobStatus(v))
	}
}

func (s *server) handleJobCancel() http.HandlerFunc {
	return func(w http.ResponseWriter, r *http.Request) {
		j, ok := s.jobFor(w, r)
		if !ok {
			return
		}
		if !j.snapshot().Done {
			j.stop()
		}
		http.Redirect(w, r, "/jobs/"+j.ID, http.StatusSeeOther)
	}
}

// refreshSeconds is the reload interval of the progress page without JavaScript.
func refreshSeconds(done bool) int {
	if done {
		return 0
	}
	return 2
}
