package linelist

import (
	"fmt"
	"strings"
	"testing"
)

// BenchmarkParse10000 parses a 10,000-line list with 14 columns.
func BenchmarkParse10000(b *testing.B) {
	var sb strings.Builder
	sb.WriteString("tag,service,location,pipe_size,length [m],elbows,valves,operating_temp [°C],steam_pressure [kPa g],layer1_material,layer1_thickness [mm],jacket,duct_width [mm],duct_height [mm]\n")
	for i := range MaxRows {
		fmt.Fprintf(&sb, "HW-%05d,Heating hot water,indoor,NPS 2,%d,%d,1,%d,,mineral_fiber_pipe_c547_t1,40,all_service_jacket,,\n", i, 5+i%40, i%5, 60+i%30)
	}
	text := sb.String()
	b.SetBytes(int64(len(text)))
	for b.Loop() {
		rows, errs := Parse(strings.NewReader(text))
		if len(rows) != MaxRows || len(errs) > 0 {
			b.Fatal(len(rows), errs)
		}
	}
}
