package analysis

import (
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"fmt"
	"slices"

	"lagwright/calc"
)

// ProjectSettings are a project's design conditions, default criteria, economics and
// fitting allowances, stored as JSON with the project (SI). A line takes from them what
// it does not set itself.
type ProjectSettings struct {
	Indoor    Location          `json:"indoor"`
	Outdoor   Location          `json:"outdoor"`
	Criteria  ProjectCriteria   `json:"criteria"`
	Economics *Economics        `json:"economics,omitempty"`
	Fittings  FittingAllowances `json:"fittings"`
}

// Location holds the design conditions of one location (indoor or outdoor) with its
// per-criterion condition sets.
type Location struct {
	AmbientTempC        float64     `json:"ambient_temp_c"`
	SurroundingsTempC   *float64    `json:"surroundings_temp_c,omitempty"`
	WindMS              float64     `json:"wind_m_s"`
	RelativeHumidityPct *float64    `json:"relative_humidity_pct,omitempty"`
	Conditions          *Conditions `json:"conditions,omitempty"`
}

// ProjectCriteria are the project's default criteria.
type ProjectCriteria struct {
	MaxSurfaceTempC *float64 `json:"max_surface_temp_c,omitempty"`
	DewMarginK      *float64 `json:"dew_margin_k,omitempty"`
	EnergyCode      string   `json:"energy_code,omitempty"`
}

// FittingAllowances is the equivalent insulated length of one fitting of each kind, in
// metres of the run. Our defaults are common practice for heat loss and material
// take-off on small and medium pipe; edit them per project.
type FittingAllowances struct {
	ElbowM  float64 `json:"elbow_m"`
	TeeM    float64 `json:"tee_m"`
	ValveM  float64 `json:"valve_m"`
	FlangeM float64 `json:"flange_m"`
	CapM    float64 `json:"cap_m"`
}

// Fittings counts the fittings on a run.
type Fittings struct {
	Elbows  int `json:"elbows"`
	Tees    int `json:"tees"`
	Valves  int `json:"valves"`
	Flanges int `json:"flanges"`
	Caps    int `json:"caps"`
}

// DefaultSettings is a new project's settings: a temperate indoor plant room and a
// mild outdoor design day. Users are expected to edit them.
func DefaultSettings() ProjectSettings {
	return ProjectSettings{
		Indoor:   Location{AmbientTempC: 24, RelativeHumidityPct: ptr(50.0)},
		Outdoor:  Location{AmbientTempC: 30, WindMS: 3, RelativeHumidityPct: ptr(70.0)},
		Criteria: ProjectCriteria{MaxSurfaceTempC: ptr(60.0), DewMarginK: ptr(1.0)},
		Fittings: DefaultFittingAllowances(),
	}
}

// DefaultFittingAllowances are our defaults (common practice: a fitting counts as a
// short length of run — an elbow about 0.6 m, a valve about 1.5 m with its bonnet).
func DefaultFittingAllowances() FittingAllowances {
	return FittingAllowances{ElbowM: 0.6, TeeM: 0.9, ValveM: 1.5, FlangeM: 0.6, CapM: 0.3}
}

// EquivalentLength is the fittings' equivalent insulated length, m.
func (a FittingAllowances) EquivalentLength(f Fittings) float64 {
	return float64(f.Elbows)*a.ElbowM + float64(f.Tees)*a.TeeM + float64(f.Valves)*a.ValveM +
		float64(f.Flanges)*a.FlangeM + float64(f.Caps)*a.CapM
}

// Validate checks the settings into field errors (paths as in the project JSON).
func (p ProjectSettings) Validate() error {
	var c errs
	for name, loc := range map[string]Location{"indoor": p.Indoor, "outdoor": p.Outdoor} {
		pre := "settings." + name + "."
		rangeCheck(&c, pre+"ambient_temp_c", &loc.AmbientTempC, -70, 80, "°C")
		rangeCheck(&c, pre+"surroundings_temp_c", loc.SurroundingsTempC, -100, 300, "°C")
		rangeCheck(&c, pre+"wind_m_s", &loc.WindMS, 0, 40, "m/s")
		rangeCheck(&c, pre+"relative_humidity_pct", loc.RelativeHumidityPct, 0.1, 100, "%")
	}
	rangeCheck(&c, "settings.criteria.max_surface_temp_c", p.Criteria.MaxSurfaceTempC, 20, 200, "°C")
	rangeCheck(&c, "settings.criteria.dew_margin_k", p.Criteria.DewMarginK, 0, 20, "K")
	for name, v := range map[string]float64{"elbow_m": p.Fittings.ElbowM, "tee_m": p.Fittings.TeeM, "valve_m": p.Fittings.ValveM,
		"flange_m": p.Fittings.FlangeM, "cap_m": p.Fittings.CapM} {
		rangeCheck(&c, "settings.fittings."+name, &v, 0, 50, "m")
	}
	return c.err()
}

// Effective is the calculation input of a stored line: the line's own input, with the
// project's design conditions for its location, default criteria, economics and
// fitting allowances filling what the line leaves unset.
func (p ProjectSettings) Effective(location string, line Input, fit Fittings) Input {
	in := line
	loc := p.Indoor
	if location == "outdoor" {
		loc = p.Outdoor
	}
	if in.AmbientTempC == nil {
		in.AmbientTempC = ptr(loc.AmbientTempC)
		if in.SurroundingsTempC == nil {
			in.SurroundingsTempC = loc.SurroundingsTempC
		}
	}
	if in.WindMS == nil {
		in.WindMS = ptr(loc.WindMS)
	}
	if in.RelativeHumidityPct == nil {
		in.RelativeHumidityPct = loc.RelativeHumidityPct
	}
	if in.Conditions == nil && loc.Conditions != nil {
		cs := *loc.Conditions
		in.Conditions = &cs
	}
	cr := Criteria{}
	if in.Criteria != nil {
		cr = *in.Criteria
	}
	if cr.MaxSurfaceTempC == nil {
		cr.MaxSurfaceTempC = p.Criteria.MaxSurfaceTempC
	}
	if cr.DewMarginK == nil {
		cr.DewMarginK = p.Criteria.DewMarginK
	}
	if cr.EnergyCode == "" && in.Geometry == "pipe" {
		cr.EnergyCode = p.Criteria.EnergyCode
	}
	in.Criteria = &cr
	if in.Economics == nil && p.Economics != nil && p.Economics.EnergyPricePerKWh != nil {
		e := *p.Economics
		in.Economics = &e
	}
	if eq := p.Fittings.EquivalentLength(fit); eq > 0 && in.FittingsEquivLengthM == nil && in.LengthM != nil {
		in.FittingsEquivLengthM = ptr(eq)
	}
	return in
}

// Versions names the version of every material and jacket a result depends on.
type Versions map[string]int

// ResultHash keys a stored result: the effective input, the versions of the materials
// and jackets it names and the method version. A stored result whose hash differs is
// stale and is computed again.
func ResultHash(in Input, v Versions) string {
	h := sha256.New()
	js, _ := json.Marshal(in) // Input holds only marshalable values
	h.Write(js)
	keys := make([]string, 0, len(v))
	for k := range v {
		keys = append(keys, k)
	}
	slices.Sort(keys)
	for _, k := range keys {
		fmt.Fprintf(h, "|%s=%d", k, v[k])
	}
	fmt.Fprintf(h, "|method=%s", calc.MethodVersion)
	return hex.EncodeToString(h.Sum(nil))
}

// Slugs lists the material and jacket slugs an input names, for ResultHash and for the
// store's record of which lines use which material.
func (in Input) Slugs() (materials []string, jacket string) {
	for _, l := range in.Layers {
		if l.Material != "" && !slices.Contains(materials, l.Material) {
			materials = append(materials, l.Material)
		}
	}
	return materials, in.Jacket
}
