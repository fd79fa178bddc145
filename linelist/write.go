package linelist

import (
	"bytes"
	"encoding/csv"
	"io"
	"strconv"

	"lagwright/units"
)

// Record writes a row back as cells under the given header (as Header gives it, or as
// a file had it): the same column mapping Parse uses, so Parse(Record(row)) is the row
// again. Numbers are written in the header's unit with all their digits. A header
// cell that is not a known column gets "".
func Record(headers []string, r Row) []string {
	out := make([]string, len(headers))
	for i, h := range headers {
		name, unit, _ := splitHeader(h)
		ci, ok := byName[name]
		if !ok {
			continue
		}
		col := columns[ci]
		switch col.kind {
		case kText:
			out[i] = col.textOut(&r)
		case kCount:
			if n := *col.count(&r.Fittings); n != 0 {
				out[i] = strconv.Itoa(n)
			}
		case kQty:
			u, ok := findUnit(col, unit)
			v := col.numIn(&r.Input)
			if !ok || v == nil {
				continue
			}
			out[i] = formatQty(col, u, *v)
		}
	}
	return out
}

// formatQty writes an SI value in a header unit, with every digit (no rounding).
func formatQty(col column, u headerUnit, si float64) string {
	var x float64
	switch {
	case u.parse == "":
		x = si / u.factor
	default:
		one, _ := units.Parse(col.q, units.SI, "1 "+u.parse)
		zero, _ := units.Parse(col.q, units.SI, "0 "+u.parse)
		x = (si - zero) / (one - zero)
	}
	return strconv.FormatFloat(x, 'f', -1, 64)
}

// Write writes rows as CSV under headers (Header(sys) for a clean export).
func Write(w io.Writer, headers []string, rows []Row) error {
	cw := csv.NewWriter(w)
	if err := cw.Write(headers); err != nil {
		return err
	}
	for _, r := range rows {
		if err := cw.Write(Record(headers, r)); err != nil {
			return err
		}
	}
	cw.Flush()
	return cw.Error()
}

// Template is a line list with every column, its units in sys, and one example line:
// a heating hot water main in mineral fiber with an all-service jacket. It opens in a
// spreadsheet as it is (UTF-8 with a byte-order mark, so "°C" shows right).
func Template(sys units.System) []byte {
	ex := map[string][2]string{ // column → example value in SI, US
		"tag":              {"HW-101", "HW-101"},
		"service":          {"Heating hot water supply", "Heating hot water supply"},
		"location":         {"indoor", "indoor"},
		"exposure":         {"exposed", "exposed"},
		"geometry":         {"pipe", "pipe"},
		"orientation":      {"horizontal", "horizontal"},
		"pipe_size":        {"DN50", "NPS 2"},
		"pipe_schedule":    {"40", "40"},
		"pipe_material":    {"carbon_steel", "carbon_steel"},
		"length":           {"30", "100"},
		"elbows":           {"4", "4"},
		"tees":             {"1", "1"},
		"valves":           {"2", "2"},
		"valves_finish":    {"cover", "cover"},
		"cover_thickness":  {"50", "2"},
		"support_kind":     {"clamp", "clamp"},
		"fluid":            {"water", "water"},
		"system":           {"heating_hot_water", "heating_hot_water"},
		"operating_temp":   {"82", "180"},
		"mass_flow":        {"0.5", "4000"},
		"layer1_material":  {"mineral_fiber_pipe_c547_t1", "mineral_fiber_pipe_c547_t1"},
		"layer1_thickness": {"40", "1-1/2"},
		"jacket":           {"all_service_jacket", "all_service_jacket"},
		"max_surface_temp": {"50", "120"},
		"notes":            {"Example line: replace it with yours. Units are in the headers.", "Example line: replace it with yours. Units are in the headers."},
	}
	k := 0
	if sys == units.US {
		k = 1
	}
	hdr := Header(sys)
	row := make([]string, len(columns))
	for i, c := range columns {
		row[i] = ex[c.name][k]
	}
	var b bytes.Buffer
	b.WriteString("\uFEFF")
	cw := csv.NewWriter(&b)
	_ = cw.Write(hdr) // a bytes.Buffer does not fail
	_ = cw.Write(row)
	cw.Flush()
	return b.Bytes()
}
