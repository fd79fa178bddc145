package handlers

import (
	"context"
	"encoding/json"
	"fmt"
	"net/http"
	"regexp"
	"strconv"
	"strings"

	"github.com/a-h/templ"

	"lagwright/analysis"
	"lagwright/catalog"
	"lagwright/field"
	"lagwright/store"
	"lagwright/units"
	"lagwright/web"
)

// The project form: name, client, site, display units, and the settings (design
// conditions per location with per-criterion sets, default criteria, economics,
// fitting allowances), typed in the units chosen on the form and stored in SI.

var (
	locationNames = []string{"indoor", "outdoor"}
	conditionSets = []string{"personnel", "condensation", "freeze", "economics"}
)

// airFields are the four values of a condition set under prefix.
func airFields(prefix string, freeze bool) []numField {
	f := []numField{
		{Key: prefix + "ambient_temp_c", Q: units.Temp, Label: "Ambient"},
		{Key: prefix + "surroundings_temp_c", Q: units.Temp, Label: "Surroundings"},
		{Key: prefix + "wind_m_s", Q: units.Speed, Label: "Wind"},
		{Key: prefix + "relative_humidity_pct", Label: "Relative humidity"},
		{Key: prefix + "dew_point_c", Q: units.Temp, Label: "Dew point"},
	}
	if freeze {
		f = append(f, numField{Key: prefix + "initial_temp_c", Q: units.Temp, Label: "Initial water temperature"})
	}
	return f
}

// projectNumFields lists every numeric field of the project form.
func projectNumFields() []numField {
	var out []numField
	for _, loc := range locationNames {
		out = append(out, airFields("settings."+loc+".", false)...)
		for _, set := range conditionSets {
			out = append(out, airFields("settings."+loc+".conditions."+set+".", set == "freeze")...)
		}
	}
	out = append(out,
		numField{Key: "settings.criteria.max_surface_temp_c", Q: units.Temp, Label: "Touch limit"},
		numField{Key: "settings.criteria.dew_margin_k", Q: units.TempDiff, Label: "Dew-point margin"},
		numField{Key: "settings.economics.heating.price_per_kwh", Label: "Heating: price per kWh bought"},
		numField{Key: "settings.economics.heating.efficiency", Scale: 0.01, Label: "Heating: plant efficiency"},
		numField{Key: "settings.economics.heating.hours_per_year", Label: "Heating: hours a year"},
		numField{Key: "settings.economics.heating.co2_kg_per_kwh", Label: "Heating: CO2 per kWh bought (kg)"},
		numField{Key: "settings.economics.cooling.price_per_kwh", Label: "Cooling: price per kWh of electricity"},
		numField{Key: "settings.economics.cooling.cop", Label: "Cooling: COP"},
		numField{Key: "settings.economics.cooling.hours_per_year", Label: "Cooling: hours a year"},
		numField{Key: "settings.economics.cooling.co2_kg_per_kwh", Label: "Cooling: CO2 per kWh of electricity (kg)"},
		numField{Key: "settings.economics.discount_rate", Scale: 0.01, Label: "Discount rate"},
		numField{Key: "settings.economics.escalation_rate", Scale: 0.01, Label: "Energy escalation"},
		numField{Key: "settings.economics.life_years", Int: true, Label: "Life (years)"},
		numField{Key: "settings.fittings.elbow_m", Q: units.LongLength, Label: "Elbow"},
		numField{Key: "settings.fittings.tee_m", Q: units.LongLength, Label: "Tee"},
		numField{Key: "settings.fittings.valve_m", Q: units.LongLength, Label: "Valve"},
		numField{Key: "settings.fittings.flange_m", Q: units.LongLength, Label: "Flange pair"},
		numField{Key: "settings.fittings.cap_m", Q: units.LongLength, Label: "Cap"},
		numField{Key: "settings.fittings.strainer_m", Q: units.LongLength, Label: "Strainer"},
		numField{Key: "settings.fittings.reducer_m", Q: units.LongLength, Label: "Reducer"},
	)
	return out
}

// projectInput is a project as a form or the API gives it, before saving.
type projectInput struct {
	Name     string                   `json:"name"`
	Client   string                   `json:"client"`
	Site     string                   `json:"site"`
	Units    string                   `json:"units"`
	Settings analysis.ProjectSettings `json:"settings"`
	Version  *int                     `json:"version"`
}

// validate checks the project beyond the types: name, units, and the settings
// (ProjectSettings.Validate plus the condition sets and economics it leaves alone).
//
// codeTable finds an energy-code table by id (the library: built-in and custom tables).
func (p *projectInput) validate(codeTable func(id string) (catalog.CodeTable, bool)) field.Errors {
	var fe field.Errors
	add := func(name, msg string) { fe = append(fe, field.Error{Field: name, Message: msg}) }
	p.Name, p.Client, p.Site = strings.TrimSpace(p.Name), strings.TrimSpace(p.Client), strings.TrimSpace(p.Site)
	if p.Name == "" {
		add("name", "is required")
	}
	for k, v := range map[string]string{"name": p.Name, "client": p.Client, "site": p.Site} {
		if len(v) > 200 {
			add(k, "must be at most 200 characters")
		}
	}
	if p.Units != "si" && p.Units != "us" {
		add("units", `must be "si" or "us"`)
	}
	if err := p.Settings.Validate(); err != nil {
		fe = append(fe, asFieldErrors(err)...)
	}
	rng := func(field string, v *float64, lo, hi float64) {
		if v != nil && (*v < lo || *v > hi) {
			add(field, fmt.Sprintf("must be between %g and %g", lo, hi))
		}
	}
	for _, name := range locationNames {
		loc := p.Settings.Indoor
		if name == "outdoor" {
			loc = p.Settings.Outdoor
		}
		if loc.Conditions == nil {
			continue
		}
		sets := map[string]*analysis.ConditionSet{"personnel": loc.Conditions.Personnel, "condensation": loc.Conditions.Condensation,
			"freeze": loc.Conditions.Freeze, "economics": loc.Conditions.Economics}
		for _, sn := range conditionSets {
			cs := sets[sn]
			if cs == nil {
				continue
			}
			pre := "settings." + name + ".conditions." + sn + "."
			rng(pre+"ambient_temp_c", cs.AmbientTempC, -70, 80)
			rng(pre+"surroundings_temp_c", cs.SurroundingsTempC, -100, 300)
			rng(pre+"wind_m_s", cs.WindMS, 0, 40)
			rng(pre+"relative_humidity_pct", cs.RelativeHumidityPct, 0.1, 100)
			rng(pre+"dew_point_c", cs.DewPointC, -70, 80)
			if cs.RelativeHumidityPct != nil && cs.DewPointC != nil {
				add(pre+"relative_humidity_pct", "give the relative humidity or the dew point, not both")
				add(pre+"dew_point_c", "give the relative humidity or the dew point, not both")
			}
			rng(pre+"initial_temp_c", cs.InitialTempC, 0, 850)
		}
	}
	if c := p.Settings.Criteria.EnergyCode; c != "" {
		if _, ok := codeTable(c); !ok {
			add("settings.criteria.energy_code", "unknown energy-code table")
		}
	}
	return fe
}

// project builds the row to save.
func (p *projectInput) project() store.Project {
	js, _ := json.Marshal(p.Settings)
	return store.Project{Name: p.Name, Client: p.Client, Site: p.Site, Units: p.Units, Settings: js}
}

// projectFormFromRequest reads the project form. Numbers are typed in the units chosen
// on the form. A blank optional value is "not given"; blank required ones fall back to
// their defaults only where the form says so (fittings allowances).
func projectFormFromRequest(r *http.Request) (*formState, projectInput) {
	st := newFormState()
	var in projectInput
	for _, k := range []string{"name", "client", "site", "units", "version", "settings.criteria.energy_code", "settings.criteria.touch_exposure", "settings.economics.currency"} {
		st.Values.Set(k, r.PostForm.Get(k))
	}
	in.Name, in.Client, in.Site = r.PostForm.Get("name"), r.PostForm.Get("client"), r.PostForm.Get("site")
	in.Units = r.PostForm.Get("units")
	sys := units.System(in.Units)
	if !sys.Valid() {
		sys = units.SI
	}
	m := map[string]any{}
	readNums(r, projectNumFields(), sys, st, m)
	for _, loc := range locationNames {
		if formGetPath(m, "settings."+loc+".ambient_temp_c") == nil && st.Errors["settings."+loc+".ambient_temp_c"] == "" {
			st.addError("settings."+loc+".ambient_temp_c", "is required")
		}
	}
	if c := r.PostForm.Get("settings.criteria.energy_code"); c != "" {
		formSetPath(m, "settings.criteria.energy_code", c)
	}
	if c := strings.TrimSpace(r.PostForm.Get("settings.criteria.touch_exposure")); c != "" {
		formSetPath(m, "settings.criteria.touch_exposure", c)
	}
	if c := strings.ToUpper(strings.TrimSpace(r.PostForm.Get("settings.economics.currency"))); c != "" {
		formSetPath(m, "settings.economics.currency", c)
	}
	settings, _ := m["settings"].(map[string]any)
	if settings == nil {
		settings = map[string]any{}
	}
	if _, ok := settings["fittings"]; !ok {
		settings["fittings"] = jsonMap(analysis.FittingAllowances{})
	}
	js, _ := json.Marshal(settings)
	if err := analysis.DecodeStrict(js, &in.Settings); err != nil {
		st.place(asFieldErrors(err), func(f string) (string, bool) { return "settings." + f, true })
	}
	if v, err := parseVersion(r.PostForm.Get("version")); err == nil {
		in.Version = &v
	}
	return st, in
}

// projectFormValues fills a form from a stored project.
func projectFormValues(p store.Project, set analysis.ProjectSettings) *formState {
	st := newFormState()
	st.Values.Set("name", p.Name)
	st.Values.Set("client", p.Client)
	st.Values.Set("site", p.Site)
	st.Values.Set("units", p.Units)
	st.Values.Set("version", strconv.Itoa(p.Version))
	st.Values.Set("settings.criteria.energy_code", set.Criteria.EnergyCode)
	st.Values.Set("settings.criteria.touch_exposure", set.Criteria.TouchExposure)
	if set.Economics != nil {
		st.Values.Set("settings.economics.currency", set.Economics.Currency)
	}
	writeNums(map[string]any{"settings": jsonMap(set)}, projectNumFields(), units.System(p.Units), st)
	return st
}

// projectFormView builds the view of the project form.
func (s *Server) projectFormView(ctx context.Context, st *formState, p *store.Project) web.ProjectFormView {
	sys := units.System(st.Values.Get("units"))
	if !sys.Valid() {
		sys = units.SI
	}
	v := web.ProjectFormView{Assets: s.assets.urls, EntryForm: st.view(), Title: "New project", Action: "/projects", Cancel: "/projects"}
	if p != nil {
		v.Title, v.Action, v.Cancel = "Edit "+p.Name, fmt.Sprintf("/projects/%d/edit", p.ID), fmt.Sprintf("/projects/%d", p.ID)
	}
	label := map[string]string{}
	for _, f := range projectNumFields() {
		label[f.Key] = f.unitLabel(sys)
	}
	v.Units = label
	for _, loc := range locationNames {
		lv := web.LocationFields{Name: loc, Title: map[string]string{"indoor": "Indoor", "outdoor": "Outdoor"}[loc]}
		rows := append([]string{""}, conditionSets...)
		for _, set := range rows {
			pre := "settings." + loc + "."
			title := "Design"
			if set != "" {
				pre += "conditions." + set + "."
				title = map[string]string{"personnel": "Personnel protection", "condensation": "Condensation",
					"freeze": "Freeze", "economics": "Economics"}[set]
			}
			row := web.ConditionRow{Title: title, Prefix: pre, Freeze: set == "freeze", Design: set == ""}
			lv.Rows = append(lv.Rows, row)
		}
		v.Locations = append(v.Locations, lv)
	}
	for _, t := range s.codeTableList(ctx) {
		v.EnergyCodes = append(v.EnergyCodes, web.Choice{Value: t.ID, Label: t.Title()})
	}
	other := units.US
	v.UnitsName, v.SwitchLabel = "SI (mm, °C, W/m, m)", "Use US customary units instead"
	if sys == units.US {
		other = units.SI
		v.UnitsName, v.SwitchLabel = "US customary (in, °F, Btu/h·ft, ft)", "Use SI units instead"
	}
	v.SwitchURL = "/projects/new?units=" + string(other)
	if p != nil {
		v.SwitchURL = fmt.Sprintf("/projects/%d/edit?units=%s", p.ID, other)
	}
	return v
}

// localiseRanges rewrites the range messages of the form's numeric fields ("must be
// between 30 and 100 °C", from the validation in SI) in the units the form is in.
func localiseRanges(st *formState, sys units.System) {
	fields := map[string]numField{}
	for _, f := range projectNumFields() {
		fields[f.Key] = f
	}
	for k, msg := range st.Errors {
		if f, ok := fields[k]; ok {
			st.Errors[k] = localiseRange(f, sys, msg)
		}
	}
}

var rangeMsg = regexp.MustCompile(`^must be between (-?[0-9.e+]+) and (-?[0-9.e+]+)( .*)?$`)

// localiseRange writes one range message (its bounds in SI, with or without the SI
// unit) in a system's units; other messages are returned as they are.
func localiseRange(f numField, sys units.System, msg string) string {
	m := rangeMsg.FindStringSubmatch(msg)
	if m == nil {
		return msg
	}
	lo, err1 := strconv.ParseFloat(m[1], 64)
	hi, err2 := strconv.ParseFloat(m[2], 64)
	if err1 != nil || err2 != nil {
		return msg
	}
	var a, b, unit string
	switch {
	case f.Q > 0:
		a, b, unit = strings.TrimSuffix(units.Format(f.Q, sys, lo), ".0"), strings.TrimSuffix(units.Format(f.Q, sys, hi), ".0"), units.Label(f.Q, sys)
	case f.Scale != 0:
		a, b, unit = formPlain(lo/f.Scale), formPlain(hi/f.Scale), "%"
	default:
		return msg
	}
	return "must be between " + a + " and " + b + " " + unit
}

// projectNew shows the form in SI, or in US customary units with ?units=us: the
// defaults converted, the headings and messages in those units.
func (s *Server) projectNew(w http.ResponseWriter, r *http.Request) {
	p := store.Project{Units: "si"}
	if r.URL.Query().Get("units") == "us" {
		p.Units = "us"
	}
	st := projectFormValues(p, analysis.DefaultSettings())
	st.Values.Del("version")
	templ.Handler(web.ProjectForm(s.projectFormView(r.Context(), st, nil))).ServeHTTP(w, r)
}

func (s *Server) projectCreate(w http.ResponseWriter, r *http.Request) {
	if err := r.ParseForm(); err != nil {
		s.fail(w, r, err)
		return
	}
	st, in := projectFormFromRequest(r)
	st.place(in.validate(s.codeTables(r)), func(f string) (string, bool) { return f, true })
	localiseRanges(st, units.System(in.Units))
	if !st.ok() {
		templ.Handler(web.ProjectForm(s.projectFormView(r.Context(), st, nil)), templ.WithStatus(http.StatusUnprocessableEntity)).ServeHTTP(w, r)
		return
	}
	p, err := s.store.CreateProject(r.Context(), in.project())
	if err != nil {
		s.fail(w, r, err)
		return
	}
	http.Redirect(w, r, fmt.Sprintf("/projects/%d", p.ID), http.StatusSeeOther)
}

func (s *Server) projectEdit(w http.ResponseWriter, r *http.Request) {
	p, set := projectOf(r)
	// ?units= shows the form in the other system (the stored values converted); saving
	// it then changes the project's display units.
	shown := p
	if u := units.System(r.URL.Query().Get("units")); u.Valid() {
		shown.Units = string(u)
	}
	templ.Handler(web.ProjectForm(s.projectFormView(r.Context(), projectFormValues(shown, set), &p))).ServeHTTP(w, r)
}

func (s *Server) projectUpdate(w http.ResponseWriter, r *http.Request) {
	p, _ := projectOf(r)
	if err := r.ParseForm(); err != nil {
		s.fail(w, r, err)
		return
	}
	st, in := projectFormFromRequest(r)
	st.place(in.validate(s.codeTables(r)), func(f string) (string, bool) { return f, true })
	localiseRanges(st, units.System(in.Units))
	if in.Version == nil {
		st.Other = append(st.Other, "The form lacks its version; reload the page.")
	}
	if !st.ok() {
		templ.Handler(web.ProjectForm(s.projectFormView(r.Context(), st, &p)), templ.WithStatus(http.StatusUnprocessableEntity)).ServeHTTP(w, r)
		return
	}
	row := in.project()
	row.ID, row.Version = p.ID, *in.Version
	if _, err := s.store.UpdateProject(r.Context(), row); err != nil {
		if classify(err).Code == CodeConflict {
			st.Values.Set("version", strconv.Itoa(p.Version))
			v := s.projectFormView(r.Context(), st, &p)
			v.Notice = "Someone else saved this project after you opened it. Your changes are below, not saved yet; " +
				"check them and save again to overwrite, or reload the page to see theirs."
			templ.Handler(web.ProjectForm(v), templ.WithStatus(http.StatusConflict)).ServeHTTP(w, r)
			return
		}
		s.fail(w, r, err)
		return
	}
	http.Redirect(w, r, fmt.Sprintf("/projects/%d", p.ID), http.StatusSeeOther)
}
