package schedule

import (
	"fmt"
	"io"
	"strconv"
	"strings"
	"time"

	"lagwright/analysis"
	"lagwright/calc"
	"lagwright/catalog"
	"lagwright/units"
)

// Sheet is the calculation sheet of one line for the engineer of record: every input,
// the conditions each criterion used, the assumptions, the conductivity used per layer,
// the surface coefficients, the results, the compliance row, the methods and their
// sources, warnings and cautions. Values are written in the project's units.
type Sheet struct {
	Title         string
	Tag           string
	Project       string
	Client        string
	Site          string
	Units         units.System
	Date          time.Time
	MethodVersion string
	Sections      []Section // label/value sections: line, inputs, conditions, surface, results, sizing, compliance
	Layers        Table     // per layer: material, thickness, k used, mean and face temperatures
	Assumptions   []string
	Warnings      []string
	Cautions      []string
	Methods       []string
	Errors        []string // field errors that stopped the analysis
}

// Section is a titled list of label/value pairs.
type Section struct {
	Title string
	Rows  [][2]string
}

func (s *Section) add(label, value string) {
	if value != "" {
		s.Rows = append(s.Rows, [2]string{label, value})
	}
}

type fmtr struct{ sys units.System }

func (f fmtr) q(q units.Quantity, v float64) string { return units.FormatUnit(q, f.sys, v) }

func (f fmtr) p(q units.Quantity, v *float64) string {
	if v == nil {
		return ""
	}
	return f.q(q, *v)
}

// check writes a check's value in the sheet's units where the unit is one of them.
func (f fmtr) check(v float64, unit string) string {
	switch unit {
	case "°C":
		return f.q(units.Temp, v)
	case "K":
		return f.q(units.TempDiff, v)
	case "mm":
		return f.q(units.Length, v)
	case "W/m":
		return f.q(units.HeatFlowPerLength, v)
	case "W/m²":
		return f.q(units.HeatFlux, v)
	}
	return strconv.FormatFloat(v, 'f', -1, 64) + " " + unit
}

func num(v *float64, suffix string) string {
	if v == nil {
		return ""
	}
	return strconv.FormatFloat(*v, 'g', 6, 64) + suffix
}

func (f fmtr) air(a analysis.AirOut) string {
	s := "ambient " + f.q(units.Temp, a.AmbientTempC) + ", surroundings " + f.q(units.Temp, a.SurroundingsTempC) +
		", wind " + f.q(units.Speed, a.WindMS)
	if a.RelativeHumidityPct != nil {
		s += ", RH " + strconv.FormatFloat(*a.RelativeHumidityPct, 'f', -1, 64) + " %"
	}
	if a.DewPointC != nil {
		s += ", dew point " + f.q(units.Temp, *a.DewPointC)
	}
	if a.InitialTempC != nil {
		s += ", water initially at " + f.q(units.Temp, *a.InitialTempC)
	}
	return s
}

// BuildSheet makes the calculation sheet of one line.
func BuildSheet(p Project, l Line, r Resolver, date time.Time) Sheet {
	sys := p.Units
	if !sys.Valid() {
		sys = units.SI
	}
	f := fmtr{sys}
	in := l.Input
	sh := Sheet{
		Title: "Calculation sheet — " + l.Tag, Tag: l.Tag, Project: p.Name, Client: p.Client, Site: p.Site, Units: sys,
		Date: date.UTC(), MethodVersion: calc.MethodVersion, Methods: Methods, Errors: l.Errors,
	}
	row := buildRow(l, r)

	line := Section{Title: "Line"}
	line.add("Tag", l.Tag)
	line.add("Service", l.Service)
	line.add("Location", row.Location)
	line.add("Exposure", row.Exposure)
	line.add("Purpose", row.Purpose)
	line.add("Notes", l.Notes)

	inp := Section{Title: "Inputs"}
	inp.add("Geometry", strings.TrimSpace(in.Geometry+" "+in.Orientation+" "+in.Facing))
	inp.add("Pipe size", in.PipeSize)
	inp.add("Pipe schedule / type", in.PipeSchedule)
	inp.add("Pipe OD", f.p(units.Length, in.PipeODmm))
	if l.Output != nil && in.PipeODmm == nil {
		inp.add("Pipe OD (from size)", f.p(units.Length, l.Output.PipeODmm))
	}
	inp.add("Pipe wall", f.p(units.Length, in.PipeWallMM))
	inp.add("Pipe material", in.PipeMaterial)
	inp.add("Duct width", f.p(units.Length, in.DuctWidthMM))
	inp.add("Duct height", f.p(units.Length, in.DuctHeightMM))
	inp.add("Height", f.p(units.LongLength, in.HeightM))
	inp.add("Width", f.p(units.LongLength, in.WidthM))
	inp.add("Plate length", f.p(units.LongLength, in.PlateLengthM))
	inp.add("Plate width", f.p(units.LongLength, in.PlateWidthM))
	inp.add("Inside film coefficient", f.p(units.SurfaceCoeff, in.InnerCoeff))
	inp.add("Fluid", in.Fluid)
	inp.add("Operating temperature", f.p(units.Temp, in.OperatingTempC))
	inp.add("Steam pressure (gauge)", f.p(units.Pressure, in.SteamGaugePressureKPa))
	inp.add("Ambient temperature", f.p(units.Temp, in.AmbientTempC))
	inp.add("Surroundings temperature", f.p(units.Temp, in.SurroundingsTempC))
	inp.add("Wind", f.p(units.Speed, in.WindMS))
	inp.add("Relative humidity", num(in.RelativeHumidityPct, " %"))
	for i, ly := range in.Layers {
		var what string
		switch {
		case ly.Material != "":
			what = ly.Material
			if m, ok := r.Material(ly.Material); ok {
				what = m.Name
				if m.Spec != "" {
					what += " (" + m.Spec + ")"
				}
			}
		case ly.KWmK != nil:
			what = "k = " + f.q(units.Conductivity, *ly.KWmK)
		default:
			pts := make([]string, len(ly.KPoints))
			for k, pt := range ly.KPoints {
				pts[k] = f.q(units.Conductivity, pt[1]) + " at " + f.q(units.Temp, pt[0])
			}
			what = "k points: " + strings.Join(pts, "; ")
		}
		inp.add(fmt.Sprintf("Layer %d", i+1), what+", "+f.p(units.Length, ly.ThicknessMM))
	}
	inp.add("Jacket", row.Jacket)
	if row.Jacket != "" {
		inp.add("Jacket is a vapour retarder", yesNo(row.VapourRetarder))
	}
	inp.add("Surface emittance", num(in.SurfaceEmittance, ""))
	inp.add("Bare emittance", num(in.BareEmittance, ""))
	inp.add("Fixed surface coefficient", f.p(units.SurfaceCoeff, in.SurfaceCoeff))
	inp.add("Run length", f.p(units.LongLength, in.LengthM))
	inp.add("Surface area", f.p(units.Area, in.AreaM2))
	fit := l.Fittings
	if fit != (analysis.Fittings{}) {
		inp.add("Fittings", fittingCounts(fit))
	}
	inp.add("Fittings' equivalent length", f.p(units.LongLength, in.FittingsEquivLengthM))
	if fl := in.Flow; fl != nil {
		inp.add("Mass flow", f.p(units.MassFlow, fl.MassFlowKgS))
		inp.add("Specific heat", num(fl.CpJkgK, " J/kg·K"))
	}
	if c := in.Criteria; c != nil {
		inp.add("Personnel protection limit", f.p(units.Temp, c.MaxSurfaceTempC))
		inp.add("Dew-point margin", f.p(units.TempDiff, c.DewMarginK))
		inp.add("Maximum heat flow", f.p(units.HeatFlowPerLength, c.MaxHeatFlowWPerM))
		inp.add("Maximum temperature change", f.p(units.TempDiff, c.MaxTempChangeK))
		inp.add("Freeze protection time", num(c.FreezeHours, " h"))
		inp.add("Freeze basis", c.FreezeBasis)
		inp.add("Heat tracing maintains", f.p(units.Temp, c.MaintainTempC))
		inp.add("Energy code table", codeTableName(c.EnergyCode, l.Output))
	}
	if e := in.Economics; e != nil {
		cur := " " + e.CurrencyCode()
		if h := e.Heating; h != nil {
			inp.add("Heating: price per kWh bought", num(h.PricePerKWh, cur))
			inp.add("Heating: plant efficiency", num(h.Efficiency, ""))
			inp.add("Heating: hours per year", num(h.HoursPerYear, " h"))
			inp.add("Heating: CO2 per kWh bought", num(h.CO2KgPerKWh, " kg"))
		}
		if k := e.Cooling; k != nil {
			inp.add("Cooling: price per kWh of electricity", num(k.PricePerKWh, cur))
			inp.add("Cooling: COP", num(k.COP, ""))
			inp.add("Cooling: hours per year", num(k.HoursPerYear, " h"))
			inp.add("Cooling: CO2 per kWh of electricity", num(k.CO2KgPerKWh, " kg"))
		}
		inp.add("Discount rate", num(e.DiscountRate, ""))
		inp.add("Escalation rate", num(e.EscalationRate, ""))
	}
	sh.Sections = append(sh.Sections, line, inp)

	o := l.Output
	if o == nil {
		sh.Cautions = []string{analysis.Caution}
		return sh
	}
	cond := Section{Title: "Conditions used by each criterion"}
	cu := o.ConditionsUsed
	cond.add("Design (heat flow, surface temperature)", f.air(cu.Design))
	cond.add("Personnel protection", f.air(cu.Personnel))
	cond.add("Condensation control", f.air(cu.Condensation))
	if cu.Freeze != nil {
		cond.add("Freeze protection", f.air(*cu.Freeze))
	}
	cond.add("Economics", f.air(cu.Economics))

	surf := Section{Title: "Surface coefficients"}
	surf.add("Convection", f.q(units.SurfaceCoeff, o.SurfaceCoeff.Convection))
	surf.add("Radiation", f.q(units.SurfaceCoeff, o.SurfaceCoeff.Radiation))
	surf.add("Combined", f.q(units.SurfaceCoeff, o.SurfaceCoeff.Convection+o.SurfaceCoeff.Radiation))

	res := Section{Title: "Results"}
	res.add("Total insulation thickness", f.q(units.Length, o.InsulationMM))
	res.add("Insulation outside diameter", f.p(units.Length, o.OuterDiameterMM))
	if a := o.OuterAreaM2PerM; a != nil {
		if sys == units.US {
			res.add("Jacket area per length", strconv.FormatFloat(*a/units.Foot, 'f', 3, 64)+" ft²/ft")
		} else {
			res.add("Jacket area per length", strconv.FormatFloat(*a, 'f', 3, 64)+" m²/m")
		}
	}
	res.add("Equivalent length (run + fittings)", f.p(units.LongLength, o.EquivalentLengthM))
	res.add("Heat flow per length", f.p(units.HeatFlowPerLength, o.HeatFlowWPerM))
	res.add("Heat flux at the surface", f.q(units.HeatFlux, o.HeatFluxWm2))
	res.add("Heat flow per run", f.p(units.HeatFlow, o.HeatFlowW))
	res.add("Surface temperature", f.q(units.Temp, o.SurfaceTempC))
	res.add("Pipe surface temperature", f.q(units.Temp, o.PipeSurfaceC))
	for _, fc := range o.Faces {
		res.add("Face "+fc.Face, f.q(units.Temp, fc.SurfaceTempC)+", "+f.q(units.HeatFlowPerLength, fc.HeatFlowWPerM))
	}
	res.add("Bare heat flow per length", f.p(units.HeatFlowPerLength, o.BareHeatFlow))
	res.add("Bare surface temperature", f.q(units.Temp, o.BareSurfaceC))
	res.add("Insulation efficiency", num(o.EfficiencyPct, " %"))
	if o.DewPointC != nil {
		res.add(strings.ToUpper(o.DewPointKind[:1])+o.DewPointKind[1:], f.q(units.Temp, *o.DewPointC))
	}
	res.add("Condensation margin", f.p(units.TempDiff, o.CondensationMarginK))
	res.add("Outlet temperature", f.p(units.Temp, o.OutletTempC))
	res.add("Temperature change", f.p(units.TempDiff, o.TempChangeK))
	res.add("Steam saturation temperature", f.p(units.Temp, o.SteamSatTempC))
	res.add("Condensate", num(o.CondensateKgPerH, " kg/h"))
	res.add("Time to 0 °C (stagnant)", num(o.FreezeHoursTo0C, " h"))
	res.add("Time to freeze (stagnant)", num(o.FreezeHoursToFreeze, " h"))
	res.add("Heat tracing needed", f.p(units.HeatFlowPerLength, o.HeatTraceWPerM))

	chk := Section{Title: "Checks of the build as specified"}
	for _, c := range o.Checks {
		verdict, rel := "passes", "at most "
		if !c.Pass {
			verdict = "fails"
		}
		if c.Sense == "min" {
			rel = "at least "
		}
		chk.add(strings.ToUpper(c.Label[:1])+c.Label[1:], verdict+": "+f.check(c.Value, c.Unit)+", "+rel+f.check(c.Limit, c.Unit))
	}

	siz := Section{Title: "Sizing: thinnest available thickness per criterion"}
	crit := func(label string, v *float64) {
		if v != nil {
			siz.add(label, f.q(units.Length, *v))
		}
	}
	crit("Personnel protection", o.Sizing.PersonnelProtectionMM)
	crit("Condensation control", o.Sizing.CondensationMM)
	crit("Maximum heat flow", o.Sizing.MaxHeatFlowMM)
	crit("Maximum temperature change", o.Sizing.MaxTempChangeMM)
	crit("Freeze protection", o.Sizing.FreezeMM)
	crit("Energy code", o.Sizing.EnergyCodeMM)
	crit("Economic thickness", o.Sizing.EconomicMM)
	if o.Sizing.Governing != nil {
		gov := "no available build meets it"
		if o.Sizing.GoverningThicknessMM != nil {
			gov = f.p(units.Length, o.Sizing.GoverningThicknessMM)
		}
		siz.add("Governing", criterionName(*o.Sizing.Governing)+", "+gov)
	}
	if len(o.Sizing.LayersProposed) > 0 {
		var t []float64
		for _, lp := range o.Sizing.LayersProposed {
			t = append(t, lp.ThicknessMM)
		}
		siz.add("Proposed build-up", conv(f).thicknessText(t))
	}
	for _, u := range o.Sizing.Unmet {
		siz.add("Unmet", criterionName(u))
	}
	if len(siz.Rows) == 0 {
		siz.add("Criteria", "none applied to this line")
	}

	comp := Section{Title: "Energy-code compliance"}
	if ec := o.EnergyCode; ec != nil {
		comp.add("Table", ec.Table)
		comp.add("Edition", ec.Edition)
		comp.add("Row", ec.Row)
		comp.add("Column (nominal size, in)", ec.Column)
		comp.add("Required", yesNo(ec.Required))
		comp.add("Table thickness", f.p(units.Length, ec.TableThicknessMM))
		comp.add("k of the material at the row's mean rating temperature", f.p(units.Conductivity, ec.KAtMeanWmK))
		if len(ec.KRangeWmK) == 2 {
			comp.add("Row's k range", f.q(units.Conductivity, ec.KRangeWmK[0])+" – "+f.q(units.Conductivity, ec.KRangeWmK[1]))
		}
		comp.add("Corrected minimum thickness", f.p(units.Length, ec.CorrectedMM))
		comp.add("Specified thickness", f.q(units.Length, ec.SpecifiedMM))
		result := "FAIL"
		if ec.Pass {
			result = "PASS"
		}
		if !ec.Required {
			result = "no requirement"
		}
		comp.add("Result", result)
		comp.add("Source", ec.Source)
	} else {
		comp.add("Result", "not checked (no energy-code table selected for this line)")
	}
	sh.Sections = append(sh.Sections, cond, surf, res, chk)
	if fs := f.fittingsSection(o); len(fs.Rows) > 0 {
		sh.Sections = append(sh.Sections, fs)
	}
	sh.Sections = append(sh.Sections, siz, comp)

	c := conv(f)
	sh.Layers = Table{Columns: []Column{textCol("layer", "Layer", 5), textCol("material", "Material", 30),
		c.col("thickness", "Installed thickness", units.Length, 10), c.col("nominal", "Nominal thickness", units.Length, 10),
		{Key: "k", Title: "k used", Unit: units.Label(units.Conductivity, sys), Numeric: true, Decimals: 4, Width: 12},
		c.col("mean", "Mean temp.", units.Temp, 9), c.col("inner", "Inner face", units.Temp, 9), c.col("outer", "Outer face", units.Temp, 9)}}
	for i, ly := range o.Layers {
		name := ly.Material
		if m, ok := r.Material(ly.Material); ok {
			name = m.Name
		}
		if name == "" {
			name = "given k"
		}
		sh.Layers.Rows = append(sh.Layers.Rows, []Cell{text(strconv.Itoa(i + 1)), text(name),
			c.num(units.Length, ly.ThicknessMM), c.num(units.Length, ly.NominalThicknessMM),
			{IsNum: true, Num: round(units.FromSI(units.Conductivity, sys, ly.KUsed), 4)},
			c.num(units.Temp, ly.MeanTempC), c.num(units.Temp, ly.InnerTempC), c.num(units.Temp, ly.OuterTempC)})
	}
	sh.Assumptions = o.Assumptions
	sh.Warnings = o.Warnings
	sh.Cautions = o.Cautions
	if len(sh.Cautions) == 0 {
		sh.Cautions = []string{analysis.Caution}
	}
	return sh
}

// WriteSheetPDF writes a calculation sheet as a portrait A4 PDF with the engineer of
// record's block at the end; every page carries the caution and its page number.
func WriteSheetPDF(w io.Writer, sh Sheet) error {
	d := newPDF("P", "A4", sh.Title+" — "+sh.Project, strings.Join(sh.Cautions, " "))
	d.AddPage()
	d.SetFont(pdfFont, "B", 14)
	d.CellFormat(0, 8, sh.Title, "", 1, "L", false, 0, "")
	d.keyValues([][2]string{{"Project", sh.Project}, {"Client", sh.Client}, {"Site", sh.Site},
		{"Date", sh.Date.Format("2006-01-02")}, {"Method version", sh.MethodVersion}}, 60)
	d.Ln(2)
	if len(sh.Errors) > 0 {
		d.list("Not computed: the input has errors", sh.Errors)
	}
	for _, s := range sh.Sections {
		if d.GetY()+14 > d.bottom {
			d.AddPage()
		}
		d.SetFont(pdfFont, "B", 10)
		d.CellFormat(0, 6, s.Title, "", 1, "L", false, 0, "")
		d.keyValues(s.Rows, 60)
		d.Ln(2)
		if s.Title == "Conditions used by each criterion" && len(sh.Layers.Rows) > 0 {
			d.tableSection("Layers: conductivity used (each at its own mean temperature)", sh.Layers, 7.5, 2)
		}
	}
	d.list("Assumptions", sh.Assumptions)
	d.list("Warnings", sh.Warnings)
	d.list("Methods and sources", sh.Methods)
	d.list("Cautions", sh.Cautions)
	if d.GetY()+45 > d.bottom {
		d.AddPage()
	}
	d.SetFont(pdfFont, "B", 10)
	d.CellFormat(0, 6, "Engineer of record", "", 1, "L", false, 0, "")
	d.SetFont(pdfFont, "", 9)
	for _, label := range []string{"Name", "Licence no. and jurisdiction", "Signature", "Date"} {
		d.CellFormat(55, 9, label, "", 0, "L", false, 0, "")
		x, y := d.GetX(), d.GetY()
		d.Line(x, y+7, x+100, y+7)
		d.Ln(9)
	}
	if err := d.Error(); err != nil {
		return fmt.Errorf("pdf: %w", err)
	}
	return d.Output(w)
}

// fittingCounts writes a line's fitting counts: "4 elbows, 2 valves".
func fittingCounts(f analysis.Fittings) string {
	var parts []string
	for _, k := range catalog.FittingKinds {
		if n := f.Count(k); n > 0 {
			name := catalog.FittingKindName(k)
			if n != 1 {
				name += "s"
			}
			parts = append(parts, strconv.Itoa(n)+" "+name)
		}
	}
	return strings.Join(parts, ", ")
}

// fittingsSection shows each fitting kind with its finish and heat, the straight run's
// heat, and the supports with theirs.
func (f fmtr) fittingsSection(o *analysis.Output) Section {
	sec := Section{Title: "Fittings and supports"}
	if o.StraightRunHeatW != nil && (len(o.Fittings) > 0 || o.Supports != nil) {
		sec.add("Straight run", f.q(units.HeatFlow, *o.StraightRunHeatW))
	}
	for _, fo := range o.Fittings {
		name := catalog.FittingKindName(fo.Kind)
		label := strconv.Itoa(fo.Count) + " × " + name + ", " + conv(f).finishName(fo.Finish, nil)
		v := f.q(units.LongLength, fo.EquivLengthM) + " equivalent length each"
		if fo.BareAreaM2 != nil {
			v += ", bare surface " + f.q(units.Area, *fo.BareAreaM2) + " each"
		}
		if fo.HeatW != nil {
			v += "; heat " + f.q(units.HeatFlow, *fo.HeatW)
		}
		sec.add(strings.ToUpper(label[:1])+label[1:], v)
	}
	if w, ok := o.FittingsHeatW["fittings_equiv_length"]; ok {
		sec.add("Insulated fittings (equivalent length given)", f.q(units.HeatFlow, w))
	}
	if sp := o.Supports; sp != nil {
		v := strconv.Itoa(sp.Count) + " × " + supportKindText(sp.Kind, sp.Count) + " at " + f.q(units.LongLength, sp.SpacingM) + " spacing"
		if sp.HeatW != nil {
			v += "; heat " + f.q(units.HeatFlow, *sp.HeatW)
			if sp.HeatEachW != nil {
				v += " (" + f.q(units.HeatFlow, *sp.HeatEachW) + " each)"
			}
		} else {
			v += "; counted for the bid (heat not modelled above the ambient)"
		}
		sec.add("Supports", v)
		if sp.ClampCondensationMarginK != nil && sp.ClampSurfaceTempC != nil {
			sec.add("Bare clamp: surface and margin to the dew point", f.q(units.Temp, *sp.ClampSurfaceTempC)+", "+f.q(units.TempDiff, *sp.ClampCondensationMarginK))
		}
	}
	return sec
}

// codeTableName is an energy-code table as a reader cites it ("ASHRAE/IES Standard 90.1
// minimum pipe insulation thickness (90.1-2016)"), not its identifier: from the answer
// (which names custom tables too), else the catalog.
func codeTableName(id string, o *analysis.Output) string {
	if id == "" {
		return ""
	}
	if o != nil && o.EnergyCode != nil && o.EnergyCode.Table != "" {
		if o.EnergyCode.Edition == "" {
			return o.EnergyCode.Table
		}
		return o.EnergyCode.Table + " (" + o.EnergyCode.Edition + ")"
	}
	if t, ok := catalog.CodeTableByID(id); ok {
		return t.Title()
	}
	return id
}
