// Package web holds the templ components of every page and fragment, and their
// view models. Components get plain values: no queries and no physics here.
//
// Edit the .templ files, then run `go tool templ generate`; the generated
// *_templ.go files are committed.
package web
