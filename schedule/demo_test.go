package schedule

import (
	"bytes"
	"errors"
	"testing"

	"lagwright/analysis"
	"lagwright/demo"
	"lagwright/field"
	"lagwright/units"
)

// demoSchedule is the demo project's schedule (package demo's line list), analysed
// with the catalog, in US customary units as the demo project is.
func demoSchedule(t *testing.T) Schedule {
	t.Helper()
	set := demo.Settings()
	p := Project{ID: 1, Name: demo.Name, Client: "Kettlewick Brewing Co-operative (fictional)", Units: units.US, Settings: set}
	var lines []Line
	for i, dl := range demo.Lines() {
		eff := set.Effective(dl.Location, dl.Input, dl.Fittings)
		l := Line{ID: int64(i + 1), Tag: dl.Tag, Service: dl.Service, Location: dl.Location, Exposure: dl.Exposure,
			Notes: dl.Notes, Input: eff, Fittings: dl.Fittings}
		out, err := analysis.Analyse(eff, analysis.CatalogResolver{})
		var fe field.Errors
		switch {
		case errors.As(err, &fe):
			for _, e := range fe {
				l.Errors = append(l.Errors, e.Field+": "+e.Message)
			}
		case err != nil:
			t.Fatalf("%s: %v", dl.Tag, err)
		default:
			l.Output = out
		}
		lines = append(lines, l)
	}
	return Build(p, lines, analysis.CatalogResolver{}, 1, fixedDate)
}

func TestCSVGoldenDemo(t *testing.T) {
	var buf bytes.Buffer
	if err := WriteCSV(&buf, demoSchedule(t)); err != nil {
		t.Fatal(err)
	}
	golden(t, "schedule_demo_us.csv", buf.Bytes())
}
