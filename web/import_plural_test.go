package web

import "testing"

// Counts on the import screens agree with their nouns (English grammar).
func TestImportCounts(t *testing.T) {
	cases := []struct{ got, want string }{
		{impCount(1, "line", "lines"), "1 line"},
		{impCount(0, "line", "lines"), "0 lines"},
		{impCount(600, "line", "lines"), "600 lines"},
		{impAll(1), "The row"},
		{impAll(12), "All 12 rows"},
		{impPlural(1, "has", "have"), "has"},
		{impPlural(2, "has", "have"), "have"},
	}
	for _, c := range cases {
		if c.got != c.want {
			t.Errorf("got %q, want %q", c.got, c.want)
		}
	}
}
