package handlers

import (
	"context"
	"errors"
	"fmt"
	"net/http"
	"strconv"
	"strings"

	"github.com/a-h/templ"

	"lagwright/analysis"
	"lagwright/catalog"
	"lagwright/field"
	"lagwright/results"
	"lagwright/store"
	"lagwright/units"
	"lagwright/web"
)

// The line page: the form on one side, live results on the other. GET shows it; POST
// …/results computes without saving (the htmx fragment, or the whole page for the
// Calculate button without JavaScript); POST to the line saves it (303 to the project).

// lineCtx is what every line handler loads: the project, its settings and the line.
type lineCtx struct {
	p    store.Project
	set  analysis.ProjectSettings
	sys  units.System
	line store.Line // zero for a new line
	lib  *store.Library
}

// lineScope gathers the line handlers' context: the route's project and settings,
// its line (zero on the new-line routes) and the request's library.
func (s *Server) lineScope(r *http.Request) (*lineCtx, error) {
	p, set := projectOf(r)
	c := &lineCtx{p: p, set: set, sys: units.System(p.Units), line: lineOf(r)}
	var err error
	if c.lib, err = s.library(r.Context()); err != nil {
		return nil, err
	}
	return c, nil
}

// ownInput is the stored line's own input (nil for a new line or one that cannot be read).
func (c *lineCtx) ownInput() *analysis.Input {
	if c.line.ID == 0 {
		return nil
	}
	own, _, err := results.Decode(c.line)
	if err != nil {
		return nil
	}
	return &own
}

func (c *lineCtx) projectURL() string { return fmt.Sprintf("/projects/%d", c.p.ID) }

func (c *lineCtx) lineURL() string {
	if c.line.ID == 0 {
		return fmt.Sprintf("/projects/%d/lines", c.p.ID)
	}
	return fmt.Sprintf("/projects/%d/lines/%d", c.p.ID, c.line.ID)
}

func (c *lineCtx) resultsURL() string {
	if c.line.ID == 0 {
		return fmt.Sprintf("/projects/%d/lines/results", c.p.ID)
	}
	return fmt.Sprintf("/projects/%d/lines/%d/results", c.p.ID, c.line.ID)
}

// view builds the line page.
func (s *Server) lineView(c *lineCtx, st *formState, res web.LineResults) web.LineFormView {
	title := "New line"
	if c.line.ID != 0 {
		title = "Line " + c.line.Tag
	}
	v := web.LineFormView{Assets: s.assets.urls, Title: title, ProjectName: c.p.Name, ProjectURL: c.projectURL(),
		Action: c.lineURL(), ResultsURL: c.resultsURL(), EntryForm: st.view(), LayerRows: layerRows(st), Results: res,
		Units: map[string]string{"layers.thickness_mm": units.Label(units.Length, c.sys),
			"height_default": units.FormatUnit(units.LongLength, c.sys, 3)}}
	if c.line.ID != 0 {
		v.SavedURL = c.lineURL()
	}
	geometry := shapeGeometry(st.Values.Get("shape"))
	for _, n := range lineNums {
		v.Units[n.Key] = n.onShape(geometry).unitLabel(c.sys)
	}
	for _, sh := range shapes {
		v.Shapes = append(v.Shapes, web.Choice{Value: sh.value, Label: sh.label})
	}
	v.PipeSizes = pipeSizeOptions(c.sys, st.Values.Get("pipe_size"))
	v.Schedules = []web.Choice{{Value: "", Label: "default (40 / L)"}, {Value: "40", Label: "Schedule 40"}, {Value: "80", Label: "Schedule 80"},
		{Value: "K", Label: "Type K"}, {Value: "L", Label: "Type L"}, {Value: "M", Label: "Type M"}}
	v.PipeMaterials = []web.Choice{{Value: "", Label: "default (by size)"}}
	for _, m := range catalog.PipeMaterials() {
		v.PipeMaterials = append(v.PipeMaterials, web.Choice{Value: m.Slug, Label: m.Name})
	}
	v.Fluids = []web.Choice{{Value: "", Label: "water (default)"}}
	for _, f := range []string{"water", "steam", "glycol", "refrigerant", "air", "other"} {
		v.Fluids = append(v.Fluids, web.Choice{Value: f, Label: f})
	}
	v.Systems = []web.Choice{{Value: "", Label: "not given (code check by temperature)"}}
	for _, sys := range catalog.Systems {
		v.Systems = append(v.Systems, web.Choice{Value: sys, Label: strings.ReplaceAll(sys, "_", " ")})
	}
	v.Materials = []web.Choice{{Value: "", Label: "—"}}
	for _, m := range c.lib.MaterialChoices() {
		label := m.Name
		if m.Spec != "" {
			label += " (" + m.Spec + ")"
		}
		v.Materials = append(v.Materials, web.Choice{Value: m.Slug, Label: label})
	}
	v.Conditions = existingConditions
	if own := c.ownInput(); own != nil && !existingEditable(own.Existing) {
		v.ExistingNote = "This line's as-found survey has several layers (set through the API or an import): it is kept as stored; edit it there."
	}
	v.Jackets = []web.Choice{{Value: "", Label: "none (give an emittance)"}}
	v.CoverJackets = []web.Choice{{Value: "", Label: "the line's jacket"}}
	v.Retarders = []web.Choice{{Value: "", Label: "the jacket, or a closed-cell outer layer (default)"},
		{Value: "insulation", Label: "the closed-cell outer layer itself"}, {Value: "none", Label: "none"}}
	for _, j := range c.lib.JacketChoices() {
		ch := web.Choice{Value: j.Slug, Label: fmt.Sprintf("%s (ε %.2f)", j.Name, j.Emittance)}
		v.Jackets = append(v.Jackets, ch)
		v.CoverJackets = append(v.CoverJackets, ch)
		if j.VapourRetarder {
			v.Retarders = append(v.Retarders, web.Choice{Value: j.Slug, Label: j.Name + " under the cover"})
		}
	}
	v.Finishes = []web.Choice{{Value: "", Label: "insulated (as the line)"}, {Value: analysis.FinishCover, Label: "removable cover"},
		{Value: analysis.FinishBare, Label: "bare"}}
	v.SupportKinds = []web.Choice{{Value: "", Label: "default (insert below ambient, else clamp)"},
		{Value: analysis.SupportInsert, Label: "insert and shield"}, {Value: analysis.SupportClamp, Label: "clamp on the pipe"}}
	for _, k := range catalog.FittingKinds {
		v.FittingKinds = append(v.FittingKinds, web.Choice{Value: k, Label: catalog.FittingKindName(k)})
	}
	return v
}

// compute analyses a line as typed (nothing saved) and returns its results.
func (s *Server) compute(ctx context.Context, c *lineCtx, lf lineFields) (analysis.Stored, string, analysis.Input) {
	l := lf.line(c.p.ID)
	st, hash, err := s.results.Compute(c.lib, c.set, l, lf.Input, lf.Fittings)
	if err != nil {
		st = analysis.Stored{Errors: field.Errors{{Message: "The calculation failed: " + err.Error()}}}
	}
	return st, hash, c.set.Effective(lf.Location, lf.Input, lf.Fittings)
}

func (s *Server) lineNew(w http.ResponseWriter, r *http.Request) {
	c, err := s.lineScope(r)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	st := newFormState()
	st.Values.Set("shape", "pipe-horizontal")
	st.Values.Set("location", "indoor")
	st.Values.Set("exposure", "exposed")
	w.Header().Set("Cache-Control", "no-store")
	templ.Handler(web.LinePage(s.lineView(c, st, web.LineResults{Cautions: []string{analysis.Caution}}))).ServeHTTP(w, r)
}

func (s *Server) lineShow(w http.ResponseWriter, r *http.Request) {
	c, err := s.lineScope(r)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	lv, err := s.results.One(r.Context(), c.set, c.lib, c.line)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	st := lineFormValues(c.line, lv.Own, lv.Fittings, c.sys)
	w.Header().Set("Cache-Control", "no-store")
	templ.Handler(web.LinePage(s.lineView(c, st, buildResults(lv.Effective, lv.Result, c.sys, nameLookup{c.lib})))).ServeHTTP(w, r)
}

// lineResults computes the form as typed: the results fragment for htmx, the whole page
// (status 422 when something is wrong) for the Calculate button.
func (s *Server) lineResults(w http.ResponseWriter, r *http.Request) {
	c, err := s.lineScope(r)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	if err := r.ParseForm(); err != nil {
		s.fail(w, r, err)
		return
	}
	st, lf := lineFormFromRequest(r, c.sys, c.ownInput())
	var res web.LineResults
	if st.ok() {
		stored, _, eff := s.compute(r.Context(), c, lf)
		st.place(stored.Errors, lineFieldKey(st))
		res = buildResults(eff, stored, c.sys, nameLookup{c.lib})
	} else {
		res = web.LineResults{Cautions: []string{analysis.Caution}}
		for _, k := range formSortedKeys(st.Errors) {
			res.Problems = append(res.Problems, lineFieldLabel(k)+": "+st.Errors[k])
		}
		res.Problems = append(res.Problems, st.Other...)
	}
	w.Header().Set("Cache-Control", "no-store")
	if r.Header.Get("HX-Request") == "true" {
		// htmx 2 swaps only 2xx answers: the fragment says what is wrong.
		templ.Handler(web.LinePage(s.lineView(c, st, res)), templ.WithFragments("results")).ServeHTTP(w, r)
		return
	}
	status := http.StatusOK
	if !st.ok() {
		status = http.StatusUnprocessableEntity
	}
	templ.Handler(web.LinePage(s.lineView(c, st, res)), templ.WithStatus(status)).ServeHTTP(w, r)
}

// fieldLabel names a form field for a problem list.
func lineFieldLabel(k string) string {
	for _, f := range append(lineNumFields, fittingFields...) {
		if f.Key == k {
			return f.Label
		}
	}
	return k
}

// lineSave creates (POST /projects/{id}/lines) or updates (POST /projects/{id}/lines/{line})
// a line. Invalid input is never saved: the form comes back with the messages beside
// the fields (422). A stale version comes back with the typed input and a notice (409).
func (s *Server) lineSave(w http.ResponseWriter, r *http.Request) {
	c, err := s.lineScope(r)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	withLine := c.line.ID != 0
	if err := r.ParseForm(); err != nil {
		s.fail(w, r, err)
		return
	}
	st, lf := lineFormFromRequest(r, c.sys, c.ownInput())
	if withLine && lf.Version == nil {
		st.Other = append(st.Other, "The form lacks the line's version; reload the page.")
	}
	render := func(status int, res web.LineResults, notice string) {
		v := s.lineView(c, st, res)
		v.Notice = notice
		templ.Handler(web.LinePage(v), templ.WithStatus(status)).ServeHTTP(w, r)
	}
	if !st.ok() {
		render(http.StatusUnprocessableEntity, web.LineResults{Cautions: []string{analysis.Caution}}, "")
		return
	}
	stored, hash, eff := s.compute(r.Context(), c, lf)
	res := buildResults(eff, stored, c.sys, nameLookup{c.lib})
	if len(stored.Errors) > 0 {
		st.place(stored.Errors, lineFieldKey(st))
		render(http.StatusUnprocessableEntity, res, "")
		return
	}
	row := lf.line(c.p.ID)
	row.Result, row.ResultHash = stored.Marshal(), hash
	mats, _ := lf.Input.Slugs()
	var saved store.Line
	if withLine {
		row.ID, row.Version = c.line.ID, *lf.Version
		saved, err = s.store.UpdateLine(r.Context(), row, mats)
	} else {
		saved, err = s.store.CreateLine(r.Context(), row, mats)
	}
	switch {
	case errors.Is(err, store.ErrDuplicateTag):
		st.addError("tag", "is already used by another line in this project")
		render(http.StatusUnprocessableEntity, res, "")
		return
	case errors.Is(err, store.ErrConflict):
		cur, gerr := s.store.Line(r.Context(), c.p.ID, c.line.ID)
		if gerr != nil {
			s.fail(w, r, gerr)
			return
		}
		st.Values.Set("version", strconv.Itoa(cur.Version))
		render(http.StatusConflict, res, "Someone else saved this line after you opened it; your changes were not saved. "+
			"Your input is kept below: Save again to overwrite their version, or open the line again to see theirs.")
		return
	case errors.Is(err, store.ErrUnknownMaterial):
		st.addError("layers[0].material", "a material is not in the library")
		render(http.StatusUnprocessableEntity, res, "")
		return
	case err != nil:
		s.fail(w, r, err)
		return
	}
	http.Redirect(w, r, fmt.Sprintf("%s#line-%d", c.projectURL(), saved.ID), http.StatusSeeOther)
}
