package handlers

import (
	"encoding/json"
	"fmt"
	"net/http"
	"strconv"
	"strings"

	"github.com/a-h/templ"

	"lagwright/analysis"
	"lagwright/catalog"
	"lagwright/field"
	"lagwright/units"
	"lagwright/web"
)

// fittingTablesURL is the page of a project's fitting and support-spacing tables.
func fittingTablesURL(pid int64) string { return projectURL(pid) + "/fittings" }

// fittingTablesEdit shows GET /projects/{id}/fittings: the project's rows, one a line,
// beside the built-in tables by size they edit.
func (s *Server) fittingTablesEdit(w http.ResponseWriter, r *http.Request) {
	p, set := projectOf(r)
	sys := projectSystem(p)
	v := fittingTablesView(p.ID, p.Name, p.Version, sys)
	v.Assets = s.assets.urls
	v.FittingRows = fittingRowsText(set.FittingTable, sys)
	v.SupportRows = supportRowsText(set.SupportTable, sys)
	v.Saved = r.URL.Query().Get("saved") == "1"
	w.Header().Set("Cache-Control", "no-store")
	templ.Handler(web.FittingTables(v)).ServeHTTP(w, r)
}

// fittingTablesSave handles POST /projects/{id}/fittings: both tables, all or nothing.
// A bad line comes back named with its message (422); a stale version is 409.
func (s *Server) fittingTablesSave(w http.ResponseWriter, r *http.Request) {
	p, _ := projectOf(r)
	sys := projectSystem(p)
	if err := r.ParseForm(); err != nil {
		s.fail(w, r, err)
		return
	}
	ft, fe := parseFittingRows(r.PostForm.Get("fitting_table"), sys)
	st, se := parseSupportRows(r.PostForm.Get("support_spacing"), sys)
	errs := append(fe, se...)
	if len(errs) == 0 {
		check := analysis.DefaultSettings()
		check.FittingTable, check.SupportTable = ft, st
		if err := check.Validate(); err != nil {
			for _, e := range asFieldErrors(err) {
				errs = append(errs, tableLineMessage(e))
			}
		}
	}
	version, verr := strconv.Atoi(r.PostForm.Get("version"))
	if verr != nil {
		errs = append(errs, "the form lacks the project's version: reload the page")
	}
	if len(errs) > 0 {
		v := fittingTablesView(p.ID, p.Name, version, sys)
		v.Assets = s.assets.urls
		v.FittingRows, v.SupportRows = r.PostForm.Get("fitting_table"), r.PostForm.Get("support_spacing")
		v.Errors = append(errs, "Nothing was saved: correct the lines named.")
		w.Header().Set("Cache-Control", "no-store")
		templ.Handler(web.FittingTables(v), templ.WithStatus(http.StatusUnprocessableEntity)).ServeHTTP(w, r)
		return
	}
	m := map[string]json.RawMessage{}
	if len(p.Settings) > 0 {
		if err := json.Unmarshal(p.Settings, &m); err != nil {
			s.fail(w, r, fmt.Errorf("project settings: %w", err))
			return
		}
	}
	for key, rows := range map[string]any{"fitting_table": ft, "support_spacing": st} {
		js, _ := json.Marshal(rows)
		if string(js) == "null" || string(js) == "[]" {
			delete(m, key)
		} else {
			m[key] = js
		}
	}
	js, _ := json.Marshal(m)
	p.Settings, p.Version = js, version
	if _, err := s.store.UpdateProject(r.Context(), p); err != nil {
		s.fail(w, r, err) // store.ErrConflict → 409
		return
	}
	http.Redirect(w, r, fittingTablesURL(p.ID)+"?saved=1", http.StatusSeeOther)
}

// tableLineMessage words a settings error by the line of the text box it came from:
// "settings.fitting_table[2].kind" → "Fitting table, line 3: kind …".
func tableLineMessage(e field.Error) string {
	for _, t := range []struct{ key, name string }{{"settings.fitting_table[", "Fitting table"}, {"settings.support_spacing[", "Support spacing"}} {
		if rest, ok := strings.CutPrefix(e.Field, t.key); ok {
			n, field, _ := strings.Cut(rest, "].")
			if i, err := strconv.Atoi(n); err == nil {
				return fmt.Sprintf("%s, line %d: %s %s", t.name, i+1, strings.ReplaceAll(field, "_", " "), e.Message)
			}
		}
	}
	return e.Field + ": " + e.Message
}

// fittingKindOf reads a kind as typed: "valve", "Valves", "flange pair" → its key.
func fittingKindOf(s string) string {
	k := strings.ReplaceAll(strings.ToLower(strings.TrimSpace(s)), " ", "_")
	for _, kind := range catalog.FittingKinds {
		if k == kind || k+"s" == kind {
			return kind
		}
	}
	return k
}

// splitRow splits one typed row at commas, semicolons or tabs.
func splitRow(line string) []string {
	f := strings.FieldsFunc(line, func(r rune) bool { return r == ',' || r == ';' || r == '\t' })
	for i := range f {
		f[i] = strings.TrimSpace(f[i])
	}
	return f
}

// parseFittingRows reads "kind, nominal size, length" lines (length in the project's
// units of run); blank lines are skipped.
func parseFittingRows(text string, sys units.System) ([]analysis.FittingRow, []string) {
	var rows []analysis.FittingRow
	var errs []string
	for i, line := range strings.Split(text, "\n") {
		if strings.TrimSpace(line) == "" {
			continue
		}
		f := splitRow(line)
		if len(f) != 3 {
			errs = append(errs, fmt.Sprintf("Fitting table, line %d: write kind, nominal size, equivalent length (e.g. valve, NPS 4, 2.1)", i+1))
			continue
		}
		v, err := units.Parse(units.LongLength, sys, f[2])
		if err != nil {
			errs = append(errs, fmt.Sprintf("Fitting table, line %d: equivalent length: %s", i+1, err.Error()))
			continue
		}
		rows = append(rows, analysis.FittingRow{Kind: fittingKindOf(f[0]), NominalSize: f[1], EquivLengthM: v})
	}
	return rows, errs
}

// parseSupportRows reads "nominal size, spacing" lines.
func parseSupportRows(text string, sys units.System) ([]analysis.SupportRow, []string) {
	var rows []analysis.SupportRow
	var errs []string
	for i, line := range strings.Split(text, "\n") {
		if strings.TrimSpace(line) == "" {
			continue
		}
		f := splitRow(line)
		if len(f) != 2 {
			errs = append(errs, fmt.Sprintf("Support spacing, line %d: write nominal size, spacing (e.g. NPS 4, 4.3)", i+1))
			continue
		}
		v, err := units.Parse(units.LongLength, sys, f[1])
		if err != nil {
			errs = append(errs, fmt.Sprintf("Support spacing, line %d: spacing: %s", i+1, err.Error()))
			continue
		}
		rows = append(rows, analysis.SupportRow{NominalSize: f[0], SpacingM: v})
	}
	return rows, errs
}

func fittingRowsText(rows []analysis.FittingRow, sys units.System) string {
	var b strings.Builder
	for _, r := range rows {
		fmt.Fprintf(&b, "%s, %s, %s\n", catalog.FittingKindName(r.Kind), r.NominalSize, units.Format(units.LongLength, sys, r.EquivLengthM))
	}
	return b.String()
}

func supportRowsText(rows []analysis.SupportRow, sys units.System) string {
	var b strings.Builder
	for _, r := range rows {
		fmt.Fprintf(&b, "%s, %s\n", r.NominalSize, units.Format(units.LongLength, sys, r.SpacingM))
	}
	return b.String()
}

// fittingTablesView is the page with the built-in tables in the project's units.
func fittingTablesView(pid int64, name string, version int, sys units.System) web.FittingTablesView {
	v := web.FittingTablesView{Title: "Fittings and supports: " + name, ProjectURL: projectURL(pid), Action: fittingTablesURL(pid),
		Version: version, LengthUnit: units.Label(units.LongLength, sys), FittingBasis: catalog.FittingLengthBasis,
		SupportBasis: catalog.SupportSpacingSteel + "; " + catalog.SupportSpacingCopper}
	for _, k := range catalog.FittingKinds {
		v.Kinds = append(v.Kinds, catalog.FittingKindName(k))
	}
	for _, n := range catalog.FittingTableSizes {
		row := web.FittingTableRow{Size: "NPS " + catalog.FormatNominal(n)}
		for _, k := range catalog.FittingKinds {
			l, _ := catalog.FittingEquivLengthM(k, n)
			row.Lengths = append(row.Lengths, units.Format(units.LongLength, sys, l))
		}
		row.SteelSpacing = units.Format(units.LongLength, sys, catalog.SupportSpacingM(n, false))
		if n <= 4 {
			row.CopperSpacing = units.Format(units.LongLength, sys, catalog.SupportSpacingM(n, true))
		}
		v.Builtin = append(v.Builtin, row)
	}
	return v
}
