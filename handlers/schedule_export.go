package handlers

import (
	"bytes"
	"fmt"
	"io"
	"net/http"
	"regexp"
	"strings"

	"lagwright/schedule"
)

// exportFormat is one download format of the schedule.
type exportFormat struct {
	ext, contentType string
	write            func(io.Writer, schedule.Schedule) error
	buffer           bool // write to memory first, so an error can still be answered cleanly
}

var (
	exportCSV  = exportFormat{"csv", "text/csv; charset=utf-8", schedule.WriteCSV, false}
	exportXLSX = exportFormat{"xlsx", "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet", schedule.WriteXLSX, true}
	exportPDF  = exportFormat{"pdf", "application/pdf", schedule.WriteSchedulePDF, true}
)

// scheduleExport answers a schedule download (the draft, or ?rev=N): the handler sets
// the headers and streams what the encoder writes.
func (s *Server) scheduleExport(f exportFormat) http.HandlerFunc {
	return func(w http.ResponseWriter, r *http.Request) {
		_, sc, err := s.requestedSchedule(r)
		if err != nil {
			s.fail(w, r, err)
			return
		}
		name := exportName(sc.Header.Project, sc.Header.Revision, f.ext)
		if f.buffer {
			var buf bytes.Buffer
			if err := f.write(&buf, sc); err != nil {
				s.fail(w, r, err)
				return
			}
			setDownload(w, f.contentType, name)
			_, _ = buf.WriteTo(w)
			return
		}
		setDownload(w, f.contentType, name)
		if err := f.write(w, sc); err != nil {
			// Headers are gone; log it (the client sees a truncated download).
			s.log.ErrorContext(r.Context(), "schedule export", "path", r.URL.Path, "err", err)
		}
	}
}

func setDownload(w http.ResponseWriter, contentType, filename string) {
	h := w.Header()
	h.Set("Content-Type", contentType)
	h.Set("Content-Disposition", `attachment; filename="`+filename+`"`)
	h.Set("Cache-Control", "no-store")
}

var unsafeName = regexp.MustCompile(`[^A-Za-z0-9._-]+`)

// exportName is a safe ASCII file name: "schedule-north-plant-rev2.csv".
func exportName(project string, rev int, ext string) string {
	base := safeSlug(project)
	tag := "draft"
	if rev > 0 {
		tag = fmt.Sprintf("rev%d", rev)
	}
	return "schedule-" + base + "-" + tag + "." + ext
}

// safeSlug writes s as lower-case ASCII letters, digits, dots, dashes and underscores
// only (at most 60), for file names in Content-Disposition; "x" when nothing is left.
func safeSlug(s string) string {
	base := strings.Trim(unsafeName.ReplaceAllString(strings.ToLower(s), "-"), "-.")
	if len(base) > 60 {
		base = strings.Trim(base[:60], "-.")
	}
	if base == "" {
		base = "x"
	}
	return base
}
