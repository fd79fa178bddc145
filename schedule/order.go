package schedule

import (
	"cmp"
	"strconv"
	"strings"
)

// The totals by material, size and thickness are ordered by material, then size, then
// thickness. Sizes order by kind — NPS, DN, CTS, plain OD, ducts, flat surfaces, then
// anything else — and within a kind by their numbers read as numbers (NPS 1/2 < NPS 2
// < NPS 10; ducts by width, then height).

// Size kinds, in the order the totals list them.
const (
	kindNPS = iota
	kindDN
	kindCTS
	kindOD
	kindDuct
	kindFlat
	kindOther
)

// sizeOrder is a size text read for sorting.
type sizeOrder struct {
	kind int
	a, b float64 // nominal or OD (a); duct width (a) and height (b)
	text string  // tie-break, and the order of sizes that could not be read
}

// sizeKey reads a size as written by Row.SizeText: "NPS 2-1/2", "DN 50", "CTS 3/4",
// "OD 60.3 mm", "OD 2-3/8 in", "800 × 400 mm", "flat surface".
func sizeKey(s string) sizeOrder {
	k := sizeOrder{kind: kindOther, text: s}
	t := strings.TrimSpace(s)
	prefix, rest, _ := strings.Cut(t, " ")
	switch strings.ToUpper(prefix) {
	case "NPS", "DN", "CTS", "OD":
		n, ok := sizeNumber(strings.TrimSpace(strings.TrimSuffix(strings.TrimSuffix(rest, " mm"), " in")))
		if !ok {
			return k
		}
		k.kind = map[string]int{"NPS": kindNPS, "DN": kindDN, "CTS": kindCTS, "OD": kindOD}[strings.ToUpper(prefix)]
		k.a = n
		return k
	}
	if w, h, ok := strings.Cut(t, " × "); ok {
		h = strings.TrimSpace(strings.TrimSuffix(strings.TrimSuffix(h, " mm"), " in"))
		wn, ok1 := sizeNumber(strings.TrimSpace(w))
		hn, ok2 := sizeNumber(h)
		if ok1 && ok2 {
			k.kind, k.a, k.b = kindDuct, wn, hn
		}
		return k
	}
	if strings.HasPrefix(t, "flat") {
		k.kind = kindFlat
	}
	return k
}

// sizeNumber reads "2", "12.7", "1/2", "1-1/2" or "1 1/2".
func sizeNumber(s string) (float64, bool) {
	s = strings.TrimSpace(s)
	whole, frac := s, ""
	if i := strings.IndexAny(s, "- "); i > 0 {
		whole, frac = s[:i], strings.TrimSpace(s[i+1:])
	} else if strings.Contains(s, "/") {
		whole, frac = "0", s
	}
	w, err := strconv.ParseFloat(whole, 64)
	if err != nil || w < 0 {
		return 0, false
	}
	if frac == "" {
		return w, true
	}
	n, d, ok := strings.Cut(frac, "/")
	num, err1 := strconv.Atoi(n)
	den, err2 := strconv.Atoi(d)
	if !ok || err1 != nil || err2 != nil || den <= 0 {
		return 0, false
	}
	return w + float64(num)/float64(den), true
}

func compareSizes(a, b sizeOrder) int {
	return cmp.Or(cmp.Compare(a.kind, b.kind), cmp.Compare(a.a, b.a), cmp.Compare(a.b, b.b), strings.Compare(a.text, b.text))
}

// compareGroups orders two material totals: material name (case-insensitively), size,
// then thickness.
func compareGroups(matA string, sizeA sizeOrder, thA float64, matB string, sizeB sizeOrder, thB float64) int {
	return cmp.Or(
		strings.Compare(strings.ToLower(matA), strings.ToLower(matB)),
		strings.Compare(matA, matB),
		compareSizes(sizeA, sizeB),
		cmp.Compare(thA, thB),
	)
}
