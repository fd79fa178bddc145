package schedule

import (
	"os"
	"testing"
)

func TestWritePDFForLooking(t *testing.T) {
	if os.Getenv("PDF_OUT") == "" {
		t.Skip()
	}
	f, _ := os.Create(os.Getenv("PDF_OUT"))
	defer f.Close()
	if err := WriteSchedulePDF(f, demoSchedule(t)); err != nil {
		t.Fatal(err)
	}
}
