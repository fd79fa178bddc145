package analysis

import (
	"fmt"
	"testing"
	"unsafe"

	"lagwright/calc"
)

func TestZZSize(t *testing.T) {
	fmt.Println("analyser", unsafe.Sizeof(analyser{}), "Output", unsafe.Sizeof(Output{}), "Result", unsafe.Sizeof(calc.Result{}), "line", unsafe.Sizeof(line{}), "memo", unsafe.Sizeof(memoEntry{}), "Input", unsafe.Sizeof(Input{}))
}
