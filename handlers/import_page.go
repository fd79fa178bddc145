package handlers

import (
	"errors"
	"io"
	"net/http"

	"github.com/a-h/templ"

	"lagwright/web"
)

// importForm shows the empty import form: GET /projects/{id}/import.
func (s *Server) importForm(w http.ResponseWriter, r *http.Request) {
	p, _ := projectOf(r)
	w.Header().Set("Cache-Control", "no-store")
	templ.Handler(web.ImportPage(s.importView(p, "", nil))).ServeHTTP(w, r)
}

// importFormText reads the line list of an import form: the uploaded file when one was
// chosen, else the named text field (the paste box, or the commit's hidden copy).
// The body limit of the server applies.
func importFormText(r *http.Request, field string) (string, error) {
	if err := r.ParseMultipartForm(1 << 20); err != nil && !errors.Is(err, http.ErrNotMultipart) {
		return "", err
	}
	if f, _, err := r.FormFile("file"); err == nil {
		defer f.Close()
		b, err := io.ReadAll(f)
		if err != nil {
			return "", err
		}
		if len(b) > 0 {
			return string(b), nil
		}
	}
	return r.FormValue(field), nil
}

// importPreview checks an uploaded or pasted line list and shows what it holds, with
// every problem: POST /projects/{id}/import. Nothing is saved. A list with problems
// is answered 422, with the form and the text to fix.
func (s *Server) importPreview(w http.ResponseWriter, r *http.Request) {
	p, _ := projectOf(r)
	text, err := importFormText(r, "rows")
	if err != nil {
		s.fail(w, r, err)
		return
	}
	w.Header().Set("Cache-Control", "no-store")
	if len(text) == 0 {
		v := s.importView(p, "", nil)
		v.FormError = "Choose a CSV file or paste the rows of your spreadsheet (with the header row), then preview."
		templ.Handler(web.ImportPage(v), templ.WithStatus(http.StatusUnprocessableEntity)).ServeHTTP(w, r)
		return
	}
	plan, err := s.planImport(r.Context(), p, []byte(text), nil)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	status := http.StatusOK
	if !plan.OK() {
		status = http.StatusUnprocessableEntity
	}
	templ.Handler(web.ImportPage(s.importView(p, text, plan)), templ.WithStatus(status)).ServeHTTP(w, r)
}
