// Package static holds the stylesheet, htmx and other browser assets, embedded
// into the binary. handlers serves them under /static/ with a content hash in each
// URL, so browsers may cache them for a year.
package static

import "embed"

// FS holds the assets, named by their file names ("app.css", "htmx.min.js").
//
//go:embed *.css *.js
var FS embed.FS
