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

// Outside a notebook a progress bar prints a line at each quarter; in a
// notebook it is one bar, redrawn in place.
func ExampleProgress() {
	bar := nb.NewProgress("Monte Carlo builds")
	for done := 0; done <= 1000; done += 100 {
		bar.Update(done, 1000) // as tolerance.Options.Progress is called
	}
	bar.Done()
	// Output:
	// Monte Carlo builds: 0 % (0 of 1000)
	// Monte Carlo builds: 30 % (300 of 1000)
	// Monte Carlo builds: 50 % (500 of 1000)
	// Monte Carlo builds: 80 % (800 of 1000)
	// Monte Carlo builds: 100 % (1000 of 1000)
}
