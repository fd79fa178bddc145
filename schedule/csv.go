package schedule

import (
	"bufio"
	"encoding/csv"
	"io"
	"strings"
)

// WriteCSV writes the schedule as CSV in its units: a header block of label/value
// pairs (project, revision, design conditions, allowances, methods, cautions), a blank
// line, the schedule table with units in its column headings, a blank line, and the
// totals by material × size × thickness, by jacket, and the grand totals.
//
// Text cells that a spreadsheet would read as a formula (starting with = + - @, tab or
// carriage return) are neutralised with a leading single quote; numbers are written as
// plain numbers.
func WriteCSV(w io.Writer, s Schedule) error {
	bw := bufio.NewWriterSize(w, 64<<10)
	cw := csv.NewWriter(bw)
	v := NewView(s)
	rec := make([]string, 0, 40)
	put := func(fields ...string) {
		rec = rec[:0]
		for _, f := range fields {
			rec = append(rec, SafeText(f))
		}
		_ = cw.Write(rec) // errors surface through cw.Error
	}
	put("Insulation schedule")
	for _, kv := range v.Conditions {
		put(kv[0], kv[1])
	}
	for _, m := range v.Header.Methods {
		put("Method", m)
	}
	for _, c := range v.Header.Cautions {
		put("Caution", c)
	}
	put()
	writeTable := func(t Table) {
		rec = rec[:0]
		for _, c := range t.Columns {
			rec = append(rec, SafeText(c.Heading()))
		}
		_ = cw.Write(rec)
		for _, row := range t.Rows {
			rec = rec[:0]
			for i, cell := range row {
				if cell.IsNum {
					rec = append(rec, cell.String(t.Columns[i].Decimals))
				} else {
					rec = append(rec, SafeText(cell.Text))
				}
			}
			_ = cw.Write(rec)
		}
	}
	writeTable(v.Rows)
	put()
	put("Totals by material, size and thickness")
	writeTable(v.ByMaterial)
	put()
	put("Fittings and supports by material, size and thickness")
	writeTable(v.Items)
	put()
	put("Totals by jacket")
	writeTable(v.ByJacket)
	put()
	put("Grand totals")
	writeTable(v.Grand)
	cw.Flush()
	if err := cw.Error(); err != nil {
		return err
	}
	return bw.Flush()
}

// SafeText neutralises a text cell that a spreadsheet would run as a formula: one
// starting with =, +, -, @, a tab or a carriage return gets a leading single quote.
func SafeText(s string) string {
	if s != "" && strings.ContainsRune("=+-@\t\r", rune(s[0])) {
		return "'" + s
	}
	return s
}
