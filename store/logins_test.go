package store_test

import (
	"context"
	"testing"
	"time"

	"github.com/jackc/pgx/v5"

	"lagwright/store"
	"lagwright/store/storetest"
)

// TestLoginLimitWindow: a key with Max attempts in the window waits until the oldest
// ages out; attempts older than the window do not count; a success clears its own
// attempt and the name's, not the address's.
func TestLoginLimitWindow(t *testing.T) {
	dsn := storetest.NewDSN(t)
	ctx := context.Background()
	st, err := store.Open(ctx, dsn)
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(st.Close)
	raw, err := pgx.Connect(ctx, dsn)
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { raw.Close(context.Background()) })
	lim := store.LoginLimit{Max: 3, Window: 15 * time.Minute}
	age := func(key string, ago time.Duration) {
		t.Helper()
		if _, err := raw.Exec(ctx, `UPDATE login_attempts SET at = now() - $2::interval WHERE key = $1`, key, ago); err != nil {
			t.Fatal(err)
		}
	}
	for i := range lim.Max {
		_, wait, err := st.ReserveLogin(ctx, lim, "ip:a", "user:n")
		if err != nil || wait != 0 {
			t.Fatalf("attempt %d: wait %v, %v", i+1, wait, err)
		}
	}
	age("user:n", 14*time.Minute)
	_, wait, err := st.ReserveLogin(ctx, lim, "user:n")
	if err != nil || wait < 50*time.Second || wait > 70*time.Second {
		t.Errorf("4th attempt 14 min after 3: wait %v, %v; want about 1 min", wait, err)
	}
	age("user:n", 16*time.Minute) // out of the window
	a, wait, err := st.ReserveLogin(ctx, lim, "user:n", "ip:b")
	if err != nil || wait != 0 {
		t.Fatalf("attempt after the window: wait %v, %v", wait, err)
	}
	if err := st.LoginSucceeded(ctx, a, "user:n"); err != nil {
		t.Fatal(err)
	}
	if _, wait, _ := st.ReserveLogin(ctx, lim, "ip:a"); wait == 0 {
		t.Error("the address's count was cleared by another address's success")
	}
	for i := range lim.Max {
		if _, wait, _ := st.ReserveLogin(ctx, lim, "ip:b", "user:n"); wait != 0 {
			t.Errorf("attempt %d after success: blocked (success should leave no rows)", i+1)
		}
	}
}
