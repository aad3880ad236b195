// Package run executes notebooks headless with the beamnote kernel and
// checks what they show: the third step of the notebook flow (install →
// serve → run and check → record). It runs the kernel that package install
// registered and reads the executed notebooks with package ipynb; what it
// finds goes on to package record.
//
// [Rerun] ("beamnote-kernel run", "make rerun"; "make nbtest" with Twice
// and RequireFigure) runs each notebook with jupyter nbconvert --execute
// into an output folder, stops a cell that runs past the cell timeout,
// checks the executed notebook ([CheckExecuted]), collects the design
// targets its cells showed, records them in its metadata, exports it as
// HTML, and hands the targets to package record, which keeps the record
// beside the notebook, says what moved and writes the summary page.
//
// # Errors in cells
//
// kernel.json starts gonb with --raw_error, so that a cell that does not
// compile has the compiler's messages, by cell and line ("Cell[3]: Line 2"),
// in its error output (the traceback) rather than only in an HTML block:
// a terminal, nbconvert and an HTML export all show them. gonb v0.11.4 also
// gives a cell whose program exits nonzero an error output. [CheckExecuted]
// fails a cell with an error output, a crash on stderr, or a line of output
// that starts with "error:" (a cell that printed its error and returned, or
// nb.Must and nb.Check, which print "error: …" and exit 1), and a cell
// tagged [FigureTag] without a figure.
//
// # Errors
//
// Functions return errors that name the step and the command that failed;
// nothing here panics on the state of the machine.
package run
