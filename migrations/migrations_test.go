package migrations

import (
	"fmt"
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
	// fs.Glob sorts by name, and names are zero-padded: the last is the latest.
	if last := ups[len(ups)-1]; !strings.HasPrefix(last, fmt.Sprintf("%04d_", latest)) {
		t.Errorf("Latest = %d, but the last file is %s", latest, last)
	}
}
