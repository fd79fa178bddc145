package schedule

import (
	"math"
	"slices"
	"strconv"
	"strings"

	"lagwright/analysis"
	"lagwright/catalog"
	"lagwright/units"
)

// Cell is one shown value: a number (Num, rounded to its column's decimals) or text.
// A number cell with Blank set is empty (the value does not apply).
type Cell struct {
	Text  string
	Num   float64
	IsNum bool
	Blank bool
}

// String writes the cell as shown.
func (c Cell) String(decimals int) string {
	switch {
	case c.Blank:
		return ""
	case c.IsNum:
		return strconv.FormatFloat(c.Num, 'f', decimals, 64)
	}
	return c.Text
}

// Display writes the cell as a page or PDF shows it: numbers with their thousands
// grouped by a narrow no-break space ("16 079.03"), so large quantities read at a
// glance and never break across lines. The CSV and XLSX exports keep plain numbers
// (String).
func (c Cell) Display(decimals int) string {
	s := c.String(decimals)
	if !c.IsNum || c.Blank {
		return s
	}
	return GroupThousands(s)
}

// ThousandsSep is the thousands separator of Display: U+202F NARROW NO-BREAK SPACE, the
// SI brochure's thin space that never breaks a number.
const ThousandsSep = "\u202f"

// GroupThousands puts ThousandsSep between the thousands of a plain formatted number of
// 4 or more integer digits ("2204" → "2 204", "-16079.03" → "-16 079.03"); anything else
// is returned as it is.
func GroupThousands(s string) string {
	intPart, frac, hasFrac := strings.Cut(s, ".")
	sign := ""
	if strings.HasPrefix(intPart, "-") {
		sign, intPart = "-", intPart[1:]
	}
	if len(intPart) < 4 || strings.Trim(intPart, "0123456789") != "" {
		return s
	}
	var b strings.Builder
	b.WriteString(sign)
	for i := range len(intPart) {
		if i > 0 && (len(intPart)-i)%3 == 0 {
			b.WriteString(ThousandsSep)
		}
		b.WriteByte(intPart[i])
	}
	if hasFrac {
		b.WriteString("." + frac)
	}
	return b.String()
}

// Column is one column of a shown table.
type Column struct {
	Key      string
	Title    string
	Unit     string // "" for text and counts
	Numeric  bool
	Decimals int
	Width    float64 // in characters, for XLSX and PDF
}

// Heading is the column title with its unit: "Length (ft)".
func (c Column) Heading() string {
	if c.Unit == "" {
		return c.Title
	}
	return c.Title + " (" + c.Unit + ")"
}

// Table is a shown table: columns and rows of cells, in the display units.
type Table struct {
	Columns []Column
	Rows    [][]Cell
}

// View is a schedule converted to its display units: the rows and the totals as
// tables, and the header as label/value pairs. Totals are summed from the shown
// (rounded) row values, so each total equals the sum of its rows as printed.
type View struct {
	Header     Header
	Conditions [][2]string // label, value
	Rows       Table
	ByMaterial Table
	Items      Table // fittings by kind and finish, and supports, by material × size × thickness
	ByJacket   Table
	Grand      Table
}

func round(x float64, d int) float64 {
	p := math.Pow(10, float64(d))
	r := math.Round(x*p) / p
	if r == 0 {
		return 0 // no negative zero
	}
	return r
}

func text(s string) Cell { return Cell{Text: s} }

func blank() Cell { return Cell{IsNum: true, Blank: true} }

// conv converts and rounds an SI value for display.
type conv struct{ sys units.System }

func (c conv) decimals(q units.Quantity) int {
	us := c.sys == units.US
	switch q {
	case units.Length: // mm 1 decimal; inches to 1/1000 (1/8 in fractions are exact)
		if us {
			return 3
		}
		return 1
	case units.LongLength:
		return 1
	case units.Area:
		return 2
	case units.Volume:
		if us {
			return 2
		}
		return 3
	case units.Temp:
		return 1
	case units.HeatFlow:
		return 0
	case units.HeatFlowPerLength:
		return 1
	}
	return 2
}

func (c conv) num(q units.Quantity, v float64) Cell {
	return Cell{IsNum: true, Num: round(units.FromSI(q, c.sys, v), c.decimals(q))}
}

func (c conv) opt(q units.Quantity, v *float64) Cell {
	if v == nil || math.IsNaN(*v) || math.IsInf(*v, 0) {
		return blank()
	}
	return c.num(q, *v)
}

func (c conv) col(key, title string, q units.Quantity, width float64) Column {
	return Column{Key: key, Title: title, Unit: units.Label(q, c.sys), Numeric: true, Decimals: c.decimals(q), Width: width}
}

func count(key, title string, width float64) Column {
	return Column{Key: key, Title: title, Numeric: true, Width: width}
}

func textCol(key, title string, width float64) Column {
	return Column{Key: key, Title: title, Width: width}
}

func yesNo(b bool) string {
	if b {
		return "yes"
	}
	return "no"
}

// thicknessText writes the layers: "2 in" or "2 × 1-1/2 in" or "25 + 50 mm".
func (c conv) thicknessText(layers []float64) string {
	if len(layers) == 0 {
		return ""
	}
	same := true
	for _, t := range layers {
		if math.Abs(t-layers[0]) > 0.005 {
			same = false
		}
	}
	l := units.Label(units.Length, c.sys)
	if same && len(layers) > 1 {
		return strconv.Itoa(len(layers)) + " × " + units.Format(units.Length, c.sys, layers[0]) + " " + l
	}
	parts := make([]string, len(layers))
	for i, t := range layers {
		parts[i] = units.Format(units.Length, c.sys, t)
	}
	return strings.Join(parts, " + ") + " " + l
}

// RowColumns are the schedule's columns in sys.
func RowColumns(sys units.System) []Column {
	c := conv{sys}
	return []Column{
		textCol("tag", "Tag", 10),
		textCol("service", "Service", 18),
		textCol("purpose", "Purpose", 16),
		textCol("location", "Location", 8),
		textCol("exposure", "Exposure", 9),
		textCol("size", "Size", 12),
		c.col("od", "Pipe OD", units.Length, 8),
		c.col("length", "Length", units.LongLength, 8),
		count("elbows", "Elbows", 6),
		count("tees", "Tees", 5),
		count("valves", "Valves", 6),
		count("flange_pairs", "Flange pairs", 7),
		count("caps", "Caps", 5),
		count("strainers", "Strainers", 6),
		count("reducers", "Reducers", 6),
		textCol("fitting_finish", "Fittings not insulated", 16),
		count("supports", "Supports", 6),
		textCol("support_kind", "Support kind", 10),
		c.col("fittings_length", "Fittings equiv. length", units.LongLength, 9),
		c.col("insulated_length", "Insulated length", units.LongLength, 9),
		c.col("area", "Surface area", units.Area, 8),
		textCol("material", "Material", 26),
		textCol("spec", "Specification", 18),
		count("layers", "Layers", 6),
		textCol("build_up", "Layer build-up", 12),
		c.col("thickness", "Total thickness", units.Length, 9),
		textCol("jacket", "Jacket", 24),
		textCol("vapour_retarder", "Vapour retarder", 8),
		c.col("outer_diameter", "Insulation OD", units.Length, 9),
		c.col("jacket_area", "Jacket area incl. laps", units.Area, 10),
		c.col("volume", "Insulation volume", units.Volume, 9),
		c.col("heat_flow", "Heat flow per run", units.HeatFlow, 10),
		c.col("surface_temp", "Surface temp.", units.Temp, 8),
		textCol("governing", "Governing criterion", 18),
		textCol("energy_code", "Energy code", 9),
		c.col("heat_trace", "Heat tracing", units.HeatFlowPerLength, 8),
		textCol("notes", "Notes", 40),
	}
}

// cells writes one row in sys, in the order of RowColumns.
func (c conv) cells(r Row) []Cell {
	odCell := blank()
	if r.Geometry == "pipe" {
		odCell = c.opt(units.Length, r.PipeODmm)
	}
	supports := blank()
	if r.Supports > 0 {
		supports = intCell(r.Supports)
	}
	fitLen := blank()
	if r.LengthM != nil {
		fitLen = c.num(units.LongLength, r.FittingsM)
	}
	var nLayers Cell
	if r.Error && len(r.Layers) == 0 {
		nLayers = blank()
	} else {
		nLayers = Cell{IsNum: true, Num: float64(len(r.Layers))}
	}
	thick := c.num(units.Length, r.ThicknessMM)
	if r.Error && r.ThicknessMM <= 0 {
		thick = blank()
	}
	vr := ""
	if r.Jacket != "" {
		vr = yesNo(r.VapourRetarder)
	}
	return []Cell{
		text(r.Tag), text(r.Service), text(r.Purpose), text(r.Location), text(r.Exposure),
		text(r.SizeText(c.sys)), odCell,
		c.opt(units.LongLength, r.LengthM),
		intCell(r.Fittings.Elbows), intCell(r.Fittings.Tees), intCell(r.Fittings.Valves),
		intCell(r.Fittings.FlangePairs), intCell(r.Fittings.Caps), intCell(r.Fittings.Strainers), intCell(r.Fittings.Reducers),
		text(c.finishText(r)), supports, text(supportKindText(r.SupportKind, r.Supports)),
		fitLen,
		c.opt(units.LongLength, r.InsulatedM),
		c.opt(units.Area, r.SurfaceAreaM2()),
		text(r.Material), text(r.Spec), nLayers, text(c.thicknessText(r.Layers)),
		thick,
		text(r.Jacket), text(vr),
		c.opt(units.Length, r.OuterDiameterMM),
		c.opt(units.Area, r.JacketAreaM2),
		c.opt(units.Volume, r.VolumeM3),
		c.opt(units.HeatFlow, r.HeatFlowW),
		c.opt(units.Temp, r.SurfaceC),
		text(r.Governing), text(r.EnergyCode),
		c.opt(units.HeatFlowPerLength, r.HeatTraceWPerM),
		text(c.notes(r)),
	}
}

// notes adds to a row's notes what depends on the display units.
func (c conv) notes(r Row) string {
	if r.InstalledMM == nil {
		return r.Notes
	}
	n := "blanket compressed to " + units.FormatUnit(units.Length, c.sys, *r.InstalledMM) + " installed"
	if r.Notes == "" {
		return n
	}
	return r.Notes + "; " + n
}

func intCell(n int) Cell { return Cell{IsNum: true, Num: float64(n)} }

// ColumnIndex returns the index of a column key in RowColumns (-1 when absent).
func ColumnIndex(key string) int {
	for i, c := range RowColumns(units.SI) {
		if c.Key == key {
			return i
		}
	}
	return -1
}

// NewView converts a schedule to its display units.
func NewView(s Schedule) View {
	sys := s.Header.Units
	if !sys.Valid() {
		sys = units.SI
	}
	c := conv{sys}
	v := View{Header: s.Header}
	v.Conditions = c.conditions(s.Header)
	v.Rows = Table{Columns: RowColumns(sys), Rows: make([][]Cell, len(s.Rows))}
	for i, r := range s.Rows {
		v.Rows.Rows[i] = c.cells(r)
	}
	v.ByMaterial, v.ByJacket, v.Grand = c.totals(s.Rows, v.Rows)
	v.Items = c.items(s.Rows, v.Rows)
	return v
}

// totals sums the shown row values: material × size × thickness, jacket, grand.
func (c conv) totals(rows []Row, shown Table) (Table, Table, Table) {
	ix := func(k string) int { return ColumnIndex(k) }
	iLen, iArea, iJA, iVol, iHF, iTh := ix("insulated_length"), ix("area"), ix("jacket_area"), ix("volume"), ix("heat_flow"), ix("thickness")
	iRun := ix("length")
	num := func(cells []Cell, i int) float64 {
		if cells[i].Blank {
			return 0
		}
		return cells[i].Num
	}
	lenCol := c.col("length", "Insulated length", units.LongLength, 10)
	areaCol := c.col("area", "Surface area", units.Area, 10)
	jaCol := c.col("jacket_area", "Jacket area incl. laps", units.Area, 12)
	volCol := c.col("volume", "Insulation volume", units.Volume, 11)
	lossCol := c.col("heat_loss", "Heat loss, hot lines", units.HeatFlow, 11)
	gainCol := c.col("heat_gain", "Heat gain, cold lines", units.HeatFlow, 11)
	linesCol := count("lines", "Lines", 6)

	mat := Table{Columns: []Column{textCol("material", "Material", 30), textCol("spec", "Specification", 20),
		textCol("size", "Size", 14), c.col("thickness", "Total thickness", units.Length, 10), linesCol,
		c.col("straight_length", "Straight length", units.LongLength, 10), lenCol, areaCol, jaCol, volCol}}
	jac := Table{Columns: []Column{textCol("jacket", "Jacket", 34), textCol("vapour_retarder", "Vapour retarder", 10), linesCol, jaCol}}
	grand := Table{Columns: []Column{textCol("total", "Total", 20), linesCol, lenCol, areaCol, jaCol, volCol, lossCol, gainCol}}

	type acc struct{ lines, length, area, ja, vol, run float64 }
	mIndex := map[string]int{}
	var mAcc []acc
	jIndex := map[string]int{}
	var jAcc []acc
	var g acc
	var loss, gain float64 // hot lines lose heat, cold lines gain it: two loads, never netted
	var mKeys []sizeOrder
	for i, r := range rows {
		cells := shown.Rows[i]
		a := acc{1, num(cells, iLen), num(cells, iArea), num(cells, iJA), num(cells, iVol), num(cells, iRun)}
		g.lines++
		g.length += a.length
		g.area += a.area
		g.ja += a.ja
		g.vol += a.vol
		if q := num(cells, iHF); q >= 0 {
			loss += q
		} else {
			gain -= q
		}
		if r.Material != "" {
			th := cells[iTh]
			sizeText := r.SizeText(c.sys)
			key := r.Material + "\x00" + sizeText + "\x00" + th.String(c.decimals(units.Length))
			k, ok := mIndex[key]
			if !ok {
				k = len(mAcc)
				mIndex[key] = k
				mAcc = append(mAcc, acc{})
				mat.Rows = append(mat.Rows, []Cell{text(r.Material), text(r.Spec), text(sizeText), th})
				mKeys = append(mKeys, sizeKey(sizeText))
			}
			m := &mAcc[k]
			m.lines++
			m.run += a.run
			m.length += a.length
			m.area += a.area
			m.ja += a.ja
			m.vol += a.vol
		}
		if r.Jacket != "" {
			k, ok := jIndex[r.Jacket]
			if !ok {
				k = len(jAcc)
				jIndex[r.Jacket] = k
				jAcc = append(jAcc, acc{})
				jac.Rows = append(jac.Rows, []Cell{text(r.Jacket), text(yesNo(r.VapourRetarder))})
			}
			jAcc[k].lines++
			jAcc[k].ja += a.ja
		}
	}
	dl, da, dv := c.decimals(units.LongLength), c.decimals(units.Area), c.decimals(units.Volume)
	for k := range mat.Rows {
		m := mAcc[k]
		mat.Rows[k] = append(mat.Rows[k], Cell{IsNum: true, Num: m.lines}, Cell{IsNum: true, Num: round(m.run, dl)},
			Cell{IsNum: true, Num: round(m.length, dl)}, Cell{IsNum: true, Num: round(m.area, da)},
			Cell{IsNum: true, Num: round(m.ja, da)}, Cell{IsNum: true, Num: round(m.vol, dv)})
	}
	for k := range jac.Rows {
		jac.Rows[k] = append(jac.Rows[k], Cell{IsNum: true, Num: jAcc[k].lines}, Cell{IsNum: true, Num: round(jAcc[k].ja, da)})
	}
	order := make([]int, len(mat.Rows))
	for k := range order {
		order[k] = k
	}
	slices.SortStableFunc(order, func(x, y int) int {
		return compareGroups(mat.Rows[x][0].Text, mKeys[x], mat.Rows[x][3].Num, mat.Rows[y][0].Text, mKeys[y], mat.Rows[y][3].Num)
	})
	sorted := make([][]Cell, len(order))
	for k, o := range order {
		sorted[k] = mat.Rows[o]
	}
	mat.Rows = sorted
	dh := c.decimals(units.HeatFlow)
	grand.Rows = [][]Cell{{text("All lines"), Cell{IsNum: true, Num: g.lines},
		Cell{IsNum: true, Num: round(g.length, dl)}, Cell{IsNum: true, Num: round(g.area, da)},
		Cell{IsNum: true, Num: round(g.ja, da)}, Cell{IsNum: true, Num: round(g.vol, dv)},
		Cell{IsNum: true, Num: round(loss, dh)}, Cell{IsNum: true, Num: round(gain, dh)}}}
	return mat, jac, grand
}

// RevisionText is "Rev 3" or "Draft (not issued)".
func (h Header) RevisionText() string {
	if h.Revision == 0 {
		return "Draft (not issued)"
	}
	return "Rev " + strconv.Itoa(h.Revision)
}

// conditions writes the header as label/value pairs in sys.
func (c conv) conditions(h Header) [][2]string {
	sys := c.sys
	unitName := "SI"
	if sys == units.US {
		unitName = "US customary"
	}
	loc := func(l Conditions) string {
		s := "ambient " + units.FormatUnit(units.Temp, sys, l.AmbientC)
		if l.SurroundingsC != nil {
			s += ", surroundings " + units.FormatUnit(units.Temp, sys, *l.SurroundingsC)
		}
		if l.RHPct != nil {
			s += ", RH " + strconv.FormatFloat(*l.RHPct, 'f', -1, 64) + " %"
		}
		if l.DewPointC != nil {
			s += ", dew point " + units.FormatUnit(units.Temp, sys, *l.DewPointC)
		}
		return s + ", wind " + units.FormatUnit(units.Speed, sys, l.WindMS)
	}
	ll := func(m float64) string { return units.FormatUnit(units.LongLength, sys, m) }
	out := [][2]string{
		{"Project", h.Project},
		{"Client", h.Client},
		{"Site", h.Site},
		{"Revision", h.RevisionText()},
		{"Date", h.Date.Format("2006-01-02")},
	}
	if h.Note != "" {
		out = append(out, [2]string{"Revision note", h.Note})
	}
	out = append(out,
		[2]string{"Units", unitName},
		[2]string{"Design conditions, indoor", loc(h.Indoor)},
		[2]string{"Design conditions, outdoor", loc(h.Outdoor)},
		[2]string{"Fitting allowances (equivalent length each)", h.fittingAllowancesText(ll)},
		[2]string{"Jacket area", "outer surface × insulated length + " + strconv.FormatFloat(h.LapWastePct, 'f', -1, 64) +
			" % for laps and waste"},
		[2]string{"Insulation volume", "installed cross-section × insulated length, no waste allowance"},
		[2]string{"Surface area", "surface under the insulation: π × pipe OD × insulated length (ducts: perimeter × insulated length; flat surfaces: their area)"},
		[2]string{"Method version", h.MethodVersion},
	)
	return out
}

// fittingAllowancesText says where the fittings' equivalent lengths came from: the
// built-in table by size, with the project's own allowances and rows named.
func (h Header) fittingAllowancesText(ll func(float64) string) string {
	var own []string
	for _, k := range catalog.FittingKinds {
		if v := h.Fittings.ByKind(k); v != nil {
			own = append(own, catalog.FittingKindName(k)+" "+ll(*v))
		}
	}
	s := catalog.FittingLengthBasis
	if len(own) > 0 {
		s += "; the project's allowance for every size: " + strings.Join(own, ", ")
	}
	if n := len(h.FittingTable); n > 0 {
		s += "; the project's table by size: " + strconv.Itoa(n) + " rows"
	}
	return s
}

// finishText lists the fitting kinds that are not insulated as the line: "valves
// bare; flange pairs removable cover 1 in".
func (c conv) finishText(r Row) string {
	var parts []string
	for _, k := range catalog.FittingKinds {
		if r.Fittings.Count(k) == 0 {
			continue
		}
		if f := r.Finish.Of(k); f != analysis.FinishInsulated {
			parts = append(parts, catalog.FittingKindName(k)+"s "+c.finishName(f, r.CoverMM))
		}
	}
	return strings.Join(parts, "; ")
}

// finishName writes a fitting finish in words, with a cover's own thickness.
func (c conv) finishName(f string, coverMM *float64) string {
	switch f {
	case analysis.FinishCover:
		if coverMM != nil {
			return "removable cover " + units.FormatUnit(units.Length, c.sys, *coverMM)
		}
		return "removable cover"
	case analysis.FinishBare:
		return "bare"
	}
	return f
}

// supportKindText writes a support kind for the bid.
func supportKindText(kind string, n int) string {
	switch {
	case n == 0:
		return ""
	case kind == analysis.SupportInsert:
		return "insert and shield"
	case kind == analysis.SupportClamp:
		return "clamp"
	}
	return kind
}

// items is the table of fittings by kind and finish and supports by kind, per
// material × size × thickness group (the groups of the material totals).
func (c conv) items(rows []Row, shown Table) Table {
	iTh := ColumnIndex("thickness")
	t := Table{Columns: []Column{textCol("material", "Material", 30), textCol("size", "Size", 14),
		c.col("thickness", "Total thickness", units.Length, 10), textCol("item", "Item", 14), textCol("finish", "Finish", 24),
		count("count", "Count", 8)}}
	type key struct{ mat, size, th, item, finish string }
	index := map[key]int{}
	var order []sizeOrder
	var items []string
	for i, r := range rows {
		mat := r.Material
		if mat == "" {
			mat = BareMaterial
		}
		th := shown.Rows[i][iTh]
		sizeText := r.SizeText(c.sys)
		for _, it := range rowItems(r) {
			name, finish := catalog.FittingKindName(it.Item)+"s", c.finishName(it.Finish, it.CoverMM)
			if it.Item == "supports" {
				name, finish = "supports", supportKindText(it.Finish, it.Count)
			}
			k := key{mat, sizeText, th.String(c.decimals(units.Length)), name, finish}
			j, ok := index[k]
			if !ok {
				j = len(t.Rows)
				index[k] = j
				t.Rows = append(t.Rows, []Cell{text(mat), text(sizeText), th, text(name), text(finish), intCell(0)})
				order = append(order, sizeKey(sizeText))
				items = append(items, it.Item)
			}
			t.Rows[j][5].Num += float64(it.Count)
		}
	}
	idx := make([]int, len(t.Rows))
	for i := range idx {
		idx[i] = i
	}
	slices.SortStableFunc(idx, func(x, y int) int {
		a, b := t.Rows[x], t.Rows[y]
		if cmp := compareGroups(a[0].Text, order[x], a[2].Num, b[0].Text, order[y], b[2].Num); cmp != 0 {
			return cmp
		}
		return itemOrder(items[x]) - itemOrder(items[y])
	})
	sorted := make([][]Cell, len(idx))
	for i, j := range idx {
		sorted[i] = t.Rows[j]
	}
	t.Rows = sorted
	return t
}
