package handlers

import (
	"context"
	"encoding/json"
	"html"
	"math"
	"net/http"
	"net/url"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"lagwright/catalog"
	"lagwright/store"
	"lagwright/store/storetest"
)

func postForm(t *testing.T, h http.Handler, path string, form url.Values) *httpResult {
	t.Helper()
	rec := do(t, h, http.MethodPost, path, strings.NewReader(form.Encode()),
		map[string]string{"Content-Type": "application/x-www-form-urlencoded"})
	return &httpResult{rec.Code, rec.Header().Get("Location"), rec.Body.String()}
}

type httpResult struct {
	status   int
	location string
	body     string
}

// The Materials screen shows every category, every built-in with its mark, the
// service range in °C with °F, and k at 75 °F mean.
func TestMaterialListPage(t *testing.T) {
	s, _ := newServer(t, storetest.NewDB(t))
	rec := do(t, s.Routes(), http.MethodGet, "/materials", nil, nil)
	if rec.Code != http.StatusOK {
		t.Fatalf("GET /materials = %d", rec.Code)
	}
	body := rec.Body.String()
	for _, m := range catalog.Materials() {
		for _, want := range []string{
			`data-category="` + html.EscapeString(m.Category) + `"`,
			`href="/materials/` + m.Slug + `"`,
		} {
			if !strings.Contains(body, want) {
				t.Errorf("list lacks %s", want)
			}
		}
	}
	for _, want := range []string{
		// ASTM C534 Grade 1: −297 to 220 °F is −183 to 104 °C; 0.28 Btu·in/h·ft²·°F at 75 °F (docs/references.md)
		"−183 to 104 °C", "(−297 to 220 °F)", "0.0404 W/m·K", "(0.280 Btu·in/h·ft²·°F)",
		`class="lib-mark builtin"`, `aria-current="page">Materials`, `id="pipe-materials"`, "Carbon steel",
	} {
		if !strings.Contains(body, want) {
			t.Errorf("list lacks %q", want)
		}
	}
}

var (
	xTickRE = regexp.MustCompile(`<text class="x-tick" x="([0-9.]+)"[^>]*>([^<]*)</text>`)
	yTickRE = regexp.MustCompile(`<text class="y-tick" x="[0-9.]+" y="([0-9.]+)"[^>]*>([^<]*)</text>`)
)

// ticks reads an axis' tick positions and values and checks that the axis is truly
// numeric: labels are numbers, evenly stepped, at evenly stepped positions.
func checkAxis(t *testing.T, name string, re *regexp.Regexp, body string) {
	t.Helper()
	var pos, val []float64
	for _, m := range re.FindAllStringSubmatch(body, -1) {
		p, _ := strconv.ParseFloat(m[1], 64)
		v, err := strconv.ParseFloat(strings.Replace(m[2], "−", "-", 1), 64)
		if err != nil {
			t.Errorf("%s tick label %q is not a number", name, m[2])
			return
		}
		pos, val = append(pos, p), append(val, v)
	}
	if len(val) < 3 {
		t.Fatalf("%s axis has %d ticks", name, len(val))
	}
	step, px := val[1]-val[0], pos[1]-pos[0]
	for i := 1; i < len(val); i++ {
		if math.Abs(val[i]-val[i-1]-step) > 1e-9*math.Max(1, math.Abs(step)) || math.Abs(pos[i]-pos[i-1]-px) > 0.11 {
			t.Errorf("%s axis not evenly numeric: values %v at %v", name, val, pos)
			return
		}
	}
}

// Every material's page has its k points, source, thicknesses and a chart with true
// numeric axes; the chart follows the unit choice.
func TestMaterialPageChart(t *testing.T) {
	s, _ := newServer(t, storetest.NewDB(t))
	h := s.Routes()
	for _, m := range catalog.Materials() {
		t.Run(m.Slug, func(t *testing.T) {
			rec := do(t, h, http.MethodGet, "/materials/"+m.Slug, nil, nil)
			if rec.Code != http.StatusOK {
				t.Fatalf("status %d", rec.Code)
			}
			body := rec.Body.String()
			checkAxis(t, "x", xTickRE, body)
			checkAxis(t, "y", yTickRE, body)
			if got := strings.Count(body, `class="kchart-point"`); got != len(m.KPoints) {
				t.Errorf("%d points drawn, want %d", got, len(m.KPoints))
			}
			for _, want := range []string{
				`data-testid="k-chart"`, "<svg", `class="kchart-service"`, "mean temperature, °C", "k, W/m·K",
				html.EscapeString(m.Source), `class="lib-mark builtin"`, "Copy to a custom material",
			} {
				if !strings.Contains(body, want) {
					t.Errorf("page lacks %q", want)
				}
			}
			if strings.Contains(body, `href="/materials/`+m.Slug+`/edit"`) {
				t.Error("a built-in offers an edit link")
			}
		})
	}
	// 3/8 in is stored as 9.53 mm (catalog rounding to 0.01 mm) and still reads as 3/8 in.
	if rec := do(t, h, http.MethodGet, "/materials/elastomeric_c534_gr1", nil, nil); !strings.Contains(rec.Body.String(), "9.5 mm (3/8 in)") {
		t.Error("elastomeric page lacks 9.5 mm (3/8 in)")
	}
	rec := do(t, h, http.MethodGet, "/materials/cellular_glass_c552_t1?units=us", nil, nil)
	body := rec.Body.String()
	// ASTM C552 Type I: 0.31 Btu·in/h·ft²·°F at 75 °F (docs/references.md); the point's tooltip in US units
	for _, want := range []string{"mean temperature, °F", "k, Btu·in/h·ft²·°F", "75.0 °F: 0.310 Btu·in/h·ft²·°F", "service range −450 to 800 °F"} {
		if !strings.Contains(body, want) {
			t.Errorf("US chart lacks %q", want)
		}
	}
	checkAxis(t, "x (US)", xTickRE, body)
	if rec := do(t, h, http.MethodGet, "/materials/nope", nil, nil); rec.Code != http.StatusNotFound {
		t.Errorf("unknown material page = %d", rec.Code)
	}
	if rec := do(t, h, http.MethodGet, "/materials/polyiso_c591/edit", nil, nil); rec.Code != http.StatusConflict {
		t.Errorf("edit form of a built-in = %d, want 409", rec.Code)
	}
}

func validMaterialForm() url.Values {
	return url.Values{
		"slug": {"site_foam"}, "name": {"Site foam"}, "category": {"custom foam"}, "spec": {""},
		"source": {"maker data sheet 2024"}, "units": {"si"},
		"kp_t": {"0", "24", "", "50", "", ""}, "kp_k": {"0.030", "0.032", "", "0.035", "", ""},
		"min_temp": {"-40"}, "max_temp": {"120"}, "thicknesses": {"20, 30, 40"}, "max_layer": {"40"},
	}
}

// The custom-material form: blank rows ignored, bad input re-rendered with the input
// kept and messages beside the fields, then create, edit (stale refused), delete.
func TestMaterialFormFlow(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	h := s.Routes()
	ctx := context.Background()

	rec := do(t, h, http.MethodGet, "/materials/new", nil, nil)
	if rec.Code != 200 || strings.Count(rec.Body.String(), `name="kp_t"`) < 6 || !strings.Contains(rec.Body.String(), `method="post"`) {
		t.Fatalf("new form: %d, %d k rows", rec.Code, strings.Count(rec.Body.String(), `name="kp_t"`))
	}

	bad := validMaterialForm()
	bad.Set("slug", "Site Foam")
	bad.Set("name", "My <foam>")
	bad["kp_t"] = []string{"0", "24", "", "20"}
	bad["kp_k"] = []string{"0.030", "zero", "", "0.035"}
	bad.Set("max_temp", "-50")
	bad.Set("thicknesses", "30, 20")
	res := postForm(t, h, "/materials/new", bad)
	if res.status != http.StatusUnprocessableEntity {
		t.Fatalf("bad form = %d", res.status)
	}
	for _, want := range []string{
		`data-field="slug"`, `value="Site Foam"`, `value="My &lt;foam&gt;"`, `value="zero"`,
		`data-field="k_points[1]"`, "k: ", `data-field="max_temp"`, `data-field="thicknesses"`,
		"thickness 2: thicknesses must be in ascending order", `data-testid="form-message"`, `aria-invalid="true"`,
	} {
		if !strings.Contains(res.body, want) {
			t.Errorf("re-rendered form lacks %q", want)
		}
	}
	if _, err := st.Material(ctx, "site_foam"); err == nil {
		t.Error("a bad form saved a material")
	}

	// A built-in's slug is refused beside the slug field.
	taken := validMaterialForm()
	taken.Set("slug", "polyiso_c591")
	if res := postForm(t, h, "/materials/new", taken); res.status != http.StatusConflict || !strings.Contains(res.body, "built-in material") {
		t.Errorf("built-in slug = %d", res.status)
	}

	res = postForm(t, h, "/materials/new", validMaterialForm())
	if res.status != http.StatusSeeOther || res.location != "/materials/site_foam?created=1" {
		t.Fatalf("create = %d %q: %s", res.status, res.location, res.body)
	}
	m, err := st.Material(ctx, "site_foam")
	if err != nil || len(m.KPoints) != 3 || m.KPoints[2] != (catalog.KPoint{MeanC: 50, K: 0.035}) || m.Builtin {
		t.Fatalf("created %+v %v", m, err)
	}

	// Inch-pound entry with pasted columns (header line skipped): 75 °F is 23.888… °C,
	// 0.25 Btu·in/h·ft²·°F is 0.0360569… W/m·K (exact factors, NIST SP 811).
	us := validMaterialForm()
	us.Set("slug", "ip_foam")
	us.Set("units", "us")
	us["kp_t"], us["kp_k"] = nil, nil
	us.Set("k_paste", "Mean °F\tk\n75\t0.25\n200\t0.30\n")
	us.Set("min_temp", "-40")
	us.Set("max_temp", "250")
	us.Set("thicknesses", "1, 1-1/2, 2")
	us.Set("max_layer", "2")
	if res := postForm(t, h, "/materials/new", us); res.status != http.StatusSeeOther {
		t.Fatalf("US form = %d: %s", res.status, res.body)
	}
	ip, _ := st.Material(ctx, "ip_foam")
	if len(ip.KPoints) != 2 || math.Abs(ip.KPoints[0].MeanC-23.8888889) > 1e-6 || math.Abs(ip.KPoints[0].K-0.0360569720) > 1e-9 ||
		ip.ThicknessesMM[1] != 38.1 || math.Abs(ip.MaxC-121.1111111) > 1e-6 || ip.MaxLayerMM != 50.8 {
		t.Errorf("US entry stored as %+v", ip.Material)
	}

	// Edit: the form carries the version; a stale one is refused with the input kept.
	rec = do(t, h, http.MethodGet, "/materials/site_foam/edit", nil, nil)
	if rec.Code != 200 || !strings.Contains(rec.Body.String(), `name="version" value="1"`) || !strings.Contains(rec.Body.String(), `value="0.035"`) {
		t.Fatalf("edit form: %d", rec.Code)
	}
	edit := validMaterialForm()
	edit.Set("version", "1")
	edit.Set("name", "Site foam, revised")
	if res := postForm(t, h, "/materials/site_foam/edit", edit); res.status != http.StatusSeeOther || res.location != "/materials/site_foam?saved=1" {
		t.Fatalf("edit = %d %q: %s", res.status, res.location, res.body)
	}
	if m, _ := st.Material(ctx, "site_foam"); m.Version != 2 || m.Name != "Site foam, revised" {
		t.Errorf("after edit: %+v", m)
	}
	edit.Set("name", "Late edit")
	if res := postForm(t, h, "/materials/site_foam/edit", edit); res.status != http.StatusConflict ||
		!strings.Contains(res.body, "Someone else saved") || !strings.Contains(res.body, `value="Late edit"`) {
		t.Errorf("stale edit = %d", res.status)
	}

	// Delete: confirmation, refusal while a line uses it, then gone.
	if rec := do(t, h, http.MethodGet, "/materials/site_foam/delete", nil, nil); rec.Code != 200 || !strings.Contains(rec.Body.String(), `action="/materials/site_foam/delete"`) {
		t.Errorf("confirmation = %d", rec.Code)
	}
	p, _ := st.CreateProject(ctx, store.Project{Name: "Plant room", Units: "si"})
	l, err := st.CreateLine(ctx, store.Line{ProjectID: p.ID, Tag: "CHW-7", Input: json.RawMessage(`{}`)}, []string{"site_foam"})
	if err != nil {
		t.Fatal(err)
	}
	if res := postForm(t, h, "/materials/site_foam/delete", nil); res.status != http.StatusConflict || !strings.Contains(res.body, "CHW-7 (Plant room)") {
		t.Errorf("delete in use = %d", res.status)
	}
	if err := st.DeleteLine(ctx, p.ID, l.ID); err != nil {
		t.Fatal(err)
	}
	if res := postForm(t, h, "/materials/site_foam/delete", nil); res.status != http.StatusSeeOther || res.location != "/materials?deleted=site_foam" {
		t.Errorf("delete = %d %q", res.status, res.location)
	}
	if res := postForm(t, h, "/materials/polyiso_c591/delete", nil); res.status != http.StatusConflict {
		t.Errorf("delete built-in = %d", res.status)
	}
}

func TestJacketPages(t *testing.T) {
	st := storetest.NewDB(t)
	s, _ := newServer(t, st)
	h := s.Routes()
	rec := do(t, h, http.MethodGet, "/jackets", nil, nil)
	if rec.Code != 200 {
		t.Fatalf("GET /jackets = %d", rec.Code)
	}
	for _, j := range catalog.Jackets() {
		if !strings.Contains(rec.Body.String(), `data-slug="`+j.Slug+`"`) {
			t.Errorf("jackets page lacks %s", j.Slug)
		}
	}
	// ASJ: permeance 0.02 perm = 1.14 ng/(Pa·s·m²) (1 perm = 57.2135 ng/(Pa·s·m²), NIST SP 811)
	if !strings.Contains(rec.Body.String(), "0.02 perm (1.14 ng/Pa·s·m²)") {
		t.Error("jackets page lacks the ASJ permeance in both units")
	}
	form := url.Values{"slug": {"site_jacket"}, "name": {"Site jacket"}, "emittance": {"1.4"}, "source": {"test"}, "permeance": {"x"}}
	if res := postForm(t, h, "/jackets/new", form); res.status != 422 || !strings.Contains(res.body, `data-field="emittance"`) ||
		!strings.Contains(res.body, `data-field="permeance"`) || !strings.Contains(res.body, `value="1.4"`) {
		t.Errorf("bad jacket = %d", res.status)
	}
	form.Set("emittance", "0.9")
	form.Set("permeance", "57.2135 ng/Pa·s·m²")
	if res := postForm(t, h, "/jackets/new", form); res.status != http.StatusSeeOther {
		t.Fatalf("create jacket = %d: %s", res.status, res.body)
	}
	if j, err := st.Jacket(context.Background(), "site_jacket"); err != nil || math.Abs(j.PermeancePerm-1) > 1e-6 || j.Emittance != 0.9 {
		t.Errorf("stored %+v %v", j, err)
	}
	if rec := do(t, h, http.MethodGet, "/jackets/canvas/edit", nil, nil); rec.Code != http.StatusConflict {
		t.Errorf("edit built-in jacket = %d", rec.Code)
	}
	if res := postForm(t, h, "/jackets/site_jacket/delete", nil); res.status != http.StatusSeeOther {
		t.Errorf("delete jacket = %d", res.status)
	}
}
