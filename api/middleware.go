package api

import (
	"log/slog"
	"net/http"
	"time"

	"github.com/go-chi/chi/v5/middleware"
)

// requestLog logs one line per request at Info (Warn for 5xx) with the
// method, path, status, size, duration and request id.
func requestLog(log *slog.Logger) func(http.Handler) http.Handler {
	return func(next http.Handler) http.Handler {
		return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
			ww := middleware.NewWrapResponseWriter(w, r.ProtoMajor)
			t0 := time.Now()
			defer func() {
				status := ww.Status()
				if status == 0 {
					status = http.StatusOK
				}
				level := slog.LevelInfo
				if status >= 500 && status != statusClientClosed {
					level = slog.LevelWarn
				}
				if !log.Enabled(r.Context(), level) {
					return
				}
				log.LogAttrs(r.Context(), level, "request",
					slog.String("method", r.Method),
					slog.String("path", r.URL.Path),
					slog.Int("status", status),
					slog.Int("bytes", ww.BytesWritten()),
					slog.Duration("duration", time.Since(t0)),
					slog.String("request_id", middleware.GetReqID(r.Context())),
					slog.String("remote", r.RemoteAddr),
				)
			}()
			next.ServeHTTP(ww, r)
		})
	}
}

// echoRequestID sends the request id (chi's RequestID middleware) back in
// X-Request-Id, so a client can quote it; error documents carry it too.
func echoRequestID(next http.Handler) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		if id := middleware.GetReqID(r.Context()); id != "" {
			w.Header().Set("X-Request-Id", id)
		}
		next.ServeHTTP(w, r)
	})
}
