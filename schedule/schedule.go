// Package schedule turns a stored project's lines and their analysis results into an
// insulation schedule — one row per line, totals by material × size × thickness and by
// jacket, a header with the project, design conditions, methods and cautions — and
// writes it as CSV, XLSX and PDF. It also builds the calculation sheet of one line.
//
// The package knows nothing of the database: handlers pass plain data (Project, Line).
// Rows are kept in SI (they are what an issued revision stores); the writers convert
// them to the project's units through Table, rounding each value to the precision it
// is shown with, and compute the shown totals from the shown values, so a total always
// equals the sum of the rows above it.
//
// Quantities (our choices, stated in every export header and in the README):
//   - insulated length = run length + the insulated fittings' equivalent length (the
//     line's answer: the table by size, the project's allowances, or the override);
//   - jacket area = outer surface area per metre × insulated length × (1 + LapWaste)
//     (flat surfaces: area × (1 + LapWaste)); LapWaste is 10 % for laps and waste;
//   - insulation volume = installed cross-section × insulated length (pipes: the annulus
//     between the pipe OD and the insulation OD; rectangular ducts: the outer rectangle
//     less the duct; flat surfaces: area × thickness), without the lap allowance;
//   - surface area = the surface under the insulation (pipes: π × pipe OD × insulated
//     length; rectangular ducts: perimeter × insulated length; flat surfaces: their area).
package schedule

import (
	"math"
	"slices"
	"strings"
	"time"

	"lagwright/analysis"
	"lagwright/calc"
	"lagwright/catalog"
	"lagwright/units"
)

// LapWaste is the allowance added to jacket area for laps and waste (our choice: 10 %,
// common practice for metal and PVC jacketing take-off).
const LapWaste = 0.10

// Project is what the schedule needs of a project.
type Project struct {
	ID       int64
	Name     string
	Client   string
	Site     string
	Units    units.System
	Settings analysis.ProjectSettings
}

// Line is one stored line with its effective calculation input and its answer.
type Line struct {
	ID       int64
	Tag      string
	Service  string
	Location string // "indoor" | "outdoor"
	Exposure string // "exposed" | "concealed"
	Notes    string
	Input    analysis.Input // effective input (project conditions filled in)
	Fittings analysis.Fittings
	Output   *analysis.Output // nil when the line has errors
	Errors   []string         // field errors that stopped the analysis
}

// Schedule is a whole schedule: header, rows and totals, all in SI. It is what an
// issued revision stores (as JSON), so later edits never change it.
type Schedule struct {
	Header Header `json:"header"`
	Rows   []Row  `json:"rows"`
	Totals Totals `json:"totals"`
}

// Header is what every export shows above the rows.
type Header struct {
	ProjectID     int64                      `json:"project_id"`
	Project       string                     `json:"project"`
	Client        string                     `json:"client"`
	Site          string                     `json:"site"`
	Units         units.System               `json:"units"`
	Revision      int                        `json:"revision"` // 0: draft, not issued
	Date          time.Time                  `json:"date"`
	Note          string                     `json:"note,omitempty"`
	Indoor        Conditions                 `json:"indoor"`
	Outdoor       Conditions                 `json:"outdoor"`
	MethodVersion string                     `json:"method_version"`
	Methods       []string                   `json:"methods"`
	Cautions      []string                   `json:"cautions"`
	LapWastePct   float64                    `json:"lap_waste_pct"`
	Fittings      analysis.FittingAllowances `json:"fitting_allowances"`
	FittingTable  []analysis.FittingRow      `json:"fitting_table,omitempty"`
}

// Conditions are the design conditions of one location.
type Conditions struct {
	AmbientC      float64  `json:"ambient_temp_c"`
	SurroundingsC *float64 `json:"surroundings_temp_c,omitempty"`
	WindMS        float64  `json:"wind_m_s"`
	RHPct         *float64 `json:"relative_humidity_pct,omitempty"`
	DewPointC     *float64 `json:"dew_point_c,omitempty"`
}

// Row is one line of the schedule, in SI. Pointers are nil where a value does not apply
// or could not be computed.
type Row struct {
	LineID    int64             `json:"line_id"`
	Tag       string            `json:"tag"`
	Service   string            `json:"service"`
	Purpose   string            `json:"purpose"`
	Location  string            `json:"location"`
	Exposure  string            `json:"exposure"`
	Geometry  string            `json:"geometry"`
	Size      string            `json:"size"`             // "NPS 4", "CTS 1", "OD 60.3 mm", "800 × 400 mm", "flat"
	SizeSI    bool              `json:"size_in_si"`       // Size was written from SI dimensions (rewritten for US display)
	PipeODmm  *float64          `json:"pipe_od_mm"`       // pipes
	DuctWmm   *float64          `json:"duct_width_mm"`    // ducts
	DuctHmm   *float64          `json:"duct_height_mm"`   // ducts
	LengthM   *float64          `json:"length_m"`         // pipes and ducts
	AreaM2    *float64          `json:"area_m2"`          // flat surfaces
	Fittings  analysis.Fittings `json:"fittings"`         // counts
	FittingsM float64           `json:"fittings_equiv_m"` // the insulated fittings' equivalent length
	// Finish is each fitting kind's finish; CoverMM the removable covers' own thickness
	// (nil: the line's build-up).
	Finish          analysis.FittingFinish `json:"fitting_finish"`
	CoverMM         *float64               `json:"cover_thickness_mm,omitempty"`
	Supports        int                    `json:"supports"`               // count over the run
	SupportKind     string                 `json:"support_kind,omitempty"` // "insert" (with shield) | "clamp"
	SupportsHeatW   *float64               `json:"supports_heat_w"`        // cold lines: heat gained through them (negative)
	InsulatedM      *float64               `json:"insulated_length_m"`
	Material        string                 `json:"material"`
	Spec            string                 `json:"spec"`
	Layers          []float64              `json:"layers_mm"`              // installed thickness of each layer, inner to outer
	ThicknessMM     float64                `json:"thickness_mm"`           // nominal
	InstalledMM     *float64               `json:"installed_thickness_mm"` // compressed blankets only
	Jacket          string                 `json:"jacket"`
	VapourRetarder  bool                   `json:"vapour_retarder"`
	OuterDiameterMM *float64               `json:"outer_diameter_mm"`
	JacketAreaM2    *float64               `json:"jacket_area_m2"`
	VolumeM3        *float64               `json:"volume_m3"`
	HeatFlowW       *float64               `json:"heat_flow_w"` // per run; negative: heat gained
	HeatFlowWPerM   *float64               `json:"heat_flow_w_per_m"`
	SurfaceC        *float64               `json:"surface_temp_c"`
	Governing       string                 `json:"governing"`   // criterion that governs, in words
	EnergyCode      string                 `json:"energy_code"` // "pass" | "fail" | "not required" | "not covered" | "" (not checked)
	HeatTraceWPerM  *float64               `json:"heat_trace_w_per_m"`
	Notes           string                 `json:"notes"`
	Error           bool                   `json:"error,omitempty"` // the line could not be analysed
}

// Purposes of insulation, in the words of the schedule.
const (
	PurposeHeat      = "heat conservation"
	PurposeCold      = "cold service"
	PurposePersonnel = "personnel protection"
	PurposeFreeze    = "freeze protection"
)

// Resolver finds material and jacket names (analysis.Resolver: the store's library).
type Resolver = analysis.Resolver

// Build makes the schedule of a project's lines. rev is the revision number (0 for a
// draft) and date the date it carries.
func Build(p Project, lines []Line, r Resolver, rev int, date time.Time) Schedule {
	b := NewBuilder(p, r, rev, date)
	b.s.Rows = make([]Row, 0, len(lines))
	for _, l := range lines {
		b.Add(l)
	}
	return b.Schedule()
}

// Builder makes a schedule one line at a time, in the lines' order, keeping only the
// rows: a big project's lines (and their answers) need not be held at once. Build is
// NewBuilder, Add for each line, then Schedule.
type Builder struct {
	s        Schedule
	r        Resolver
	cautions []string
}

// NewBuilder starts the schedule of a project: rev is the revision number (0 for a
// draft) and date the date it carries.
func NewBuilder(p Project, r Resolver, rev int, date time.Time) *Builder {
	b := &Builder{s: Schedule{Header: header(p, rev, date), Rows: []Row{}}, r: r}
	b.cautions = slices.Clone(b.s.Header.Cautions)
	return b
}

// Add appends the row of the next line. The line's answer is not kept.
func (b *Builder) Add(l Line) {
	b.s.Rows = append(b.s.Rows, buildRow(l, b.r))
	if l.Output != nil {
		for _, c := range l.Output.Cautions {
			if !slices.Contains(b.cautions, c) {
				b.cautions = append(b.cautions, c)
			}
		}
	}
}

// Schedule finishes the schedule: the header's cautions (the project's and every
// line's, each once, in order of first appearance) and the totals.
func (b *Builder) Schedule() Schedule {
	s := b.s
	s.Header.Cautions = b.cautions
	s.Totals = SumRows(s.Rows)
	return s
}

// Methods names every method the analysis uses and its published source.
var Methods = []string{
	"Conduction through layered insulation, k of each layer at its own mean temperature: ASTM C680, ISO 12241",
	"Natural convection: Churchill–Chu (horizontal cylinder, vertical plate), slender-cylinder correction of Popiel, Wojtkowiak & Bober (2007)",
	"Forced convection: Churchill–Bernstein (across a cylinder); flat-plate average (along a plate)",
	"Radiation: grey body, Stefan–Boltzmann, with the jacket's emittance",
	"Rectangular ducts: four faces as parallel paths, mean-perimeter rule (ISO 12241 approach)",
	"Dew point: saturation pressure by Hyland–Wexler (ASHRAE Handbook—Fundamentals, ch. 1)",
	"Steam, saturated and superheated: IAPWS-IF97 (regions 1, 2 and 4)",
	"Freeze protection and heat tracing: ASHRAE Handbook—Fundamentals ch. 23 (insulation resistance only, by default); ISO 12241 §6.2 freezing",
	"Personnel protection: surface-temperature limit on the contact-burn basis of ASTM C1055",
	"Energy code: ASHRAE/IES 90.1 minimum pipe insulation with its conductivity correction",
	"Economics: present worth by NIST Handbook 135 (modified uniform present-worth factor)",
}

func header(p Project, rev int, date time.Time) Header {
	set := p.Settings
	return Header{
		ProjectID: p.ID, Project: p.Name, Client: p.Client, Site: p.Site, Units: p.Units,
		Revision: rev, Date: date.UTC().Truncate(time.Second),
		Indoor:        conditions(set.Indoor),
		Outdoor:       conditions(set.Outdoor),
		MethodVersion: calc.MethodVersion,
		Methods:       slices.Clone(Methods),
		Cautions:      []string{analysis.Caution},
		LapWastePct:   LapWaste * 100,
		Fittings:      set.Fittings,
		FittingTable:  set.FittingTable,
	}
}

func conditions(l analysis.Location) Conditions {
	return Conditions{AmbientC: l.AmbientTempC, SurroundingsC: l.SurroundingsTempC, WindMS: l.WindMS, RHPct: l.RelativeHumidityPct, DewPointC: l.DewPointC}
}

func ptr[T any](v T) *T { return &v }

func buildRow(l Line, r Resolver) Row {
	in := l.Input
	row := Row{
		LineID: l.ID, Tag: l.Tag, Service: l.Service, Location: l.Location, Exposure: l.Exposure,
		Geometry: in.Geometry, Fittings: l.Fittings, LengthM: in.LengthM, AreaM2: in.AreaM2,
	}
	if row.Location == "" {
		row.Location = "indoor"
	}
	if row.Exposure == "" {
		row.Exposure = "exposed"
	}
	if in.FittingsEquivLengthM != nil && in.LengthM != nil {
		row.FittingsM = *in.FittingsEquivLengthM
	}
	if in.FittingFinish != nil {
		row.Finish = *in.FittingFinish
	}
	if in.FittingCover != nil {
		row.CoverMM = in.FittingCover.ThicknessMM
	}
	if o := l.Output; o != nil && o.Supports != nil {
		row.Supports, row.SupportKind, row.SupportsHeatW = o.Supports.Count, o.Supports.Kind, o.Supports.HeatW
	}
	if o := l.Output; o != nil && o.EquivalentLengthM != nil && in.LengthM != nil {
		row.FittingsM = *o.EquivalentLengthM - *in.LengthM
	}
	if in.LengthM != nil {
		row.InsulatedM = ptr(*in.LengthM + row.FittingsM)
	}
	row.Size, row.SizeSI = size(in)
	row.DuctWmm, row.DuctHmm = in.DuctWidthMM, in.DuctHeightMM

	// Materials and layers as specified.
	var names, specs []string
	for _, ly := range in.Layers {
		name, spec := "custom k", ""
		if ly.Material != "" {
			name = ly.Material
			if m, ok := r.Material(ly.Material); ok {
				name, spec = m.Name, m.Spec
			}
		}
		if !slices.Contains(names, name) {
			names = append(names, name)
		}
		if spec != "" && !slices.Contains(specs, spec) {
			specs = append(specs, spec)
		}
		if ly.ThicknessMM != nil && *ly.ThicknessMM > 0 {
			row.Layers = append(row.Layers, *ly.ThicknessMM)
		}
	}
	row.Material, row.Spec = strings.Join(names, " + "), strings.Join(specs, " + ")
	if in.Jacket != "" {
		row.Jacket = in.Jacket
		if j, ok := r.Jacket(in.Jacket); ok {
			row.Jacket, row.VapourRetarder = j.Name, j.VapourRetarder
		}
	} else if in.SurfaceEmittance != nil && len(in.Layers) > 0 {
		row.Jacket = "none (surface emittance given)"
	}

	var notes []string
	if l.Notes != "" {
		notes = append(notes, l.Notes)
	}
	o := l.Output
	if o == nil {
		row.Error = true
		row.Purpose = purpose(in, nil)
		for _, e := range l.Errors {
			notes = append(notes, "not computed: "+e)
		}
		if len(l.Errors) == 0 {
			notes = append(notes, "not computed")
		}
		row.Notes = strings.Join(notes, "; ")
		for _, t := range row.Layers {
			row.ThicknessMM += t
		}
		return row
	}
	// Nominal thicknesses: what is bought and counted. A compressed blanket is thinner
	// installed; a note says so.
	if len(o.Layers) > 0 {
		row.Layers = row.Layers[:0]
		var installed, nominal float64
		for _, ly := range o.Layers {
			row.Layers = append(row.Layers, ly.NominalThicknessMM)
			installed += ly.ThicknessMM
			nominal += ly.NominalThicknessMM
		}
		if installed < nominal-0.05 {
			row.InstalledMM = ptr(installed)
		}
	}
	row.ThicknessMM = o.InsulationMM
	row.PipeODmm = o.PipeODmm
	row.OuterDiameterMM = o.OuterDiameterMM
	row.Purpose = purpose(in, o)
	row.HeatFlowW = o.HeatFlowW
	row.HeatFlowWPerM = o.HeatFlowWPerM
	row.SurfaceC = ptr(o.SurfaceTempC)
	row.HeatTraceWPerM = o.HeatTraceWPerM
	if o.Sizing.Governing != nil {
		row.Governing = criterionName(*o.Sizing.Governing)
	}
	if ec := o.EnergyCode; ec != nil {
		switch {
		case ec.Reason != "": // the table does not cover the line's system
			row.EnergyCode = "not covered"
		case !ec.Required:
			row.EnergyCode = "not required"
		case ec.Pass:
			row.EnergyCode = "pass"
		default:
			row.EnergyCode = "fail"
		}
	}
	t := row.ThicknessMM / 1000
	switch {
	case row.InsulatedM != nil && o.OuterAreaM2PerM != nil:
		row.JacketAreaM2 = ptr(*o.OuterAreaM2PerM * *row.InsulatedM * (1 + LapWaste))
		switch {
		case o.PipeODmm != nil && o.OuterDiameterMM != nil:
			d, D := *o.PipeODmm/1000, *o.OuterDiameterMM/1000
			row.VolumeM3 = ptr(math.Pi / 4 * (D*D - d*d) * *row.InsulatedM)
		case in.DuctWidthMM != nil && in.DuctHeightMM != nil:
			w, h := *in.DuctWidthMM/1000, *in.DuctHeightMM/1000
			row.VolumeM3 = ptr(((w+2*t)*(h+2*t) - w*h) * *row.InsulatedM)
		}
	case in.AreaM2 != nil:
		row.JacketAreaM2 = ptr(*in.AreaM2 * (1 + LapWaste))
		row.VolumeM3 = ptr(*in.AreaM2 * t)
	}
	for _, c := range o.Checks { // the build as specified, never "thinner than the series"
		if !c.Pass {
			notes = append(notes, "fails "+criterionName(c.Criterion))
		}
	}
	for _, u := range o.Sizing.Unmet {
		notes = append(notes, "no available thickness meets "+criterionName(u))
	}
	if o.HeatTraceWPerM != nil {
		notes = append(notes, "heat tracing needed")
	}
	switch vr := o.VapourRetarder; {
	case vr != nil && vr.Source == "none":
		notes = append(notes, "cold line: no vapour retarder")
	case vr != nil && vr.Pass != nil && !*vr.Pass:
		notes = append(notes, "vapour retarder above the permeance limit")
	case vr == nil && in.Geometry != "flat" && o.Geometry != "" && in.Jacket != "" && !row.VapourRetarder && o.OperatingTempC < o.ConditionsUsed.Condensation.AmbientTempC:
		notes = append(notes, "cold line: jacket is not a vapour retarder") // answers stored before the retarder was judged
	}
	row.Notes = strings.Join(notes, "; ")
	return row
}

// purpose derives why the line is insulated: the governing criterion where it is
// personnel protection, condensation or freeze protection; otherwise freeze protection
// for a water line judged against a freeze time, cold service for a line colder than
// its design ambient, and heat conservation for the rest.
func purpose(in analysis.Input, o *analysis.Output) string {
	if o != nil && o.Sizing.Governing != nil {
		switch *o.Sizing.Governing {
		case "personnel_protection":
			return PurposePersonnel
		case "condensation":
			return PurposeCold
		case "freeze":
			return PurposeFreeze
		}
	}
	var op, amb float64
	switch {
	case o != nil:
		op, amb = o.OperatingTempC, o.ConditionsUsed.Design.AmbientTempC
	case in.OperatingTempC != nil && in.AmbientTempC != nil:
		op, amb = *in.OperatingTempC, *in.AmbientTempC
	case in.SteamGaugePressureKPa != nil:
		return PurposeHeat
	default:
		return ""
	}
	if in.Criteria != nil && in.Criteria.FreezeHours != nil && o != nil && o.FreezeHoursTo0C != nil {
		return PurposeFreeze
	}
	if op < amb {
		return PurposeCold
	}
	return PurposeHeat
}

// criterionName writes a sizing criterion key in words.
func criterionName(k string) string {
	switch k {
	case "personnel_protection":
		return "personnel protection"
	case "condensation":
		return "condensation control"
	case "max_heat_flow":
		return "maximum heat flow"
	case "max_temp_change":
		return "maximum temperature change"
	case "freeze":
		return "freeze protection"
	case "energy_code":
		return "energy code"
	case "economic":
		return "economic thickness"
	case "jacket_max_temp":
		return "the jacket's temperature limit"
	case "service_temp":
		return "a material's service temperature range"
	}
	return strings.ReplaceAll(k, "_", " ")
}

// size names the pipe, duct or surface. Nominal designations are kept as written; a
// plain OD or a duct is written from its SI dimensions (and rewritten for US display).
func size(in analysis.Input) (string, bool) {
	switch {
	case in.PipeSize != "":
		return strings.TrimSpace(in.PipeSize), false
	case in.PipeODmm != nil:
		return "OD", true
	case in.DuctWidthMM != nil && in.DuctHeightMM != nil:
		return "duct", true
	case in.Geometry == "flat":
		return "flat surface", false
	}
	return "", false
}

// SizeText writes a row's size in sys.
func (r Row) SizeText(sys units.System) string {
	if !r.SizeSI {
		return r.Size
	}
	switch {
	case r.Size == "OD" && r.PipeODmm != nil:
		return "OD " + units.FormatUnit(units.Length, sys, *r.PipeODmm)
	case r.Size == "duct" && r.DuctWmm != nil && r.DuctHmm != nil:
		return units.Format(units.Length, sys, *r.DuctWmm) + " × " + units.FormatUnit(units.Length, sys, *r.DuctHmm)
	}
	return r.Size
}

// Totals are the sums over the rows, in SI.
type Totals struct {
	ByMaterial []MaterialTotal `json:"by_material"`
	Items      []ItemTotal     `json:"items"` // fittings by kind and finish, and supports, by material × size × thickness
	ByJacket   []JacketTotal   `json:"by_jacket"`
	Grand      Grand           `json:"grand"`
}

// MaterialTotal sums the rows of one material, size and total thickness.
type MaterialTotal struct {
	Material     string  `json:"material"`
	Spec         string  `json:"spec"`
	Size         string  `json:"size"`
	ThicknessMM  float64 `json:"thickness_mm"`
	Lines        int     `json:"lines"`
	LengthM      float64 `json:"insulated_length_m"`
	StraightM    float64 `json:"straight_length_m"` // the runs' own length, without fittings
	AreaM2       float64 `json:"area_m2"`           // flat surfaces
	JacketAreaM2 float64 `json:"jacket_area_m2"`
	VolumeM3     float64 `json:"volume_m3"`
}

// ItemTotal counts one priced item of a material × size × thickness group: a fitting
// kind with its finish ("insulated", "cover", "bare"), or supports of a kind ("insert",
// "clamp"). Covers of their own thickness carry it.
type ItemTotal struct {
	Material    string   `json:"material"`
	Size        string   `json:"size"`
	ThicknessMM float64  `json:"thickness_mm"`
	Item        string   `json:"item"`   // a fitting kind (catalog.FittingKinds) or "supports"
	Finish      string   `json:"finish"` // fittings: insulated | cover | bare; supports: insert | clamp
	CoverMM     *float64 `json:"cover_thickness_mm,omitempty"`
	Count       int      `json:"count"`
}

// JacketTotal sums the jacket area of one jacket.
type JacketTotal struct {
	Jacket         string  `json:"jacket"`
	VapourRetarder bool    `json:"vapour_retarder"`
	Lines          int     `json:"lines"`
	JacketAreaM2   float64 `json:"jacket_area_m2"`
}

// Grand is the whole schedule's totals. Hot lines' heat loss and cold lines' heat gain
// are two plant loads and are kept apart, never netted.
type Grand struct {
	Lines        int     `json:"lines"`
	LengthM      float64 `json:"insulated_length_m"`
	AreaM2       float64 `json:"area_m2"`
	JacketAreaM2 float64 `json:"jacket_area_m2"`
	VolumeM3     float64 `json:"volume_m3"`
	HeatLossW    float64 `json:"heat_loss_w"` // sum of the rows losing heat
	HeatGainW    float64 `json:"heat_gain_w"` // sum of the rows gaining heat, as a positive number
}

func val(p *float64) float64 {
	if p == nil {
		return 0
	}
	return *p
}

// SumRows totals rows in SI: insulated lines only (rows with a thickness) count in the
// material totals; every row with a jacket counts in the jacket totals.
func SumRows(rows []Row) Totals {
	var t Totals
	mi := map[[3]string]int{}
	ji := map[string]int{}
	for _, r := range rows {
		t.Grand.Lines++
		t.Grand.LengthM += val(r.InsulatedM)
		t.Grand.AreaM2 += val(r.SurfaceAreaM2())
		t.Grand.JacketAreaM2 += val(r.JacketAreaM2)
		t.Grand.VolumeM3 += val(r.VolumeM3)
		if q := val(r.HeatFlowW); q >= 0 {
			t.Grand.HeatLossW += q
		} else {
			t.Grand.HeatGainW -= q
		}
		if r.Material != "" {
			key := [3]string{r.Material, r.Size + "|" + r.SizeText(units.SI), thicknessKey(r.ThicknessMM)}
			i, ok := mi[key]
			if !ok {
				i = len(t.ByMaterial)
				mi[key] = i
				t.ByMaterial = append(t.ByMaterial, MaterialTotal{Material: r.Material, Spec: r.Spec, Size: r.SizeText(units.SI), ThicknessMM: r.ThicknessMM})
			}
			m := &t.ByMaterial[i]
			m.Lines++
			m.LengthM += val(r.InsulatedM)
			m.StraightM += val(r.LengthM)
			m.AreaM2 += val(r.SurfaceAreaM2())
			m.JacketAreaM2 += val(r.JacketAreaM2)
			m.VolumeM3 += val(r.VolumeM3)
		}
		if r.Jacket != "" {
			i, ok := ji[r.Jacket]
			if !ok {
				i = len(t.ByJacket)
				ji[r.Jacket] = i
				t.ByJacket = append(t.ByJacket, JacketTotal{Jacket: r.Jacket, VapourRetarder: r.VapourRetarder})
			}
			t.ByJacket[i].Lines++
			t.ByJacket[i].JacketAreaM2 += val(r.JacketAreaM2)
		}
	}
	slices.SortStableFunc(t.ByMaterial, func(a, b MaterialTotal) int {
		return compareGroups(a.Material, sizeKey(a.Size), a.ThicknessMM, b.Material, sizeKey(b.Size), b.ThicknessMM)
	})
	t.Items = sumItems(rows)
	return t
}

// rowItems lists a row's priced items: each fitting kind counted, with its finish, and
// its supports.
func rowItems(r Row) []ItemTotal {
	var out []ItemTotal
	for _, k := range catalog.FittingKinds {
		if n := r.Fittings.Count(k); n > 0 {
			it := ItemTotal{Item: k, Finish: r.Finish.Of(k), Count: n}
			if it.Finish == analysis.FinishCover {
				it.CoverMM = r.CoverMM
			}
			out = append(out, it)
		}
	}
	if r.Supports > 0 {
		out = append(out, ItemTotal{Item: "supports", Finish: r.SupportKind, Count: r.Supports})
	}
	return out
}

// itemOrder sorts items within a group: fittings in catalog order, supports last.
func itemOrder(item string) int {
	if i := slices.Index(catalog.FittingKinds, item); i >= 0 {
		return i
	}
	return len(catalog.FittingKinds)
}

// sumItems totals the fittings and supports by material × size × thickness, item and
// finish. A bare line (no material) is its own group, named "none (bare)".
func sumItems(rows []Row) []ItemTotal {
	var out []ItemTotal
	index := map[string]int{}
	for _, r := range rows {
		mat := r.Material
		if mat == "" {
			mat = BareMaterial
		}
		size := r.SizeText(units.SI)
		for _, it := range rowItems(r) {
			cover := ""
			if it.CoverMM != nil {
				cover = thicknessKey(*it.CoverMM)
			}
			key := strings.Join([]string{mat, r.Size + "|" + size, thicknessKey(r.ThicknessMM), it.Item, it.Finish, cover}, "\x00")
			i, ok := index[key]
			if !ok {
				i = len(out)
				index[key] = i
				it.Material, it.Size, it.ThicknessMM, it.Count = mat, size, r.ThicknessMM, 0
				out = append(out, it)
			}
			out[i].Count += it.Count
		}
	}
	slices.SortStableFunc(out, func(a, b ItemTotal) int {
		if c := compareGroups(a.Material, sizeKey(a.Size), a.ThicknessMM, b.Material, sizeKey(b.Size), b.ThicknessMM); c != 0 {
			return c
		}
		return itemOrder(a.Item) - itemOrder(b.Item)
	})
	return out
}

// BareMaterial names the group of lines without insulation in the item totals.
const BareMaterial = "none (bare)"

// SurfaceAreaM2 is the area of the surface under the insulation: π × pipe OD ×
// insulated length for a pipe, perimeter × insulated length for a rectangular duct, the
// given area for a flat surface; nil where it is not known (a pipe whose OD could not
// be found, a line without a length).
func (r Row) SurfaceAreaM2() *float64 {
	switch {
	case r.AreaM2 != nil:
		return r.AreaM2
	case r.InsulatedM == nil:
		return nil
	case r.PipeODmm != nil && r.DuctWmm == nil:
		return ptr(math.Pi * *r.PipeODmm / 1000 * *r.InsulatedM)
	case r.DuctWmm != nil && r.DuctHmm != nil:
		return ptr(2 * (*r.DuctWmm + *r.DuctHmm) / 1000 * *r.InsulatedM)
	}
	return nil
}

func thicknessKey(mm float64) string {
	return units.Format(units.Length, units.SI, math.Round(mm*100)/100)
}
