package web

import (
	"embed"
	"fmt"

	"residuum/assess"
)

// staticFS holds the stylesheet, the page script, the favicon and the vendored htmx 2.0.11
// (htmx.min.js and its Zero-Clause BSD licence htmx.LICENSE, from the npm package htmx.org@2.0.11,
// unpacked with "npm pack htmx.org@2").
//
//go:embed static
var staticFS embed.FS

// errNotFoundPage is served for an unknown address.
var errNotFoundPage = fmt.Errorf("page: %w", assess.ErrNotFound)

func errBadRequestf(format string, args ...any) error {
	return fmt.Errorf("%s: %w", fmt.Sprintf(format, args...), errBadRequest)
}
