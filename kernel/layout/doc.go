// Package layout is the shared ground of the beamnote kernel: where the
// checkout and its state directory are, the kernel's names, the environment
// that cells and jupyter commands run with, which jupyter and python
// commands to use, and running a command. Each step of the notebook flow
// stands on it: install (build, register and check the kernel) → serve (the
// notebook server) → run and check (execute notebooks headless) → record.
//
// Everything the steps write goes under a state directory, by default
// <checkout>/.beamnote, so nothing global changes unless the user asks for a
// per-user kernelspec:
//
//	.beamnote/bin/gonb, goimports, gopls   tools built at the pinned versions
//	.beamnote/bin/gonb-kernel        launcher of gonb that kernel.json runs
//	.beamnote/bin/shim/go            wrapper of the go command (package install)
//	.beamnote/jupyter/               Jupyter data dir (JUPYTER_DATA_DIR)
//	.beamnote/jupyter/kernels/beamnote/kernel.json, logo-*.png, logo-svg.svg
//
// # Kernel environment
//
// kernel.json sets GOPROXY=off and GOTOOLCHAIN=local for the kernel
// process ([Layout.KernelEnv]), and "!" shell commands in cells inherit
// them: a "!go get example.com/m" fails offline by design; to fetch, set
// GOPROXY to your module proxy (prefix the command with
// "GOPROXY=<your proxy>", or run "%env GOPROXY=<your proxy>" first).
// kernel.json does not set PATH, since kernelspec env values are taken
// literally and would replace the user's: it runs the launcher
// .beamnote/bin/gonb-kernel, which puts the go wrapper, the pinned tools and
// the go command's directory ([Layout.KernelPathDirs]) before the PATH that
// the kernel inherits from the notebook server, so "!" commands find the
// user's own programs. The cell build flags are not in the environment (the
// wrapper adds them inside the cell module only), so "!go build" elsewhere
// runs as it would in a terminal. Two kernels running at once share nothing
// but the build cache (safe for concurrent use) and the log file, which klog
// opens for appending (each kernel starts it afresh once it has written
// 20 MB to it).
//
// # Errors
//
// Functions return errors that name the step and the command that failed;
// nothing here panics on the state of the machine.
package layout
