package handlers

import (
	"crypto/sha256"
	"crypto/sha512"
	"encoding/base64"
	"encoding/hex"
	"io/fs"
	"net/http"
	"strings"

	"lagwright/static"
	"lagwright/web"
)

// assets knows the content hash of every embedded static file, for URLs of the
// form /static/app.css?v=<hash> that may be cached for a year.
type assets struct {
	hashes map[string]string // file name → short content hash
	urls   web.Assets
}

func loadAssets() (*assets, error) {
	a := &assets{hashes: map[string]string{}}
	err := fs.WalkDir(static.FS, ".", func(path string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		b, err := fs.ReadFile(static.FS, path)
		if err != nil {
			return err
		}
		sum := sha256.Sum256(b)
		a.hashes[path] = hex.EncodeToString(sum[:6])
		return nil
	})
	if err != nil {
		return nil, err
	}
	js, err := fs.ReadFile(static.FS, "htmx.min.js")
	if err != nil {
		return nil, err
	}
	sri := sha512.Sum384(js)
	a.urls = web.Assets{
		CSS:         a.url("app.css"),
		JS:          a.url("htmx.min.js"),
		JSIntegrity: "sha384-" + base64.StdEncoding.EncodeToString(sri[:]),
	}
	return a, nil
}

// url is the versioned URL of an embedded file.
func (a *assets) url(name string) string {
	return "/static/" + name + "?v=" + a.hashes[name]
}

// static serves the embedded files. A request carrying the current hash may be
// cached for a year; any other is revalidated each time.
func (s *Server) static(w http.ResponseWriter, r *http.Request) {
	name := strings.TrimPrefix(r.URL.Path, "/static/")
	hash, ok := s.assets.hashes[name]
	if !ok {
		s.fail(w, r, NotFound("file"))
		return
	}
	if r.URL.Query().Get("v") == hash {
		w.Header().Set("Cache-Control", "public, max-age=31536000, immutable")
	} else {
		w.Header().Set("Cache-Control", "no-cache")
	}
	w.Header().Set("ETag", `"`+hash+`"`)
	http.ServeFileFS(w, r, static.FS, name)
}
