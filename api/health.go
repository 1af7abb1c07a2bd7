package api

import (
	"context"
	"errors"
	"fmt"
	"log/slog"
	"net/http"
	"time"

	"residuum/assess"
)

// readyTimeout bounds the store ping of a readiness probe.
const readyTimeout = 2 * time.Second

// handleHealthz answers 200 while the process is up; it touches nothing.
func handleHealthz() http.Handler {
	body := []byte(`{"status":"ok"}` + "\n")
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		w.Header().Set("Cache-Control", "no-store")
		writeJSON(w, http.StatusOK, body)
	})
}

// handleReadyz answers 200 when the store answers a ping within
// readyTimeout, and 503 with Retry-After otherwise.
func handleReadyz(store assess.Store, log *slog.Logger) http.Handler {
	body := []byte(`{"status":"ready"}` + "\n")
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		w.Header().Set("Cache-Control", "no-store")
		ctx, cancel := context.WithTimeout(r.Context(), readyTimeout)
		defer cancel()
		if err := store.Ping(ctx); err != nil {
			serveError(w, r, log, unavailable(err))
			return
		}
		writeJSON(w, http.StatusOK, body)
	})
}

// unavailable makes sure a failed ping reads as ErrUnavailable, whatever
// the store wrapped (a ping that timed out, for instance).
func unavailable(err error) error {
	if errors.Is(err, assess.ErrUnavailable) {
		return err
	}
	return fmt.Errorf("ping store: %w: %w", assess.ErrUnavailable, err)
}
