package schedule

import (
	"encoding/json"
	"strconv"
	"strings"
)

// Change is one difference between two schedules: a line added, removed or changed
// (with the names of the fields that differ).
type Change struct {
	LineID int64    `json:"line_id"`
	Tag    string   `json:"tag"`
	Kind   string   `json:"kind"` // "added" | "removed" | "changed"
	Fields []string `json:"fields,omitempty"`
}

// rowFields are the compared fields of a row, by their column titles.
var rowFields = []struct {
	name string
	get  func(Row) any
}{
	{"tag", func(r Row) any { return r.Tag }},
	{"service", func(r Row) any { return r.Service }},
	{"purpose", func(r Row) any { return r.Purpose }},
	{"location", func(r Row) any { return r.Location }},
	{"exposure", func(r Row) any { return r.Exposure }},
	{"size", func(r Row) any { return r.SizeText("si") }},
	{"length", func(r Row) any { return r.LengthM }},
	{"surface area", func(r Row) any { return r.AreaM2 }},
	{"fittings", func(r Row) any { return r.Fittings }},
	{"fittings equiv. length", func(r Row) any { return r.FittingsM }},
	{"material", func(r Row) any { return r.Material }},
	{"specification", func(r Row) any { return r.Spec }},
	{"layers", func(r Row) any { return r.Layers }},
	{"installed thickness", func(r Row) any { return r.InstalledMM }},
	{"jacket", func(r Row) any { return r.Jacket }},
	{"insulation OD", func(r Row) any { return r.OuterDiameterMM }},
	{"jacket area", func(r Row) any { return r.JacketAreaM2 }},
	{"volume", func(r Row) any { return r.VolumeM3 }},
	{"heat flow", func(r Row) any { return r.HeatFlowW }},
	{"surface temp.", func(r Row) any { return r.SurfaceC }},
	{"governing criterion", func(r Row) any { return r.Governing }},
	{"energy code", func(r Row) any { return r.EnergyCode }},
	{"heat tracing", func(r Row) any { return r.HeatTraceWPerM }},
	{"notes", func(r Row) any { return r.Notes }},
}

func same(a, b any) bool {
	ja, _ := json.Marshal(a)
	jb, _ := json.Marshal(b)
	return string(ja) == string(jb)
}

// Diff lists the lines added, removed and changed from prev to cur, matched by line
// id, in the order of cur (removed lines last, in the order of prev).
func Diff(prev, cur []Row) []Change {
	old := make(map[int64]Row, len(prev))
	for _, r := range prev {
		old[r.LineID] = r
	}
	seen := make(map[int64]bool, len(cur))
	var out []Change
	for _, r := range cur {
		seen[r.LineID] = true
		p, ok := old[r.LineID]
		if !ok {
			out = append(out, Change{LineID: r.LineID, Tag: r.Tag, Kind: "added"})
			continue
		}
		var fields []string
		for _, f := range rowFields {
			if !same(f.get(p), f.get(r)) {
				fields = append(fields, f.name)
			}
		}
		if len(fields) > 0 {
			tag := r.Tag
			if p.Tag != r.Tag {
				tag = p.Tag + " → " + r.Tag
			}
			out = append(out, Change{LineID: r.LineID, Tag: tag, Kind: "changed", Fields: fields})
		}
	}
	for _, r := range prev {
		if !seen[r.LineID] {
			out = append(out, Change{LineID: r.LineID, Tag: r.Tag, Kind: "removed"})
		}
	}
	return out
}

// String writes a change in words: "P-101 changed: length, heat flow".
func (c Change) String() string {
	s := c.Tag + " " + c.Kind
	if len(c.Fields) > 0 {
		s += ": " + strings.Join(c.Fields, ", ")
	}
	return s
}

// Summary counts the changes by kind: "2 added, 1 removed, 3 changed".
func Summary(cs []Change) string {
	n := map[string]int{}
	for _, c := range cs {
		n[c.Kind]++
	}
	var parts []string
	for _, k := range []string{"added", "removed", "changed"} {
		if n[k] > 0 {
			parts = append(parts, strconv.Itoa(n[k])+" "+k)
		}
	}
	if len(parts) == 0 {
		return "no changes"
	}
	return strings.Join(parts, ", ")
}
