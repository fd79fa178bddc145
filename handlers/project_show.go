package handlers

import (
	"bytes"
	"cmp"
	"context"
	"fmt"
	"math"
	"net/http"
	"slices"
	"strconv"
	"strings"

	"github.com/a-h/templ"

	"lagwright/analysis"
	"lagwright/catalog"
	"lagwright/results"
	"lagwright/store"
	"lagwright/units"
	"lagwright/web"
)

// lineColumn is one column of the line list: its key for ?sort=, its heading, unit,
// and how a line sorts by it.
type lineColumn struct {
	key, label string
	q          units.Quantity
	num        bool
}

var lineColumns = []lineColumn{
	{key: "tag", label: "Tag"},
	{key: "service", label: "Service"},
	{key: "size", label: "Size", num: true},
	{key: "length", label: "Length", q: units.LongLength, num: true},
	{key: "temp", label: "Operating", q: units.Temp, num: true},
	{key: "insulation", label: "Insulation"},
	{key: "thickness", label: "Total thickness", q: units.Length, num: true},
	{key: "jacket", label: "Jacket"},
	{key: "qm", label: "Heat flow", q: units.HeatFlowPerLength, num: true},
	{key: "qrun", label: "Per run", q: units.HeatFlow, num: true},
	{key: "surface", label: "Surface", q: units.Temp, num: true},
	{key: "margin", label: "Dew margin", q: units.TempDiff, num: true},
	{key: "governing", label: "Governing"},
	{key: "status", label: "Status", num: true}, // by the worst flag: input problems first
}

// listRow is a rendered row with the values it sorts by.
type listRow struct {
	view web.LineRow
	str  map[string]string
	num  map[string]*float64
}

// materialNames maps slugs to names for display (custom materials from the library).
type nameLookup struct{ lib *store.Library }

func (n nameLookup) material(slug string) string {
	if n.lib != nil {
		if m, ok := n.lib.Material(slug); ok {
			return m.Name
		}
	}
	return slug
}

func (n nameLookup) jacket(slug string) string {
	if n.lib != nil {
		if j, ok := n.lib.Jacket(slug); ok {
			return j.Name
		}
	}
	return slug
}

// sizeText names a line's size: its designation, a plain OD, or a duct's width × height.
func lineSizeText(in analysis.Input, sys units.System) (string, *float64) {
	switch {
	case in.PipeSize != "":
		if p, _, err := catalog.LookupPipe(in.PipeSize, in.PipeSchedule); err == nil {
			od := p.ODmm
			return in.PipeSize, &od
		}
		return in.PipeSize, nil
	case in.PipeODmm != nil:
		return "OD " + units.FormatUnit(units.Length, sys, *in.PipeODmm), in.PipeODmm
	case in.DuctWidthMM != nil && in.DuctHeightMM != nil:
		area := *in.DuctWidthMM * *in.DuctHeightMM
		return units.Format(units.Length, sys, *in.DuctWidthMM) + " × " + units.FormatUnit(units.Length, sys, *in.DuctHeightMM), &area
	case in.Geometry == "flat":
		return "flat surface", nil
	}
	return "", nil
}

// thicknessMM is an insulation thickness for the list. The catalog keeps inch series
// in mm rounded to 0.01 mm (3/8 in is stored as 9.52), which units.Format would write
// as 0.37 in; within that rounding a thickness is shown as the eighth of an inch it
// stands for.
func thicknessMM(sys units.System, mm float64) float64 {
	if sys == units.US {
		eighths := math.Round(mm / 25.4 * 8)
		if snapped := eighths * 25.4 / 8; math.Abs(snapped-mm) <= 0.0051 {
			return snapped
		}
	}
	return mm
}

func fmtOpt(q units.Quantity, sys units.System, p *float64) string {
	if p == nil {
		return "—"
	}
	return units.Format(q, sys, *p)
}

// dewMargin is the margin to the dew point worth showing: none on a hot line whose
// surface stays above the dew point (a figure there reads as a condensation check).
func dewMargin(o *analysis.Output) *float64 {
	m := o.CondensationMarginK
	if m != nil && o.OperatingTempC > o.SurfaceTempC && *m >= 0 {
		return nil
	}
	return m
}

// buildListRow turns a stored line into its row in the project's units.
func buildListRow(pid int64, lv results.Line, sys units.System, names nameLookup) listRow {
	in, o := lv.Effective, lv.Result.Output
	keys := lineStatus(in, lv.Result)
	r := listRow{str: map[string]string{}, num: map[string]*float64{}}
	size, sizeNum := lineSizeText(in, sys)
	var mats []string
	total := 0.0
	for _, l := range in.Layers {
		name := "k " + fmtOpt(units.Conductivity, sys, l.KWmK)
		if l.Material != "" {
			name = names.material(l.Material)
		} else if l.KWmK == nil {
			name = "custom k(T)"
		}
		if !slices.Contains(mats, name) {
			mats = append(mats, name)
		}
		if l.ThicknessMM != nil {
			total += *l.ThicknessMM
		}
	}
	insulation := "bare"
	if len(mats) > 0 {
		insulation = strings.Join(mats, " + ")
		if len(in.Layers) > 1 {
			insulation += fmt.Sprintf(" (%d layers)", len(in.Layers))
		}
	}
	jacket := "—"
	if in.Jacket != "" {
		jacket = names.jacket(in.Jacket)
	}
	if in.SurfaceEmittance != nil {
		jacket += fmt.Sprintf(" (ε %.2f)", *in.SurfaceEmittance)
	}
	v := web.LineRow{
		ID: lv.Line.ID, Tag: lv.Line.Tag, Service: lv.Line.Service, Size: size, Insulation: insulation, Jacket: jacket,
		Location: lv.Line.Location, Length: fmtOpt(units.LongLength, sys, in.LengthM), Thickness: units.Format(units.Length, sys, thicknessMM(sys, total)),
		Flags:   statusFlags(keys),
		EditURL: fmt.Sprintf("/projects/%d/lines/%d", pid, lv.Line.ID), DupURL: fmt.Sprintf("/projects/%d/lines/%d/duplicate", pid, lv.Line.ID),
		DeleteURL: fmt.Sprintf("/projects/%d/lines/%d/delete", pid, lv.Line.ID),
		OpTemp:    "—", QPerM: "—", QRun: "—", Surface: "—", Margin: "—", Governing: "—",
	}
	r.num["size"], r.num["length"], r.num["thickness"] = sizeNum, in.LengthM, &total
	if in.OperatingTempC != nil {
		v.OpTemp = units.Format(units.Temp, sys, *in.OperatingTempC)
		r.num["temp"] = in.OperatingTempC
	}
	if o != nil {
		op := o.OperatingTempC
		v.OpTemp, r.num["temp"] = units.Format(units.Temp, sys, op), &op
		q := o.HeatFlowWPerM
		if q == nil {
			q = &o.HeatFluxWm2
			v.QUnit = units.Label(units.HeatFlux, sys)
			v.QPerM = units.Format(units.HeatFlux, sys, *q)
		} else {
			v.QPerM = units.Format(units.HeatFlowPerLength, sys, *q)
		}
		r.num["qm"] = q
		v.QRun, r.num["qrun"] = fmtOpt(units.HeatFlow, sys, o.HeatFlowW), o.HeatFlowW
		st := o.SurfaceTempC
		v.Surface, r.num["surface"] = units.Format(units.Temp, sys, st), &st
		v.Margin, r.num["margin"] = fmtOpt(units.TempDiff, sys, dewMargin(o)), dewMargin(o)
		if g := o.Sizing.Governing; g != nil {
			v.Governing = lineCriterionLabel(*g)
			v.GovThick = "none available" // an unmet requirement governs
			if t := o.Sizing.GoverningThicknessMM; t != nil {
				v.GovThick = units.FormatUnit(units.Length, sys, thicknessMM(sys, *t))
			}
			r.str["governing"] = lineCriterionLabel(*g)
		}
	}
	rank := float64(worstRank(keys))
	r.num["status"] = &rank
	r.str["tag"], r.str["service"], r.str["insulation"], r.str["jacket"] = v.Tag, v.Service, insulation, jacket
	r.view = v
	return r
}

var criterionLabels = map[string]string{
	"personnel_protection": "personnel protection", "condensation": "condensation", "max_heat_flow": "max heat flow",
	"max_temp_change": "max temperature change", "freeze": "freeze", "energy_code": "energy code", "economic": "economic",
}

func lineCriterionLabel(k string) string {
	if l, ok := criterionLabels[k]; ok {
		return l
	}
	return k
}

// lineSortKey is the sort asked for when it names a column ("key" or "-key"), else ""
// (the list order): only known keys reach the table cache's key, so junk values
// cannot fill it with copies of one table.
func lineSortKey(param string) string {
	for _, c := range lineColumns {
		if param == c.key || param == "-"+c.key {
			return param
		}
	}
	return ""
}

// sortLineRows sorts by a column key; "-key" sorts descending. Blank values go last either way;
// ties keep the list order.
func sortLineRows(rows []listRow, key string) (string, bool) {
	desc := strings.HasPrefix(key, "-")
	key = strings.TrimPrefix(key, "-")
	var col *lineColumn
	for i := range lineColumns {
		if lineColumns[i].key == key {
			col = &lineColumns[i]
		}
	}
	if col == nil {
		return "", false
	}
	slices.SortStableFunc(rows, func(a, b listRow) int {
		var c int
		if col.num {
			x, y := a.num[key], b.num[key]
			switch {
			case x == nil && y == nil:
				return 0
			case x == nil:
				return 1
			case y == nil:
				return -1
			}
			c = cmp.Compare(*x, *y)
		} else {
			x, y := a.str[key], b.str[key]
			switch {
			case x == "" && y == "":
				return 0
			case x == "":
				return 1
			case y == "":
				return -1
			}
			c = cmp.Compare(strings.ToLower(x), strings.ToLower(y))
			if c == 0 {
				c = tagCompare(x, y)
			}
		}
		if desc {
			return -c
		}
		return c
	})
	return key, desc
}

// naturalCompare orders tags with numbers by their value (HHW-9 before HHW-10).
func tagCompare(a, b string) int {
	for a != "" && b != "" {
		da, db := tagDigits(a), tagDigits(b)
		if da != "" && db != "" {
			x, _ := strconv.Atoi(da)
			y, _ := strconv.Atoi(db)
			if c := cmp.Compare(x, y); c != 0 {
				return c
			}
			a, b = a[len(da):], b[len(db):]
			continue
		}
		if c := cmp.Compare(a[0], b[0]); c != 0 {
			return c
		}
		a, b = a[1:], b[1:]
	}
	return cmp.Compare(len(a), len(b))
}

func tagDigits(s string) string {
	i := 0
	for i < len(s) && i < 9 && s[i] >= '0' && s[i] <= '9' {
		i++
	}
	return s[:i]
}

// projectShow is the project page: the line list with computed columns, sorting,
// totals and each line's status. It reads only each stored answer's summary
// (results.List); stale answers are recomputed (once) and saved; a view of fresh lines does
// no physics and, once their freshness keys are saved, no hashing. The table part of
// the page (ProjectLineTable) is kept rendered in memory (tableCache) under a key read
// from the database in one query (store.ListFingerprint with the project's version,
// the sort and the method version), stored only from a view whose lines were all
// fresh; a hit reads neither the lines nor the library and renders only the head.
func (s *Server) projectShow(w http.ResponseWriter, r *http.Request) {
	p, set := projectOf(r)
	// Read before the lines: a write that lands in between makes the table newer
	// than its key, which then no longer matches the database and is never served.
	fp, err := s.store.ListFingerprint(r.Context(), p.ID)
	if err != nil {
		s.fail(w, r, err)
		return
	}
	sortParam := lineSortKey(r.URL.Query().Get("sort"))
	key := newTableKey(p.ID, p.Version, p.Units, sortParam, fp)
	head := web.ProjectPageView{
		Assets: s.assets.urls, ID: p.ID, Name: p.Name, Client: p.Client, Site: p.Site,
		UnitsName:  map[string]string{"si": "SI", "us": "US customary"}[p.Units],
		NewLineURL: fmt.Sprintf("/projects/%d/lines/new", p.ID), EditURL: fmt.Sprintf("/projects/%d/edit", p.ID),
		BaseURL: fmt.Sprintf("/projects/%d", p.ID),
	}
	e, err := s.tables().getOrBuild(r.Context(), key, func(ctx context.Context) (*tableEntry, bool, error) {
		v, fresh, err := s.projectTable(ctx, p, set, sortParam, head)
		if err != nil {
			return nil, false, err
		}
		var b bytes.Buffer
		if err := web.ProjectLineTable(v).Render(ctx, &b); err != nil {
			return nil, false, err
		}
		return &tableEntry{key: key, html: b.Bytes(), lineCount: v.LineCount}, fresh, nil
	})
	if err != nil {
		s.fail(w, r, err)
		return
	}
	head.LineCount, head.Table = e.lineCount, rawHTML(e.html)
	w.Header().Set("Cache-Control", "no-store")
	templ.Handler(web.ProjectPage(head)).ServeHTTP(w, r)
}

// projectTable builds the line list of the page whose head is v: rows, sorting,
// totals and status counts. fresh says no line needed recomputing.
func (s *Server) projectTable(ctx context.Context, p store.Project, set analysis.ProjectSettings, sortParam string, v web.ProjectPageView) (web.ProjectPageView, bool, error) {
	lib, err := s.library(ctx)
	if err != nil {
		return v, false, err
	}
	views, fresh, err := s.results.List(ctx, p, set, lib)
	if err != nil {
		return v, false, err
	}
	sys := units.System(p.Units)
	rows := make([]listRow, len(views))
	var totalLen, totalLoss, totalGain float64
	counts := map[string]int{}
	for i, lv := range views {
		rows[i] = buildListRow(p.ID, lv, sys, nameLookup{lib})
		if lv.Effective.LengthM != nil {
			totalLen += *lv.Effective.LengthM
		}
		if o := lv.Result.Output; o != nil && o.HeatFlowW != nil {
			// Hot lines lose heat and cold lines gain it: two plant loads, never netted.
			if q := *o.HeatFlowW; q >= 0 {
				totalLoss += q
			} else {
				totalGain -= q
			}
		}
		for _, f := range rows[i].view.Flags {
			counts[f.Key]++
		}
	}
	sortKey, desc := sortLineRows(rows, sortParam)
	v.TotalLength = units.FormatUnit(units.LongLength, sys, totalLen)
	v.TotalHeat = units.FormatUnit(units.HeatFlow, sys, totalLoss) + " loss"
	v.TotalGain = units.FormatUnit(units.HeatFlow, sys, totalGain) + " gain"
	v.LineCount = len(rows)
	for _, c := range lineColumns {
		h := web.ColumnHead{Key: c.key, Label: c.label, Num: c.q != 0} // right-aligned: measured values
		if c.q != 0 {
			h.Unit = units.Label(c.q, sys)
		}
		next := c.key
		if sortKey == c.key {
			h.Sorted = "ascending"
			if desc {
				h.Sorted = "descending"
			} else {
				next = "-" + c.key
			}
		}
		h.Href = fmt.Sprintf("/projects/%d?sort=%s", p.ID, next)
		v.Columns = append(v.Columns, h)
	}
	for _, k := range []string{StatusTooHot, StatusCondenses, StatusBelowCode, StatusFails, StatusUnmet, StatusInputIssue, StatusOK} {
		if counts[k] > 0 {
			v.Summary = append(v.Summary, web.StatusCount{Flag: statusFlags([]string{k})[0], Count: counts[k]})
		}
	}
	for _, row := range rows {
		v.Rows = append(v.Rows, row.view)
	}
	return v, fresh, nil
}
