package schedule

import (
	"encoding/json"
	"fmt"
	"strconv"

	"lagwright/analysis"
)

// A schedule row reads a few dozen bytes of a line's stored answer (about 5 KB of JSON
// with its economics table, assumptions and warnings). The exports of big projects ask
// the database for just those parts (store.EachScheduleLines) and put them back
// together with StoredFromParts; buildRow and Builder.Add read nothing else of an
// analysis.Output. A field added to what they read must be added here too
// (TestStoredFromParts compares the rows both ways).

// resultPart is one part of a stored answer and where it goes.
type resultPart struct {
	path []string
	set  func(st *analysis.Stored, o *analysis.Output, v []byte) error
}

func floatPart(field func(o *analysis.Output) *float64) func(*analysis.Stored, *analysis.Output, []byte) error {
	return func(_ *analysis.Stored, o *analysis.Output, v []byte) error {
		f, err := strconv.ParseFloat(string(v), 64)
		*field(o) = f
		return err
	}
}

func optFloatPart(field func(o *analysis.Output) **float64) func(*analysis.Stored, *analysis.Output, []byte) error {
	return func(_ *analysis.Stored, o *analysis.Output, v []byte) error {
		f, err := strconv.ParseFloat(string(v), 64)
		*field(o) = &f
		return err
	}
}

func jsonPart(field func(o *analysis.Output) any) func(*analysis.Stored, *analysis.Output, []byte) error {
	return func(_ *analysis.Stored, o *analysis.Output, v []byte) error {
		return json.Unmarshal(v, field(o))
	}
}

func jsonBool(v []byte) (bool, error) {
	switch string(v) {
	case "true":
		return true, nil
	case "false":
		return false, nil
	}
	return false, fmt.Errorf("%q is not a JSON boolean", v)
}

// outputMarker is the index of a part that every stored output has (geometry is
// always written), so a non-nil value means the answer has an output.
const outputMarker = 0

var resultParts = []resultPart{
	{[]string{"output", "geometry"}, func(_ *analysis.Stored, o *analysis.Output, v []byte) error {
		o.Geometry = string(v)
		return nil
	}},
	{[]string{"output", "pipe_od_mm"}, optFloatPart(func(o *analysis.Output) **float64 { return &o.PipeODmm })},
	{[]string{"output", "operating_temp_c"}, floatPart(func(o *analysis.Output) *float64 { return &o.OperatingTempC })},
	{[]string{"output", "insulation_thickness_mm"}, floatPart(func(o *analysis.Output) *float64 { return &o.InsulationMM })},
	{[]string{"output", "outer_diameter_mm"}, optFloatPart(func(o *analysis.Output) **float64 { return &o.OuterDiameterMM })},
	{[]string{"output", "outer_area_m2_per_m"}, optFloatPart(func(o *analysis.Output) **float64 { return &o.OuterAreaM2PerM })},
	{[]string{"output", "heat_flow_w_per_m"}, optFloatPart(func(o *analysis.Output) **float64 { return &o.HeatFlowWPerM })},
	{[]string{"output", "heat_flow_w"}, optFloatPart(func(o *analysis.Output) **float64 { return &o.HeatFlowW })},
	{[]string{"output", "equivalent_length_m"}, optFloatPart(func(o *analysis.Output) **float64 { return &o.EquivalentLengthM })},
	{[]string{"output", "fittings_detail"}, jsonPart(func(o *analysis.Output) any { return &o.Fittings })},
	{[]string{"output", "supports"}, jsonPart(func(o *analysis.Output) any { return &o.Supports })},
	{[]string{"output", "surface_temp_c"}, floatPart(func(o *analysis.Output) *float64 { return &o.SurfaceTempC })},
	{[]string{"output", "freeze_hours_to_0c"}, optFloatPart(func(o *analysis.Output) **float64 { return &o.FreezeHoursTo0C })},
	{[]string{"output", "heat_trace_w_per_m"}, optFloatPart(func(o *analysis.Output) **float64 { return &o.HeatTraceWPerM })},
	{[]string{"output", "layers"}, jsonPart(func(o *analysis.Output) any { return &o.Layers })},
	{[]string{"output", "vapour_retarder"}, jsonPart(func(o *analysis.Output) any { return &o.VapourRetarder })},
	{[]string{"output", "sizing", "governing"}, func(_ *analysis.Stored, o *analysis.Output, v []byte) error {
		g := string(v)
		o.Sizing.Governing = &g
		return nil
	}},
	{[]string{"output", "sizing", "governing_thickness_mm"}, optFloatPart(func(o *analysis.Output) **float64 { return &o.Sizing.GoverningThicknessMM })},
	{[]string{"output", "sizing", "unmet"}, jsonPart(func(o *analysis.Output) any { return &o.Sizing.Unmet })},
	{[]string{"output", "checks"}, jsonPart(func(o *analysis.Output) any { return &o.Checks })},
	// An energy-code row always has both; both are nil when the row is null.
	{[]string{"output", "energy_code", "required"}, func(_ *analysis.Stored, o *analysis.Output, v []byte) error {
		if o.EnergyCode == nil {
			o.EnergyCode = &analysis.EnergyCodeRow{}
		}
		var err error
		o.EnergyCode.Required, err = jsonBool(v)
		return err
	}},
	{[]string{"output", "energy_code", "pass"}, func(_ *analysis.Stored, o *analysis.Output, v []byte) error {
		if o.EnergyCode == nil {
			o.EnergyCode = &analysis.EnergyCodeRow{}
		}
		var err error
		o.EnergyCode.Pass, err = jsonBool(v)
		return err
	}},
	{[]string{"output", "conditions_used", "design", "ambient_temp_c"}, floatPart(func(o *analysis.Output) *float64 { return &o.ConditionsUsed.Design.AmbientTempC })},
	{[]string{"output", "conditions_used", "condensation", "ambient_temp_c"}, floatPart(func(o *analysis.Output) *float64 { return &o.ConditionsUsed.Condensation.AmbientTempC })},
	{[]string{"output", "cautions"}, jsonPart(func(o *analysis.Output) any { return &o.Cautions })},
	{[]string{"errors"}, func(st *analysis.Stored, _ *analysis.Output, v []byte) error {
		return json.Unmarshal(v, &st.Errors)
	}},
}

// ResultPaths are the paths (JSON keys from the top of an analysis.Stored) of the parts
// of a stored answer that a schedule row reads, for store.EachScheduleLines.
func ResultPaths() [][]string {
	out := make([][]string, len(resultParts))
	for i, p := range resultParts {
		out[i] = p.path
	}
	return out
}

// StoredFromParts puts back together the part of a stored answer that a schedule row
// reads from the values at ResultPaths (as PostgreSQL's #>> writes them: JSON text for
// arrays and objects, numbers and booleans as JSON, strings unquoted, nil for null or
// missing). The output holds only those fields; everything else is zero.
func StoredFromParts(parts [][]byte) (analysis.Stored, error) {
	var st analysis.Stored
	if len(parts) != len(resultParts) {
		return st, fmt.Errorf("stored answer: %d parts, want %d", len(parts), len(resultParts))
	}
	var o *analysis.Output
	if parts[outputMarker] != nil {
		o = &analysis.Output{}
		st.Output = o
	}
	for i, v := range parts {
		p := resultParts[i]
		if v == nil || (o == nil && p.path[0] == "output") {
			continue
		}
		if err := p.set(&st, o, v); err != nil {
			return analysis.Stored{}, fmt.Errorf("stored answer %v: %w", p.path, err)
		}
	}
	return st, nil
}
