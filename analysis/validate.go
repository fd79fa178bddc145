package analysis

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"lagwright/calc"
	"lagwright/catalog"
)

// Bounds on inputs: physical sense, and a ceiling on the work one request can cause.
const (
	maxLayers      = 10
	maxThicknessMM = 600
	maxCandidates  = 40
	maxKPoints     = 30
)

// airSet is one resolved condition set.
type airSet struct {
	air     calc.Air
	rh      *float64 // given, or derived from the given dew point
	dew     *float64 // given, or derived from the given humidity
	initial *float64 // freeze only

	dewGiven bool   // the dew point was given (rh derived from it)
	dewField string // the field that gave the dew point or the humidity, for messages

	personnel   bool    // the personnel set: its echo names the sunlight and absorptance
	absorptance float64 // personnel: solar absorptance of the outer surface
}

func (a airSet) out() AirOut {
	o := AirOut{AmbientTempC: a.air.TempC, SurroundingsTempC: a.air.SurroundingsC,
		WindMS: a.air.WindMS, RelativeHumidityPct: a.rh, DewPointC: a.dew, InitialTempC: a.initial}
	if a.personnel {
		o.SolarFluxWm2, o.SolarAbsorptance = ptr(a.air.SolarWm2), ptr(a.absorptance)
	}
	if a.rh != nil {
		o.RelativeHumidityPct = ptr(round(*a.rh, 3))
	}
	if a.dew != nil {
		o.DewPointC = ptr(round(*a.dew, 3))
	}
	return o
}

// humid reports whether the set knows its moisture (a humidity or a dew point).
func (a airSet) humid() bool { return a.dew != nil }

// line is a validated input with everything resolved: ready for calc.
type line struct {
	in    Input
	shape calc.Shape
	base  calc.System // as specified
	bare  calc.System // no insulation, bare emittance, correlations

	layerMaterials []string          // slug per layer ("" for k given directly)
	installed      []float64         // installed / nominal thickness per layer (< 1 for compressed blankets)
	outerMaterial  *catalog.Material // material of the sized (outermost) layer, when known

	pipe      *catalog.PipeSize
	nominalIn float64 // nominal pipe size, inches; 0 = not a pipe or unknown
	// sizeUsed names the size the energy-code column was read for ("CTS 1", "DN65",
	// "OD 30 mm") and sizeBasis how: "pipe_size", "matched_od" or "od".
	sizeUsed, sizeBasis string
	pipeMat             catalog.PipeMaterial
	jacket              *catalog.Jacket
	retarder            retarder // the build's vapour retarder, as given or found

	fluid        string
	opC          float64
	steamAbsPa   float64 // > 0 for steam at a known pressure
	steamSatC    float64 // saturation temperature at steamAbsPa
	superheatK   float64 // > 0: superheated steam, operating this far above saturation
	cpJkgK       float64
	lengthM      float64 // 0 = not given
	equivLengthM float64 // length + the insulated fittings' equivalent length
	runHeatW     float64 // the run's whole heat: run, fittings of every finish, supports

	existing *calc.System // the build as found (nil: no existing given)
	kFactor  float64      // condition factor on k of the existing layers
	missing  float64      // fraction of the run found bare

	fittings       []fittingKind
	anyCover       bool
	coverJacket    *catalog.Jacket
	supports       *Supports // nil: not a pipe run
	supportSpacing float64
	areaM2         float64 // flats: 0 = not given

	design, personnel, condensation, freeze, econ airSet
	crit                                          criteria
	candidatesMM                                  []float64
	// Layered builds of the sized layer (set by analyser.candidates): the largest single
	// layer made (0: never split), the largest series thickness within it (0: no layered
	// extension) and the series the layers come from.
	maxLayerMM, bigLayerMM float64
	series                 []float64

	assumptions, warnings []string

	sized []calc.Layer // scratch of analyser.system: the layers with a candidate thickness
}

// retarder is the build's vapour retarder: a jacket (the cover, or a film or mastic
// under it), the closed-cell outer layer, or none.
type retarder struct {
	source string // "jacket" | "retarder" | "insulation" | "none"
	name   string
	perm   float64 // US perm; 0 = unknown
	basis  string  // of the permeance
}

// criteria are the resolved sizing criteria.
type criteria struct {
	personnel       bool
	public          bool // touch exposure of the public or patients: the user's lower limit
	maxSurfaceC     float64
	condensation    bool
	dewMarginK      float64
	maxHeatFlow     *float64
	maxTempChange   *float64
	freezeHours     *float64
	freezeBasis     string
	freezeFraction  float64
	freezeModel     string // "handbook" | "full"
	maintainC       float64
	maintainGiven   bool // maintain_temp_c given: tracing asked for on any pipe line
	heatTraceFactor float64
	energyCode      *catalog.CodeTable
	economic        bool
}

func (l *line) assume(format string, args ...any) {
	l.assumptions = append(l.assumptions, sprintf(format, args...))
}

func (l *line) warn(format string, args ...any) {
	l.warnings = append(l.warnings, sprintf(format, args...))
}

// assumeText adds an assumption already in words (not a format: '%' stays as it is).
func (l *line) assumeText(s string) {
	l.assumptions = append(l.assumptions, s)
}

// sprintf is fmt.Sprintf, skipping fmt for a fixed sentence (no verbs, no arguments).
func sprintf(format string, args ...any) string {
	if len(args) == 0 && strings.IndexByte(format, '%') < 0 {
		return format
	}
	return fmt.Sprintf(format, args...)
}

// fmtF formats v as fmt's %.<prec>f does (fmt formats through strconv the same way, Inf
// and NaN included), without fmt's machinery.
func fmtF(v float64, prec int) string {
	return strconv.FormatFloat(v, 'f', prec, 64)
}

// words builds one message from text and numbers in a single allocation:
// words{}.s("k ").f(0.31, 3).s(" at ").String().
type words struct{ b []byte }

func (w words) s(text string) words { w.b = append(w.b, text...); return w }

// f appends v as fmt's %.<prec>f.
func (w words) f(v float64, prec int) words {
	w.b = strconv.AppendFloat(w.b, v, 'f', prec, 64)
	return w
}

// n appends v as fmtNum does.
func (w words) n(v float64) words {
	start := len(w.b)
	w.b = strconv.AppendFloat(w.b, v, 'f', 6, 64)
	for len(w.b) > start && w.b[len(w.b)-1] == '0' {
		w.b = w.b[:len(w.b)-1]
	}
	if len(w.b) > start && w.b[len(w.b)-1] == '.' {
		w.b = w.b[:len(w.b)-1]
	}
	return w
}

// r appends v as fmtRound does, without allocating.
func (w words) r(v float64, prec int) words {
	start := len(w.b)
	w.b = strconv.AppendFloat(w.b, v, 'f', prec, 64)
	if prec > 0 {
		for w.b[len(w.b)-1] == '0' {
			w.b = w.b[:len(w.b)-1]
		}
		if w.b[len(w.b)-1] == '.' {
			w.b = w.b[:len(w.b)-1]
		}
	}
	if string(w.b[start:]) == "-0" {
		w.b = append(w.b[:start], '0')
	}
	return w
}

// i appends n as fmt's %d.
func (w words) i(n int) words { w.b = strconv.AppendInt(w.b, int64(n), 10); return w }

func (w words) String() string { return string(w.b) }

// rangeCheck adds an error when a given value lies outside [lo, hi].
func rangeCheck(c *errs, field string, v *float64, lo, hi float64, unit string) {
	if v == nil {
		return
	}
	if *v < lo || *v > hi {
		c.add(field, "must be between %s and %s %s", fmtNum(lo), fmtNum(hi), unit)
	}
}

// positiveCheck adds an error unless 0 < v ≤ hi.
func positiveCheck(c *errs, field string, v *float64, hi float64, unit string) {
	if v == nil {
		return
	}
	if *v <= 0 {
		c.add(field, "must be greater than 0")
	} else if *v > hi {
		c.add(field, "must be at most %s %s", fmtNum(hi), unit)
	}
}

func fmtNum(v float64) string {
	return strings.TrimSuffix(strings.TrimRight(fmtF(v, 6), "0"), ".")
}

// fmtRound writes v rounded to prec decimals for a message, without trailing zeros:
// 689.475729 → "689.5" (prec 1), 24 → "24", -0.04 → "0".
func fmtRound(v float64, prec int) string {
	s := fmtF(v, prec)
	if strings.IndexByte(s, '.') >= 0 {
		s = strings.TrimSuffix(strings.TrimRight(s, "0"), ".")
	}
	if s == "-0" {
		return "0"
	}
	return s
}

func orDefault(p *float64, d float64) float64 {
	if p != nil {
		return *p
	}
	return d
}

func ptr[T any](v T) *T { return &v }

// resolve validates the input and resolves sizes, materials, jackets and conditions.
// Every problem is reported at once as field.Errors.
func resolve(in Input, r Resolver) (*line, error) {
	var c errs
	l := new(line) // set field by field: a composite literal would copy a whole zero line
	l.in = in
	l.assumptions = make([]string, 0, 24) // a line states about twenty
	resolveGeometry(l, &c)
	resolveFluid(l, &c)
	resolveConditions(l, &c)
	resolveLayers(l, r, &c)
	resolveSurface(l, r, &c)
	resolveRun(l, &c)
	resolveFittings(l, r, &c)
	resolveExisting(l, r, &c)
	resolveCriteria(l, r, &c)
	resolveEconomics(l, &c)
	if err := c.err(); err != nil {
		return nil, err
	}
	return l, nil
}

func resolveGeometry(l *line, c *errs) {
	in := l.in
	orient := in.Orientation
	if orient == "" {
		orient = "horizontal"
	} else if orient != "horizontal" && orient != "vertical" {
		c.add("orientation", `must be "horizontal" or "vertical"`)
	}
	rangeCheck(c, "height_m", in.HeightM, 0.1, 200, "m")
	rangeCheck(c, "width_m", in.WidthM, 0.1, 200, "m")
	rangeCheck(c, "plate_length_m", in.PlateLengthM, 0.1, 200, "m")
	rangeCheck(c, "plate_width_m", in.PlateWidthM, 0.1, 200, "m")
	rangeCheck(c, "inner_coeff_w_m2k", in.InnerCoeff, 1, 1e6, "W/m²·K")
	if in.Facing != "" && !(in.Geometry == "flat" && orient == "horizontal") {
		c.add("facing", "applies only to a horizontal flat surface")
	} else if in.Facing != "" && in.Facing != "up" && in.Facing != "down" {
		c.add("facing", `must be "up" or "down"`)
	}
	if in.Geometry != "pipe" {
		for _, f := range [...]struct {
			field string
			given bool
		}{{"pipe_od_mm", in.PipeODmm != nil}, {"pipe_size", in.PipeSize != ""},
			{"pipe_schedule", in.PipeSchedule != ""}, {"pipe_wall_mm", in.PipeWallMM != nil}} {
			if f.given {
				c.add(f.field, "applies only to pipe geometry")
			}
		}
	}
	if in.Geometry != "duct" {
		if in.DuctWidthMM != nil {
			c.add("duct_width_mm", "applies only to duct geometry")
		}
		if in.DuctHeightMM != nil {
			c.add("duct_height_mm", "applies only to duct geometry")
		}
	}

	sys := &l.base
	sys.InnerCoeff = orDefault(in.InnerCoeff, 0)
	switch in.Geometry {
	case "pipe":
		l.shape = calc.PipeHorizontal
		if orient == "vertical" {
			l.shape = calc.PipeVertical
			sys.Height = orDefault(in.HeightM, 3)
			if in.HeightM == nil {
				l.assume("vertical run height 3 m (default) for natural convection")
			}
		} else if in.HeightM != nil {
			c.add("height_m", "applies only to vertical pipes and vertical flat surfaces")
		}
		resolvePipe(l, c)
	case "duct":
		l.shape = calc.Duct
		if orient == "vertical" {
			c.add("orientation", "rectangular ducts are calculated as horizontal runs; use horizontal")
		}
		if in.DuctWidthMM == nil {
			c.add("duct_width_mm", "is required for a duct")
		}
		if in.DuctHeightMM == nil {
			c.add("duct_height_mm", "is required for a duct")
		}
		rangeCheck(c, "duct_width_mm", in.DuctWidthMM, 50, 10000, "mm")
		rangeCheck(c, "duct_height_mm", in.DuctHeightMM, 50, 10000, "mm")
		sys.DuctWidth = orDefault(in.DuctWidthMM, 0) / 1000
		sys.DuctHeight = orDefault(in.DuctHeightMM, 0) / 1000
		l.assume("duct sheet resistance neglected; inner surface at the air temperature inside the duct")
	case "flat":
		if orient == "vertical" {
			l.shape = calc.FlatVertical
			sys.Height = orDefault(in.HeightM, 3)
			sys.Width = orDefault(in.WidthM, 3)
			if in.HeightM == nil || in.WidthM == nil {
				l.assume("vertical surface %s m high, %s m along the wind (defaults where not given)", fmtRound(sys.Height, 2), fmtRound(sys.Width, 2))
			}
		} else {
			l.shape = calc.FlatUp
			if in.Facing == "down" {
				l.shape = calc.FlatDown
			}
			sys.PlateLength = orDefault(in.PlateLengthM, 1)
			sys.PlateWidth = orDefault(in.PlateWidthM, 1)
			if in.PlateLengthM == nil || in.PlateWidthM == nil {
				l.assume("horizontal surface %s m × %s m (defaults where not given)", fmtRound(sys.PlateLength, 2), fmtRound(sys.PlateWidth, 2))
			}
			if in.Facing == "" {
				l.assume("horizontal surface facing up (default)")
			}
		}
	case "":
		c.add("geometry", `is required: "pipe", "duct" or "flat"`)
	default:
		c.add("geometry", `must be "pipe", "duct" or "flat"`)
	}
	sys.Shape = l.shape
	if l.shape != calc.FlatVertical && in.Geometry == "flat" && in.WidthM != nil {
		c.add("width_m", "applies only to vertical flat surfaces")
	}
	if in.Geometry != "flat" || orient != "horizontal" {
		if in.PlateLengthM != nil {
			c.add("plate_length_m", "applies only to horizontal flat surfaces")
		}
		if in.PlateWidthM != nil {
			c.add("plate_width_m", "applies only to horizontal flat surfaces")
		}
	}
}

func resolvePipe(l *line, c *errs) {
	in := l.in
	sys := &l.base
	switch {
	case in.PipeODmm != nil && in.PipeSize != "":
		c.add("pipe_size", "give pipe_size or pipe_od_mm, not both")
	case in.PipeSize != "":
		size, wall, err := catalog.LookupPipe(in.PipeSize, in.PipeSchedule)
		if err != nil {
			field := "pipe_size"
			if in.PipeSchedule != "" && strings.Contains(strings.ToLower(err.Error()), "schedule") {
				field = "pipe_schedule"
			}
			c.add(field, "%s", err.Error())
			break
		}
		if in.PipeWallMM != nil {
			c.add("pipe_wall_mm", "the wall comes from pipe_size and pipe_schedule; give pipe_wall_mm only with pipe_od_mm")
		}
		l.pipe = &size
		l.nominalIn = size.NominalIn
		sys.PipeOD = size.ODmm / 1000
		sys.PipeWall = wall / 1000
		if in.PipeSchedule == "" {
			sched := "schedule 40"
			if size.Kind == catalog.PipeKind("copper") {
				sched = "type L"
			}
			var buf [96]byte
			l.assumeText(words{buf[:0]}.s(size.Designation).s(", ").s(sched).s(" wall (default) ").f(wall, 2).s(" mm").String())
		}
	case in.PipeODmm != nil:
		rangeCheck(c, "pipe_od_mm", in.PipeODmm, 3, 3000, "mm")
		if in.PipeSchedule != "" {
			c.add("pipe_schedule", "applies only with pipe_size")
		}
		sys.PipeOD = *in.PipeODmm / 1000
		if in.PipeWallMM != nil {
			if *in.PipeWallMM <= 0 || *in.PipeWallMM >= *in.PipeODmm/2 {
				c.add("pipe_wall_mm", "must be greater than 0 and less than half the outside diameter")
			}
			sys.PipeWall = *in.PipeWallMM / 1000
		} else {
			l.assume("pipe wall not modelled (plain outside diameter): the insulation's inner face is at the operating temperature")
		}
	default:
		c.add("pipe_size", `give pipe_size ("NPS 4", "DN100", "CTS 1") or pipe_od_mm`)
	}

	slug := in.PipeMaterial
	if slug == "" {
		slug = "carbon_steel"
		if l.pipe != nil && l.pipe.Kind == catalog.PipeKind("copper") {
			slug = "copper"
		}
		l.assumeText("pipe material " + strings.ReplaceAll(slug, "_", " ") + " (default)")
	}
	pm, ok := catalog.PipeMaterialBySlug(slug)
	if !ok {
		c.add("pipe_material", "unknown pipe material %q (carbon_steel, stainless_steel, copper, galvanised_steel, pvc)", slug)
	}
	l.pipeMat = pm
	sys.WallK = pm.WallK
	if l.pipe != nil {
		l.sizeUsed, l.sizeBasis = l.pipe.Designation, "pipe_size"
	} else if in.PipeODmm != nil && *in.PipeODmm > 0 {
		sizeForOD(l, *in.PipeODmm)
	}
	if sys.PipeWall > 0 && in.InnerCoeff == nil {
		l.assume("no inside film: the pipe's inner surface is at the operating temperature (conservative)")
	}
}

// heatFlowUnit is the unit of max_heat_flow_w_per_m for this line: W/m², per m² of
// surface, on flat surfaces; W/m elsewhere.
func heatFlowUnit(l *line) string {
	if l.shape.IsFlat() {
		return "W/m²"
	}
	return "W/m"
}

// sizeForOD places a plain outside diameter in its tube family (copper tube for copper,
// steel pipe otherwise): a standard OD within 0.5 mm gives its nominal size, any other
// OD is read in inches against the column bounds itself.
func sizeForOD(l *line, odMM float64) {
	kind := catalog.Steel
	if l.pipeMat.Slug == "copper" {
		kind = catalog.Copper
	}
	if d, n, ok := catalog.SizeForOD(kind, odMM); ok {
		l.nominalIn, l.sizeUsed, l.sizeBasis = n, d, "matched_od"
		return
	}
	l.nominalIn, l.sizeUsed, l.sizeBasis = odMM/25.4, "OD "+fmtRound(odMM, 2)+" mm", "od"
}

// Default specific heats, J/kg·K, for the run's temperature change.
var defaultCp = map[string]float64{
	"water":  4186, // near 20 °C, common practice
	"glycol": 3600, // about 40 % propylene glycol near 0 °C, from memory — give cp_j_kgk for your mix
	"air":    1006, // dry air near 20 °C (Cengel Table A-15)
}

func resolveFluid(l *line, c *errs) {
	if sys := l.in.System; sys != "" {
		air := sys == "supply_air" || sys == "return_air" || sys == "exhaust"
		switch {
		case !catalog.IsSystem(sys):
			c.add("system", "must be one of %s", strings.Join(catalog.Systems, ", "))
		case air && l.shape.IsPipe():
			c.add("system", "%s is an air system: a duct or flat, not a pipe", sys)
		case !air && sys != "process" && l.in.Geometry == "duct":
			c.add("system", "%s is a piped system: a duct serves supply_air, return_air, exhaust or process", sys)
		}
	}
	in := l.in
	l.fluid = in.Fluid
	if l.fluid == "" {
		l.fluid = "water"
		if in.SteamGaugePressureKPa != nil {
			l.fluid = "steam"
		}
	}
	switch l.fluid {
	case "water", "steam", "glycol", "refrigerant", "air", "other":
	default:
		c.add("fluid", `must be one of "water", "steam", "glycol", "refrigerant", "air", "other"`)
	}
	if in.SteamGaugePressureKPa != nil {
		if l.fluid != "steam" {
			c.add("steam_gauge_pressure_kpa", `applies only to fluid "steam"`)
			return
		}
		p := *in.SteamGaugePressureKPa
		if p < -100 || p > 21000 {
			c.add("steam_gauge_pressure_kpa", "must be between -100 and 21000 kPa (gauge)")
			return
		}
		abs := (p + 101.325) * 1000
		t, err := calc.SteamSaturationTemp(abs)
		if err != nil {
			c.add("steam_gauge_pressure_kpa", "%s", err.Error())
			return
		}
		l.steamAbsPa = abs
		l.steamSatC = t
		l.opC = t
		switch op := in.OperatingTempC; {
		case op == nil || math.Abs(*op-t) <= 0.5:
			l.assume("saturated steam at %s kPa gauge (%s kPa absolute at sea-level atmosphere 101.325 kPa): %.1f °C (IAPWS-IF97)",
				fmtRound(p, 1), fmtRound(p+101.325, 1), t)
		case *op < t:
			c.add("operating_temp_c", "is below the saturation temperature %.1f °C at the given steam pressure: steam there is wet or condensed; "+
				"give the pressure alone for saturated steam, or a temperature above %.1f °C for superheated steam", t, t)
		default:
			if _, _, err := calc.SuperheatedSteam(abs, *op); err != nil {
				c.add("operating_temp_c", "superheated steam at this pressure: %s", strings.TrimPrefix(err.Error(), "calc: "))
				return
			}
			l.opC = *op
			l.superheatK = *op - t
			l.assume("superheated steam at %s kPa gauge (%s kPa absolute at sea-level atmosphere 101.325 kPa) and %s °C: %.1f K above saturation at %.1f °C; "+
				"properties by IAPWS-IF97 region 2, pressure drop along the run neglected", fmtRound(p, 1), fmtRound(p+101.325, 1), fmtRound(*op, 1), l.superheatK, t)
		}
		return
	}
	if in.OperatingTempC == nil {
		if l.fluid == "steam" {
			c.add("operating_temp_c", "is required (or steam_gauge_pressure_kpa for saturated steam)")
		} else {
			c.add("operating_temp_c", "is required")
		}
		return
	}
	rangeCheck(c, "operating_temp_c", in.OperatingTempC, -200, 850, "°C")
	l.opC = *in.OperatingTempC
	if l.fluid == "steam" && l.opC >= 0.01 && l.opC <= 373 {
		p, err := calc.SteamSaturationPressure(l.opC)
		if err == nil {
			l.steamAbsPa, l.steamSatC = p, l.opC
			l.assume("steam taken as saturated at %.1f °C (%.0f kPa absolute, IAPWS-IF97)", l.opC, p/1000)
		}
	}
}

func resolveConditions(l *line, c *errs) {
	in := l.in
	if in.AmbientTempC == nil {
		c.add("ambient_temp_c", "is required (the design air temperature around the line)")
	}
	rangeCheck(c, "ambient_temp_c", in.AmbientTempC, -70, 80, "°C")
	rangeCheck(c, "surroundings_temp_c", in.SurroundingsTempC, -100, 300, "°C")
	rangeCheck(c, "wind_m_s", in.WindMS, 0, 40, "m/s")
	rangeCheck(c, "relative_humidity_pct", in.RelativeHumidityPct, 0.1, 100, "%")
	rangeCheck(c, "dew_point_c", in.DewPointC, -70, 80, "°C")
	bothHumidities(c, "", in.RelativeHumidityPct, in.DewPointC)
	switch in.RelativeHumidityOver {
	case "", "water", "ice":
	default:
		c.add("relative_humidity_over", `must be "water" or "ice"`)
	}
	amb := orDefault(in.AmbientTempC, 20)
	l.design = airSet{air: calc.Air{TempC: amb, SurroundingsC: orDefault(in.SurroundingsTempC, amb), WindMS: orDefault(in.WindMS, 0)},
		rh: in.RelativeHumidityPct, dew: in.DewPointC, dewGiven: in.DewPointC != nil, dewField: "relative_humidity_pct"}
	if in.DewPointC != nil {
		l.design.dewField = "dew_point_c"
	}
	if in.SurroundingsTempC == nil {
		var buf [64]byte
		l.assumeText(words{buf[:0]}.s("surroundings at the ambient temperature ").r(amb, 1).s(" °C").String())
	}
	if in.WindMS == nil {
		l.assume("still air (wind 0 m/s) at design conditions")
	}
	var cs Conditions
	if in.Conditions != nil {
		cs = *in.Conditions
	}
	l.personnel = personnelSet(l, c, cs.Personnel)
	l.condensation = conditionSet(l, c, "condensation", cs.Condensation, true)
	l.freeze = conditionSet(l, c, "freeze", cs.Freeze, false)
	l.econ = conditionSet(l, c, "economics", cs.Economics, false)
	for _, s := range [...]struct {
		name string
		set  *ConditionSet
	}{{"personnel", cs.Personnel}, {"condensation", cs.Condensation}, {"economics", cs.Economics}} {
		if s.set != nil && s.set.InitialTempC != nil {
			c.add("conditions."+s.name+".initial_temp_c", "applies only to the freeze conditions")
		}
	}
	for _, s := range [...]struct {
		name string
		set  *ConditionSet
	}{{"condensation", cs.Condensation}, {"freeze", cs.Freeze}, {"economics", cs.Economics}} {
		if s.set != nil && s.set.SolarFluxWm2 != nil {
			c.add("conditions."+s.name+".solar_flux_w_m2", "applies only to the personnel conditions")
		}
	}
	if in.Location != "" && in.Location != "indoor" && in.Location != "outdoor" {
		c.add("location", `must be "indoor" or "outdoor"`)
	}
	if cs.Freeze != nil {
		rangeCheck(c, "conditions.freeze.initial_temp_c", cs.Freeze.InitialTempC, -50, 200, "°C")
	}
	overWater := in.RelativeHumidityOver != "ice"
	humidity(l, c, "", &l.design, overWater, true)
	humidity(l, c, "condensation", &l.condensation, overWater, true)
	for _, s := range [...]struct {
		name string
		set  *airSet
	}{{"personnel", &l.personnel}, {"freeze", &l.freeze}, {"economics", &l.econ}} {
		humidity(l, c, s.name, s.set, overWater, false)
	}
}

// bothHumidities names both fields when a set gives a humidity and a dew point.
func bothHumidities(c *errs, prefix string, rh, dew *float64) {
	if rh != nil && dew != nil {
		c.add(prefix+"relative_humidity_pct", "give relative_humidity_pct or dew_point_c, not both")
		c.add(prefix+"dew_point_c", "give relative_humidity_pct or dew_point_c, not both")
	}
}

// humidity completes a set's moisture: the dew point from a given humidity, or the
// humidity from a given dew point. A dew point above the set's air is a field error
// where the set is used (strict), and otherwise leaves the set without moisture.
func humidity(l *line, c *errs, name string, s *airSet, overWater, strict bool) {
	t := s.air.TempC
	if c.has("ambient_temp_c") || c.has("conditions."+name+".ambient_temp_c") || c.has(s.dewField) {
		s.rh, s.dew = nil, nil // already named: a derived value would only repeat the error
		return
	}
	switch {
	case s.dewGiven:
		if *s.dew > t {
			s.rh, s.dew = nil, nil
			if !strict {
				return
			}
			if name != "" && s.dewField == "dew_point_c" { // inherited from the design conditions
				c.add("conditions."+name+".ambient_temp_c", "is below the design dew point: give the set its own dew_point_c or relative_humidity_pct")
				return
			}
			c.add(s.dewField, "must not be above the air temperature (%s °C)", fmtRound(t, 2))
			return
		}
		rh, err := calc.RelativeHumidity(t, *s.dew, overWater)
		if err != nil {
			s.rh, s.dew = nil, nil
			if strict {
				c.add(s.dewField, "%s", err.Error())
			}
			return
		}
		s.rh = ptr(rh)
		if name == "condensation" {
			l.assume("condensation judged at the dew point given, %s °C (relative humidity %s %% at %s °C, derived)",
				fmtRound(*s.dew, 2), fmtRound(rh, 1), fmtRound(t, 1))
		}
	case s.rh != nil:
		dp, err := calc.DewPointRH(t, *s.rh, overWater)
		if err != nil {
			s.rh = nil
			if strict {
				c.add(s.dewField, "%s", err.Error())
			}
			return
		}
		s.dew = ptr(dp)
		if name == "condensation" && t < 0 {
			basis := "over liquid water (the weather-data convention; relative_humidity_over \"ice\" to change)"
			if !overWater {
				basis = "over ice (relative_humidity_over \"ice\")"
			}
			l.assume("relative humidity %s %% at %s °C taken %s", fmtRound(*s.rh, 1), fmtRound(t, 1), basis)
		}
	}
}

// conditionSet resolves one per-criterion set: absent values take the design
// conditions, except that personnel protection and condensation default to still air.
func conditionSet(l *line, c *errs, name string, set *ConditionSet, stillAir bool) airSet {
	out := l.design
	if stillAir {
		out.air.WindMS = 0
	}
	if set == nil {
		l.assumeText(judgedAtDesign(name, stillAir))
		return out
	}
	p := "conditions." + name + "."
	rangeCheck(c, p+"ambient_temp_c", set.AmbientTempC, -70, 80, "°C")
	rangeCheck(c, p+"surroundings_temp_c", set.SurroundingsTempC, -100, 300, "°C")
	rangeCheck(c, p+"wind_m_s", set.WindMS, 0, 40, "m/s")
	rangeCheck(c, p+"relative_humidity_pct", set.RelativeHumidityPct, 0.1, 100, "%")
	rangeCheck(c, p+"dew_point_c", set.DewPointC, -70, 80, "°C")
	bothHumidities(c, p, set.RelativeHumidityPct, set.DewPointC)
	if set.AmbientTempC != nil {
		out.air.TempC = *set.AmbientTempC
		out.air.SurroundingsC = *set.AmbientTempC
	}
	if set.SurroundingsTempC != nil {
		out.air.SurroundingsC = *set.SurroundingsTempC
	}
	if set.WindMS != nil {
		out.air.WindMS = *set.WindMS
	}
	if set.RelativeHumidityPct != nil {
		out.rh, out.dew, out.dewGiven, out.dewField = set.RelativeHumidityPct, nil, false, p+"relative_humidity_pct"
	}
	if set.DewPointC != nil {
		out.rh, out.dew, out.dewGiven, out.dewField = nil, set.DewPointC, true, p+"dew_point_c"
	}
	out.initial = set.InitialTempC
	return out
}

// hotDayC is the personnel ambient floor: a hot day, 32 °C (90 °F), common practice.
const hotDayC = 32.0

// defaultSolarWm2 is the sunlight on the projected area of an outdoor line for personnel
// protection, W/m² (a clear-sky noon, common practice).
const defaultSolarWm2 = 1000.0

// personnelSet resolves the personnel conditions. Where the set does not give them:
// the warmer of the design ambient and a 32 °C hot day (air and surroundings), still
// air, and outdoors sunlight of 1000 W/m² on the projected area (all common practice).
func personnelSet(l *line, c *errs, set *ConditionSet) airSet {
	in := l.in
	given := set
	if set == nil {
		set = &ConditionSet{}
	}
	out := conditionSet(l, c, "personnel", given, true)
	if given == nil {
		l.assumptions = l.assumptions[:len(l.assumptions)-1] // "at the design conditions": replaced below
	}
	out.personnel = true
	var parts []string
	if set.AmbientTempC == nil && out.air.TempC < hotDayC {
		out.air.TempC = hotDayC
		parts = append(parts, "a 32 °C (90 °F) hot-day ambient, warmer than the design ambient")
	}
	if set.AmbientTempC == nil && set.SurroundingsTempC == nil && out.air.SurroundingsC < hotDayC {
		out.air.SurroundingsC = hotDayC
	}
	if set.WindMS == nil {
		parts = append(parts, "still air")
	}
	rangeCheck(c, "conditions.personnel.solar_flux_w_m2", set.SolarFluxWm2, 0, 1400, "W/m²")
	switch {
	case set.SolarFluxWm2 != nil:
		out.air.SolarWm2 = *set.SolarFluxWm2
	case in.Location == "outdoor":
		out.air.SolarWm2 = defaultSolarWm2
		parts = append(parts, "sunlight of 1000 W/m² on the projected area (outdoors)")
	}
	if len(parts) > 0 {
		l.assumeText("personnel protection judged with " + strings.Join(parts, ", ") + " (common practice)")
	}
	return out
}

// judgedAtDesign words the assumption of a condition set that takes the design
// conditions (fixed sentences for the sets resolveConditions has: no string building).
func judgedAtDesign(name string, stillAir bool) string {
	switch {
	case name == "personnel" && stillAir:
		return "personnel judged at the design conditions in still air (common practice)"
	case name == "condensation" && stillAir:
		return "condensation judged at the design conditions in still air (common practice)"
	case name == "freeze" && !stillAir:
		return "freeze judged at the design conditions"
	case name == "economics" && !stillAir:
		return "economics judged at the design conditions"
	case stillAir:
		return name + " judged at the design conditions in still air (common practice)"
	}
	return name + " judged at the design conditions"
}

func resolveLayers(l *line, r Resolver, c *errs) {
	if len(l.in.Layers) > maxLayers {
		c.add("layers", "must have at most %d layers", maxLayers)
		return
	}
	ls := buildLayers(l, l.in.Layers, "layers", r, c)
	l.base.Layers, l.layerMaterials, l.installed, l.outerMaterial = ls.layers, ls.materials, ls.installed, ls.outer
}

// builtLayers are resolved insulation layers, inner to outer.
type builtLayers struct {
	layers    []calc.Layer
	materials []string          // slug per layer ("" for k given directly)
	installed []float64         // installed / nominal thickness per layer
	outer     *catalog.Material // the outermost layer's material, when known
}

// buildLayers resolves a list of layers (the line's, or the existing build's) named
// under field ("layers", "existing.layers").
func buildLayers(l *line, list []LayerInput, field string, r Resolver, c *errs) builtLayers {
	var out builtLayers
	for i, li := range list {
		p := func() string { return field + "[" + strconv.Itoa(i) + "]." } // named on error only
		switch t := li.ThicknessMM; {
		case t == nil:
			c.add(p()+"thickness_mm", "is required")
		case *t <= 0 || *t > maxThicknessMM:
			positiveCheck(c, p()+"thickness_mm", t, maxThicknessMM, "mm")
		}
		given := 0
		for _, g := range []bool{li.Material != "", li.KWmK != nil, li.KPoints != nil} {
			if g {
				given++
			}
		}
		if given != 1 {
			c.add(p()+"material", "give exactly one of material, k_w_mk or k_points")
			continue
		}
		layer := calc.Layer{}
		factor := 1.0
		switch {
		case li.Material != "":
			m, ok := r.Material(li.Material)
			if !ok {
				c.add(p()+"material", "unknown material %q", li.Material)
				continue
			}
			layer.Name = m.Name
			layer.K = kCurve(m.KPoints)
			if m.Compressible && m.CompressionPct > 0 {
				factor = 1 - m.CompressionPct/100
				l.assume("%s %d (%s) counted at its installed thickness: %s %% compression of the nominal (common practice)",
					strings.TrimSuffix(strings.ReplaceAll(field, "existing.layers", "existing layer"), "s"), i+1, m.Name, fmtNum(m.CompressionPct))
			}
			layer.MinC, layer.MaxC, layer.HasLimits = m.MinC, m.MaxC, true
			if i == len(list)-1 {
				out.outer = &m
			}
		case li.KWmK != nil:
			if *li.KWmK <= 0 || *li.KWmK > 10 {
				c.add(p()+"k_w_mk", "must be greater than 0 and at most 10 W/m·K")
				continue
			}
			layer.K = calc.KCurve{{MeanC: 20, K: *li.KWmK}}
			l.assume("%s %d: constant k %s W/m·K at every temperature",
				strings.TrimSuffix(strings.ReplaceAll(field, "existing.layers", "existing layer"), "s"), i+1, fmtNum(*li.KWmK))
		default:
			if !validKPoints(c, p()+"k_points", li.KPoints) {
				continue
			}
			for _, pt := range li.KPoints {
				layer.K = append(layer.K, calc.KPoint{MeanC: pt[0], K: pt[1]})
			}
		}
		layer.Thickness = orDefault(li.ThicknessMM, 0) / 1000 * factor
		out.layers = append(out.layers, layer)
		out.materials = append(out.materials, li.Material)
		out.installed = append(out.installed, factor)
	}
	return out
}

// validKPoints checks a k-versus-mean-temperature list.
func validKPoints(c *errs, field string, pts [][2]float64) bool {
	if len(pts) < 1 || len(pts) > maxKPoints {
		c.add(field, "must have 1 to %d points [mean_temp_c, k_w_mk]", maxKPoints)
		return false
	}
	for j, pt := range pts {
		if pt[0] < -273 || pt[0] > 1200 {
			c.add(fmt.Sprintf("%s[%d][0]", field, j), "mean temperature must be between -273 and 1200 °C")
			return false
		}
		if pt[1] <= 0 || pt[1] > 10 {
			c.add(fmt.Sprintf("%s[%d][1]", field, j), "k must be greater than 0 and at most 10 W/m·K")
			return false
		}
		if j > 0 && pt[0] <= pts[j-1][0] {
			c.add(fmt.Sprintf("%s[%d][0]", field, j), "mean temperatures must be strictly increasing")
			return false
		}
	}
	return true
}

func kCurve(pts []catalog.KPoint) calc.KCurve {
	out := make(calc.KCurve, len(pts))
	for i, p := range pts {
		out[i] = calc.KPoint{MeanC: p.MeanC, K: p.K}
	}
	return out
}

func resolveSurface(l *line, r Resolver, c *errs) {
	in := l.in
	rangeCheck(c, "surface_emittance", in.SurfaceEmittance, 0, 1, "")
	rangeCheck(c, "bare_emittance", in.BareEmittance, 0, 1, "")
	rangeCheck(c, "surface_coeff_w_m2k", in.SurfaceCoeff, 1, 500, "W/m²·K")
	if in.Jacket != "" {
		j, ok := r.Jacket(in.Jacket)
		if !ok {
			c.add("jacket", "unknown jacket %q", in.Jacket)
		} else {
			l.jacket = &j
		}
	}
	switch {
	case in.SurfaceEmittance != nil:
		l.base.Emittance = *in.SurfaceEmittance
		if l.jacket != nil {
			l.assume("surface emittance %s given; it overrides the jacket's %s", fmtNum(*in.SurfaceEmittance), fmtNum(l.jacket.Emittance))
		}
	case l.jacket != nil:
		l.base.Emittance = l.jacket.Emittance
	case len(in.Layers) > 0 && in.SurfaceCoeff == nil:
		c.add("jacket", "give a jacket or surface_emittance for the insulated surface")
	}
	resolveRetarder(l, r, c)
	rangeCheck(c, "surface_absorptance", in.SurfaceAbsorptance, 0, 1, "")
	switch {
	case in.SurfaceAbsorptance != nil:
		l.base.SolarAbsorptance = *in.SurfaceAbsorptance
	case l.jacket != nil && l.jacket.SolarAbsorptance > 0 && len(in.Layers) > 0:
		l.base.SolarAbsorptance = l.jacket.SolarAbsorptance
	default:
		l.base.SolarAbsorptance = 0.9
	}
	l.personnel.absorptance = l.base.SolarAbsorptance
	if l.personnel.air.SolarWm2 > 0 {
		src := "given"
		switch {
		case in.SurfaceAbsorptance != nil:
		case l.jacket != nil && l.jacket.SolarAbsorptance > 0 && len(in.Layers) > 0:
			src = l.jacket.AbsorptanceSource
		default:
			src = "no absorptance known for this surface: a dark one assumed, the safe side (common practice)"
		}
		l.assumeText("solar absorptance " + fmtNum(l.base.SolarAbsorptance) + " of the outer surface for personnel protection: " + src)
	}
	if in.SurfaceCoeff != nil && len(in.Layers) == 0 {
		// A fixed coefficient on a bare line would be compared with a bare heat flow from
		// the correlations: the two would not agree. Refused rather than half applied.
		c.add("surface_coeff_w_m2k", "applies to the insulated surface only: give layers, or leave it out for a bare line")
		c.add("layers", "a bare line takes no surface_coeff_w_m2k (the bare surface uses the correlations)")
	}
	if in.SurfaceCoeff != nil {
		l.base.FixedCoeff = *in.SurfaceCoeff
		l.assume("fixed surface coefficient %s W/m²·K on the insulated surface (replaces convection and radiation)", fmtNum(*in.SurfaceCoeff))
	}

	// The bare comparison: same pipe, no insulation, correlations, bare emittance.
	l.bare = l.base
	l.bare.Layers = nil
	l.bare.FixedCoeff = 0
	switch {
	case in.BareEmittance != nil:
		l.bare.Emittance = *in.BareEmittance
	case in.Geometry == "pipe" && l.pipeMat.Slug != "":
		l.bare.Emittance = l.pipeMat.BareEmittance
		var buf [96]byte
		l.assumeText(words{buf[:0]}.s("bare emittance ").n(l.pipeMat.BareEmittance).s(" (").s(strings.ToLower(l.pipeMat.Name)).s(")").String())
	default:
		l.bare.Emittance = 0.9
		l.assume("bare emittance 0.9 (painted or oxidised sheet metal, common practice)")
	}
	if len(in.Layers) == 0 {
		l.base.Emittance = l.bare.Emittance
		if in.SurfaceEmittance != nil {
			l.base.Emittance = *in.SurfaceEmittance
			l.bare.Emittance = *in.SurfaceEmittance
		}
	}
}

func resolveRun(l *line, c *errs) {
	in := l.in
	positiveCheck(c, "length_m", in.LengthM, 100000, "m")
	rangeCheck(c, "fittings_equiv_length_m", in.FittingsEquivLengthM, 0, 100000, "m")
	positiveCheck(c, "area_m2", in.AreaM2, 1e6, "m²")
	if !l.shape.IsFlat() && in.AreaM2 != nil {
		c.add("area_m2", "applies to flat surfaces; for pipes and ducts give length_m")
	}
	if l.shape.IsFlat() {
		l.areaM2 = orDefault(in.AreaM2, 0)
		if in.LengthM != nil {
			c.add("length_m", "applies to pipes and ducts; for a flat surface give area_m2")
		}
		if in.FittingsEquivLengthM != nil {
			c.add("fittings_equiv_length_m", "applies to pipes and ducts")
		}
		if in.Flow != nil {
			c.add("flow", "applies to pipes and ducts")
		}
		return
	}
	if in.LengthM != nil {
		l.lengthM = *in.LengthM
		l.equivLengthM = l.lengthM + orDefault(in.FittingsEquivLengthM, 0)
	} else if in.FittingsEquivLengthM != nil {
		c.add("fittings_equiv_length_m", "needs length_m")
	}
	if in.Flow != nil {
		if in.Flow.MassFlowKgS == nil {
			c.add("flow.mass_flow_kg_s", "is required with flow")
		} else {
			positiveCheck(c, "flow.mass_flow_kg_s", in.Flow.MassFlowKgS, 10000, "kg/s")
		}
		rangeCheck(c, "flow.cp_j_kgk", in.Flow.CpJkgK, 100, 20000, "J/kg·K")
		if in.Flow.CpJkgK != nil && l.superheatK > 0 {
			c.add("flow.cp_j_kgk", "superheated steam takes its specific heat from IAPWS-IF97 region 2 along the run; leave it out")
		}
		if in.Flow.CpJkgK != nil {
			l.cpJkgK = *in.Flow.CpJkgK
		} else if cp, ok := defaultCp[l.fluid]; ok {
			l.cpJkgK = cp
			l.assume("specific heat of %s %s J/kg·K", l.fluid, fmtNum(cp))
		} else if l.fluid != "steam" {
			c.add("flow.cp_j_kgk", "is required for fluid %q", l.fluid)
		}
		if l.fluid == "steam" && l.steamAbsPa > 0 && l.superheatK == 0 {
			l.assume("saturated steam does not cool along the run: it condenses (flow is not used)")
		}
		if in.LengthM == nil {
			c.add("length_m", "is required with flow (the run's temperature change)")
		}
	}
}

func resolveCriteria(l *line, r Resolver, c *errs) {
	cr := Criteria{}
	if l.in.Criteria != nil {
		cr = *l.in.Criteria
	}
	k := &l.crit
	rangeCheck(c, "criteria.max_surface_temp_c", cr.MaxSurfaceTempC, 20, 200, "°C")
	rangeCheck(c, "criteria.dew_margin_k", cr.DewMarginK, 0, 20, "K")
	positiveCheck(c, "criteria.max_heat_flow_w_per_m", cr.MaxHeatFlowWPerM, 1e6, heatFlowUnit(l))
	positiveCheck(c, "criteria.max_temp_change_k", cr.MaxTempChangeK, 500, "K")
	positiveCheck(c, "criteria.freeze_hours", cr.FreezeHours, 8760, "h")
	rangeCheck(c, "criteria.maintain_temp_c", cr.MaintainTempC, 0.5, 300, "°C")
	rangeCheck(c, "criteria.heat_trace_factor", cr.HeatTraceFactor, 1, 3, "")
	if cr.MaxRetarderPermeancePerm != nil && (*cr.MaxRetarderPermeancePerm <= 0 || *cr.MaxRetarderPermeancePerm > 10) {
		c.add("criteria.max_retarder_permeance_perm", "must be greater than 0 and at most 10 perm")
	}
	if cr.FreezeFraction != nil && (*cr.FreezeFraction <= 0 || *cr.FreezeFraction > 1) {
		c.add("criteria.freeze_fraction", "must be greater than 0 and at most 1")
	}
	k.maxSurfaceC = orDefault(cr.MaxSurfaceTempC, 60)
	k.personnel = (cr.PersonnelProtection == nil || *cr.PersonnelProtection) && l.opC > k.maxSurfaceC
	switch cr.TouchExposure {
	case "", "industrial":
		if k.personnel && cr.MaxSurfaceTempC == nil {
			l.assume("personnel protection: surface at most 60 °C (industrial exposure, contact of a few seconds: common practice for metal jacketing, on the contact-burn basis of ASTM C1055)")
		}
	case "public":
		if cr.MaxSurfaceTempC == nil {
			c.add("criteria.max_surface_temp_c", "give the touch limit for areas used by the public or patients (lower than the industrial 60 °C; see ASTM C1055 and the local code)")
		}
		k.public = true
	default:
		c.add("criteria.touch_exposure", `must be "industrial" or "public"`)
	}
	k.dewMarginK = orDefault(cr.DewMarginK, 1)
	// Condensation is judged wherever the surface can reach the dew point plus margin: it
	// lies between the fluid and the colder of the air and the surroundings.
	k.condensation = (cr.Condensation == nil || *cr.Condensation) && l.condensation.humid() &&
		min(l.opC, l.condensation.air.TempC, l.condensation.air.SurroundingsC) < *l.condensation.dew+k.dewMarginK
	if (cr.Condensation == nil || *cr.Condensation) && !l.condensation.humid() && l.opC < l.condensation.air.TempC {
		l.warn("below-ambient line with no relative humidity or dew point given: condensation was not checked")
	}
	k.maxHeatFlow = cr.MaxHeatFlowWPerM
	k.maxTempChange = cr.MaxTempChangeK
	if k.maxTempChange != nil && (l.in.Flow == nil || l.in.LengthM == nil) {
		c.add("criteria.max_temp_change_k", "needs flow and length_m")
	}
	if k.maxTempChange != nil && l.fluid == "steam" && l.superheatK == 0 {
		c.add("criteria.max_temp_change_k", "saturated steam condenses instead of cooling; use max_heat_flow_w_per_m")
	}
	k.freezeHours = cr.FreezeHours
	k.freezeBasis = cr.FreezeBasis
	if k.freezeBasis == "" {
		k.freezeBasis = "onset"
	} else if k.freezeBasis != "onset" && k.freezeBasis != "fraction" {
		c.add("criteria.freeze_basis", `must be "onset" or "fraction"`)
	}
	k.freezeFraction = orDefault(cr.FreezeFraction, 0.25)
	k.freezeModel = cr.FreezeModel
	switch {
	case k.freezeModel == "":
		k.freezeModel = "handbook"
	case k.freezeModel != "handbook" && k.freezeModel != "full":
		c.add("criteria.freeze_model", `must be "handbook" or "full"`)
	case !l.shape.IsPipe():
		c.add("criteria.freeze_model", "applies to pipes (freeze times and heat tracing)")
	}
	k.maintainC = orDefault(cr.MaintainTempC, 5)
	k.maintainGiven = cr.MaintainTempC != nil
	if k.maintainGiven && l.in.Geometry != "" && !l.shape.IsPipe() {
		c.add("criteria.maintain_temp_c", "heat tracing applies to pipes")
	}
	if cr.HeatTraceFactor != nil && !k.maintainGiven && k.freezeHours == nil {
		c.add("criteria.heat_trace_factor", "applies with maintain_temp_c or freeze_hours (the heat-tracing load)")
	}
	k.heatTraceFactor = orDefault(cr.HeatTraceFactor, 1.2)
	if k.freezeHours != nil && l.fluid != "water" {
		c.add("criteria.freeze_hours", `applies to fluid "water"`)
	}
	if k.freezeHours != nil && !l.shape.IsPipe() {
		c.add("criteria.freeze_hours", "applies to water in pipes")
	}
	if cr.EnergyCode != "" {
		t, ok := r.CodeTable(cr.EnergyCode)
		switch {
		case !ok:
			c.add("criteria.energy_code", "unknown energy-code table %q", cr.EnergyCode)
		default:
			k.energyCode = &t
		}
	}
	k.economic = cr.Economic != nil && *cr.Economic

	switch l.in.ThicknessSeries {
	case "", "inch", "metric":
	default:
		c.add("thickness_series", `must be "inch" or "metric"`)
	}
	if len(l.in.ThicknessesMM) > maxCandidates {
		c.add("thicknesses_mm", "must have at most %d thicknesses", maxCandidates)
	}
	for i, t := range l.in.ThicknessesMM {
		if t <= 0 || t > maxThicknessMM {
			c.add(fmt.Sprintf("thicknesses_mm[%d]", i), "must be greater than 0 and at most %d mm", maxThicknessMM)
		}
	}
}

func resolveEconomics(l *line, c *errs) {
	e := l.in.Economics
	if e == nil {
		return
	}
	checkEconomics(e, "economics.", true, c)
	if len(e.InstalledCostPerM) > maxCandidates {
		c.add("economics.installed_cost_per_m", "must have at most %d entries", maxCandidates)
	}
	for i, cp := range e.InstalledCostPerM {
		p := func() string { return "economics.installed_cost_per_m[" + strconv.Itoa(i) + "]." } // named on error only
		if cp.ThicknessMM <= 0 || cp.ThicknessMM > maxThicknessMM {
			c.add(p()+"thickness_mm", "must be greater than 0 and at most %d mm", maxThicknessMM)
		}
		if cp.Cost < 0 || cp.Cost > 1e7 {
			c.add(p()+"cost", "must be between 0 and 10000000")
		}
	}
	checkCostPoints(e, c)
}

// resolveRetarder finds the build's vapour retarder: as given (a retarder jacket under
// the cover, the closed-cell outer layer, or none), else the jacket when it is one, else
// a closed-cell outer layer, else none.
func resolveRetarder(l *line, r Resolver, c *errs) {
	in := l.in
	v := in.VapourRetarder
	if v != "" && len(in.Layers) == 0 {
		c.add("vapour_retarder", "applies to an insulated line: give its layers")
		return
	}
	outerSlug := ""
	if n := len(in.Layers); n > 0 {
		outerSlug = in.Layers[n-1].Material
	}
	closed, isClosed := catalog.ClosedCellBySlug(outerSlug)
	outerPerm := func() float64 {
		t := in.Layers[len(in.Layers)-1].ThicknessMM
		if t == nil || *t <= 0 {
			return 0
		}
		return closed.PermIn / (*t / catalog.MMPerInch)
	}
	fromJacket := func(j catalog.Jacket, source string) {
		l.retarder = retarder{source: source, name: j.Name, perm: j.PermeancePerm, basis: "the jacket library's permeance"}
		if p := outerPerm(); isClosed && p > 0 && j.PermeancePerm > 0 {
			// Over a closed-cell layer the two resist vapour in series: 1/P = 1/P₁ + 1/P₂.
			l.retarder.name = j.Name + " over the closed-cell outer layer"
			l.retarder.perm = 1 / (1/j.PermeancePerm + 1/p)
			l.retarder.basis = "the jacket library's permeance in series with the layer's (" + closed.Source + ")"
		}
	}
	switch {
	case v == "none":
		l.retarder = retarder{source: "none"}
	case v == "insulation":
		if !isClosed {
			c.add("vapour_retarder", "the outer layer is not a closed-cell insulation that retards vapour by itself (flexible elastomeric, cellular glass): "+
				"give the film, facing or mastic under the cover")
			return
		}
		l.retarder = retarder{source: "insulation", name: "the closed-cell outer layer", perm: outerPerm(), basis: closed.Source}
	case v != "":
		j, ok := r.Jacket(v)
		switch {
		case !ok:
			c.add("vapour_retarder", "unknown retarder %q: a jacket, facing or mastic slug, \"insulation\" or \"none\"", v)
		case !j.VapourRetarder:
			c.add("vapour_retarder", "%s is not a vapour retarder", j.Name)
		default:
			source := "retarder"
			if in.Jacket == v {
				source = "jacket"
			}
			fromJacket(j, source)
		}
	case l.jacket != nil && l.jacket.VapourRetarder:
		fromJacket(*l.jacket, "jacket")
	case isClosed:
		l.retarder = retarder{source: "insulation", name: "the closed-cell outer layer", perm: outerPerm(), basis: closed.Source}
	default:
		l.retarder = retarder{source: "none"}
	}
}
