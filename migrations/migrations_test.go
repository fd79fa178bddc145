package migrations

import (
	"io/fs"
	"strings"
	"testing"
)

// Every up migration has its down, and Latest is the highest number.
func TestPairsAndLatest(t *testing.T) {
	ups, _ := fs.Glob(FS, "*.up.sql")
	if len(ups) == 0 {
		t.Fatal("no migrations embedded")
	}
	for _, up := range ups {
		down := strings.TrimSuffix(up, ".up.sql") + ".down.sql"
		if _, err := fs.Stat(FS, down); err != nil {
			t.Errorf("%s has no %s", up, down)
		}
	}
	latest, err := Latest()
	if err != nil || latest < 1 {
		t.Fatalf("Latest = %d, %v", latest, err)
	}
	if _, err := fs.Stat(FS, ups[len(ups)-1]); err != nil || !strings.HasPrefix(ups[len(ups)-1], strings.Repeat("0", 4-len(itoa(latest)))+itoa(latest)) {
		t.Errorf("Latest = %d, but the last file is %s", latest, ups[len(ups)-1])
	}
}

func itoa(n uint) string {
	s := ""
	for ; n > 0; n /= 10 {
		s = string(rune('0'+n%10)) + s
	}
	return s
}
