// Package linelist reads and writes line lists: CSV or tab-separated text (pasted from a
// spreadsheet) with one line (run of pipe or duct) per row and our own column names,
// snake_case with the unit in brackets ("length [m]", "operating_temp [°F]"). The unit
// in the header decides how bare numbers in that column are read; a cell may still
// carry its own unit ("25 mm", `3/4"`). Values are returned in SI, ready for analysis.
//
// The package is pure: no store, no HTTP. It checks the syntax of every cell and names
// every bad one; whether a material exists, a size is tabulated or a tag is free is for
// the caller (the import service), which also maps analysis field errors back to the
// file's columns with Row.Column.
//
// Input is bounded: at most MaxBytes, MaxRows data rows, MaxColumns columns and
// MaxCellChars characters per cell.
package linelist

import (
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
	"unicode/utf8"

	"lagwright/analysis"
	"lagwright/catalog"
	"lagwright/units"
)

// Bounds on one line list.
const (
	MaxRows      = 10000
	MaxColumns   = 200
	MaxCellChars = 1000
	MaxBytes     = 32 << 20
	// MaxErrors bounds the problems listed; the last entry then says how many more there were.
	MaxErrors = 1000
	maxTag    = 100
)

// Row is one line of the list: the line's own fields and its calculation input in SI.
type Row struct {
	Row      int // the row number as the user sees it: the header is row 1, the first line row 2
	Tag      string
	Service  string
	Location string // "indoor" | "outdoor"
	Exposure string // "exposed" | "concealed"
	Notes    string
	Fittings analysis.Fittings
	Input    analysis.Input

	hdr *header
}

// RowError names one problem: the row (as the user sees it, 0 for the file as a
// whole), the column header as written in the file ("" for the whole row) and a
// message for people.
type RowError struct {
	Row     int    `json:"row"`
	Field   string `json:"field"`
	Message string `json:"message"`
}

func (e RowError) Error() string {
	switch {
	case e.Row == 0:
		return e.Message
	case e.Field == "":
		return fmt.Sprintf("row %d: %s", e.Row, e.Message)
	}
	return fmt.Sprintf("row %d, %s: %s", e.Row, e.Field, e.Message)
}

// header is a file's header row, resolved to columns.
type header struct {
	cols  []int        // column index per cell (-1: none)
	units []headerUnit // the unit of each quantity cell
	text  map[int]string
	sys   units.System
}

// Column returns the header, as written in this file, of the column that fills an
// analysis field ("layers[0].thickness_mm" → "layer1_thickness [in]"). A field with
// no column in the file gets the column's canonical header in the file's units; a
// field no column fills (project settings) gives "".
func (r Row) Column(field string) string {
	i, ok := columnOf(field)
	if !ok {
		return ""
	}
	if r.hdr != nil {
		if h, ok := r.hdr.text[i]; ok {
			return h
		}
		return columns[i].header(r.hdr.sys)
	}
	return columns[i].header(units.SI)
}

// System is the file's unit system: US when its temperatures (or else lengths) are in
// US units, for messages in the user's units.
func (r Row) System() units.System {
	if r.hdr == nil {
		return units.SI
	}
	return r.hdr.sys
}

// columnOf maps an analysis field path to a column.
func columnOf(field string) (int, bool) {
	f := field
	if strings.HasPrefix(f, "layers[") {
		end := strings.Index(f, "]")
		n, err := strconv.Atoi(f[len("layers["):max(end, len("layers["))])
		if err != nil || n < 0 || n >= maxLayers {
			return 0, false
		}
		name := fmt.Sprintf("layer%d_material", n+1)
		if strings.HasPrefix(f[end+1:], ".thickness_mm") {
			name = fmt.Sprintf("layer%d_thickness", n+1)
		}
		return byName[name], true
	}
	switch f {
	case "layers":
		return byName["layer1_material"], true
	case "flow":
		return byName["mass_flow"], true
	case "surface_emittance":
		return byName["jacket"], true
	case "fittings_equiv_length_m":
		return byName["length"], true
	case "fittings", "fitting_finish":
		return byName["elbows"], true
	case "fitting_cover":
		return byName["cover_thickness"], true
	case "supports":
		return byName["support_kind"], true
	}
	if k, ok := strings.CutPrefix(f, "fittings."); ok {
		if i, ok := byName[k]; ok {
			return i, true
		}
	}
	for i, c := range columns {
		if c.field != "" && c.field == f {
			return i, true
		}
	}
	if i, ok := byName[f]; ok && columns[i].field == "" { // the line's own fields: tag, service …
		return i, true
	}
	return 0, false
}

// collector gathers problems up to MaxErrors and counts the rest.
type collector struct {
	list []RowError
	more int
}

func (c *collector) add(row int, field, format string, args ...any) {
	if len(c.list) >= MaxErrors {
		c.more++
		return
	}
	c.list = append(c.list, RowError{Row: row, Field: field, Message: fmt.Sprintf(format, args...)})
}

func (c *collector) result() []RowError {
	if c.more > 0 {
		noun := "problems"
		if c.more == 1 {
			noun = "problem"
		}
		c.list = append(c.list, RowError{Message: fmt.Sprintf("… and %d more %s not listed; fix these first", c.more, noun)})
	}
	return c.list
}

// Parse reads a line list: comma-, semicolon- or tab-separated (detected from the
// header row), UTF-8 with or without a byte-order mark (text that is not UTF-8 is read
// as Windows-1252/Latin-1, as older spreadsheets save it). It returns the rows that
// parsed cleanly and every problem found. A problem with the header stops the reading
// (no rows); otherwise every data row is checked. Fully blank rows are skipped.
func Parse(r io.Reader) (rows []Row, errs []RowError) {
	var c collector
	data, err := io.ReadAll(io.LimitReader(r, MaxBytes+1))
	if err != nil {
		c.add(0, "", "could not read the line list: %v", err)
		return nil, c.result()
	}
	if len(data) > MaxBytes {
		c.add(0, "", "the line list is larger than %d MiB; split it into several imports", MaxBytes>>20)
		return nil, c.result()
	}
	text, ok := decodeText(data)
	if !ok {
		c.add(0, "", "the file is UTF-16 text; save it from the spreadsheet as CSV UTF-8, or paste the rows instead")
		return nil, c.result()
	}
	if strings.TrimSpace(text) == "" {
		c.add(0, "", "the line list is empty: give a header row and at least one line")
		return nil, c.result()
	}
	cr := csv.NewReader(strings.NewReader(text))
	cr.Comma = detectDelimiter(text)
	cr.FieldsPerRecord = -1
	cr.LazyQuotes = true
	cr.ReuseRecord = true

	rec, err := cr.Read()
	if err != nil {
		c.add(1, "", "the header row cannot be read: %s", csvMessage(err))
		return nil, c.result()
	}
	hdr := readHeader(rec, &c)
	if len(c.list) > 0 {
		return nil, c.result()
	}
	rows = make([]Row, 0, min(strings.Count(text, "\n"), MaxRows)) // a Row is large: grow once
	rowNo, lines := 1, 0
	for {
		rec, err := cr.Read()
		if err == io.EOF {
			break
		}
		rowNo++
		if err != nil {
			c.add(rowNo, "", "cannot be read: %s", csvMessage(err))
			if !errors.Is(err, csv.ErrFieldCount) {
				break // the reader cannot go on past a broken quote
			}
			continue
		}
		if blank(rec) {
			continue
		}
		if lines++; lines > MaxRows {
			c.add(rowNo, "", "a line list has at most %d lines; split it into several imports", MaxRows)
			break
		}
		if row, ok := readRow(rec, rowNo, hdr, &c); ok {
			rows = append(rows, row)
		}
	}
	if len(rows) == 0 && len(c.list) == 0 {
		c.add(0, "", "the line list has a header but no lines")
	}
	return rows, c.result()
}

func csvMessage(err error) string {
	var pe *csv.ParseError
	if errors.As(err, &pe) {
		return pe.Err.Error()
	}
	return err.Error()
}

// decodeText strips a UTF-8 byte-order mark and turns non-UTF-8 bytes (a spreadsheet's
// "CSV" in Windows-1252) into text; UTF-16 is refused (ok false).
func decodeText(data []byte) (string, bool) {
	if bytes.HasPrefix(data, []byte{0xFF, 0xFE}) || bytes.HasPrefix(data, []byte{0xFE, 0xFF}) {
		return "", false
	}
	data = bytes.TrimPrefix(data, []byte{0xEF, 0xBB, 0xBF})
	if utf8.Valid(data) {
		return string(data), true
	}
	var b strings.Builder
	b.Grow(len(data) + len(data)/8)
	for len(data) > 0 {
		r, size := utf8.DecodeRune(data)
		if r == utf8.RuneError && size <= 1 {
			r = cp1252(data[0])
			size = 1
		}
		b.WriteRune(r)
		data = data[size:]
	}
	return b.String(), true
}

// cp1252 maps one Windows-1252 byte to its rune (the 0x80–0x9F block differs from Latin-1).
func cp1252(c byte) rune {
	const block = "€\u0081‚ƒ„…†‡ˆ‰Š‹Œ\u008dŽ\u008f\u0090‘’“”•–—˜™š›œ\u009džŸ"
	if c >= 0x80 && c <= 0x9F {
		return []rune(block)[c-0x80]
	}
	return rune(c)
}

// detectDelimiter picks tab, semicolon or comma: the one found most often in the
// header row outside quotes (tabs win ties: pasted cells; then commas).
func detectDelimiter(text string) rune {
	line, _, _ := strings.Cut(text, "\n")
	var tabs, semis, commas int
	inQuote := false
	for _, r := range line {
		switch r {
		case '"':
			inQuote = !inQuote
		case '\t':
			if !inQuote {
				tabs++
			}
		case ';':
			if !inQuote {
				semis++
			}
		case ',':
			if !inQuote {
				commas++
			}
		}
	}
	switch {
	case tabs > 0 && tabs >= semis && tabs >= commas:
		return '\t'
	case semis > commas:
		return ';'
	}
	return ','
}

func blank(rec []string) bool {
	for _, s := range rec {
		if strings.TrimSpace(s) != "" {
			return false
		}
	}
	return true
}

// readHeader resolves the header cells to columns: unknown and duplicate columns,
// missing or unknown units and a missing tag column are errors on row 1.
func readHeader(rec []string, c *collector) *header {
	if len(rec) > MaxColumns {
		c.add(1, "", "the header has %d columns; at most %d are allowed", len(rec), MaxColumns)
		return nil
	}
	h := &header{cols: make([]int, len(rec)), units: make([]headerUnit, len(rec)), text: map[int]string{}}
	seen := map[int]string{}
	var tempSys units.System
	us, si := 0, 0
	for i, raw := range rec {
		h.cols[i] = -1
		cell := strings.TrimSpace(raw)
		if len(cell) > MaxCellChars {
			c.add(1, clip(cell, 40), "a header cell is longer than %d characters", MaxCellChars)
			continue
		}
		if cell == "" {
			if i == len(rec)-1 || blank(rec[i:]) {
				continue // trailing delimiters
			}
			c.add(1, fmt.Sprintf("column %d", i+1), "has no header; name every column (see the template)")
			continue
		}
		name, unit, hasUnit := splitHeader(cell)
		ci, ok := byName[name]
		if !ok {
			c.add(1, cell, "unknown column %q; the template lists the columns (%s)", name, suggest(name))
			continue
		}
		if prev, dup := seen[ci]; dup {
			c.add(1, cell, "duplicate column: %q is already given as %q", name, prev)
			continue
		}
		seen[ci] = cell
		col := columns[ci]
		switch {
		case col.kind != kQty && hasUnit:
			c.add(1, cell, "%s takes no unit; write it as %q", name, name)
			continue
		case col.kind == kQty && !hasUnit:
			c.add(1, cell, "give the unit in brackets: %s", col.unitHelp())
			continue
		case col.kind == kQty:
			u, ok := findUnit(col, unit)
			if !ok {
				c.add(1, cell, "unit %q is not accepted here; use %s", unit, col.unitHelp())
				continue
			}
			h.units[i] = u
			if u.sys == units.US {
				us++
			} else {
				si++
			}
			if name == "operating_temp" {
				tempSys = u.sys
			}
		}
		h.cols[i] = ci
		h.text[ci] = cell
	}
	if _, ok := seen[byName["tag"]]; !ok && len(c.list) == 0 {
		c.add(1, "tag", "the tag column is required (every line needs a tag)")
	}
	switch {
	case tempSys != "":
		h.sys = tempSys
	case us > si:
		h.sys = units.US
	default:
		h.sys = units.SI
	}
	return h
}

// splitHeader reads "Operating_Temp [°F]" as ("operating_temp", "°F", true). Names are
// matched case-insensitively, with spaces taken as underscores.
func splitHeader(cell string) (name, unit string, hasUnit bool) {
	name = cell
	if i := strings.IndexByte(cell, '['); i >= 0 {
		name = cell[:i]
		rest := cell[i+1:]
		rest, _, _ = strings.Cut(rest, "]")
		unit, hasUnit = strings.TrimSpace(rest), true
	}
	name = strings.Join(strings.Fields(strings.ToLower(name)), "_")
	return name, unit, hasUnit
}

func findUnit(col column, unit string) (headerUnit, bool) {
	n := normUnit(unit)
	for _, u := range col.hdr {
		if u.norm == n {
			return u, true
		}
	}
	return headerUnit{}, false
}

// suggest names the closest known column, or lists a few.
func suggest(name string) string {
	for _, c := range columns {
		if strings.HasPrefix(c.name, name) || strings.HasPrefix(name, c.name) {
			return "did you mean " + c.name + "?"
		}
	}
	return "e.g. tag, service, pipe_size, length [m], operating_temp [°C], layer1_material, layer1_thickness [mm]"
}

// readRow reads one data row; ok is false when a cell had a problem.
func readRow(rec []string, rowNo int, h *header, c *collector) (Row, bool) {
	before := len(c.list) + c.more
	b := &builder{}
	b.row.Row, b.row.hdr = rowNo, h
	for i, raw := range rec {
		if i >= len(h.cols) {
			if strings.TrimSpace(raw) != "" {
				c.add(rowNo, "", "has a value in column %d, beyond the %d columns of the header", i+1, len(h.cols))
				break
			}
			continue
		}
		ci := h.cols[i]
		if ci < 0 {
			continue
		}
		cell := strings.TrimSpace(raw)
		if cell == "" {
			continue
		}
		col := columns[ci]
		field := h.text[ci]
		if utf8.RuneCountInString(cell) > MaxCellChars {
			c.add(rowNo, field, "is longer than %d characters", MaxCellChars)
			continue
		}
		switch col.kind {
		case kText:
			*col.text(b) = cell
		case kCount:
			n, err := strconv.Atoi(cell)
			if err != nil || n < 0 || n > 10000 {
				c.add(rowNo, field, "must be a whole number from 0 to 10000, not %q", cell)
				continue
			}
			*col.count(&b.row.Fittings) = n
		case kQty:
			v, err := readQty(col, h.units[i], cell)
			if err != nil {
				c.add(rowNo, field, "%s", err.Error())
				continue
			}
			*col.num(b) = &v
		}
	}
	finish(b, h, rowNo, c)
	return b.row, len(c.list)+c.more == before
}

// readQty reads a cell of a quantity column. A bare number ("40", "1-1/2", "0.75") is
// in the header's unit; a cell with its own unit ("25 mm", `3/4"`, "180 °F") keeps it.
func readQty(col column, u headerUnit, cell string) (float64, error) {
	if u.parse == "" { // a quantity package units lacks: a plain number times the factor
		v, err := units.ParseFraction(cell)
		if err != nil || strings.ContainsAny(cell, `"″`) {
			return 0, fmt.Errorf("must be a number in %s, not %q", u.label, cell)
		}
		return v * u.factor, nil
	}
	if strings.ContainsAny(cell, ",") {
		return 0, fmt.Errorf("not a number: %q (use a dot for decimals and no thousands separators)", cell)
	}
	if last := cell[len(cell)-1]; last >= '0' && last <= '9' || last == '.' { // a bare number: the header's unit
		return units.Parse(col.q, units.SI, cell+" "+u.parse)
	}
	v, err := units.Parse(col.q, units.SI, cell)
	if err != nil {
		return 0, err
	}
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return 0, fmt.Errorf("not a number: %q", cell)
	}
	return v, nil
}

// finish checks the line's own fields and assembles the input: layers in order,
// flow and criteria where given, the geometry by default.
func finish(b *builder, h *header, rowNo int, c *collector) {
	r := &b.row
	col := func(name string) string {
		if t, ok := h.text[byName[name]]; ok {
			return t
		}
		return name
	}
	switch {
	case r.Tag == "":
		c.add(rowNo, col("tag"), "is required")
	case utf8.RuneCountInString(r.Tag) > maxTag:
		c.add(rowNo, col("tag"), "must be at most %d characters", maxTag)
	}
	r.Location = strings.ToLower(r.Location)
	switch r.Location {
	case "":
		r.Location = "indoor"
	case "indoor", "outdoor":
	default:
		c.add(rowNo, col("location"), `must be "indoor" or "outdoor", not %q`, r.Location)
	}
	r.Exposure = strings.ToLower(r.Exposure)
	switch r.Exposure {
	case "":
		r.Exposure = "exposed"
	case "exposed", "concealed":
	default:
		c.add(rowNo, col("exposure"), `must be "exposed" or "concealed", not %q`, r.Exposure)
	}
	in := &r.Input
	in.Geometry = strings.ToLower(in.Geometry)
	in.Orientation = strings.ToLower(in.Orientation)
	in.Fluid = strings.ToLower(in.Fluid)
	if in.Geometry == "" {
		in.Geometry = "pipe"
		if in.DuctWidthMM != nil || in.DuctHeightMM != nil {
			in.Geometry = "duct"
		}
	}
	in.PipeSize = pipeSize(in.PipeSize)

	in.Layers = []analysis.LayerInput{}
	gap := -1
	for i, l := range b.layers {
		given := l.Material != "" || l.ThicknessMM != nil
		if !given {
			if gap < 0 {
				gap = i
			}
			continue
		}
		n := i + 1
		switch {
		case l.Material == "":
			c.add(rowNo, col(fmt.Sprintf("layer%d_material", n)), "is required with layer%d_thickness", n)
		case l.ThicknessMM == nil:
			c.add(rowNo, col(fmt.Sprintf("layer%d_thickness", n)), "is required with layer%d_material", n)
		case gap >= 0:
			c.add(rowNo, col(fmt.Sprintf("layer%d_material", n)), "layer %d is given but layer %d is not: fill the layers from layer1, inner to outer", n, gap+1)
		}
		in.Layers = append(in.Layers, l)
	}
	if b.flow.MassFlowKgS != nil || b.flow.CpJkgK != nil {
		f := b.flow
		in.Flow = &f
	}
	if b.crit != (analysis.Criteria{}) {
		cr := b.crit
		in.Criteria = &cr
	}
	if b.finish != (analysis.FittingFinish{}) {
		f := b.finish
		for _, k := range catalog.FittingKinds {
			p := f.Field(k)
			*p = strings.ToLower(*p)
		}
		in.FittingFinish = &f
	}
	if b.cover != (analysis.FittingCover{}) {
		cv := b.cover
		in.FittingCover = &cv
	}
	if b.supp != (analysis.Supports{}) {
		sp := b.supp
		sp.Kind = strings.ToLower(sp.Kind)
		in.Supports = &sp
	}
	finishExisting(b, rowNo, col, c)
}

// finishExisting assembles the as-found survey of a row: existing_condition "bare" (or
// no existing layer with other survey cells) is a run found bare; "good", "wet",
// "damaged" name the condition factor; existing_k_factor is a number;
// existing_bare_fittings lists fitting kinds separated by ";" or ",".
func finishExisting(b *builder, rowNo int, col func(string) string, c *collector) {
	l := b.exLayer
	cond := strings.ToLower(strings.TrimSpace(b.exCondition))
	if l.Material == "" && l.ThicknessMM == nil && cond == "" && b.exK == "" && b.exMissing == nil && b.exFitting == "" {
		return
	}
	e := &analysis.Existing{Layers: []analysis.LayerInput{}}
	switch {
	case l.Material != "" && l.ThicknessMM == nil:
		c.add(rowNo, col("existing_thickness"), "is required with existing_material")
	case l.Material == "" && l.ThicknessMM != nil:
		c.add(rowNo, col("existing_material"), "is required with existing_thickness")
	case l.Material != "":
		if cond == "bare" {
			c.add(rowNo, col("existing_condition"), `is "bare" but an existing layer is given`)
		}
		e.Layers = append(e.Layers, l)
	}
	if cond != "bare" {
		e.Condition = cond
	}
	if b.exK != "" {
		v, err := strconv.ParseFloat(strings.TrimSpace(b.exK), 64)
		if err != nil {
			c.add(rowNo, col("existing_k_factor"), "must be a number (a factor on k, 1 – 20), not %q", clip(b.exK, 20))
		} else {
			e.KFactor = &v
		}
	}
	e.MissingFraction = b.exMissing
	for _, k := range strings.FieldsFunc(b.exFitting, func(r rune) bool { return r == ';' || r == ',' }) {
		if k = strings.ToLower(strings.TrimSpace(k)); k != "" {
			e.BareFittings = append(e.BareFittings, k)
		}
	}
	b.row.Input.Existing = e
}

// pipeSize reads a bare nominal size ("2", `1-1/2"`) as steel NPS; designations
// (NPS, DN, CTS) pass as written for the catalog to look up.
func pipeSize(s string) string {
	if s == "" {
		return s
	}
	if v, err := units.ParseFraction(s); err == nil && v > 0 {
		return "NPS " + strings.TrimSuffix(strings.TrimSuffix(strings.TrimSpace(s), `"`), "″")
	}
	return s
}

// clip shortens s to n runes for a message.
func clip(s string, n int) string {
	if utf8.RuneCountInString(s) <= n {
		return s
	}
	return string([]rune(s)[:n]) + "…"
}
