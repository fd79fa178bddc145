package linelist

import (
	"bytes"
	"math"
	"reflect"
	"strconv"
	"strings"
	"testing"

	"lagwright/analysis"
	"lagwright/units"
)

func mustParse(t *testing.T, text string) []Row {
	t.Helper()
	rows, errs := Parse(strings.NewReader(text))
	if len(errs) > 0 {
		t.Fatalf("Parse: %v", errs)
	}
	return rows
}

func TestTemplateParses(t *testing.T) {
	for _, sys := range []units.System{units.SI, units.US} {
		rows := mustParse(t, string(Template(sys)))
		if len(rows) != 1 {
			t.Fatalf("%s template: %d rows", sys, len(rows))
		}
		r := rows[0]
		if r.Row != 2 || r.Tag != "HW-101" || r.Location != "indoor" || r.Exposure != "exposed" ||
			r.Fittings != (analysis.Fittings{Elbows: 4, Tees: 1, Valves: 2}) || len(r.Input.Layers) != 1 {
			t.Errorf("%s template row: %+v", sys, r)
		}
		// 40 mm is the SI example; 1-1/2 in = 38.1 mm exactly the US one (1 in = 25.4 mm, NIST SP 811).
		want := map[units.System]float64{units.SI: 40, units.US: 38.1}[sys]
		if got := *r.Input.Layers[0].ThicknessMM; math.Abs(got-want) > 1e-9 {
			t.Errorf("%s template thickness = %g mm, want %g", sys, got, want)
		}
	}
}

// Two files, one with SI headers and one with US headers, describing the same lines in
// exactly convertible values give the same SI input.
func TestSIAndUSHeadersAgree(t *testing.T) {
	si := "tag,pipe_size,length [m],operating_temp [°C],steam_pressure [kPa g],mass_flow [kg/s],cp [J/kg·K],layer1_material,layer1_thickness [mm],layer2_material,layer2_thickness [mm],jacket,max_surface_temp [°C],dew_margin [K],max_heat_flow [W/m],max_temp_change [K],freeze_hours [h],pipe_od [mm],duct_width [mm],duct_height [mm]\n" +
		"A,NPS 2,30.48,100,,0.45359237,4186.8,mineral_fiber_pipe_c547_t1,38.1,elastomeric_c534_gr1,12.7,fsk,60,5," + exact(units.HeatFlowPerLength, 100) + ",10,6,,,\n" +
		"B,,3.048,-40,,,,polyiso_c591,50.8,,,pvc_jacket,,1,,,,114.3,,\n" +
		"C,,,,1000,,,calcium_silicate_c533_t1,76.2,,,aluminium_new,,,,,,,,\n" +
		"D,,,20,,,,glass_blanket_c553,50.8,,,fsk,,,,,,,609.6,304.8\n"
	us := "TAG;Pipe_Size;length [ft];operating_temp [degF];steam_pressure [psig];mass_flow [lb/h];cp [Btu/lb·°F];layer1_material;layer1_thickness [in];layer2_material;layer2_thickness [in];jacket;max_surface_temp [F];dew_margin [°F];max_heat_flow [Btu/h·ft];max_temp_change [°F];freeze_hours [h];pipe_od [in];duct_width [in];duct_height [in]\n" +
		"A;2\";100;212;;3600;1;mineral_fiber_pipe_c547_t1;1-1/2;elastomeric_c534_gr1;1/2\";fsk;140;9;100.0000;18;6;;;\n" +
		"B;;10;-40;;;;polyiso_c591;2;;;pvc_jacket;;1.8;;;;4.5;;\n" +
		"C;;;;" + strconv.FormatFloat(1000/units.ToSI(units.Pressure, units.US, 1), 'f', -1, 64) + ";;;calcium_silicate_c533_t1;3;;;aluminium_new;;;;;;;;\n" +
		"D;;;68;;;;glass_blanket_c553;2;;;fsk;;;;;;;24;12\n"
	a, b := mustParse(t, si), mustParse(t, us)
	if len(a) != 4 || len(b) != 4 {
		t.Fatalf("rows: %d, %d", len(a), len(b))
	}
	for i := range a {
		if d := diffInput(a[i].Input, b[i].Input, 1e-9); d != "" {
			t.Errorf("row %d: SI and US differ: %s", a[i].Row, d)
		}
	}
	if a[0].Input.PipeSize != "NPS 2" || b[0].Input.PipeSize != "NPS 2" {
		t.Errorf("pipe sizes %q, %q; want NPS 2 (a bare 2\" is steel NPS)", a[0].Input.PipeSize, b[0].Input.PipeSize)
	}
	if a[3].Input.Geometry != "duct" || a[0].Input.Geometry != "pipe" {
		t.Errorf("default geometry: %q, %q", a[3].Input.Geometry, a[0].Input.Geometry)
	}
	if b[0].System() != units.US || a[0].System() != units.SI {
		t.Errorf("systems %s %s", a[0].System(), b[0].System())
	}
}

// exact writes the SI value of a US value with every digit.
func exact(q units.Quantity, us float64) string {
	return strconv.FormatFloat(units.ToSI(q, units.US, us), 'f', -1, 64)
}

// diffInput compares two inputs, numbers within a relative tolerance, by their JSON
// shape (every pointer and list compared).
func diffInput(x, y analysis.Input, tol float64) string {
	return diffValue(reflect.ValueOf(x), reflect.ValueOf(y), "", tol)
}

func diffValue(x, y reflect.Value, path string, tol float64) string {
	switch x.Kind() {
	case reflect.Pointer:
		if x.IsNil() != y.IsNil() {
			return path + ": one is nil"
		}
		if x.IsNil() {
			return ""
		}
		return diffValue(x.Elem(), y.Elem(), path, tol)
	case reflect.Float64:
		a, b := x.Float(), y.Float()
		if math.Abs(a-b) > tol*math.Max(1, math.Abs(a)) {
			return path + ": " + strings.TrimSpace(reflect.ValueOf(a).String()) + " ≠ " + reflect.ValueOf(b).String()
		}
	case reflect.Struct:
		for i := 0; i < x.NumField(); i++ {
			if d := diffValue(x.Field(i), y.Field(i), path+"."+x.Type().Field(i).Name, tol); d != "" {
				return d
			}
		}
	case reflect.Slice, reflect.Array:
		if x.Len() != y.Len() {
			return path + ": lengths differ"
		}
		for i := 0; i < x.Len(); i++ {
			if d := diffValue(x.Index(i), y.Index(i), path+"[]", tol); d != "" {
				return d
			}
		}
	default:
		if !reflect.DeepEqual(x.Interface(), y.Interface()) {
			return path + ": differ"
		}
	}
	return ""
}

func TestDelimitersBOMAndEncodings(t *testing.T) {
	cases := []struct {
		name, text string
		tags       []string
	}{
		{"comma", "tag,length [m]\nA,1\nB,2\n", []string{"A", "B"}},
		{"semicolon", "tag;length [m]\r\nA;1\r\nB;2\r\n", []string{"A", "B"}},
		{"pasted tab", "tag\tservice\tlength [ft]\nA\tHot, water\t1\n", []string{"A"}},
		{"BOM", "\uFEFFtag,length [m]\nA,1\n", []string{"A"}},
		{"Windows-1252 degree sign", "tag,operating_temp [\xb0C]\nA,60\n", []string{"A"}},
		{"quoted comma and blank rows", "tag,service\n\"A\",\"Hot, water\"\n,\n\nB,x\n", []string{"A", "B"}},
		{"only tag column", "tag\nA\n", []string{"A"}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			rows := mustParse(t, c.text)
			var tags []string
			for _, r := range rows {
				tags = append(tags, r.Tag)
			}
			if !reflect.DeepEqual(tags, c.tags) {
				t.Errorf("tags %v, want %v", tags, c.tags)
			}
		})
	}
	rows := mustParse(t, "tag\tservice\tlength [ft]\nA\tHot, water\t1\n")
	if rows[0].Service != "Hot, water" || math.Abs(*rows[0].Input.LengthM-0.3048) > 1e-12 {
		t.Errorf("pasted row: %+v", rows[0])
	}
}

func TestErrorsNamed(t *testing.T) {
	cases := []struct {
		name, text string
		want       []RowError
	}{
		{"unknown and duplicate columns", "tag,colour,length [m],Length [ft]\n", []RowError{
			{1, "colour", ""}, {1, "Length [ft]", ""}}},
		{"missing unit and unknown unit", "tag,length,operating_temp [K]\nA,1,2\n", []RowError{
			{1, "length", ""}, {1, "operating_temp [K]", ""}}},
		{"unit on a text column", "tag [m]\n", []RowError{{1, "tag [m]", ""}}},
		{"no tag column", "service\nx\n", []RowError{{1, "tag", ""}}},
		{"empty", "  \n", []RowError{{0, "", ""}}},
		{"UTF-16", "\xff\xfet\x00a\x00g\x00", []RowError{{0, "", ""}}},
		{"header only", "tag,service\n", []RowError{{0, "", ""}}},
		{"bad cells", "tag,location,exposure,elbows,length [m],layer1_material,layer1_thickness [in],layer2_material,layer2_thickness [in]\n" +
			"A,indoors,open,2.5,1.5 kg,,1,,\n" +
			",outdoor,,x,\"1,5\",mineral_fiber_pipe_c547_t1,,x,\n" +
			"C,,,,,,,x,1\n",
			[]RowError{
				{2, "location", ""}, {2, "exposure", ""}, {2, "elbows", ""}, {2, "length [m]", ""}, {2, "layer1_material", ""},
				{3, "elbows", ""}, {3, "length [m]", ""}, {3, "tag", ""}, {3, "layer1_thickness [in]", ""}, {3, "layer2_thickness [in]", ""},
				{4, "layer2_material", ""},
			}},
		{"cells beyond the header", "tag,service\nA,b,c\n", []RowError{{2, "", ""}}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, errs := Parse(strings.NewReader(c.text))
			var got []RowError
			for _, e := range errs {
				if e.Message == "" {
					t.Errorf("%v has no message", e)
				}
				got = append(got, RowError{e.Row, e.Field, ""})
			}
			if !sameSet(got, c.want) {
				t.Errorf("errors %v\nwant rows/fields %v", errs, c.want)
			}
		})
	}
}

func sameSet(a, b []RowError) bool {
	if len(a) != len(b) {
		return false
	}
	count := map[RowError]int{}
	for _, e := range a {
		count[e]++
	}
	for _, e := range b {
		count[e]--
	}
	for _, n := range count {
		if n != 0 {
			return false
		}
	}
	return true
}

func TestBounds(t *testing.T) {
	var b bytes.Buffer
	b.WriteString("tag\n")
	for i := range MaxRows + 1 {
		b.WriteString("T" + strings.Repeat("x", i%3) + "\n")
	}
	rows, errs := Parse(&b)
	if len(rows) != MaxRows || len(errs) != 1 || errs[0].Row != MaxRows+2 || !strings.Contains(errs[0].Message, "at most 10000 lines") {
		t.Errorf("10,001 lines: %d rows, errors %v", len(rows), errs)
	}
	_, errs = Parse(strings.NewReader(strings.Repeat("tag,", MaxColumns) + "notes\n"))
	if len(errs) != 1 || !strings.Contains(errs[0].Message, "at most 200") {
		t.Errorf("201 columns: %v", errs)
	}
	_, errs = Parse(strings.NewReader("tag,notes\nA," + strings.Repeat("n", MaxCellChars+1) + "\n"))
	if len(errs) != 1 || errs[0].Field != "notes" || errs[0].Row != 2 {
		t.Errorf("long cell: %v", errs)
	}
	// Error lists are bounded too.
	b.Reset()
	b.WriteString("tag,elbows\n")
	for range 2000 {
		b.WriteString("A,x\n")
	}
	_, errs = Parse(&b)
	if len(errs) != MaxErrors+1 || !strings.Contains(errs[MaxErrors].Message, "1000 more") {
		t.Errorf("2000 bad rows: %d errors, last %v", len(errs), errs[len(errs)-1])
	}
}

func TestColumnMapping(t *testing.T) {
	rows := mustParse(t, "tag,layer2_thickness [in],layer2_material,layer1_material,layer1_thickness [in],mass_flow [lb/h],operating_temp [°F]\nA,1,x,y,1,1,100\n")
	r := rows[0]
	cases := map[string]string{
		"layers[1].thickness_mm":      "layer2_thickness [in]",
		"layers[0].material":          "layer1_material",
		"layers[0].k_w_mk":            "layer1_material",
		"flow.mass_flow_kg_s":         "mass_flow [lb/h]",
		"operating_temp_c":            "operating_temp [°F]",
		"length_m":                    "length [ft]", // not in the file: the canonical header in the file's units
		"criteria.max_surface_temp_c": "max_surface_temp [°F]",
		"pipe_size":                   "pipe_size",
		"tag":                         "tag",
		"ambient_temp_c":              "", // project settings: no column
		"layers[7].material":          "",
	}
	for field, want := range cases {
		if got := r.Column(field); got != want {
			t.Errorf("Column(%q) = %q, want %q", field, got, want)
		}
	}
}

func TestRecordRoundTrip(t *testing.T) {
	for _, sys := range []units.System{units.SI, units.US} {
		rows := mustParse(t, string(Template(sys)))
		var b bytes.Buffer
		if err := Write(&b, Header(sys), rows); err != nil {
			t.Fatal(err)
		}
		again := mustParse(t, b.String())
		if d := diffInput(rows[0].Input, again[0].Input, 1e-12); d != "" || rows[0].Tag != again[0].Tag ||
			rows[0].Fittings != again[0].Fittings || rows[0].Notes != again[0].Notes {
			t.Errorf("%s: round trip differs: %s\n%s", sys, d, b.String())
		}
	}
}
