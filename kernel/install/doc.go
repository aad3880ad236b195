// Package install builds, registers and checks the beamnote Jupyter kernel:
// the first step of the notebook flow (install → serve → run and check →
// record). Where it writes is package layout's.
//
// The kernel is gonb (github.com/janpfeifer/gonb) at the exact version pinned
// in the checkout's go.mod, built from the module cache with goimports beside
// it, and gopls, which gonb asks for completion and contextual help, at the
// version pinned by its own tool module kernel/tools/gopls (gopls needs an
// x/tools of its own, older than goimports'). [Install] builds them into
// .beamnote/bin, writes the go wrapper (.beamnote/bin/shim/go), the kernel
// launcher (.beamnote/bin/gonb-kernel), the gopls script and the kernelspec
// with the logo ([WriteKernelspec]), and warms the build cache ([Warm]).
// [Doctor] checks each of these pieces.
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
// # Module queries
//
// goimports asks the go command the same module questions for every cell
// that leaves an import unused ("go env", "go list -m"). In the cell module
// the wrapper answers them from answers it kept there
// ($GONB_TMP_DIR/.beamnote-queries), while the arguments, the environment
// and the files the query reads are unchanged; see shim_query.go.
//
// # Completion
//
// gonb starts gopls when the kernel starts and first connects to it 12 s
// later (a fixed wait in gonb v0.11.4), so the first completion or help
// request of a kernel can take that long; later ones take 0.1–0.5 s. The
// gopls that gonb finds on PATH is a script that starts the pinned binary
// with an idle timeout, so it ends after its kernel.
//
// # Build cache
//
// [Warm] compiles a program that imports every package of the checkout with
// the kernel's environment and flags, so the first cell of a new kernel links
// from the build cache instead of compiling gonum and gonum/plot cold.
//
// # Doctor
//
// [Doctor] checks the installation: the go command, Jupyter and its Python
// packages, the pinned tools by the version recorded in each binary, the go
// wrapper, the kernelspec and the build cache, and gives the fix for each
// missing piece. kernel.json, the launcher, the wrapper and the logs hold
// absolute paths of the checkout. After moving the checkout, run
// "make kernel" again; the doctor and "beamnote-kernel serve" report a
// kernelspec written for another checkout ([CheckKernelspec]).
//
// # Errors
//
// Functions return errors that name the step and the command that failed;
// nothing here panics on the state of the machine.
package install
