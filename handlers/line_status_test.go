package handlers

import (
	"context"
	"math"
	"net/http"
	"net/url"
	"regexp"
	"slices"
	"strings"
	"testing"

	"lagwright/analysis"
	"lagwright/store/storetest"
)

// The demo project's badges, as the project page renders them, agree with the checks of
// every line's answer; each check agrees with its own value and limit, and the personnel
// check's value is the surface the heat balance gives at the personnel conditions
// (solved again as design conditions). The demo is our invented scenario.
func TestDemoBadgesAgreeWithChecks(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	h := s.Routes()
	rec := postPage(t, h, "/projects/demo", url.Values{}, nil)
	if rec.Code != http.StatusSeeOther {
		t.Fatalf("demo = %d", rec.Code)
	}
	list, _ := st.Projects(context.Background())
	if len(list) != 1 {
		t.Fatalf("projects %v", list)
	}
	_, views := freshLines(t, s, list[0].Project)
	body := do(t, h, "GET", rec.Header().Get("Location"), nil, nil).Body.String()
	rows := strings.Split(body, `data-testid="line-row"`)[1:]
	tagRe, statusRe := regexp.MustCompile(`data-tag="([^"]+)"`), regexp.MustCompile(`data-status="([^"]+)"`)
	badges := map[string][]string{}
	for _, r := range rows {
		m := tagRe.FindStringSubmatch(r)
		if m == nil {
			continue
		}
		for _, s := range statusRe.FindAllStringSubmatch(r, -1) {
			badges[m[1]] = append(badges[m[1]], s[1])
		}
	}
	if len(badges) != len(views) {
		t.Fatalf("%d rows with badges on the page, %d lines", len(badges), len(views))
	}
	seen := map[string]bool{}
	for _, v := range views {
		o := v.Result.Output
		if o == nil {
			t.Fatalf("%s: no answer: %v", v.Line.Tag, v.Result.Errors)
		}
		var want []string
		for _, c := range o.Checks {
			if ok := map[string]bool{"max": c.Value <= c.Limit, "min": c.Value >= c.Limit}[c.Sense]; ok != c.Pass {
				t.Errorf("%s: check %+v: pass disagrees with its value and limit", v.Line.Tag, c)
			}
			if c.Pass {
				continue
			}
			key := map[string]string{"personnel_protection": StatusTooHot, "condensation": StatusCondenses,
				"energy_code": StatusBelowCode}[c.Criterion]
			if key == "" {
				key = StatusFails
			}
			if !slices.Contains(want, key) {
				want = append(want, key)
			}
		}
		if len(o.Sizing.Unmet) > 0 {
			want = append(want, StatusUnmet)
		}
		if len(want) == 0 {
			want = []string{StatusOK}
		}
		got := badges[v.Line.Tag]
		slices.Sort(got)
		slices.Sort(want)
		if !slices.Equal(got, want) {
			t.Errorf("%s: badges %v, checks say %v (%+v)", v.Line.Tag, got, want, o.Checks)
		}
		for _, k := range got {
			seen[k] = true
		}
		if c := personnelCheck(o); c != nil {
			in := v.Effective
			p := o.ConditionsUsed.Personnel
			in.AmbientTempC, in.SurroundingsTempC, in.WindMS = &p.AmbientTempC, &p.SurroundingsTempC, &p.WindMS
			in.Conditions = &analysis.Conditions{Personnel: &analysis.ConditionSet{AmbientTempC: &p.AmbientTempC,
				SurroundingsTempC: &p.SurroundingsTempC, WindMS: &p.WindMS, SolarFluxWm2: new(float64)}}
			sunlit := p.SolarFluxWm2 != nil && *p.SolarFluxWm2 > 0
			again, err := analysis.Analyse(in, analysis.CatalogResolver{})
			if err != nil {
				t.Fatalf("%s again: %v", v.Line.Tag, err)
			}
			hot := again.SurfaceTempC
			for _, f := range again.Faces {
				hot = math.Max(hot, f.SurfaceTempC)
			}
			switch {
			case !sunlit && math.Abs(hot-c.Value) > 0.01:
				t.Errorf("%s: personnel check %v °C, the surface at the personnel conditions is %v °C", v.Line.Tag, c.Value, hot)
			case sunlit && c.Value <= hot: // sunlight only warms the jacket
				t.Errorf("%s: sunlit personnel check %v °C, not above the shaded surface %v °C", v.Line.Tag, c.Value, hot)
			}
		}
	}
	for _, k := range []string{StatusTooHot, StatusCondenses, StatusOK} {
		if !seen[k] {
			t.Errorf("no demo line shows %q: the walk would not catch a wrong badge of that kind", k)
		}
	}
}

func personnelCheck(o *analysis.Output) *analysis.Check {
	for i := range o.Checks {
		if o.Checks[i].Criterion == "personnel_protection" {
			return &o.Checks[i]
		}
	}
	return nil
}
