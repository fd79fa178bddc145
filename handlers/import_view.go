package handlers

import (
	"strings"

	"lagwright/linelist"
	"lagwright/store"
	"lagwright/units"
	"lagwright/web"
)

// maxPrefill is the largest text put back into the paste box of the preview.
const maxPrefill = 256 << 10

// importJobRows: a commit of more rows than this runs in the background with progress.
const importJobRows = 500

// importView builds the import screen for project p; text and plan are those of a
// preview (plan nil: the empty form).
func (s *Server) importView(p store.Project, text string, plan *importPlan) web.ImportView {
	sys := projectSystem(p)
	v := web.ImportView{
		Assets: s.assets.urls, ProjectID: p.ID, ProjectName: p.Name, ProjectURL: projectURL(p.ID),
		ActionURL: importURL(p.ID), CommitURL: importURL(p.ID) + "/commit",
		TemplateURL: "/api/v1/import/template.csv?units=" + string(sys),
	}
	if sys == units.US {
		v.UnitsLabel, v.OtherURL, v.OtherLabel = "US units", "/api/v1/import/template.csv?units=si", "or in SI units"
	} else {
		v.UnitsLabel, v.OtherURL, v.OtherLabel = "SI units", "/api/v1/import/template.csv?units=us", "or in US units"
	}
	si, us := linelist.Header(units.SI), linelist.Header(units.US)
	for i := range si {
		v.Columns = append(v.Columns, [2]string{si[i], us[i]})
	}
	if len(text) <= maxPrefill {
		v.Text = text
	}
	if plan != nil {
		v.Preview = importPreviewView(plan, text)
	}
	return v
}

// importPreviewView shapes a plan for the screen: the good rows with their results, the bad
// ones with their problems, in file order.
func importPreviewView(plan *importPlan, text string) *web.ImportPreview {
	sys := plan.Sys
	pv := &web.ImportPreview{Lines: len(plan.Rows), HeatFlowLabel: units.Label(units.HeatFlowPerLength, sys),
		Background: len(plan.Rows) > importJobRows}
	byRow := map[int][]string{}
	for _, e := range plan.Problems {
		pv.Problems = append(pv.Problems, web.ImportProblem{Row: e.Row, Field: e.Field, Message: e.Message})
		if e.Row > 1 {
			msg := e.Message
			if e.Field != "" {
				msg = e.Field + ": " + msg
			}
			byRow[e.Row] = append(byRow[e.Row], msg)
		}
	}
	seen := map[int]bool{}
	var loss, gain float64
	for i, r := range plan.Rows {
		seen[r.Row] = true
		vr := importRow(plan, r, sys)
		if i < len(plan.Results) {
			if o := plan.Results[i].Output; o != nil {
				if o.HeatFlowWPerM != nil {
					vr.HeatFlow = units.FormatUnit(units.HeatFlowPerLength, sys, *o.HeatFlowWPerM)
				} else {
					vr.HeatFlow = units.FormatUnit(units.HeatFlux, sys, o.HeatFluxWm2)
				}
				vr.SurfaceTemp = units.FormatUnit(units.Temp, sys, o.SurfaceTempC)
				if o.SteamSatTempC != nil {
					vr.Temp += " (" + units.FormatUnit(units.Temp, sys, *o.SteamSatTempC) + ")"
				}
				if o.HeatFlowW != nil && *o.HeatFlowW >= 0 {
					loss += *o.HeatFlowW
				} else if o.HeatFlowW != nil {
					gain -= *o.HeatFlowW
				}
			}
		}
		vr.Problems = byRow[r.Row]
		pv.Rows = append(pv.Rows, vr)
	}
	// Rows that did not parse: a stub with their problems, in order.
	for row, msgs := range byRow {
		if !seen[row] {
			pv.Rows = append(pv.Rows, web.ImportRow{Row: row, Tag: "—", Problems: msgs})
		}
	}
	sortRows(pv.Rows)
	bad := 0
	for _, r := range pv.Rows {
		if len(r.Problems) > 0 {
			bad++
		}
	}
	pv.BadRows = bad
	pv.Lines = len(pv.Rows)
	if loss > 0 {
		pv.HeatLoss = units.FormatUnit(units.HeatFlow, sys, loss)
	}
	if gain > 0 {
		pv.HeatGain = units.FormatUnit(units.HeatFlow, sys, gain)
	}
	if len(plan.Problems) == 0 {
		pv.Commit = text
	}
	return pv
}

func sortRows(rows []web.ImportRow) {
	for i := 1; i < len(rows); i++ { // nearly sorted: insertion sort
		for j := i; j > 0 && rows[j].Row < rows[j-1].Row; j-- {
			rows[j], rows[j-1] = rows[j-1], rows[j]
		}
	}
}

// importRow formats a row's own values in the project's units.
func importRow(plan *importPlan, r linelist.Row, sys units.System) web.ImportRow {
	in := r.Input
	vr := web.ImportRow{Row: r.Row, Tag: r.Tag, Service: r.Service, Jacket: jacketName(plan, in.Jacket)}
	switch {
	case in.Geometry == "duct" && in.DuctWidthMM != nil && in.DuctHeightMM != nil:
		vr.Size = units.Format(units.Length, sys, *in.DuctWidthMM) + " × " + units.FormatUnit(units.Length, sys, *in.DuctHeightMM) + " duct"
	case in.PipeSize != "":
		vr.Size = in.PipeSize
	case in.PipeODmm != nil:
		vr.Size = units.FormatUnit(units.Length, sys, *in.PipeODmm) + " OD"
	default:
		vr.Size = in.Geometry
	}
	if in.PipeSchedule != "" {
		vr.Size += " sch " + in.PipeSchedule
	}
	if in.LengthM != nil {
		vr.Length = units.FormatUnit(units.LongLength, sys, *in.LengthM)
	}
	switch {
	case in.SteamGaugePressureKPa != nil:
		gauge := " kPa g"
		if sys == units.US {
			gauge = " psig"
		}
		vr.Temp = units.Format(units.Pressure, sys, *in.SteamGaugePressureKPa) + gauge + " steam"
	case in.OperatingTempC != nil:
		vr.Temp = units.FormatUnit(units.Temp, sys, *in.OperatingTempC)
	}
	var layers []string
	for _, l := range in.Layers {
		s := materialName(plan, l.Material)
		if l.ThicknessMM != nil {
			s = units.FormatUnit(units.Length, sys, *l.ThicknessMM) + " " + s
		}
		layers = append(layers, s)
	}
	if len(layers) == 0 {
		vr.Layers = "bare"
	} else {
		vr.Layers = strings.Join(layers, " + ")
	}
	return vr
}

func materialName(plan *importPlan, slug string) string {
	if plan.lib != nil {
		if m, ok := plan.lib.Material(slug); ok {
			return m.Name
		}
	}
	return slug
}

func jacketName(plan *importPlan, slug string) string {
	if plan.lib != nil && slug != "" {
		if j, ok := plan.lib.Jacket(slug); ok {
			return j.Name
		}
	}
	return slug
}

// importProblems converts problems for the progress page.
func importProblems(list []linelist.RowError) []web.ImportProblem {
	out := make([]web.ImportProblem, len(list))
	for i, e := range list {
		out[i] = web.ImportProblem{Row: e.Row, Field: e.Field, Message: e.Message}
	}
	return out
}
