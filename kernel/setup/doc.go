// Package setup prepares, checks and serves the beamnote Jupyter kernel.
//
// The kernel is gonb (github.com/janpfeifer/gonb) at the exact version pinned
// in the checkout's go.mod, built from the module cache with goimports beside
// it, and gopls, which gonb asks for completion and contextual help, at the
// version pinned by its own tool module kernel/tools/gopls (gopls needs an
// x/tools of its own, older than goimports'). Everything set-up writes goes
// under a state directory, by default <checkout>/.beamnote, so nothing global
// changes unless the user asks for a per-user kernelspec:
//
//	.beamnote/bin/gonb, goimports, gopls   tools built at the pinned versions
//	.beamnote/bin/gonb-kernel        launcher of gonb that kernel.json runs (see below)
//	.beamnote/bin/shim/go            wrapper of the go command (see below)
//	.beamnote/jupyter/               Jupyter data dir (JUPYTER_DATA_DIR)
//	.beamnote/jupyter/kernels/beamnote/kernel.json, logo-*.png, logo-svg.svg
//
// # Cell module
//
// gonb compiles each cell in a fresh module that it creates with "go mod init"
// in a temporary directory, then runs "go get" for the cell's imports. A
// module that is not published (this checkout) must be both required and
// replaced there, before the first cell runs. The kernel's PATH therefore
// starts with a small shell wrapper named go: when gonb runs "go mod init" in
// its own temporary directory ($GONB_TMP_DIR), the wrapper lets the real go
// command create the module and then adds
//
//	require github.com/beamnote/beamnote v0.0.0
//	replace github.com/beamnote/beamnote => <checkout>
//
// with the checkout's requirements and go.sum, so cells import any opticslib
// package with GOPROXY=off and no set-up cell. In the cell module the
// wrapper also adds [CellGoFlags] to "go build" and "go test", adds
// -tags=minimal unless a Go file of the cell module mentions ".Save" (see
// cellSVGOnlyFlag), runs them with GOGC=400 (cellBuildGOGC), and, with
// GOPROXY=off, skips gonb's bare per-cell "go get", which could fetch
// nothing: the cells' "go build -mod=mod" adds any requirement the module
// cache holds. Every other invocation, and every invocation outside the cell
// module, is handed to the real go command unchanged.
//
// # Kernel environment
//
// kernel.json sets GOPROXY=off and GOTOOLCHAIN=local for the kernel
// process, and "!" shell commands in cells inherit them: a
// "!go get example.com/m" fails offline by design; to fetch, set GOPROXY to
// your module proxy (prefix the command with "GOPROXY=<your proxy>", or run
// "%env GOPROXY=<your proxy>" first). kernel.json does not set PATH, since
// kernelspec env values are taken literally and would replace the user's:
// it runs the launcher .beamnote/bin/gonb-kernel, which puts the go wrapper,
// the pinned tools and the go command's directory before the PATH that the
// kernel inherits from the notebook server, so "!" commands find the user's
// own programs. The cell build flags are not in the environment (the
// wrapper adds them inside the cell module only), so "!go build" elsewhere
// runs as it would in a terminal. Two kernels running at once share nothing
// but the build cache (safe for concurrent use) and the log file, which klog
// opens for appending (each kernel starts it afresh once it has written
// 20 MB to it).
//
// kernel.json, the launcher, the wrapper and the logs hold absolute paths
// of the checkout. After moving the checkout, run "make kernel" again; the
// doctor and "serve" report a kernelspec written for another checkout.
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
// nb.Must and nb.Check, which print "error: …" and exit 1).
//
// # Completion
//
// gonb starts gopls when the kernel starts and first connects to it 12 s
// later (a fixed wait in gonb v0.11.4), so the first completion or help
// request of a kernel can take that long; later ones take 0.1–0.5 s.
//
// # Notebook server
//
// [Layout.ServeCommand] passes the server's token in the environment
// (JUPYTER_TOKEN), never on the command line, which every local user can
// read in the process list; "beamnote-kernel serve" prints the URL once the
// server answers it ([WaitServing]).
//
// # Build cache
//
// [Warm] compiles a program that imports every package of the checkout with
// the kernel's environment and flags, so the first cell of a new kernel links
// from the build cache instead of compiling gonum and gonum/plot cold.
//
// # Errors
//
// Functions return errors that name the step and the command that failed;
// nothing here panics on the state of the machine.
package setup
