package schedule

import (
	"fmt"
	"io"
	"strings"

	"github.com/xuri/excelize/v2"
)

// Sheet names of the XLSX export.
const (
	SheetSchedule   = "Schedule"
	SheetTotals     = "Totals"
	SheetConditions = "Conditions"
)

// xlsxStyles holds the styles of one workbook, each created once.
type xlsxStyles struct {
	head, title, text, wrap int
	num                     map[int]int // by decimals
}

func newXLSXStyles(f *excelize.File) (*xlsxStyles, error) {
	st := &xlsxStyles{num: map[int]int{}}
	var err error
	border := []excelize.Border{{Type: "bottom", Color: "555555", Style: 1}}
	if st.head, err = f.NewStyle(&excelize.Style{
		Font:      &excelize.Font{Bold: true},
		Fill:      excelize.Fill{Type: "pattern", Pattern: 1, Color: []string{"E8EDF2"}},
		Alignment: &excelize.Alignment{WrapText: true, Vertical: "top"},
		Border:    border,
	}); err != nil {
		return nil, err
	}
	if st.title, err = f.NewStyle(&excelize.Style{Font: &excelize.Font{Bold: true, Size: 12}}); err != nil {
		return nil, err
	}
	if st.text, err = f.NewStyle(&excelize.Style{Alignment: &excelize.Alignment{Vertical: "top"}}); err != nil {
		return nil, err
	}
	if st.wrap, err = f.NewStyle(&excelize.Style{Alignment: &excelize.Alignment{Vertical: "top", WrapText: true}}); err != nil {
		return nil, err
	}
	for d := 0; d <= 3; d++ {
		format := "0"
		if d > 0 {
			format += "." + strings.Repeat("0", d)
		}
		if st.num[d], err = f.NewStyle(&excelize.Style{CustomNumFmt: &format, Alignment: &excelize.Alignment{Vertical: "top"}}); err != nil {
			return nil, err
		}
	}
	return st, nil
}

// WriteXLSX writes the schedule as an XLSX workbook streamed sheet by sheet: "Schedule"
// (the rows, header row frozen, units in the headings, numbers as numbers with number
// formats), "Totals" (by material × size × thickness, by jacket, grand totals) and
// "Conditions" (project, revision, design conditions, allowances, methods, cautions).
func WriteXLSX(w io.Writer, s Schedule) error {
	f := excelize.NewFile()
	defer f.Close()
	st, err := newXLSXStyles(f)
	if err != nil {
		return fmt.Errorf("xlsx styles: %w", err)
	}
	if err := f.SetSheetName("Sheet1", SheetSchedule); err != nil {
		return err
	}
	for _, name := range []string{SheetTotals, SheetConditions} {
		if _, err := f.NewSheet(name); err != nil {
			return err
		}
	}
	v := NewView(s)
	if err := xlsxSchedule(f, st, v); err != nil {
		return fmt.Errorf("xlsx schedule sheet: %w", err)
	}
	if err := xlsxTotals(f, st, v); err != nil {
		return fmt.Errorf("xlsx totals sheet: %w", err)
	}
	if err := xlsxConditions(f, st, v); err != nil {
		return fmt.Errorf("xlsx conditions sheet: %w", err)
	}
	_, err = f.WriteTo(w)
	return err
}

func cellName(col, row int) string {
	n, _ := excelize.CoordinatesToCellName(col, row)
	return n
}

func (st *xlsxStyles) headRow(t Table) []any {
	out := make([]any, len(t.Columns))
	for i, c := range t.Columns {
		out[i] = excelize.Cell{StyleID: st.head, Value: c.Heading()}
	}
	return out
}

func (st *xlsxStyles) row(t Table, cells []Cell, out []any) []any {
	out = out[:0]
	for i, c := range cells {
		switch {
		case c.IsNum && c.Blank:
			out = append(out, nil)
		case c.IsNum:
			out = append(out, excelize.Cell{StyleID: st.num[t.Columns[i].Decimals], Value: c.Num})
		default:
			out = append(out, excelize.Cell{StyleID: st.text, Value: c.Text})
		}
	}
	return out
}

func xlsxSchedule(f *excelize.File, st *xlsxStyles, v View) error {
	sw, err := f.NewStreamWriter(SheetSchedule)
	if err != nil {
		return err
	}
	// Widths and panes before the first row.
	for i, c := range v.Rows.Columns {
		if err := sw.SetColWidth(i+1, i+1, c.Width+2); err != nil {
			return err
		}
	}
	if err := sw.SetPanes(&excelize.Panes{Freeze: true, XSplit: 1, YSplit: 1, TopLeftCell: "B2", ActivePane: "bottomRight"}); err != nil {
		return err
	}
	if err := sw.SetRow("A1", st.headRow(v.Rows), excelize.RowOpts{Height: 32}); err != nil {
		return err
	}
	buf := make([]any, 0, len(v.Rows.Columns))
	for i, cells := range v.Rows.Rows {
		buf = st.row(v.Rows, cells, buf)
		if err := sw.SetRow(cellName(1, i+2), buf); err != nil {
			return err
		}
	}
	return sw.Flush()
}

func xlsxTotals(f *excelize.File, st *xlsxStyles, v View) error {
	sw, err := f.NewStreamWriter(SheetTotals)
	if err != nil {
		return err
	}
	widths := []float64{34, 20, 16, 12, 8, 12, 12, 14, 12}
	for i, w := range widths {
		if err := sw.SetColWidth(i+1, i+1, w); err != nil {
			return err
		}
	}
	r := 1
	section := func(title string, t Table) error {
		if err := sw.SetRow(cellName(1, r), []any{excelize.Cell{StyleID: st.title, Value: title}}); err != nil {
			return err
		}
		r++
		if err := sw.SetRow(cellName(1, r), st.headRow(t), excelize.RowOpts{Height: 32}); err != nil {
			return err
		}
		r++
		var buf []any
		for _, cells := range t.Rows {
			buf = st.row(t, cells, buf)
			if err := sw.SetRow(cellName(1, r), buf); err != nil {
				return err
			}
			r++
		}
		r++
		return nil
	}
	if err := section("Totals by material, size and thickness", v.ByMaterial); err != nil {
		return err
	}
	if err := section("Fittings and supports by material, size and thickness", v.Items); err != nil {
		return err
	}
	if err := section("Totals by jacket", v.ByJacket); err != nil {
		return err
	}
	if err := section("Grand totals", v.Grand); err != nil {
		return err
	}
	return sw.Flush()
}

func xlsxConditions(f *excelize.File, st *xlsxStyles, v View) error {
	sw, err := f.NewStreamWriter(SheetConditions)
	if err != nil {
		return err
	}
	if err := sw.SetColWidth(1, 1, 40); err != nil {
		return err
	}
	if err := sw.SetColWidth(2, 2, 120); err != nil {
		return err
	}
	r := 1
	put := func(label, value string, style int) error {
		err := sw.SetRow(cellName(1, r), []any{excelize.Cell{StyleID: style, Value: label}, excelize.Cell{StyleID: st.wrap, Value: value}})
		r++
		return err
	}
	if err := put("Insulation schedule", "", st.title); err != nil {
		return err
	}
	for _, kv := range v.Conditions {
		if err := put(kv[0], kv[1], st.head); err != nil {
			return err
		}
	}
	for _, m := range v.Header.Methods {
		if err := put("Method", m, st.head); err != nil {
			return err
		}
	}
	for _, c := range v.Header.Cautions {
		if err := put("Caution", c, st.head); err != nil {
			return err
		}
	}
	return sw.Flush()
}
