package linelist

import (
	"fmt"
	"strconv"
	"strings"

	"lagwright/analysis"
	"lagwright/catalog"
	"lagwright/units"
)

// column is one column a line list may carry: its canonical name (snake_case, without
// the unit), how a cell is read into a Row and written back, and, for columns with a
// unit, the unit spellings accepted in the header.
type column struct {
	name  string
	field string // the analysis path it fills ("" for the line's own fields)
	kind  kind

	// kind text: where the value lives.
	text func(b *builder) *string
	// textOut reads it back from a Row.
	textOut func(r *Row) string

	// kind qty: the quantity, the pointer it fills and reads, and the header units.
	q     units.Quantity
	num   func(b *builder) **float64
	numIn func(in *analysis.Input) *float64
	hdr   []headerUnit // accepted header units; the first SI one and the first US one are what Template writes

	// kind count: the fitting count it fills.
	count func(f *analysis.Fittings) *int
}

type kind int

const (
	kText  kind = iota // free text or a keyword
	kQty               // a number with the unit given in the header
	kCount             // a whole number (fittings)
)

// headerUnit is one spelling of a unit in a header: norm is the spelling after normUnit,
// label the way Template writes it, parse the unit as package units spells it (or, for
// quantities units lacks, factor: SI per header unit), and sys the system it belongs to.
type headerUnit struct {
	norm, label, parse string
	factor             float64
	sys                units.System
}

// The header units of each kind of quantity. Plain spellings only; normUnit folds case,
// spaces, degree signs, dots and middle dots.
var (
	uLength = []headerUnit{{norm: "mm", label: "mm", parse: "mm", sys: units.SI}, {norm: "in", label: "in", parse: "in", sys: units.US},
		{norm: "inch", label: "inch", parse: "in", sys: units.US}, {norm: `"`, label: `"`, parse: "in", sys: units.US}}
	uRun  = []headerUnit{{norm: "m", label: "m", parse: "m", sys: units.SI}, {norm: "ft", label: "ft", parse: "ft", sys: units.US}}
	uTemp = []headerUnit{{norm: "c", label: "°C", parse: "C", sys: units.SI}, {norm: "f", label: "°F", parse: "F", sys: units.US}}
	uDiff = []headerUnit{{norm: "k", label: "K", parse: "K", sys: units.SI}, {norm: "f", label: "°F", parse: "F", sys: units.US},
		{norm: "c", label: "°C", parse: "K", sys: units.SI}}
	uPressure = []headerUnit{{norm: "kpag", label: "kPa g", parse: "kPa", sys: units.SI}, {norm: "psig", label: "psig", parse: "psi", sys: units.US},
		{norm: "barg", label: "bar g", parse: "bar", sys: units.SI}}
	uMassFlow = []headerUnit{{norm: "kg/s", label: "kg/s", parse: "kg/s", sys: units.SI}, {norm: "lb/h", label: "lb/h", parse: "lb/h", sys: units.US},
		{norm: "kg/h", label: "kg/h", parse: "kg/h", sys: units.SI}}
	uHeatFlow = []headerUnit{{norm: "w/m", label: "W/m", parse: "W/m", sys: units.SI}, {norm: "btu/hft", label: "Btu/h·ft", parse: "Btu/h·ft", sys: units.US}}
	// Specific heat: package units has no such quantity; 1 Btu/lb·°F = 4186.8 J/kg·K
	// exactly (Btu(IT), NIST SP 811 Appendix B).
	uCp = []headerUnit{{norm: "j/kgk", label: "J/kg·K", factor: 1, sys: units.SI}, {norm: "btu/lbf", label: "Btu/lb·°F", factor: 4186.8, sys: units.US},
		{norm: "kj/kgk", label: "kJ/kg·K", factor: 1000, sys: units.SI}}
	// Point heat-transfer value of a support: 1 Btu/h·°F = 0.5275279 W/K (Btu(IT)
	// 1055.05585 J, NIST SP 811 Appendix B; 1 °F = 5/9 K).
	uWPerK = []headerUnit{{norm: "w/k", label: "W/K", factor: 1, sys: units.SI}, {norm: "btu/hf", label: "Btu/h·°F", factor: 1055.05585262 / 3600 * 1.8, sys: units.US}}
	uHours = []headerUnit{{norm: "h", label: "h", factor: 1, sys: units.SI}, {norm: "h", label: "h", factor: 1, sys: units.US}}
	uPct   = []headerUnit{{norm: "%", label: "%", factor: 0.01, sys: units.SI}, {norm: "%", label: "%", factor: 0.01, sys: units.US}}
)

// unitNorm folds the spellings of a header unit: "°F", "degF", "F" → "f"; "kPa g",
// "kPa(g)" → "kpag"; "Btu/h·ft", "Btu/hr-ft" → "btu/hft"; "J/kg·K" → "j/kgk".
var unitNorm = strings.NewReplacer(" ", "", "°", "", "º", "", "·", "", "⋅", "", "*", "", ".", "", "(", "", ")", "", "-", "",
	"″", `"`, "hr", "h", "deg", "", "lbm", "lb")

func normUnit(s string) string { return unitNorm.Replace(strings.ToLower(strings.TrimSpace(s))) }

// builder collects one row's cells before the Input is assembled.
type builder struct {
	row    Row
	layers [maxLayers]analysis.LayerInput
	flow   analysis.Flow
	crit   analysis.Criteria
	finish analysis.FittingFinish
	cover  analysis.FittingCover
	supp   analysis.Supports
	// The as-found survey: one existing layer, condition or factor, missing share,
	// fitting kinds found bare.
	exLayer                     analysis.LayerInput
	exCondition, exK, exFitting string
	exMissing                   *float64
}

// maxLayers is the number of layer columns a line list has.
const maxLayers = 3

func text(name, field string, at func(b *builder) *string, out func(r *Row) string) column {
	return column{name: name, field: field, kind: kText, text: at, textOut: out}
}

func qty(name, field string, q units.Quantity, hdr []headerUnit, at func(b *builder) **float64, in func(in *analysis.Input) *float64) column {
	return column{name: name, field: field, kind: kQty, q: q, hdr: hdr, num: at, numIn: in}
}

func count(name string, at func(f *analysis.Fittings) *int) column {
	return column{name: name, kind: kCount, count: at}
}

// columns is every column, in the order Template writes them.
var columns = buildColumns()

func buildColumns() []column {
	cols := []column{
		text("tag", "", func(b *builder) *string { return &b.row.Tag }, func(r *Row) string { return r.Tag }),
		text("service", "", func(b *builder) *string { return &b.row.Service }, func(r *Row) string { return r.Service }),
		text("location", "", func(b *builder) *string { return &b.row.Location }, func(r *Row) string { return r.Location }),
		text("exposure", "", func(b *builder) *string { return &b.row.Exposure }, func(r *Row) string { return r.Exposure }),
		text("geometry", "geometry", func(b *builder) *string { return &b.row.Input.Geometry }, func(r *Row) string { return r.Input.Geometry }),
		text("orientation", "orientation", func(b *builder) *string { return &b.row.Input.Orientation }, func(r *Row) string { return r.Input.Orientation }),
		text("pipe_size", "pipe_size", func(b *builder) *string { return &b.row.Input.PipeSize }, func(r *Row) string { return r.Input.PipeSize }),
		text("pipe_schedule", "pipe_schedule", func(b *builder) *string { return &b.row.Input.PipeSchedule }, func(r *Row) string { return r.Input.PipeSchedule }),
		qty("pipe_od", "pipe_od_mm", units.Length, uLength, func(b *builder) **float64 { return &b.row.Input.PipeODmm },
			func(in *analysis.Input) *float64 { return in.PipeODmm }),
		text("pipe_material", "pipe_material", func(b *builder) *string { return &b.row.Input.PipeMaterial }, func(r *Row) string { return r.Input.PipeMaterial }),
		qty("duct_width", "duct_width_mm", units.Length, uLength, func(b *builder) **float64 { return &b.row.Input.DuctWidthMM },
			func(in *analysis.Input) *float64 { return in.DuctWidthMM }),
		qty("duct_height", "duct_height_mm", units.Length, uLength, func(b *builder) **float64 { return &b.row.Input.DuctHeightMM },
			func(in *analysis.Input) *float64 { return in.DuctHeightMM }),
		qty("length", "length_m", units.LongLength, uRun, func(b *builder) **float64 { return &b.row.Input.LengthM },
			func(in *analysis.Input) *float64 { return in.LengthM }),
		count("elbows", func(f *analysis.Fittings) *int { return &f.Elbows }),
		count("tees", func(f *analysis.Fittings) *int { return &f.Tees }),
		count("valves", func(f *analysis.Fittings) *int { return &f.Valves }),
		count("flange_pairs", func(f *analysis.Fittings) *int { return &f.FlangePairs }),
		count("caps", func(f *analysis.Fittings) *int { return &f.Caps }),
		count("strainers", func(f *analysis.Fittings) *int { return &f.Strainers }),
		count("reducers", func(f *analysis.Fittings) *int { return &f.Reducers }),
	}
	for _, k := range catalog.FittingKinds {
		cols = append(cols, text(k+"_finish", "fitting_finish."+k, func(b *builder) *string { return b.finish.Field(k) },
			func(r *Row) string {
				if r.Input.FittingFinish == nil {
					return ""
				}
				return *r.Input.FittingFinish.Field(k)
			}))
	}
	cols = append(cols,
		qty("cover_thickness", "fitting_cover.thickness_mm", units.Length, uLength, func(b *builder) **float64 { return &b.cover.ThicknessMM },
			func(in *analysis.Input) *float64 {
				if in.FittingCover == nil {
					return nil
				}
				return in.FittingCover.ThicknessMM
			}),
		text("cover_jacket", "fitting_cover.jacket", func(b *builder) *string { return &b.cover.Jacket }, func(r *Row) string {
			if r.Input.FittingCover == nil {
				return ""
			}
			return r.Input.FittingCover.Jacket
		}),
		qty("support_spacing", "supports.spacing_m", units.LongLength, uRun, func(b *builder) **float64 { return &b.supp.SpacingM },
			func(in *analysis.Input) *float64 { return supports(in).SpacingM }),
		text("support_kind", "supports.kind", func(b *builder) *string { return &b.supp.Kind }, func(r *Row) string { return supports(&r.Input).Kind }),
		qty("support_heat_value", "supports.w_per_k", 0, uWPerK, func(b *builder) **float64 { return &b.supp.WPerK },
			func(in *analysis.Input) *float64 { return supports(in).WPerK }),
	)
	cols = append(cols,
		text("fluid", "fluid", func(b *builder) *string { return &b.row.Input.Fluid }, func(r *Row) string { return r.Input.Fluid }),
		text("system", "system", func(b *builder) *string { return &b.row.Input.System }, func(r *Row) string { return r.Input.System }),
		qty("operating_temp", "operating_temp_c", units.Temp, uTemp, func(b *builder) **float64 { return &b.row.Input.OperatingTempC },
			func(in *analysis.Input) *float64 { return in.OperatingTempC }),
		qty("dew_point", "dew_point_c", units.Temp, uTemp, func(b *builder) **float64 { return &b.row.Input.DewPointC },
			func(in *analysis.Input) *float64 { return in.DewPointC }),
		qty("steam_pressure", "steam_gauge_pressure_kpa", units.Pressure, uPressure,
			func(b *builder) **float64 { return &b.row.Input.SteamGaugePressureKPa },
			func(in *analysis.Input) *float64 { return in.SteamGaugePressureKPa }),
		qty("mass_flow", "flow.mass_flow_kg_s", units.MassFlow, uMassFlow, func(b *builder) **float64 { return &b.flow.MassFlowKgS },
			func(in *analysis.Input) *float64 {
				if in.Flow == nil {
					return nil
				}
				return in.Flow.MassFlowKgS
			}),
		qty("cp", "flow.cp_j_kgk", 0, uCp, func(b *builder) **float64 { return &b.flow.CpJkgK },
			func(in *analysis.Input) *float64 {
				if in.Flow == nil {
					return nil
				}
				return in.Flow.CpJkgK
			}),
	)
	for i := range maxLayers {
		n := strconv.Itoa(i + 1)
		p := fmt.Sprintf("layers[%d].", i)
		cols = append(cols,
			text("layer"+n+"_material", p+"material", func(b *builder) *string { return &b.layers[i].Material },
				func(r *Row) string {
					if i < len(r.Input.Layers) {
						return r.Input.Layers[i].Material
					}
					return ""
				}),
			qty("layer"+n+"_thickness", p+"thickness_mm", units.Length, uLength, func(b *builder) **float64 { return &b.layers[i].ThicknessMM },
				func(in *analysis.Input) *float64 {
					if i < len(in.Layers) {
						return in.Layers[i].ThicknessMM
					}
					return nil
				}))
	}
	crit := func(in *analysis.Input) *analysis.Criteria {
		if in.Criteria == nil {
			return &analysis.Criteria{}
		}
		return in.Criteria
	}
	cols = append(cols,
		text("jacket", "jacket", func(b *builder) *string { return &b.row.Input.Jacket }, func(r *Row) string { return r.Input.Jacket }),
		text("vapour_retarder", "vapour_retarder", func(b *builder) *string { return &b.row.Input.VapourRetarder },
			func(r *Row) string { return r.Input.VapourRetarder }),
		qty("max_surface_temp", "criteria.max_surface_temp_c", units.Temp, uTemp, func(b *builder) **float64 { return &b.crit.MaxSurfaceTempC },
			func(in *analysis.Input) *float64 { return crit(in).MaxSurfaceTempC }),
		qty("dew_margin", "criteria.dew_margin_k", units.TempDiff, uDiff, func(b *builder) **float64 { return &b.crit.DewMarginK },
			func(in *analysis.Input) *float64 { return crit(in).DewMarginK }),
		qty("max_heat_flow", "criteria.max_heat_flow_w_per_m", units.HeatFlowPerLength, uHeatFlow,
			func(b *builder) **float64 { return &b.crit.MaxHeatFlowWPerM },
			func(in *analysis.Input) *float64 { return crit(in).MaxHeatFlowWPerM }),
		qty("max_temp_change", "criteria.max_temp_change_k", units.TempDiff, uDiff, func(b *builder) **float64 { return &b.crit.MaxTempChangeK },
			func(in *analysis.Input) *float64 { return crit(in).MaxTempChangeK }),
		qty("freeze_hours", "criteria.freeze_hours", 0, uHours, func(b *builder) **float64 { return &b.crit.FreezeHours },
			func(in *analysis.Input) *float64 { return crit(in).FreezeHours }),
		text("freeze_model", "criteria.freeze_model", func(b *builder) *string { return &b.crit.FreezeModel },
			func(r *Row) string { return crit(&r.Input).FreezeModel }),
		qty("maintain_temp", "criteria.maintain_temp_c", units.Temp, uTemp, func(b *builder) **float64 { return &b.crit.MaintainTempC },
			func(in *analysis.Input) *float64 { return crit(in).MaintainTempC }),
		text("existing_material", "existing.layers[0].material", func(b *builder) *string { return &b.exLayer.Material },
			func(r *Row) string {
				if e := r.Input.Existing; e != nil && len(e.Layers) > 0 {
					return e.Layers[0].Material
				}
				return ""
			}),
		qty("existing_thickness", "existing.layers[0].thickness_mm", units.Length, uLength, func(b *builder) **float64 { return &b.exLayer.ThicknessMM },
			func(in *analysis.Input) *float64 {
				if e := in.Existing; e != nil && len(e.Layers) > 0 {
					return e.Layers[0].ThicknessMM
				}
				return nil
			}),
		text("existing_condition", "existing.condition", func(b *builder) *string { return &b.exCondition }, func(r *Row) string {
			switch e := r.Input.Existing; {
			case e == nil:
				return ""
			case len(e.Layers) == 0:
				return "bare"
			}
			return r.Input.Existing.Condition
		}),
		text("existing_k_factor", "existing.k_factor", func(b *builder) *string { return &b.exK }, func(r *Row) string {
			if e := r.Input.Existing; e != nil && e.KFactor != nil {
				return strconv.FormatFloat(*e.KFactor, 'f', -1, 64)
			}
			return ""
		}),
		qty("existing_missing", "existing.missing_fraction", 0, uPct, func(b *builder) **float64 { return &b.exMissing },
			func(in *analysis.Input) *float64 {
				if e := in.Existing; e != nil {
					return e.MissingFraction
				}
				return nil
			}),
		text("existing_bare_fittings", "existing.bare_fittings", func(b *builder) *string { return &b.exFitting }, func(r *Row) string {
			if e := r.Input.Existing; e != nil {
				return strings.Join(e.BareFittings, ";")
			}
			return ""
		}),
		text("notes", "", func(b *builder) *string { return &b.row.Notes }, func(r *Row) string { return r.Notes }),
	)
	return cols
}

// byName finds a column by its canonical name.
var byName = func() map[string]int {
	m := make(map[string]int, len(columns))
	for i, c := range columns {
		m[c.name] = i
	}
	m["flanges"] = m["flange_pairs"] // the column's name before flange pairs were named so
	return m
}()

// Header returns the canonical header of every column in one system of units
// ("length [m]" or "length [ft]"), in the order Template writes them.
func Header(sys units.System) []string {
	out := make([]string, len(columns))
	for i, c := range columns {
		out[i] = c.header(sys)
	}
	return out
}

// header writes a column's canonical header in sys.
func (c column) header(sys units.System) string {
	if c.kind != kQty {
		return c.name
	}
	for _, u := range c.hdr {
		if u.sys == sys {
			return c.name + " [" + u.label + "]"
		}
	}
	return c.name + " [" + c.hdr[0].label + "]"
}

// unitHelp lists the units a column accepts, for messages.
func (c column) unitHelp() string {
	var s []string
	seen := map[string]bool{}
	for _, u := range c.hdr {
		if !seen[u.label] {
			seen[u.label] = true
			s = append(s, c.name+" ["+u.label+"]")
		}
	}
	return strings.Join(s, " or ")
}

func supports(in *analysis.Input) *analysis.Supports {
	if in.Supports == nil {
		return &analysis.Supports{}
	}
	return in.Supports
}
