package nb_test

import (
	"fmt"

	"github.com/beamnote/beamnote/kernel/nb"
	"github.com/beamnote/beamnote/opticslib/table"
)

// Outside a notebook (go run, go test), display calls print a plain-text
// fallback to standard output.
func ExampleTable() {
	err := nb.Table(table.Table{
		Caption: "Lens drawer, bench 3",
		Header:  []string{"part", "f (mm)", "diameter (mm)"},
		Rows: [][]string{
			{"plano-concave", "-30", "6"},
			{"achromat", "150", "25.4"},
		},
	})
	if err != nil {
		fmt.Println(err)
	}
	// Output:
	// Lens drawer, bench 3
	// part           f (mm)  diameter (mm)
	// -------------  ------  -------------
	// plano-concave  -30     6
	// achromat       150     25.4
}

func ExampleSVG() {
	svg := []byte(`<svg xmlns="http://www.w3.org/2000/svg" width="8" height="8"></svg>`)
	if err := nb.SVG(svg, "empty frame"); err != nil {
		fmt.Println(err)
	}
	// Output:
	// [figure: empty frame (67 bytes of SVG)]
}
