package field

import (
	"errors"
	"fmt"
	"testing"
)

func TestErrors(t *testing.T) {
	var e Errors
	if e.Err() != nil {
		t.Fatal("no problems must be a nil error")
	}
	e.Add("layers[1].thickness_mm", "must be at most %d mm", 500)
	e.Add("", "the input is empty")
	e.Add("layers[0]", "no material")
	wrapped := fmt.Errorf("line 3: %w", e.Sorted().Err())
	var got Errors
	if !errors.As(wrapped, &got) {
		t.Fatalf("errors.As does not find the field errors in %v", wrapped)
	}
	want := []string{"", "layers[0]", "layers[1].thickness_mm"}
	for i, w := range want {
		if got[i].Field != w {
			t.Errorf("sorted field %d = %q, want %q", i, got[i].Field, w)
		}
	}
	if got[2].Message != "must be at most 500 mm" {
		t.Errorf("message %q", got[2].Message)
	}
	for _, tc := range []struct {
		name string
		want bool
	}{{"layers", true}, {"layers[1]", true}, {"layers[1].thickness_mm", true}, {"lay", false}, {"jacket", false}} {
		if e.Has(tc.name) != tc.want {
			t.Errorf("Has(%q) = %v, want %v", tc.name, !tc.want, tc.want)
		}
	}
}
