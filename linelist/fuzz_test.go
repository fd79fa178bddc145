package linelist

import (
	"strings"
	"testing"

	"lagwright/units"
)

// FuzzParse: Parse never panics, stays within its bounds, returns no rows after a
// header error, and every row it returns has passed the row checks.
func FuzzParse(f *testing.F) {
	f.Add(string(Template(units.SI)))
	f.Add(string(Template(units.US)))
	f.Add("tag\tlength [ft]\tlayer1_thickness [in]\nA\t1-1/2\t3/4\"\n")
	f.Add("tag;operating_temp [°F];pipe_od [mm]\n\"x;y\";-40;1e3\n")
	f.Add("\uFEFFtag,elbows,notes\nA,2,\"multi\nline\"\n,,\n")
	f.Add("tag,\"length [m]\nA,\"1")
	f.Fuzz(func(t *testing.T, text string) {
		rows, errs := Parse(strings.NewReader(text))
		if len(rows) > MaxRows || len(errs) > MaxErrors+1 {
			t.Fatalf("unbounded: %d rows, %d errors", len(rows), len(errs))
		}
		if len(rows) > 0 && len(errs) > 0 && errs[0].Row == 1 {
			t.Fatalf("rows returned despite a header error: %v", errs[0])
		}
		for _, r := range rows {
			if r.Tag == "" || r.Row < 2 || (r.Location != "indoor" && r.Location != "outdoor") {
				t.Fatalf("row escaped the checks: %+v", r)
			}
			for _, l := range r.Input.Layers {
				if l.ThicknessMM == nil || l.Material == "" {
					t.Fatalf("incomplete layer: %+v", r)
				}
			}
		}
	})
}
