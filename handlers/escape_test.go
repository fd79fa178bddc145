package handlers

import (
	"bytes"
	"context"
	"encoding/csv"
	"fmt"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"

	"lagwright/demo"
	"lagwright/store"
	"lagwright/store/storetest"
)

const (
	xssScript = `<script>alert(1)</script>`
	xssAttr   = `"><img src=x onerror=alert(1)>`
)

// Text fields holding markup come back escaped on every page and export, and text
// cells that a spreadsheet would run as a formula are neutralised in the CSV; numbers
// stay numbers.
func TestMarkupEscapedAndFormulasNeutralised(t *testing.T) {
	st := storetest.NewDB(t)
	s, logs := newServer(t, st)
	h := s.Routes()
	ctx := context.Background()

	pr := demo.Project()
	pr.Name, pr.Client, pr.Site = "Plant "+xssScript, xssAttr, "=HYPERLINK(\"http://evil.example\")"
	p, err := st.CreateProject(ctx, pr)
	if err != nil {
		t.Fatal(err)
	}
	rows, mats := demo.StoreLines(p.ID)
	rows, mats = rows[:6], mats[:6]
	texts := []struct{ tag, service, notes string }{
		{xssScript, xssAttr, xssScript},
		{"=1+2", "+SUM(A1:A9)", "-2+3"},
		{"@cmd", "=cmd|' /C calc'!A0", "\tleading tab"},
		{"-Tag", "\rCR", "plain"},
	}
	for i, tx := range texts {
		rows[i].Tag, rows[i].Service, rows[i].Notes = tx.tag, tx.service, tx.notes
	}
	if _, err := st.CreateLines(ctx, p.ID, rows, mats); err != nil {
		t.Fatal(err)
	}
	lines, err := st.Lines(ctx, p.ID)
	if err != nil {
		t.Fatal(err)
	}
	byTag := map[string]store.Line{}
	for _, l := range lines {
		byTag[l.Tag] = l
	}
	xl := byTag[xssScript]
	base := fmt.Sprintf("/projects/%d", p.ID)
	lineURL := fmt.Sprintf("%s/lines/%d", base, xl.ID)

	raw := []string{xssScript, xssAttr, "<img src=x", "<script>alert"}
	pages := []struct {
		path     string
		escaped  []string // must appear (proves the text is on the page)
		optional bool     // the page may not show the text fields
	}{
		{"/projects", []string{"&lt;script&gt;alert(1)&lt;/script&gt;"}, false},
		{base, []string{"&lt;script&gt;alert(1)&lt;/script&gt;", "&#34;&gt;&lt;img src=x onerror=alert(1)&gt;"}, false},
		{base + "/edit", []string{"&lt;script&gt;alert(1)&lt;/script&gt;"}, false},
		{lineURL, []string{"&lt;script&gt;alert(1)&lt;/script&gt;"}, false},
		{lineURL + "/compare", nil, true},
		{lineURL + "/sheet", []string{"&lt;script&gt;alert(1)&lt;/script&gt;"}, false},
		{base + "/schedule", []string{"&lt;script&gt;alert(1)&lt;/script&gt;"}, false},
		{base + "/economics", nil, true},
		{base + "/costs", nil, true},
		{base + "/import", nil, true},
	}
	for _, pg := range pages {
		rec := do(t, h, "GET", pg.path, nil, nil)
		if rec.Code != 200 {
			t.Errorf("GET %s = %d", pg.path, rec.Code)
			continue
		}
		body := rec.Body.String()
		for _, r := range raw {
			if strings.Contains(body, r) {
				t.Errorf("GET %s holds unescaped %q", pg.path, r)
			}
		}
		for _, e := range pg.escaped {
			if !strings.Contains(body, e) {
				t.Errorf("GET %s lacks the escaped text %q", pg.path, e)
			}
		}
	}

	// CSV: every text cell starting with = + - @ tab or CR carries a leading quote;
	// numbers (negative ones too) are plain.
	rec := do(t, h, "GET", base+"/schedule.csv", nil, nil)
	if rec.Code != 200 {
		t.Fatalf("CSV: %d", rec.Code)
	}
	r := csv.NewReader(bytes.NewReader(rec.Body.Bytes()))
	r.FieldsPerRecord = -1
	recs, err := r.ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	number := regexp.MustCompile(`^-?[0-9]+(\.[0-9]+)?([eE][-+]?[0-9]+)?$`)
	found := map[string]bool{}
	numbers := 0
	for _, row := range recs {
		for _, c := range row {
			if c == "" {
				continue
			}
			if number.MatchString(c) {
				numbers++
				continue
			}
			if strings.ContainsRune("=+-@\t\r", rune(c[0])) {
				t.Errorf("CSV cell %q would run as a formula", c)
			}
			if strings.HasPrefix(c, "'") && number.MatchString(c[1:]) {
				t.Errorf("CSV number %q was quoted as text", c)
			}
			found[c] = true
		}
	}
	for _, want := range []string{"'=1+2", "'+SUM(A1:A9)", "'@cmd", "'=cmd|' /C calc'!A0", "'-Tag", xssScript} {
		if !found[want] {
			t.Errorf("CSV lacks the cell %q", want)
		}
	}
	if numbers < 10 {
		t.Errorf("only %d numeric cells in the CSV", numbers)
	}

	// XLSX: the same texts are string cells, never formulas.
	rec = do(t, h, "GET", base+"/schedule.xlsx", nil, nil)
	if rec.Code != 200 {
		t.Fatalf("XLSX: %d", rec.Code)
	}
	f, err := excelize.OpenReader(bytes.NewReader(rec.Body.Bytes()))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	seen := map[string]bool{}
	for _, sheet := range f.GetSheetList() {
		xrows, err := f.GetRows(sheet)
		if err != nil {
			t.Fatal(err)
		}
		for ri, row := range xrows {
			for ci, v := range row {
				cell, _ := excelize.CoordinatesToCellName(ci+1, ri+1)
				if fm, _ := f.GetCellFormula(sheet, cell); fm != "" {
					t.Errorf("XLSX %s!%s holds a formula %q", sheet, cell, fm)
				}
				for _, tx := range texts {
					if v == tx.tag || v == "'"+tx.tag {
						seen[tx.tag] = true
						if typ, _ := f.GetCellType(sheet, cell); typ == excelize.CellTypeFormula {
							t.Errorf("XLSX %s!%s = %q is a formula cell", sheet, cell, v)
						}
					}
				}
				if _, err := strconv.ParseFloat(v, 64); err == nil {
					numbers++
				}
			}
		}
	}
	for _, tx := range texts {
		if !seen[tx.tag] {
			t.Errorf("XLSX lacks the tag %q", tx.tag)
		}
	}
	if strings.Contains(logs.String(), "internal error") {
		t.Errorf("internal errors logged:\n%s", logs)
	}
}
