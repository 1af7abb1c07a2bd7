//go:build tools

// Package deps pins the project's third-party modules while the packages
// that use them are being written; it is never built.
package deps

import (
	_ "codeberg.org/go-pdf/fpdf"
	_ "github.com/a-h/templ"
	_ "github.com/chromedp/chromedp"
	_ "github.com/getkin/kin-openapi/openapi3filter"
	_ "github.com/go-chi/chi/v5"
	_ "github.com/go-chi/chi/v5/middleware"
	_ "github.com/google/go-cmp/cmp"
	_ "github.com/jackc/pgx/v5/pgxpool"
	_ "github.com/pressly/goose/v3"
	_ "gonum.org/v1/gonum/optimize"
	_ "gonum.org/v1/plot"
	_ "gonum.org/v1/plot/vg/vgsvg"
	_ "gopkg.in/yaml.v3"
	_ "modernc.org/sqlite"
)
