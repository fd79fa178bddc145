package schedule

import (
	"fmt"
	"io"
	"time"

	"github.com/xuri/excelize/v2"
)

// Audit is an energy audit of a project's lines as an owner reads it: every line with
// its loss as found, the proposed build, the annual savings (energy, money, CO2), the
// installed cost and the simple payback, best first, and the totals by energy basis.
// Tables arrive in display units with the currency in the money headings.
type Audit struct {
	Project     string
	Currency    string // ISO 4217
	Date        time.Time
	Rows        Table
	Totals      Table
	Notes       []string // lines left out and why
	Assumptions []string // the basis of every figure
	Cautions    []string
}

// Sheet names of the audit workbook.
const (
	SheetAudit       = "Audit"
	SheetAuditTotals = "Totals"
	SheetAuditBasis  = "Basis"
)

// WriteAuditPDF writes the audit as a landscape A4 PDF: a title block, the lines best
// first with their heading repeated on every page, the totals, then the basis of the
// figures and the cautions. Every page carries the caution and its page number.
func WriteAuditPDF(w io.Writer, a Audit) error {
	title := fmt.Sprintf("Insulation audit — %s — %s — money in %s", a.Project, a.Date.Format("2006-01-02"), a.Currency)
	caution := ""
	if len(a.Cautions) > 0 {
		caution = a.Cautions[0]
	}
	d := newPDF("L", "A4", title, caution)
	d.AddPage()
	d.SetFont(pdfFont, "B", 16)
	d.CellFormat(0, 9, "Insulation audit: savings from insulating what is there", "", 1, "L", false, 0, "")
	d.keyValues([][2]string{{"Project", a.Project}, {"Date", a.Date.Format("2006-01-02")}, {"Currency", a.Currency + " (ISO 4217)"}}, 40)
	d.Ln(2)
	d.tableSection("Lines, best payback first", a.Rows, 6.5, 3)
	d.tableSection("Totals by energy basis", a.Totals, 8, 2)
	d.list("Notes", a.Notes)
	d.list("Basis of the figures", a.Assumptions)
	d.list("Cautions", a.Cautions)
	if err := d.Error(); err != nil {
		return fmt.Errorf("pdf: %w", err)
	}
	return d.Output(w)
}

// WriteAuditXLSX writes the audit as a workbook: "Audit" (the lines, header row
// frozen, numbers as numbers), "Totals" (by energy basis) and "Basis" (project, date,
// currency, notes, the basis of the figures, cautions).
func WriteAuditXLSX(w io.Writer, a Audit) error {
	f := excelize.NewFile()
	defer f.Close()
	st, err := newXLSXStyles(f)
	if err != nil {
		return fmt.Errorf("xlsx styles: %w", err)
	}
	if err := f.SetSheetName("Sheet1", SheetAudit); err != nil {
		return err
	}
	for _, name := range []string{SheetAuditTotals, SheetAuditBasis} {
		if _, err := f.NewSheet(name); err != nil {
			return err
		}
	}
	for _, s := range []struct {
		sheet string
		t     Table
	}{{SheetAudit, a.Rows}, {SheetAuditTotals, a.Totals}} {
		if err := xlsxTable(f, st, s.sheet, s.t); err != nil {
			return fmt.Errorf("xlsx %s sheet: %w", s.sheet, err)
		}
	}
	sw, err := f.NewStreamWriter(SheetAuditBasis)
	if err != nil {
		return err
	}
	if err := sw.SetColWidth(1, 1, 24); err != nil {
		return err
	}
	if err := sw.SetColWidth(2, 2, 120); err != nil {
		return err
	}
	r := 1
	put := func(label, value string) error {
		err := sw.SetRow(cellName(1, r), []any{excelize.Cell{StyleID: st.head, Value: label}, excelize.Cell{StyleID: st.wrap, Value: value}})
		r++
		return err
	}
	rows := [][2]string{{"Project", a.Project}, {"Date", a.Date.Format("2006-01-02")}, {"Currency", a.Currency + " (ISO 4217)"}}
	for _, n := range a.Notes {
		rows = append(rows, [2]string{"Note", n})
	}
	for _, s := range a.Assumptions {
		rows = append(rows, [2]string{"Basis", s})
	}
	for _, c := range a.Cautions {
		rows = append(rows, [2]string{"Caution", c})
	}
	for _, kv := range rows {
		if err := put(kv[0], kv[1]); err != nil {
			return err
		}
	}
	if err := sw.Flush(); err != nil {
		return err
	}
	_, err = f.WriteTo(w)
	return err
}

// xlsxTable writes one table on its own sheet: widths, frozen heading, rows.
func xlsxTable(f *excelize.File, st *xlsxStyles, sheet string, t Table) error {
	sw, err := f.NewStreamWriter(sheet)
	if err != nil {
		return err
	}
	for i, c := range t.Columns {
		if err := sw.SetColWidth(i+1, i+1, c.Width+2); err != nil {
			return err
		}
	}
	if err := sw.SetPanes(&excelize.Panes{Freeze: true, XSplit: 1, YSplit: 1, TopLeftCell: "B2", ActivePane: "bottomRight"}); err != nil {
		return err
	}
	if err := sw.SetRow("A1", st.headRow(t), excelize.RowOpts{Height: 32}); err != nil {
		return err
	}
	buf := make([]any, 0, len(t.Columns))
	for i, cells := range t.Rows {
		buf = st.row(t, cells, buf)
		if err := sw.SetRow(cellName(1, i+2), buf); err != nil {
			return err
		}
	}
	return sw.Flush()
}
