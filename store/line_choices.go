package store

import (
	"cmp"
	"slices"

	"lagwright/catalog"
)

// MaterialChoices lists the library's materials by name, for pickers on line forms.
func (l *Library) MaterialChoices() []catalog.Material {
	out := make([]catalog.Material, 0, len(l.materials))
	for _, m := range l.materials {
		out = append(out, m.m)
	}
	slices.SortFunc(out, func(a, b catalog.Material) int {
		return cmp.Or(cmp.Compare(a.Name, b.Name), cmp.Compare(a.Slug, b.Slug))
	})
	return out
}

// JacketChoices lists the library's jackets by name, for pickers on line forms.
func (l *Library) JacketChoices() []catalog.Jacket {
	out := make([]catalog.Jacket, 0, len(l.jackets))
	for _, j := range l.jackets {
		out = append(out, j.j)
	}
	slices.SortFunc(out, func(a, b catalog.Jacket) int { return cmp.Or(cmp.Compare(a.Name, b.Name), cmp.Compare(a.Slug, b.Slug)) })
	return out
}
