package catalog

import "math"

// CodeRow is one fluid-temperature row of an energy-code minimum pipe insulation table.
//
// The published tables print integer °F ranges with inclusive edges ("105–140", "141–200"),
// which leaves gaps for real temperatures (140 < T < 141). Lagwright treats the rows as
// contiguous: a heating row's lower edge is exclusive of the previous row's upper edge
// (MinExclusive: 141–200 is stored as 140 < T ≤ 200), and "<40" is T < 40 (MaxExclusive).
// Contains applies the rule; Label keeps the printed range.
type CodeRow struct {
	Service      string  // "heating" | "cooling"
	Label        string  // the printed range, °F: "141–200", ">350", "<40"
	MinF, MaxF   float64 // fluid temperature range, °F, ±Inf for open ends
	MinExclusive bool    // MinF itself is not in the row
	MaxExclusive bool    // MaxF itself is not in the row
	KMin, KMax   float64 // conductivity range, Btu·in/(h·ft²·°F)
	MeanRatingF  float64 // mean rating temperature of the conductivity range, °F
	ThicknessIn  [5]float64
}

// Contains reports whether a fluid temperature in °F falls in the row.
func (r CodeRow) Contains(tF float64) bool {
	if math.IsNaN(tF) {
		return false
	}
	if tF < r.MinF || (r.MinExclusive && tF == r.MinF) {
		return false
	}
	if tF > r.MaxF || (r.MaxExclusive && tF == r.MaxF) {
		return false
	}
	return true
}

// CodeColumn is one nominal pipe size column: MinNominalIn ≤ nominal < MaxNominalIn.
type CodeColumn struct {
	Label                      string
	MinNominalIn, MaxNominalIn float64
}

// Systems are the building and process systems a line can serve (the calc JSON's
// `system`); a code table names the ones it covers.
var Systems = []string{"heating_hot_water", "steam_condensate", "domestic_hot_water", "domestic_cold_water",
	"chilled_water", "brine", "refrigerant", "process", "supply_air", "return_air", "exhaust"}

// IsSystem reports whether s is one of Systems.
func IsSystem(s string) bool {
	for _, x := range Systems {
		if x == s {
			return true
		}
	}
	return false
}

// CodeTable is an energy-code minimum pipe insulation table.
type CodeTable struct {
	ID, Name, Edition string
	Jurisdiction      string        // where the edition is adopted, as the user notes it
	Kind              string        // "pipe" (thickness by temperature row × size column) | "duct"
	Systems           []string      // the systems the table covers (see Systems)
	Columns           [5]CodeColumn // <1, 1–<1½, 1½–<4, 4–<8, ≥8
	Rows              []CodeRow
	// RefEnd names the end of a row's conductivity range used as k in the correction
	// T = r[(1 + t/r)^(K/k) − 1]: "upper" or "lower".
	RefEnd    string
	Footnotes []CodeFootnote // reductions the table's footnotes allow, as named options
	Source    string
}

// CodeFootnote is a reduction a table's footnotes allow (runouts, piping within
// conditioned space …): a short name and the footnote's text.
type CodeFootnote struct {
	Name, Text string
}

// RefK returns the conductivity (Btu·in/(h·ft²·°F)) that the table's correction uses as k
// for a row: KMax when RefEnd is "upper", KMin when it is "lower".
func (t CodeTable) RefK(r CodeRow) float64 {
	if t.RefEnd == "lower" {
		return r.KMin
	}
	return r.KMax
}

var inf = math.Inf(1)

var codeTables = []CodeTable{
	{
		ID:           "ashrae-90.1-2016",
		Name:         "ASHRAE/IES Standard 90.1 minimum pipe insulation thickness",
		Edition:      "90.1-2016",
		Jurisdiction: "where ASHRAE/IES 90.1-2016 (or a code adopting it) is in force",
		Kind:         "pipe",
		// Section 6.8.3 covers heating and service hot water piping and cooling piping
		// (chilled water, brine, refrigerant); domestic cold water and process piping are
		// outside its scope (common practice reading of the standard's scope, section 2).
		Systems: []string{"heating_hot_water", "steam_condensate", "domestic_hot_water", "chilled_water", "brine", "refrigerant"},
		Columns: [5]CodeColumn{
			{"<1", 0, 1},
			{"1 to <1-1/2", 1, 1.5},
			{"1-1/2 to <4", 1.5, 4},
			{"4 to <8", 4, 8},
			{"≥8", 8, inf},
		},
		Rows: []CodeRow{
			// Heating systems (Table 6.8.3-1).
			{Service: "heating", Label: ">350", MinF: 350, MaxF: inf, MinExclusive: true,
				KMin: 0.32, KMax: 0.34, MeanRatingF: 250, ThicknessIn: [5]float64{4.5, 5, 5, 5, 5}},
			// k range 0.29–0.31 in the secondary source read; 0.29–0.32 from memory — verify.
			{Service: "heating", Label: "251–350", MinF: 250, MaxF: 350, MinExclusive: true,
				KMin: 0.29, KMax: 0.31, MeanRatingF: 200, ThicknessIn: [5]float64{3, 4, 4.5, 4.5, 4.5}},
			{Service: "heating", Label: "201–250", MinF: 200, MaxF: 250, MinExclusive: true,
				KMin: 0.27, KMax: 0.30, MeanRatingF: 150, ThicknessIn: [5]float64{2.5, 2.5, 2.5, 3, 3}},
			{Service: "heating", Label: "141–200", MinF: 140, MaxF: 200, MinExclusive: true,
				KMin: 0.25, KMax: 0.29, MeanRatingF: 125, ThicknessIn: [5]float64{1.5, 1.5, 2, 2, 2}},
			{Service: "heating", Label: "105–140", MinF: 105, MaxF: 140,
				KMin: 0.22, KMax: 0.28, MeanRatingF: 100, ThicknessIn: [5]float64{1, 1, 1.5, 1.5, 1.5}},
			// Cooling systems (Table 6.8.3-2).
			{Service: "cooling", Label: "40–60", MinF: 40, MaxF: 60,
				KMin: 0.21, KMax: 0.27, MeanRatingF: 75, ThicknessIn: [5]float64{0.5, 0.5, 1, 1, 1}},
			{Service: "cooling", Label: "<40", MinF: math.Inf(-1), MaxF: 40, MaxExclusive: true,
				KMin: 0.20, KMax: 0.26, MeanRatingF: 50, ThicknessIn: [5]float64{0.5, 1, 1, 1, 1.5}},
		},
		RefEnd: "upper",
		Source: "ASHRAE 90.1-2016 Tables 6.8.3-1/-2, reproduced from a secondary source — verify against the " +
			"adopted code. The thickness correction takes k at the upper end of the row's range, " + labelMemory +
			"; one state code uses the lower end. The 251–350 °F row's k range is 0.29–0.31 in the source read " +
			"and 0.29–0.32 as recalled. Rows are contiguous: each heating row's lower edge is exclusive of the " +
			"previous row's upper edge; no requirement between 60 and 105 °F. Footnotes (reductions in " +
			"partitions within conditioned space and for direct-buried piping) not reproduced",
	},
}

func (t CodeTable) clone() CodeTable {
	t.Rows = append([]CodeRow(nil), t.Rows...)
	t.Systems = append([]string(nil), t.Systems...)
	t.Footnotes = append([]CodeFootnote(nil), t.Footnotes...)
	return t
}

// Covers reports whether the table applies to a system. An empty system is covered: the
// line did not say, and the table applies by temperature alone.
func (t CodeTable) Covers(system string) bool {
	if system == "" {
		return true
	}
	for _, s := range t.Systems {
		if s == system {
			return true
		}
	}
	return false
}

// Title names the table as a reader cites it: name and edition, never the id.
func (t CodeTable) Title() string {
	if t.Edition == "" {
		return t.Name
	}
	return t.Name + " (" + t.Edition + ")"
}

// CodeTables returns every energy-code table.
func CodeTables() []CodeTable {
	out := make([]CodeTable, len(codeTables))
	for i, t := range codeTables {
		out[i] = t.clone()
	}
	return out
}

// CodeTableByID finds an energy-code table by its ID ("ashrae-90.1-2016").
func CodeTableByID(id string) (CodeTable, bool) {
	for _, t := range codeTables {
		if t.ID == id {
			return t.clone(), true
		}
	}
	return CodeTable{}, false
}

// Lookup finds the row for a fluid temperature (°C, converted to °F exactly and rounded to
// 1e-6 °F so that a temperature entered in °F and stored in °C lands on its printed edge) and
// the column for a nominal pipe size (in). required is false, with row nil and indices −1,
// where no row applies (between the cooling and heating ranges, 60–105 °F, or a temperature
// that is not a number). col is −1 when nominalIn is negative or not a number; row is still
// returned then.
func (t CodeTable) Lookup(fluidC, nominalIn float64) (row *CodeRow, rowIndex, col int, required bool) {
	tF := math.Round(CToF(fluidC)*1e6) / 1e6
	rowIndex = -1
	for i := range t.Rows {
		if t.Rows[i].Contains(tF) {
			rowIndex = i
			break
		}
	}
	if rowIndex < 0 {
		return nil, -1, -1, false
	}
	r := t.Rows[rowIndex]
	col = -1
	for j, c := range t.Columns {
		if nominalIn >= c.MinNominalIn && nominalIn < c.MaxNominalIn {
			col = j
			break
		}
	}
	return &r, rowIndex, col, true
}
