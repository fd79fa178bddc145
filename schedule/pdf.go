package schedule

import (
	_ "embed"
	"fmt"
	"io"
	"strings"

	"codeberg.org/go-pdf/fpdf"
)

// DejaVu Sans (Bitstream Vera licence with public-domain DejaVu changes; see
// fonts/LICENSE-DejaVu.txt), embedded so that °C, m², ø and × render in every PDF.
//
//go:embed fonts/DejaVuSans.ttf
var fontRegular []byte

//go:embed fonts/DejaVuSans-Bold.ttf
var fontBold []byte

const pdfFont = "DejaVu"

// pdfDoc wraps fpdf with our page frame: a running title, repeated table headings,
// the caution and page numbers on every page.
type pdfDoc struct {
	*fpdf.Fpdf
	title   string
	caution string
	heading func() // draws the current table's heading row at the top of a page; nil for none
	w, h    float64
	margin  float64
	bottom  float64 // y limit for content
}

func newPDF(orientation, size, title, caution string) *pdfDoc {
	f := fpdf.New(orientation, "mm", size, "")
	f.AddUTF8FontFromBytes(pdfFont, "", fontRegular)
	f.AddUTF8FontFromBytes(pdfFont, "B", fontBold)
	f.SetCompression(true)
	f.SetAutoPageBreak(false, 0)
	f.AliasNbPages("{nb}")
	w, h := f.GetPageSize()
	d := &pdfDoc{Fpdf: f, title: title, caution: caution, w: w, h: h, margin: 10}
	d.bottom = h - 16
	f.SetMargins(d.margin, d.margin, d.margin)
	f.SetHeaderFunc(func() {
		f.SetFont(pdfFont, "B", 9)
		f.SetTextColor(0, 0, 0)
		f.SetXY(d.margin, 6)
		f.CellFormat(w-2*d.margin, 5, d.title, "B", 1, "L", false, 0, "")
		f.SetY(13)
		if d.heading != nil {
			d.heading()
		}
	})
	f.SetFooterFunc(func() {
		f.SetY(h - 14)
		f.SetFont(pdfFont, "", 6.5)
		f.SetTextColor(60, 60, 60)
		f.MultiCell(w-2*d.margin-30, 3, d.caution, "T", "L", false)
		f.SetXY(w-d.margin-30, h-14)
		f.CellFormat(30, 3, fmt.Sprintf("Page %d of {nb}", f.PageNo()), "T", 0, "R", false, 0, "")
	})
	return d
}

// pdfTable draws a table with wrapped cells, breaking pages and repeating its heading.
type pdfTable struct {
	t      Table
	widths []float64
	size   float64 // font size, pt
	lineH  float64
}

func (d *pdfDoc) table(t Table, totalW, size float64) *pdfTable {
	pt := &pdfTable{t: t, size: size, lineH: size * 0.42, widths: make([]float64, len(t.Columns))}
	// Each column at least as wide as its longest word (heading in bold, and the cells of
	// the first rows), so words and numbers are not broken; the rest of the width is
	// shared in proportion to the columns' nominal widths.
	minW := make([]float64, len(t.Columns))
	word := func(s string, i int) {
		for _, w := range strings.Fields(s) {
			minW[i] = max(minW[i], d.GetStringWidth(w)+2.2)
		}
	}
	d.SetFont(pdfFont, "B", size)
	for i, c := range t.Columns {
		word(c.Title, i)
		word("("+c.Unit+")", i)
	}
	d.SetFont(pdfFont, "", size)
	for r, row := range t.Rows {
		if r >= 300 {
			break
		}
		for i, c := range row {
			if c.IsNum || i == 0 {
				minW[i] = max(minW[i], d.GetStringWidth(c.Display(t.Columns[i].Decimals))+2.2)
			} else {
				word(c.Text, i)
			}
		}
	}
	var need, nominal float64
	for i, c := range t.Columns {
		minW[i] = min(minW[i], totalW/4)
		need += minW[i]
		nominal += c.Width
	}
	spare := totalW - need
	for i, c := range t.Columns {
		if spare >= 0 {
			pt.widths[i] = minW[i] + spare*c.Width/nominal
		} else {
			pt.widths[i] = minW[i] * totalW / need
		}
	}
	return pt
}

func (d *pdfDoc) lines(text string, w float64, max int) []string {
	if text == "" {
		return []string{""}
	}
	ls := d.wrap(text, w-2.2)
	if len(ls) > max {
		ls = ls[:max]
		ls[max-1] = strings.TrimRight(ls[max-1], " ") + "…"
	}
	return ls
}

func (d *pdfDoc) drawRow(pt *pdfTable, texts []string, numeric []bool, bold bool, fill bool, maxLines int) {
	style := ""
	if bold {
		style = "B"
	}
	d.SetFont(pdfFont, style, pt.size)
	wrapped := make([][]string, len(texts))
	n := 1
	for i, s := range texts {
		wrapped[i] = d.lines(s, pt.widths[i], maxLines)
		n = max(n, len(wrapped[i]))
	}
	h := float64(n)*pt.lineH + 1
	if d.GetY()+h > d.bottom {
		d.AddPage()
		d.SetFont(pdfFont, style, pt.size)
	}
	x0, y0 := d.margin, d.GetY()
	if fill {
		d.SetFillColor(232, 237, 242)
		d.Rect(x0, y0, sum(pt.widths), h, "F")
	}
	x := x0
	for i, ls := range wrapped {
		align := "L"
		if numeric[i] && !bold {
			align = "R"
		}
		for k, l := range ls {
			d.SetXY(x, y0+0.5+float64(k)*pt.lineH)
			d.CellFormat(pt.widths[i], pt.lineH, l, "", 0, align, false, 0, "")
		}
		x += pt.widths[i]
	}
	d.SetDrawColor(190, 190, 190)
	d.Line(x0, y0+h, x0+sum(pt.widths), y0+h)
	d.SetDrawColor(0, 0, 0)
	d.SetXY(x0, y0+h)
}

// wrap breaks text into lines no wider than w (mm) in the current font, at spaces;
// a word wider than w is broken between characters.
func (d *pdfDoc) wrap(text string, w float64) []string {
	var out []string
	space := d.GetStringWidth(" ")
	for _, para := range strings.Split(text, "\n") {
		line, lw := "", 0.0
		for _, word := range strings.Fields(para) {
			ww := d.GetStringWidth(word)
			if line != "" && lw+space+ww <= w {
				line, lw = line+" "+word, lw+space+ww
				continue
			}
			if line != "" {
				out = append(out, line)
			}
			for ww > w && len([]rune(word)) > 1 {
				r := []rune(word)
				k := len(r) - 1
				for k > 1 && d.GetStringWidth(string(r[:k])) > w {
					k--
				}
				out = append(out, string(r[:k]))
				word = string(r[k:])
				ww = d.GetStringWidth(word)
			}
			line, lw = word, ww
		}
		out = append(out, line)
	}
	return out
}

func sum(xs []float64) float64 {
	var s float64
	for _, x := range xs {
		s += x
	}
	return s
}

func (d *pdfDoc) headingOf(pt *pdfTable) func() {
	heads := make([]string, len(pt.t.Columns))
	num := make([]bool, len(pt.t.Columns))
	for i, c := range pt.t.Columns {
		heads[i] = c.Heading()
	}
	return func() { d.drawRow(pt, heads, num, true, true, 6) }
}

func (d *pdfDoc) body(pt *pdfTable, maxLines int) {
	num := make([]bool, len(pt.t.Columns))
	for i, c := range pt.t.Columns {
		num[i] = c.Numeric
	}
	texts := make([]string, len(pt.t.Columns))
	for _, row := range pt.t.Rows {
		for i, c := range row {
			texts[i] = c.Display(pt.t.Columns[i].Decimals)
		}
		d.drawRow(pt, texts, num, false, false, maxLines)
	}
}

// tableSection starts a titled table that repeats its heading on every page it spans.
func (d *pdfDoc) tableSection(title string, t Table, size float64, maxLines int) {
	pt := d.table(t, d.w-2*d.margin, size)
	need := 20.0
	if d.GetY()+need > d.bottom {
		d.heading = nil
		d.AddPage()
	}
	if title != "" {
		d.SetFont(pdfFont, "B", 10)
		d.CellFormat(0, 6, title, "", 1, "L", false, 0, "")
	}
	d.heading = d.headingOf(pt)
	d.heading()
	d.body(pt, maxLines)
	d.heading = nil
	d.Ln(4)
}

func (d *pdfDoc) keyValues(kvs [][2]string, labelW float64) {
	const lh = 3.8
	for _, kv := range kvs {
		d.SetFont(pdfFont, "B", 8)
		labels := d.lines(kv[0], labelW, 4)
		d.SetFont(pdfFont, "", 8)
		values := d.lines(kv[1], d.w-2*d.margin-labelW, 30)
		h := float64(max(len(labels), len(values))) * lh
		if d.GetY()+h > d.bottom {
			d.AddPage()
		}
		y := d.GetY()
		d.SetFont(pdfFont, "B", 8)
		for k, l := range labels {
			d.SetXY(d.margin, y+float64(k)*lh)
			d.CellFormat(labelW, lh, l, "", 0, "L", false, 0, "")
		}
		d.SetFont(pdfFont, "", 8)
		for k, l := range values {
			d.SetXY(d.margin+labelW, y+float64(k)*lh)
			d.CellFormat(d.w-2*d.margin-labelW, lh, l, "", 0, "L", false, 0, "")
		}
		d.SetXY(d.margin, y+h+0.8)
	}
}

func (d *pdfDoc) list(title string, items []string) {
	if len(items) == 0 {
		return
	}
	if d.GetY()+12 > d.bottom {
		d.AddPage()
	}
	d.SetFont(pdfFont, "B", 10)
	d.CellFormat(0, 6, title, "", 1, "L", false, 0, "")
	d.SetFont(pdfFont, "", 8)
	for _, it := range items {
		lines := d.lines("• "+it, d.w-2*d.margin, 20)
		if d.GetY()+float64(len(lines))*3.8 > d.bottom {
			d.AddPage()
			d.SetFont(pdfFont, "", 8)
		}
		for _, l := range lines {
			d.CellFormat(0, 3.8, l, "", 1, "L", false, 0, "")
		}
	}
	d.Ln(3)
}

// WriteSchedulePDF writes the schedule as a landscape A3 PDF: a title block with the
// project, revision, design conditions, methods and cautions, then the rows with their
// heading repeated on every page, then the totals. Every page carries the caution and
// its page number.
func WriteSchedulePDF(w io.Writer, s Schedule) error {
	v := NewView(s)
	h := v.Header
	title := fmt.Sprintf("Insulation schedule — %s — %s — %s", h.Project, h.RevisionText(), h.Date.Format("2006-01-02"))
	d := newPDF("L", "A3", title, strings.Join(h.Cautions, " "))
	d.AddPage()
	d.SetFont(pdfFont, "B", 16)
	d.CellFormat(0, 9, "Insulation schedule", "", 1, "L", false, 0, "")
	d.keyValues(v.Conditions, 70)
	d.Ln(2)
	d.list("Methods", h.Methods)
	d.list("Cautions", h.Cautions)
	d.AddPage()
	d.tableSection("Schedule", v.Rows, 5.5, 6)
	d.tableSection("Totals by material, size and thickness", v.ByMaterial, 8, 3)
	d.tableSection("Fittings and supports by material, size and thickness", v.Items, 8, 3)
	d.tableSection("Totals by jacket", v.ByJacket, 8, 3)
	d.tableSection("Grand totals", v.Grand, 8, 2)
	if err := d.Error(); err != nil {
		return fmt.Errorf("pdf: %w", err)
	}
	return d.Output(w)
}
