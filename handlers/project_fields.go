package handlers

import (
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"net/http"
	"net/url"
	"sort"
	"strconv"
	"strings"

	"lagwright/field"
	"lagwright/units"
	"lagwright/web"
)

// Form plumbing shared by the project and line forms. Every form field is named by the
// JSON path of the value it sets ("settings.indoor.ambient_temp_c", "criteria.dew_margin_k"),
// so the field errors of analysis and of ProjectSettings.Validate land beside the field
// that caused them without a translation table.

// numField is one numeric form field: its JSON path and how a typed value becomes SI.
type numField struct {
	Key   string
	Q     units.Quantity // 0: a plain number (no unit)
	Scale float64        // plain numbers: SI = typed × Scale (percent → fraction: 0.01); 0 means 1
	Int   bool           // a whole number
	Label string
}

// specificHeatUS is J/(kg·K) per Btu/(lb·°F), from the exact Btu(IT), pound and °F
// definitions (NIST SP 811): 4186.8.
const specificHeatUS = units.BtuIT / units.Pound / units.FahrenheitK

// cpQuantity marks the specific-heat field, which the units package does not cover.
const cpQuantity units.Quantity = -1

// unitLabel is the unit shown beside a field in a system.
func (f numField) unitLabel(sys units.System) string {
	switch {
	case f.Q == cpQuantity && sys == units.US:
		return "Btu/lb·°F"
	case f.Q == cpQuantity:
		return "J/kg·K"
	case f.Q > 0:
		return units.Label(f.Q, sys)
	case f.Scale == 0.01:
		return "%"
	}
	return ""
}

// parse reads a typed value into SI (float64, or int for whole numbers).
func (f numField) parse(sys units.System, raw string) (any, error) {
	switch {
	case f.Int:
		v, err := units.ParseFraction(raw)
		if err != nil || v != math.Trunc(v) {
			return nil, fmt.Errorf("must be a whole number")
		}
		return int(v), nil
	case f.Q == cpQuantity:
		v, err := units.ParseFraction(raw)
		if err != nil {
			return nil, fmt.Errorf("must be a number, e.g. 4186")
		}
		if sys == units.US {
			v *= specificHeatUS
		}
		return formRoundSig(v), nil
	case f.Q > 0:
		v, err := units.Parse(f.Q, sys, raw)
		if err != nil {
			return nil, err
		}
		return formRoundSig(v), nil
	}
	v, err := units.ParseFraction(strings.TrimSuffix(strings.TrimSpace(raw), "%"))
	if err != nil {
		return nil, fmt.Errorf("must be a number")
	}
	if f.Scale != 0 {
		v *= f.Scale
	}
	return formRoundSig(v), nil
}

// format writes an SI value the way the form shows it: in the system's unit, rounded
// for reading ("7.61" mph, not "7.605583393"). Saving the form unchanged still stores
// the same value: writeNums keeps the exact value beside it (exactKey) and readNums
// takes it back while the field still shows its rounding.
func (f numField) format(sys units.System, v float64) string {
	switch {
	case f.Int:
		return strconv.FormatInt(int64(math.Round(v)), 10)
	case f.Q == cpQuantity:
		if sys == units.US {
			v /= specificHeatUS
		}
		return formPlain(float64(float32(v))) // 4186 J/(kg·K) = 0.99989 Btu/(lb·°F): 7 digits are plenty
	case f.Q > 0:
		if f.Q == units.Length && sys == units.US {
			if s := units.Format(f.Q, sys, v); s != "" {
				if back, err := units.Parse(f.Q, sys, s); err == nil && math.Abs(back-v) < 1e-9 {
					return s
				}
			}
		}
		return units.FormatDisplay(f.Q, sys, v)
	}
	if f.Scale != 0 {
		v /= f.Scale
	}
	return formPlain(v)
}

// roundSig rounds to 10 significant digits, so °F → °C → °F round trips stay tidy.
func formRoundSig(v float64) float64 {
	if v == 0 || math.IsNaN(v) || math.IsInf(v, 0) {
		return v
	}
	r, _ := strconv.ParseFloat(strconv.FormatFloat(v, 'g', 10, 64), 64)
	return r
}

func formPlain(v float64) string { return strconv.FormatFloat(formRoundSig(v), 'g', -1, 64) }

// formState is a form's typed values and its messages by field.
type formState struct {
	Values url.Values
	Errors map[string]string
	Other  []string // problems that belong to no field on this form
	// layerRow maps analysis layer indices to form rows where blank rows were skipped.
	layerRow [][2]int
}

func newFormState() *formState { return &formState{Values: url.Values{}, Errors: map[string]string{}} }

func (f *formState) addError(field, msg string) {
	if _, ok := f.Errors[field]; !ok {
		f.Errors[field] = msg
	}
}

func (f *formState) ok() bool { return len(f.Errors) == 0 && len(f.Other) == 0 }

// view hands the state to a template.
func (f *formState) view() web.EntryForm {
	v := web.EntryForm{Values: map[string]string{}, Errors: map[string]string{}, Other: f.Other}
	for k := range f.Values {
		v.Values[k] = f.Values.Get(k)
	}
	for k, e := range f.Errors {
		v.Errors[k] = e
	}
	return v
}

// place puts field errors beside the fields the form has (by JSON path, or an alias),
// and the others in the general list with their path.
func (f *formState) place(fe field.Errors, has func(string) (string, bool)) {
	for _, e := range fe {
		if key, ok := has(e.Field); ok {
			f.addError(key, e.Message)
			continue
		}
		if e.Field == "" {
			f.Other = append(f.Other, e.Message)
		} else {
			f.Other = append(f.Other, e.Field+": "+e.Message)
		}
	}
}

// readNums parses the numeric fields of a request into a nested JSON map.
func readNums(r *http.Request, fields []numField, sys units.System, st *formState, into map[string]any) {
	for _, f := range fields {
		raw := r.PostForm.Get(f.Key)
		st.Values.Set(f.Key, raw)
		if strings.TrimSpace(raw) == "" {
			continue
		}
		v, err := f.parse(sys, raw)
		if err != nil {
			st.addError(f.Key, err.Error())
			continue
		}
		if exact, ok := f.exact(r.PostForm.Get(exactKey(f.Key)), sys, raw); ok {
			v = exact
			st.Values.Set(exactKey(f.Key), r.PostForm.Get(exactKey(f.Key)))
		}
		formSetPath(into, f.Key, v)
	}
}

// exactKey names the hidden field that carries a rounded field's exact SI value.
func exactKey(k string) string { return web.ExactKey(k) }

// exact is the SI value of a hidden exact field while the shown field still reads as
// its rounding (the user did not change it); ok is false otherwise.
func (f numField) exact(hidden string, sys units.System, raw string) (any, bool) {
	if hidden == "" || f.Int {
		return nil, false
	}
	v, err := strconv.ParseFloat(hidden, 64)
	if err != nil || math.IsNaN(v) || math.IsInf(v, 0) || f.format(sys, v) != strings.TrimSpace(raw) {
		return nil, false
	}
	return v, true
}

// writeNums fills form values from a JSON map (SI) in the system's units.
func writeNums(from map[string]any, fields []numField, sys units.System, st *formState) {
	for _, f := range fields {
		if v, ok := formGetPath(from, f.Key).(float64); ok {
			setShown(st, f, sys, v)
		}
	}
}

// setShown puts an SI value on the form as shown (rounded for reading) and, where the
// rounding does not read back to it, the exact value in the hidden field beside it.
func setShown(st *formState, f numField, sys units.System, v float64) {
	shown := f.format(sys, v)
	st.Values.Set(f.Key, shown)
	if !f.Int {
		if back, err := f.parse(sys, shown); err != nil || back != v {
			st.Values.Set(exactKey(f.Key), strconv.FormatFloat(v, 'g', -1, 64))
		}
	}
}

// setPath sets a dotted path in a nested map, creating the maps on the way.
func formSetPath(m map[string]any, path string, v any) {
	parts := strings.Split(path, ".")
	for _, p := range parts[:len(parts)-1] {
		next, ok := m[p].(map[string]any)
		if !ok {
			next = map[string]any{}
			m[p] = next
		}
		m = next
	}
	m[parts[len(parts)-1]] = v
}

// getPath reads a dotted path from a nested map (nil when absent).
func formGetPath(m map[string]any, path string) any {
	var cur any = m
	for _, p := range strings.Split(path, ".") {
		mm, ok := cur.(map[string]any)
		if !ok {
			return nil
		}
		cur = mm[p]
	}
	return cur
}

// toMap turns a struct into its JSON map (numbers as float64).
func jsonMap(v any) map[string]any {
	js, _ := json.Marshal(v)
	m := map[string]any{}
	_ = json.Unmarshal(js, &m)
	return m
}

// asFieldErrors finds the field.Errors in err (nil for other errors).
func asFieldErrors(err error) field.Errors {
	var fe field.Errors
	errors.As(err, &fe)
	return fe
}

// sortedKeys lists a map's keys in order (for stable output).
func formSortedKeys[V any](m map[string]V) []string {
	out := make([]string, 0, len(m))
	for k := range m {
		out = append(out, k)
	}
	sort.Strings(out)
	return out
}
