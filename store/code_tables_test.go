package store_test

import (
	"context"
	"reflect"
	"testing"

	"lagwright/catalog"
	"lagwright/store/storetest"
)

// The built-in tables come out of the database exactly as the catalog holds them (the
// verified ASHRAE 90.1-2016 rows of catalog/codes_test.go), open ends included, and a
// second seed leaves their version alone.
func TestCodeTablesSeededAsCatalog(t *testing.T) {
	st := storetest.NewDB(t)
	ctx := context.Background()
	if err := st.SeedCatalog(ctx); err != nil {
		t.Fatal(err)
	}
	lib, err := st.Library(ctx)
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range catalog.CodeTables() {
		got, ok := lib.CodeTable(want.ID)
		if !ok {
			t.Fatalf("%s not in the library", want.ID)
		}
		if !reflect.DeepEqual(got, want) {
			t.Errorf("%s from the database:\n%+v\nwant\n%+v", want.ID, got, want)
		}
		if v := lib.Version("code_table:" + want.ID); v != 1 {
			t.Errorf("%s version %d after a second seed, want 1", want.ID, v)
		}
	}
}
