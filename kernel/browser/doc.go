// Package browser holds the end-to-end test of beamnote's notebooks in a
// real browser: TestBrowserRunAll serves a temporary copy of notebooks/ with
// the notebook server that `beamnote-kernel serve` starts
// (serve.Command of kernel/serve: loopback, a token in JUPYTER_TOKEN), opens
// each notebook in Debian's headless Chromium, runs all cells from the page
// as Cell > Run All does, waits until the kernel is idle, and checks what the
// page shows: every code cell ran (has an execution count), no cell shows
// an error output or an "error:" line (the rules of run.CheckExecuted,
// applied to the notebook as the page holds it and to the rendered outputs),
// every notebook shows an inline <svg> figure with a nonzero size, and a
// notebook that draws a caustic (optplot.Caustic) shows it inline. A PNG of
// each whole notebook is kept in build/browser/<notebook>.png, with the
// notebook as the page held it (<notebook>.ipynb) and the logs of the
// server and the browser.
//
// Live what-ifs (kernel/nb/live) are exercised wherever a notebook has one:
// while the cells run, the driver watches for live controls, moves each
// slider (it sets the range input's value and dispatches input and change
// events, as a drag does), waits until the cell's figure names the new
// value and differs from before, times that round trip (input event →
// new figure in the page's DOM, and to two animation frames later), sends
// a burst of moves in one go that must end at its last value, and presses
// done; the cell must then complete with the controls replaced by their
// end line. TestBrowserSlider does this on kernel/nb/live's test notebook
// (testdata/slider.ipynb) and also checks the notebook as the page holds
// it; go test -v logs the round trips. A screenshot of the live controls
// is kept as <notebook>-live.png.
//
// The package has no code of its own; the tests are
//
//	go test ./kernel/browser/            (go test -v for timings and warnings)
//	go test -v -run 'TestBrowserRunAll/02' ./kernel/browser/   one notebook
//	go test -v -run TestBrowserSlider ./kernel/browser/        the slider, with the round trip
//
// # Driver
//
// driver.py speaks the Chrome DevTools Protocol with the websocket client of
// python3-tornado (a Debian package; no npm, no Python package index) and is
// run with the Python that Jupyter uses (layout.Python). The test starts
// Chromium with --remote-debugging-port=0 and passes the address that
// Chromium writes to DevToolsActivePort; the driver opens a tab per notebook,
// detects the front-end (classic Notebook 6 through window.Jupyter;
// Notebook 7 and JupyterLab through window.jupyterapp, which it has the page
// expose by setting exposeAppInBrowser in the page config before the
// application starts: written for them, but only Notebook 6 is available
// from Debian 12 and has been run), runs all cells, polls until no cell is
// running and the kernel is idle three times in a row, and prints a JSON
// report: per cell the execution count, error outputs, stderr text and
// inline figures (rendered size, whether a given text is in the figure, text
// drawn past the figure's edge), the notebook's nbformat JSON, and the
// page's JavaScript exceptions and console errors. See its doc string for
// the command line.
//
// # Requirements
//
// It needs the kernel installed (`make kernel`, which fills .beamnote/),
// Chromium at /usr/bin/chromium (Debian package chromium; BEAMNOTE_CHROMIUM
// names another binary) and python3-tornado; kernel/install-deps.sh installs
// both packages. Without any of them the test skips, saying what is missing,
// except under CI=true, where it fails. go test -short skips it too.
//
// # Processes
//
// The server and Chromium each run in a process group of their own, and
// every process the test starts carries a marker variable in its
// environment, which the kernel, gopls and Chromium's helpers inherit even
// when they start sessions of their own (Jupyter starts kernels in a new
// session, Chromium's crash handler detaches). At the end, also when the
// test fails or is interrupted with SIGINT or SIGTERM, the test shuts the
// kernels down through the server's REST API, stops the server and
// Chromium, then kills every process that still carries the marker or
// descends from the test, and fails if one survives.
package browser
