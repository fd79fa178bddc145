package schedule

import (
	"bytes"
	"encoding/csv"
	"flag"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"

	"lagwright/catalog"
	"lagwright/units"
)

var update = flag.Bool("update", false, "rewrite the golden files in testdata/golden")

func golden(t *testing.T, name string, got []byte) {
	t.Helper()
	path := filepath.Join("testdata", "golden", name)
	if *update {
		if err := os.WriteFile(path, got, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (run go test ./schedule/ -update to create it)", err)
	}
	if !bytes.Equal(got, want) {
		t.Errorf("%s differs from the golden file; run with -update after checking the difference.\ngot:\n%s", name, got)
	}
}

func TestCSVGolden(t *testing.T) {
	for _, sys := range []units.System{units.SI, units.US} {
		t.Run(string(sys), func(t *testing.T) {
			var buf bytes.Buffer
			if err := WriteCSV(&buf, fixtureSchedule(t, sys)); err != nil {
				t.Fatal(err)
			}
			golden(t, "schedule_"+string(sys)+".csv", buf.Bytes())
		})
	}
}

// readCSVTable finds the schedule table in a CSV export: its heading row starts with "Tag".
func readCSVTable(t *testing.T, data []byte) (head []string, rows [][]string) {
	t.Helper()
	r := csv.NewReader(bytes.NewReader(data))
	r.FieldsPerRecord = -1
	all, err := r.ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	for i, rec := range all {
		if len(rec) > 0 && rec[0] == "Tag" {
			for _, row := range all[i+1:] {
				if len(row) <= 1 {
					break
				}
				rows = append(rows, row)
			}
			return rec, rows
		}
	}
	t.Fatal("no schedule table in the CSV")
	return nil, nil
}

func colOf(t *testing.T, head []string, heading string) int {
	t.Helper()
	for i, h := range head {
		if h == heading {
			return i
		}
	}
	t.Fatalf("no column %q in %q", heading, head)
	return -1
}

// US customary exports convert lengths, thicknesses, areas and temperatures exactly
// (1 in = 25.4 mm, 1 ft = 0.3048 m: NIST SP 811).
func TestUSUnits(t *testing.T) {
	var buf bytes.Buffer
	if err := WriteCSV(&buf, fixtureSchedule(t, units.US)); err != nil {
		t.Fatal(err)
	}
	head, rows := readCSVTable(t, buf.Bytes())
	var stm []string
	for _, r := range rows {
		if r[0] == "STM-301" {
			stm = r
		}
	}
	if stm == nil {
		t.Fatal("no STM-301 row")
	}
	for _, tc := range []struct{ heading, want string }{
		{"Length (ft)", "100.0"},          // 30.48 m = 100 ft exactly
		{"Total thickness (in)", "4.000"}, // 2 × 50.8 mm = 2 × 2 in
		{"Layer build-up", "2 × 2 in"},
		{"Pipe OD (in)", "2.374"}, // NPS 2: the catalog's metric OD 60.3 mm (ASME B36.10M) = 2.374 in
		// Built-in table at NPS 2: only the 3 insulated elbows × 0.45 m = 1.35 m = 4.43 ft
		// count in the insulated length; the bare valves and covered flange pairs are priced apart.
		{"Fittings equiv. length (ft)", "4.4"},
		{"Insulated length (ft)", "104.4"}, // 100 ft + 4.43 ft
		{"Fittings not insulated", "valves bare; flange pairs removable cover 2 in"},
		{"Elbows", "3"},
	} {
		if got := stm[colOf(t, head, tc.heading)]; got != tc.want {
			t.Errorf("STM-301 %s = %q, want %q", tc.heading, got, tc.want)
		}
	}
	for _, h := range []string{"Jacket area incl. laps (ft²)", "Insulation volume (ft³)", "Heat flow per run (Btu/h)",
		"Surface temp. (°F)", "Heat tracing (Btu/h·ft)"} {
		colOf(t, head, h)
	}
	// Jacket area in ft² is the SI area / 0.3048².
	si := fixtureSchedule(t, units.SI)
	for _, r := range si.Rows {
		if r.Tag != "STM-301" {
			continue
		}
		want := *r.JacketAreaM2 / (0.3048 * 0.3048)
		got := stm[colOf(t, head, "Jacket area incl. laps (ft²)")]
		if got != strings.TrimSpace(formatFixed(want, 2)) {
			t.Errorf("jacket area = %s ft², want %.2f", got, want)
		}
	}
}

func formatFixed(v float64, d int) string { return Cell{IsNum: true, Num: round(v, d)}.String(d) }

func TestCSVNeutralisesFormulas(t *testing.T) {
	sc := fixtureSchedule(t, units.SI)
	sc.Rows[0].Service = "=HYPERLINK(\"http://x\")"
	sc.Rows[0].Notes = "+1+1"
	sc.Rows[1].Service = "@SUM(A1)"
	sc.Rows[1].Notes = "-2+3"
	sc.Rows[2].Notes = "\t=1"
	sc.Header.Project = "=cmd|' /C calc'!A0"
	var buf bytes.Buffer
	if err := WriteCSV(&buf, sc); err != nil {
		t.Fatal(err)
	}
	head, rows := readCSVTable(t, buf.Bytes())
	svc, notes, hf := colOf(t, head, "Service"), colOf(t, head, "Notes"), colOf(t, head, "Heat flow per run (W)")
	for _, tc := range []struct {
		row, col int
		want     string
	}{
		{0, svc, "'=HYPERLINK(\"http://x\")"},
		{0, notes, "'+1+1"},
		{1, svc, "'@SUM(A1)"},
		{1, notes, "'-2+3"},
		{2, notes, "'\t=1"},
	} {
		if got := rows[tc.row][tc.col]; got != tc.want {
			t.Errorf("row %d col %s = %q, want %q", tc.row, head[tc.col], got, tc.want)
		}
	}
	// Numbers stay numbers: a cold line's negative heat flow is not quoted.
	if got := rows[2][hf]; !strings.HasPrefix(got, "-") {
		t.Errorf("CHW-201 heat flow = %q, want a plain negative number", got)
	}
	if !strings.Contains(buf.String(), "Project,'=cmd|") {
		t.Error("project name in the header block is not neutralised")
	}
}

// Totals equal the sum of their rows: in SI (Totals) and as shown (View, from the
// rounded shown values), for the material, jacket and grand totals.
func TestTotalsEqualSumOfRows(t *testing.T) {
	for _, sys := range []units.System{units.SI, units.US} {
		sc := fixtureSchedule(t, sys)
		var length, ja, vol float64
		for _, r := range sc.Rows {
			length += val(r.InsulatedM)
			ja += val(r.JacketAreaM2)
			vol += val(r.VolumeM3)
		}
		g := sc.Totals.Grand
		if math.Abs(g.LengthM-length) > 1e-9 || math.Abs(g.JacketAreaM2-ja) > 1e-9 || math.Abs(g.VolumeM3-vol) > 1e-9 {
			t.Errorf("%s: SI grand totals %+v differ from the row sums %g m, %g m², %g m³", sys, g, length, ja, vol)
		}
		var mLen, mJA, jJA float64
		for _, m := range sc.Totals.ByMaterial {
			mLen += m.LengthM
			mJA += m.JacketAreaM2
		}
		for _, j := range sc.Totals.ByJacket {
			jJA += j.JacketAreaM2
		}
		if math.Abs(mLen-length) > 1e-9 || math.Abs(jJA-ja) > 1e-9 {
			t.Errorf("%s: material/jacket totals %g m, %g m² differ from the rows %g m, %g m²", sys, mLen, jJA, length, ja)
		}

		v := NewView(sc)
		iLen, iJA, iVol := ColumnIndex("insulated_length"), ColumnIndex("jacket_area"), ColumnIndex("volume")
		dl, da, dv := v.Rows.Columns[iLen].Decimals, v.Rows.Columns[iJA].Decimals, v.Rows.Columns[iVol].Decimals
		sums := map[string][3]float64{}
		jsum := map[string]float64{}
		var all [3]float64
		for i, row := range v.Rows.Rows {
			r := sc.Rows[i]
			x := [3]float64{row[iLen].Num, row[iJA].Num, row[iVol].Num}
			for k := range x {
				all[k] += x[k]
			}
			if r.Material != "" {
				key := r.Material + "|" + r.SizeText(sys) + "|" + row[ColumnIndex("thickness")].String(v.Rows.Columns[ColumnIndex("thickness")].Decimals)
				s := sums[key]
				for k := range x {
					s[k] += x[k]
				}
				sums[key] = s
			}
			if r.Jacket != "" {
				jsum[r.Jacket] += x[1]
			}
		}
		if len(v.ByMaterial.Rows) != len(sums) {
			t.Errorf("%s: %d material groups, want %d", sys, len(v.ByMaterial.Rows), len(sums))
		}
		for _, mr := range v.ByMaterial.Rows {
			key := mr[0].Text + "|" + mr[2].Text + "|" + mr[3].String(v.ByMaterial.Columns[3].Decimals)
			s, ok := sums[key]
			if !ok {
				t.Errorf("%s: material group %q has no rows", sys, key)
				continue
			}
			if mr[6].Num != round(s[0], dl) || mr[8].Num != round(s[1], da) || mr[9].Num != round(s[2], dv) {
				t.Errorf("%s: group %q shows %v %v %v, rows sum to %v", sys, key, mr[6].Num, mr[8].Num, mr[9].Num, s)
			}
		}
		// Every fitting and support is counted once in the item totals.
		var counted, items float64
		for _, r := range sc.Rows {
			for _, k := range catalog.FittingKinds {
				counted += float64(r.Fittings.Count(k))
			}
			counted += float64(r.Supports)
		}
		for _, ir := range v.Items.Rows {
			items += ir[5].Num
		}
		if counted == 0 || items != counted {
			t.Errorf("%s: item totals count %v, rows count %v fittings and supports", sys, items, counted)
		}
		for _, jr := range v.ByJacket.Rows {
			if jr[3].Num != round(jsum[jr[0].Text], da) {
				t.Errorf("%s: jacket %q shows %v, rows sum to %v", sys, jr[0].Text, jr[3].Num, jsum[jr[0].Text])
			}
		}
		gr := v.Grand.Rows[0]
		if gr[1].Num != float64(len(sc.Rows)) || gr[2].Num != round(all[0], dl) || gr[4].Num != round(all[1], da) || gr[5].Num != round(all[2], dv) {
			t.Errorf("%s: grand row %v, rows sum to %v", sys, gr, all)
		}
	}
}

// The XLSX export, read back, holds the schedule rows cell by cell, with numbers as
// numbers, a totals sheet and a conditions sheet.
func TestXLSXReadBack(t *testing.T) {
	sc := fixtureSchedule(t, units.US)
	var buf bytes.Buffer
	if err := WriteXLSX(&buf, sc); err != nil {
		t.Fatal(err)
	}
	f, err := excelize.OpenReader(&buf)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	if got := f.GetSheetList(); strings.Join(got, ",") != "Schedule,Totals,Conditions" {
		t.Errorf("sheets = %v", got)
	}
	v := NewView(sc)
	rows, err := f.GetRows(SheetSchedule, excelize.Options{RawCellValue: true})
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) != len(sc.Rows)+1 {
		t.Fatalf("%d sheet rows, want %d + heading", len(rows), len(sc.Rows))
	}
	for i, c := range v.Rows.Columns {
		if rows[0][i] != c.Heading() {
			t.Errorf("heading %d = %q, want %q", i, rows[0][i], c.Heading())
		}
	}
	for r, want := range v.Rows.Rows {
		got := rows[r+1]
		for i, c := range want {
			var g string
			if i < len(got) {
				g = got[i]
			}
			cell, _ := excelize.CoordinatesToCellName(i+1, r+2)
			typ, _ := f.GetCellType(SheetSchedule, cell)
			switch {
			case c.IsNum && c.Blank:
				if g != "" {
					t.Errorf("%s = %q, want empty", cell, g)
				}
			case c.IsNum:
				if typ != excelize.CellTypeUnset && typ != excelize.CellTypeNumber {
					t.Errorf("%s type = %v, want a number", cell, typ)
				}
				if g != "" && parse(t, g) != c.Num {
					t.Errorf("%s = %q, want %v", cell, g, c.Num)
				}
			default:
				if g != c.Text {
					t.Errorf("%s = %q, want %q", cell, g, c.Text)
				}
			}
		}
	}
	panes, err := f.GetPanes(SheetSchedule)
	if err != nil || !panes.Freeze || panes.YSplit != 1 {
		t.Errorf("panes = %+v, %v: want the heading row frozen", panes, err)
	}
	if w, _ := f.GetColWidth(SheetSchedule, "A"); w < 8 {
		t.Errorf("column A width = %v", w)
	}
	totals, _ := f.GetRows(SheetTotals, excelize.Options{RawCellValue: true})
	if len(totals) < len(v.ByMaterial.Rows)+len(v.ByJacket.Rows)+3 || totals[0][0] != "Totals by material, size and thickness" {
		t.Errorf("totals sheet starts %v, %d rows", totals[:1], len(totals))
	}
	last := totals[len(totals)-1]
	if last[0] != "All lines" || parse(t, last[4]) != v.Grand.Rows[0][4].Num {
		t.Errorf("grand totals row = %v, want jacket area %v", last, v.Grand.Rows[0][4].Num)
	}
	cond, _ := f.GetRows(SheetConditions)
	var text strings.Builder
	for _, r := range cond {
		text.WriteString(strings.Join(r, " ") + "\n")
	}
	for _, want := range []string{"Harbourside Clinic", "Rev 2", "US customary", "10 % for laps and waste", "Hyland–Wexler", "licensed engineer"} {
		if !strings.Contains(text.String(), want) {
			t.Errorf("conditions sheet lacks %q", want)
		}
	}
}

func parse(t *testing.T, s string) float64 {
	t.Helper()
	var v float64
	if _, err := fmtSscan(s, &v); err != nil {
		t.Fatalf("%q is not a number: %v", s, err)
	}
	return v
}

var fmtSscan = func(s string, v *float64) (int, error) { return fmt.Sscan(s, v) }
