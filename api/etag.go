package api

import (
	"fmt"
	"net/http"
	"strconv"
	"strings"
)

// ETags of projects and members are their store version, quoted: "v7".
// Every successful update increments the version, so the ETag changes with
// every change of the record and only then.
func etag(version int64) string { return `"v` + strconv.FormatInt(version, 10) + `"` }

// ifMatch reads the If-Match header of an update or delete.
//
// The rules (documented in the OpenAPI document):
//   - An update (PUT) without If-Match is refused with 428 Precondition
//     Required, so that no client overwrites a change it has not seen.
//     A delete may omit it.
//   - "*" matches any current version.
//   - A version that is not the current one gives 412 Precondition Failed;
//     so does a weak tag (W/"v3"), because If-Match uses strong comparison.
//
// It returns the version the client read (0 for "*" or no header), whether
// the header was given, and an error for a header that is not one of ours.
func ifMatch(r *http.Request) (version int64, given bool, err error) {
	h := strings.TrimSpace(r.Header.Get("If-Match"))
	if h == "" {
		return 0, false, nil
	}
	if h == "*" {
		return 0, true, nil
	}
	if strings.Contains(h, ",") {
		return 0, true, &badRequest{Field: "If-Match", Msg: "must hold one ETag, as sent in the ETag header"}
	}
	if strings.HasPrefix(h, "W/") {
		return 0, true, fmt.Errorf("a weak ETag %s never matches: %w", h, errPreconditionFailed)
	}
	s, ok := strings.CutPrefix(h, `"v`)
	s, ok2 := strings.CutSuffix(s, `"`)
	n, perr := strconv.ParseInt(s, 10, 64)
	if !ok || !ok2 || perr != nil || n < 1 {
		return 0, true, fmt.Errorf("If-Match %s is not the ETag of any version: %w", h, errPreconditionFailed)
	}
	return n, true, nil
}

// checkVersion compares the version the client read with the stored one.
func checkVersion(want, stored int64, what string) error {
	if want != 0 && want != stored {
		return fmt.Errorf("%s is at version %d (ETag %s), not %d; read it again and reapply your change: %w",
			what, stored, etag(stored), want, errPreconditionFailed)
	}
	return nil
}
