package schedule

import (
	"bytes"
	"fmt"
	"io"
	"testing"
	"time"

	"lagwright/analysis"
	"lagwright/units"
)

// Synthetic returns a schedule of n rows built directly (no database, no physics):
// the fixture's computed rows repeated with new ids and tags. For benchmarks and the
// export benchmark program.
func synthetic(tb testing.TB, n int, sys units.System) Schedule {
	base := fixtureSchedule(tb, sys)
	rows := make([]Row, n)
	for i := range rows {
		r := base.Rows[i%len(base.Rows)]
		r.LineID = int64(i + 1)
		r.Tag = fmt.Sprintf("%s-%05d", r.Tag, i)
		rows[i] = r
	}
	return Schedule{Header: base.Header, Rows: rows, Totals: SumRows(rows)}
}

func benchWriter(b *testing.B, write func(io.Writer, Schedule) error) {
	s := synthetic(b, 10000, units.US)
	var buf bytes.Buffer
	b.ReportAllocs()
	b.ResetTimer()
	for b.Loop() {
		buf.Reset()
		if err := write(&buf, s); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(buf.Len()), "bytes/op-out")
}

// BenchmarkCSV writes a 10,000-row schedule as CSV.
func BenchmarkCSV(b *testing.B) { benchWriter(b, WriteCSV) }

// BenchmarkXLSX writes a 10,000-row schedule as XLSX (target ≤ 3 s).
func BenchmarkXLSX(b *testing.B) { benchWriter(b, WriteXLSX) }

// BenchmarkPDF writes a 10,000-row schedule as PDF.
func BenchmarkPDF(b *testing.B) { benchWriter(b, WriteSchedulePDF) }

// The PDF writers produce a document whose text carries the caution and page numbers.
func TestPDFs(t *testing.T) {
	sc := fixtureSchedule(t, units.US)
	var buf bytes.Buffer
	if err := WriteSchedulePDF(&buf, sc); err != nil {
		t.Fatal(err)
	}
	if !bytes.HasPrefix(buf.Bytes(), []byte("%PDF-")) || buf.Len() < 5000 {
		t.Errorf("schedule PDF: %d bytes starting %q", buf.Len(), buf.Bytes()[:8])
	}
	p, lines := fixture(t, units.US)
	for _, l := range lines {
		sh := BuildSheet(p, l, analysis.CatalogResolver{}, time.Date(2026, 3, 14, 0, 0, 0, 0, time.UTC))
		buf.Reset()
		if err := WriteSheetPDF(&buf, sh); err != nil {
			t.Fatalf("%s: %v", l.Tag, err)
		}
		if !bytes.HasPrefix(buf.Bytes(), []byte("%PDF-")) {
			t.Errorf("%s: not a PDF", l.Tag)
		}
	}
}
