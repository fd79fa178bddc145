package store_test

import (
	"context"
	"net/url"
	"strings"
	"testing"
	"time"

	"lagwright/store"
	"lagwright/store/storetest"
)

// TestStatementTimeoutSource: the statement timeout is the configured one, else
// DATABASE_URL's (options=-c statement_timeout=…, no longer overridden), else the
// default.
func TestStatementTimeoutSource(t *testing.T) {
	dsn := storetest.NewDSN(t)
	withOptions := dsn + " options='-c statement_timeout=1500'"
	if strings.Contains(dsn, "://") {
		sep := "?"
		if strings.Contains(dsn, "?") {
			sep = "&"
		}
		withOptions = dsn + sep + "options=" + strings.ReplaceAll(url.QueryEscape("-c statement_timeout=1500"), "+", "%20")
	}
	ctx := context.Background()
	for _, tc := range []struct {
		name string
		dsn  string
		opt  store.Options
		want time.Duration
	}{
		{"default", dsn, store.Options{}, store.DefaultStatementTimeout},
		{"from DATABASE_URL", withOptions, store.Options{}, 1500 * time.Millisecond},
		{"configured", dsn, store.Options{StatementTimeout: 7 * time.Second}, 7 * time.Second},
	} {
		st, err := store.OpenWith(ctx, tc.dsn, tc.opt)
		if err != nil {
			t.Fatalf("%s: %v", tc.name, err)
		}
		got, err := st.StatementTimeout(ctx)
		st.Close()
		if err != nil || got != tc.want {
			t.Errorf("%s: statement timeout %v (%v), want %v", tc.name, got, err, tc.want)
		}
	}
}
