package analysis

import (
	"encoding/json"
	"errors"
	"runtime"
	"sync"

	"lagwright/field"
)

// Stored is a line's stored answer: the analysis, or the field errors that kept it
// from being computed (so a line with a problem is not recomputed on every view).
type Stored struct {
	Output *Output      `json:"output,omitempty"`
	Errors field.Errors `json:"errors,omitempty"`
}

// Marshal encodes the stored answer.
func (s Stored) Marshal() json.RawMessage {
	js, _ := json.Marshal(s) // Output never holds NaN or Inf
	return js
}

// AnalyseMany analyses many inputs on every core (a project's stale lines, an
// import). Internal errors (not field errors) are returned for the first line that
// has one.
func AnalyseMany(inputs []Input, r Resolver) ([]Stored, error) {
	out := make([]Stored, len(inputs))
	errs := make([]error, len(inputs))
	workers := min(runtime.GOMAXPROCS(0), len(inputs))
	var wg sync.WaitGroup
	next := make(chan int)
	for range workers {
		wg.Go(func() {
			for i := range next {
				o, err := Analyse(inputs[i], r)
				var fe field.Errors
				if errors.As(err, &fe) {
					out[i] = Stored{Errors: fe}
					continue
				}
				out[i], errs[i] = Stored{Output: o}, err
			}
		})
	}
	for i := range inputs {
		next <- i
	}
	close(next)
	wg.Wait()
	for _, err := range errs {
		if err != nil {
			return nil, err
		}
	}
	return out, nil
}
