package handlers

import (
	"context"
	"fmt"
	"net/url"
	"strconv"
	"strings"
	"testing"

	"lagwright/results"
	"lagwright/store/storetest"
	"lagwright/units"
)

func TestCostTable(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	h := s.Routes()
	p, _, set := compareFixture(t, st, "us")
	target := fmt.Sprintf("/projects/%d/costs", p.ID)
	formHdr := map[string]string{"Content-Type": "application/x-www-form-urlencoded"}
	ctx := context.Background()

	rec := do(t, h, "GET", target, nil, nil)
	if rec.Code != 200 || !strings.Contains(rec.Body.String(), "Cost, USD per ft (size flat: per ft²)") || !strings.Contains(rec.Body.String(), "Thickness, in") {
		t.Fatalf("GET costs = %d; US labels missing", rec.Code)
	}

	// A paste with one bad row: 422, every bad line named, nothing saved.
	bad := url.Values{"version": {strconv.Itoa(p.Version)}, "rows": {"0"}, "paste": {"material\tsize\tthickness\tcost\n" +
		compareMaterial + "\tNPS 4\t2\t30.50\n" +
		"unobtainium\tNPS 4\t2\t12\n" +
		compareMaterial + "\tNPS 4\t-1\tabc\n" +
		compareMaterial + ",4,2,31\n"}}
	rec = do(t, h, "POST", target, strings.NewReader(bad.Encode()), formHdr)
	if rec.Code != 422 {
		t.Fatalf("bad paste = %d, want 422", rec.Code)
	}
	body := rec.Body.String()
	for _, want := range []string{"line 3: material", "line 4: thickness", "line 4: cost", "line 5: thickness: repeats another row", "Nothing was saved"} {
		if !strings.Contains(body, want) {
			t.Errorf("422 page lacks %q", want)
		}
	}
	if strings.Contains(body, "line 2:") {
		t.Error("the good line 2 is reported as bad")
	}
	if got, _ := st.Project(ctx, p.ID); got.Version != p.Version {
		t.Errorf("a refused paste saved the project (version %d → %d)", p.Version, got.Version)
	}

	// A good paste: per ft in US units is stored per metre; exact-size rows stored as typed.
	good := url.Values{"version": {strconv.Itoa(p.Version)}, "rows": {"0"}, "paste": {compareMaterial + "\tNPS 4\t2\t30.48\n" + compareMaterial + ", any, 1-1/2, 10\n"}}
	rec = do(t, h, "POST", target, strings.NewReader(good.Encode()), formHdr)
	if rec.Code != 303 {
		t.Fatalf("good paste = %d, want 303\n%s", rec.Code, rec.Body)
	}
	got, _ := st.Project(ctx, p.ID)
	gs, _ := results.Settings(got)
	if len(gs.CostTable) != 2 || gs.CostTable[0].ThicknessMM != 50.8 || gs.CostTable[0].CostPerM != 100 ||
		gs.CostTable[1].NominalSize != "any" || gs.CostTable[1].ThicknessMM != 38.1 {
		t.Errorf("saved table %+v", gs.CostTable)
	}
	if gs.Economics == nil || *gs.Economics.Heating.PricePerKWh != *set.Economics.Heating.PricePerKWh {
		t.Error("saving the cost table lost the project's economics")
	}
	// A stale version: 409.
	rec = do(t, h, "POST", target, strings.NewReader(good.Encode()), formHdr)
	if rec.Code != 409 {
		t.Errorf("stale version = %d, want 409", rec.Code)
	}

	// Example costs: labelled rows, and the compare page says so.
	rec = do(t, h, "POST", target+"/example", strings.NewReader(url.Values{"version": {strconv.Itoa(got.Version)}}.Encode()), formHdr)
	if rec.Code != 303 {
		t.Fatalf("example = %d", rec.Code)
	}
	rec = do(t, h, "GET", target, nil, nil)
	if !strings.Contains(rec.Body.String(), `data-testid="example-notice"`) || !strings.Contains(rec.Body.String(), "mark-example") {
		t.Error("example rows are not labelled")
	}
	got, _ = st.Project(ctx, p.ID)
	gs, _ = results.Settings(got)
	examples := 0
	for _, r := range gs.CostTable {
		if r.Example {
			examples++
		}
	}
	if examples == 0 || examples != len(gs.CostTable)-2 { // two user rows; the user's "any 1-1/2" shadows one example row
		t.Errorf("%d example rows of %d", examples, len(gs.CostTable))
	}
}

// TestCostRowFlatPerArea: in US units a pipe row's cost is per ft and a "flat" row's per
// ft², each stored per m or per m² (1 ft = 0.3048 m, 1 ft² = 0.09290304 m², exact).
func TestCostRowFlatPerArea(t *testing.T) {
	resolve := func(s string) (string, bool) { return s, true }
	for _, c := range []struct {
		size string
		want float64
	}{{"any", 10 / 0.3048}, {"NPS 4", 10 / 0.3048}, {"flat", 10 / 0.09290304}} {
		row, problems := costRow(units.US, resolve, "mineral_fiber_board_c612", c.size, "2", "10")
		if len(problems) > 0 {
			t.Fatalf("%s: %v", c.size, problems)
		}
		if d := row.CostPerM - c.want; d > 1e-9 || d < -1e-9 {
			t.Errorf("size %s: 10 a US unit stored as %.6f, want %.6f", c.size, row.CostPerM, c.want)
		}
		if back := costFromSI(units.US, row.NominalSize, row.CostPerM); back < 9.999999 || back > 10.000001 {
			t.Errorf("size %s: shown back as %g", c.size, back)
		}
	}
}
