package target_test

import (
	"fmt"
	"os"

	"github.com/beamnote/beamnote/opticslib/target"
	"github.com/beamnote/beamnote/opticslib/units"
)

func Example() {
	// A beam expander meant to give a 2 mm output radius, and a fold
	// mirror meant to pass at least 99 % of the beam.
	w := 2.031 * units.Millimeter
	radius := target.Near("expander output radius", w, 2*units.Millimeter, 0.1*units.Millimeter)
	fold := target.AtLeast("fold-mirror transmission", 0.9364, 0.99)
	fmt.Println(radius)
	fmt.Println(fold)
	if err := fold.Err(); err != nil {
		fmt.Println("error:", err != nil)
	}
	target.Record{Source: "expander.ipynb", Producer: "example", Targets: []target.Target{radius, fold}}.WriteTo(os.Stdout)
	// Output:
	// target expander output radius: 2.031 mm (wanted 2 ± 0.1 mm): met
	// target fold-mirror transmission: 0.9364 (wanted ≥ 0.99): MISSED: is 0.0536 (5.4 %) below the limit
	// error: true
	// # beamnote design record: expander.ipynb
	// # produced by: example
	// # target	value	wanted	result
	// expander output radius	2.031 mm	2 ± 0.1 mm	met
	// fold-mirror transmission	0.9364	≥ 0.99	MISSED: is 0.0536 (5.4 %) below the limit
}
