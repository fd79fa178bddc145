package analysis

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"reflect"
	"strconv"
	"strings"
)

// MaxInputBytes bounds one calculation request.
const MaxInputBytes = 256 << 10

// DecodeStrict fills dst (a pointer to a struct with json tags) from a JSON object and
// reports every problem with its path, not just the first: unknown keys, wrong types,
// numbers that are not finite. encoding/json stops at the first error, which would make a
// user fix a form one field at a time.
func DecodeStrict(data []byte, dst any) error {
	var c errs
	if len(data) > MaxInputBytes {
		c.add("", "request is larger than %d KiB", MaxInputBytes>>10)
		return c.err()
	}
	dec := json.NewDecoder(bytes.NewReader(data))
	dec.UseNumber()
	var raw any
	if err := dec.Decode(&raw); err != nil {
		c.add("", "not valid JSON: %s", jsonSyntaxMessage(err))
		return c.err()
	}
	if dec.More() {
		c.add("", "not valid JSON: more than one value")
		return c.err()
	}
	obj, ok := raw.(map[string]any)
	if !ok {
		c.add("", "must be a JSON object")
		return c.err()
	}
	fill(reflect.ValueOf(dst).Elem(), obj, "", &c)
	return c.err()
}

func jsonSyntaxMessage(err error) string {
	var se *json.SyntaxError
	if errors.As(err, &se) {
		return fmt.Sprintf("%s (at byte %d)", se.Error(), se.Offset)
	}
	if errors.Is(err, io.ErrUnexpectedEOF) || errors.Is(err, io.EOF) {
		return "unexpected end of input"
	}
	return "unreadable input"
}

func join(prefix, key string) string {
	if prefix == "" {
		return key
	}
	return prefix + "." + key
}

// movedKeys names where a key of an older form of the JSON went (by struct and key), so
// an old request is told what to write instead of "unknown key". Stored data was
// migrated (migration 0020).
var movedKeys = map[string]string{
	"Economics.energy_price_per_kwh": "heating.price_per_kwh and/or cooling.price_per_kwh",
	"Economics.efficiency":           "heating.efficiency",
	"Economics.cop":                  "cooling.cop",
	"Economics.hours_per_year":       "heating.hours_per_year and/or cooling.hours_per_year",
	"Economics.co2_kg_per_kwh":       "heating.co2_kg_per_kwh and/or cooling.co2_kg_per_kwh",
}

// fill sets struct fields from a decoded JSON object.
func fill(v reflect.Value, obj map[string]any, prefix string, c *errs) {
	fields := map[string]int{}
	t := v.Type()
	for i := 0; i < t.NumField(); i++ {
		name, _, _ := strings.Cut(t.Field(i).Tag.Get("json"), ",")
		if name != "" && name != "-" {
			fields[name] = i
		}
	}
	for key, val := range obj {
		i, ok := fields[key]
		if !ok {
			if to, moved := movedKeys[t.Name()+"."+key]; moved {
				c.add(join(prefix, key), "%s", "moved: give "+to+" (see docs/calc-json.md)")
				continue
			}
			c.add(join(prefix, key), "unknown key")
			continue
		}
		setValue(v.Field(i), val, join(prefix, key), c)
	}
}

// setValue converts one JSON value into the Go value v (string, bool, int, float64,
// pointers to those, slices, fixed arrays and nested structs).
func setValue(v reflect.Value, val any, path string, c *errs) {
	if val == nil {
		v.SetZero() // null means "not given"
		return
	}
	switch v.Kind() {
	case reflect.Pointer:
		nv := reflect.New(v.Type().Elem())
		before := len(c.list)
		setValue(nv.Elem(), val, path, c)
		if len(c.list) == before {
			v.Set(nv)
		}
	case reflect.String:
		s, ok := val.(string)
		if !ok {
			c.add(path, "must be a string")
			return
		}
		if len(s) > 200 {
			c.add(path, "must be at most 200 characters")
			return
		}
		v.SetString(s)
	case reflect.Bool:
		b, ok := val.(bool)
		if !ok {
			c.add(path, "must be true or false")
			return
		}
		v.SetBool(b)
	case reflect.Float64:
		f, ok := number(val)
		if !ok {
			c.add(path, "must be a number")
			return
		}
		v.SetFloat(f)
	case reflect.Int:
		f, ok := number(val)
		if !ok || f != math.Trunc(f) || math.Abs(f) > 1e9 {
			c.add(path, "must be a whole number")
			return
		}
		v.SetInt(int64(f))
	case reflect.Slice:
		arr, ok := val.([]any)
		if !ok {
			c.add(path, "must be a list")
			return
		}
		if len(arr) > maxListLen {
			c.add(path, "must have at most %d entries", maxListLen)
			return
		}
		s := reflect.MakeSlice(v.Type(), len(arr), len(arr))
		for i, el := range arr {
			setValue(s.Index(i), el, path+"["+strconv.Itoa(i)+"]", c)
		}
		v.Set(s)
	case reflect.Array:
		arr, ok := val.([]any)
		if !ok || len(arr) != v.Len() {
			c.add(path, "must be a list of %d numbers", v.Len())
			return
		}
		for i, el := range arr {
			setValue(v.Index(i), el, path+"["+strconv.Itoa(i)+"]", c)
		}
	case reflect.Struct:
		obj, ok := val.(map[string]any)
		if !ok {
			c.add(path, "must be an object")
			return
		}
		fill(v, obj, path, c)
	default:
		c.add(path, "cannot be set")
	}
}

// maxListLen bounds every list in an input so no request can make the engine work
// without limit.
const maxListLen = 60

func number(val any) (float64, bool) {
	n, ok := val.(json.Number)
	if !ok {
		return 0, false
	}
	f, err := n.Float64()
	if err != nil || math.IsNaN(f) || math.IsInf(f, 0) {
		return 0, false
	}
	return f, true
}
