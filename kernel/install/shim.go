package install

import (
	"bytes"
	"fmt"
	"path/filepath"
	"strings"

	"github.com/beamnote/beamnote/kernel/layout"
)

// CellGoFlags are the build flags of every cell (and of [Warm], which must
// match them for the build cache to hit). The go wrapper adds them to
// "go build" and "go test" in gonb's cell module only, so "!go" commands in
// cells run with the user's own flags. -mod=mod lets "go build" add missing
// requirements to the cell's go.mod; -ldflags=-w omits DWARF debug
// information, which shortens linking of plotting cells (stack traces still
// carry file and line from the runtime's own tables). No value may contain
// a space: the wrapper splits the list into words.
const CellGoFlags = "-mod=mod -ldflags=-w"

// cellSVGOnlyFlag is added to a cell's "go build" and "go test" after
// [CellGoFlags] unless a Go file of the cell module mentions a Save method
// (".Save" not followed by a letter, digit or underscore): "minimal" is
// gonum/plot's build tag that leaves out its blank imports of every back
// end (vgall.go), and optplot's figure_files.go, the PNG and PDF writers
// of optplot.Figure.Save, carries the same tag. Those back ends register
// themselves when imported, so without the tag each plotting cell links
// the raster, JPEG, TIFF, PDF, EPS and TeX canvases it never uses. A cell
// that calls Save is built without the tag and can write PNG and PDF; any
// other Save call matched by mistake only costs that cell the old link
// time. A "-tags" in the cell's own flags (gonb's %goflags) comes later on
// the command line and replaces this one. No other module in the cells'
// build uses the tag "minimal".
const cellSVGOnlyFlag = "-tags=minimal"

// cellBuildGOGC is the GOGC of a cell's "go build" and "go test" (the go
// command and the compiler and linker it runs): with the default 100 the
// garbage collector takes a second core's worth of time during a build
// that lasts a few hundred milliseconds; at 400 a no-op build of a cell
// took 40 ms instead of 55–77 ms and a plotting cell's build about 30 ms
// less, with the same peak memory (about 113 MB, the linker's, which maps
// its output instead of allocating it). Only the build tools see it.
const cellBuildGOGC = "400"

// shimScript returns the POSIX shell wrapper installed as "go" first on the
// kernel's PATH. See the package documentation, section "Cell module", and
// [shimQueryFuncs] for the answers it keeps.
func shimScript(l layout.Layout) []byte {
	var b bytes.Buffer
	fmt.Fprintf(&b, `#!/bin/sh
%s: written by "beamnote-kernel install"; do not edit.
# Only in gonb's cell module ($GONB_TMP_DIR) does it do anything of its own:
# - "go mod init": make the checkout importable offline (require and replace
#   %s, copy the checkout's go.sum);
# - "go build" and "go test": add the cell build flags %s, and
#   %s (gonum/plot's tag for leaving out the PNG, PDF, EPS and TeX
#   back ends) unless a Go file of the cell module mentions ".Save": a
#   cell that saves a figure as PNG or PDF needs those writers; and run
#   the go command, compiler and linker with GOGC=%s (the cell program
#   itself, which gonb starts, keeps the kernel's environment);
# - a bare "go get" (what gonb runs per cell) with GOPROXY=off: skipped, as it
#   could fetch nothing and "go build -mod=mod" adds any requirement the
#   module cache holds;
# - "go env NAME..." and "go list -m" (goimports asks them for every cell
#   that leaves an import unused): given the answer kept in
#   $GONB_TMP_DIR/%s
#   while the arguments, the environment and the files the query reads
#   (go.mod, go.sum, go.work, the go.mod of each local replacement, the go
#   env files, the go command) are unchanged.
# Every other call, and every call elsewhere, goes to the real go command
# unchanged.
REAL_GO=%s
ROOT=%s
FLAGS=%s
SVGONLY=%s
`, layout.ShimMarker, layout.ModulePath, CellGoFlags, cellSVGOnlyFlag, cellBuildGOGC, shimQueryDir, shellQuote(l.RealGo), shellQuote(l.Root), shellQuote(CellGoFlags), shellQuote(cellSVGOnlyFlag))
	b.WriteString(shimQueryFuncs)
	// "[ . -ef DIR ]" (same device and inode) spares the two subshells of
	// comparing "pwd -P" outputs on every call.
	fmt.Fprintf(&b, `
if [ -n "$GONB_TMP_DIR" ] && [ . -ef "$GONB_TMP_DIR" ]; then
	case "$1" in
	build | test)
		cmd=$1
		shift
		tags=$SVGONLY
		if grep -qsE '\.Save([^[:alnum:]_]|$)' ./*.go; then
			tags=
		fi
		GOGC=%s
		export GOGC
		# $FLAGS and $tags are split into words on purpose.
		exec "$REAL_GO" "$cmd" $FLAGS $tags "$@"
		;;
	get)
		if [ "$GOPROXY" = off ] && { [ $# = 1 ] || { [ $# = 2 ] && [ "$2" = -t ]; }; }; then
			exit 0
		fi
		;;
	mod)
		if [ "$2" = init ]; then
			"$REAL_GO" "$@" || exit $?
			"$REAL_GO" mod edit -require=%s@v0.0.0 -replace=%s="$ROOT" || exit $?
			cp "$ROOT/go.sum" go.sum || exit $?
			exit 0
		fi
		;;
	env | list)
		if q_cacheable "$@"; then
			q_query "$@"
			exit
		fi
		;;
	esac
fi
exec "$REAL_GO" "$@"
`, cellBuildGOGC, layout.ModulePath, layout.ModulePath)
	return b.Bytes()
}

// shimRealGo reads REAL_GO back from a wrapper script, or returns "".
func shimRealGo(script []byte) string { return layout.ShimVar(script, "REAL_GO") }

// shimRoot reads ROOT (the checkout) back from a wrapper script, or returns "".
func shimRoot(script []byte) string { return layout.ShimVar(script, "ROOT") }

const launcherMarker = "# beamnote kernel launcher"

// launcherScript returns the POSIX shell script that kernel.json runs to
// start gonb: it puts [layout.Layout.KernelPathDirs] before the PATH that
// the kernel inherits from the notebook server, so that "!" shell commands
// in cells keep the user's PATH. (Kernelspec env values are taken
// literally, and a PATH there would replace the user's.)
func launcherScript(l layout.Layout) []byte {
	dirs := make([]string, 0, 3)
	for _, d := range l.KernelPathDirs() {
		dirs = append(dirs, shellQuote(d))
	}
	return fmt.Appendf(nil, `#!/bin/sh
%s: written by "beamnote-kernel install"; do not edit.
# Starts gonb with the go wrapper, the pinned tools and the go command first
# on the PATH the kernel inherits, which "!" commands in cells keep.
PATH=%s:${PATH:-%s}
export PATH
exec %s "$@"
`, launcherMarker, strings.Join(dirs, ":"), layout.DefaultPath, shellQuote(filepath.Join(l.Bin(), "gonb")))
}

// goplsIdleTimeout is how long the language server outlives its last
// client. gonb starts gopls in a process group of its own and connects to
// it once, 12 s after the kernel starts, for the kernel's life; a kernel
// that is killed instead of shut down left gopls running (100–230 MB) for
// ever. With the timeout gopls ends this long after its kernel.
const goplsIdleTimeout = "2m"

// goplsBinary is where the real gopls is built; [goplsScript],
// installed as .beamnote/bin/gopls, starts it.
func goplsBinary(l layout.Layout) string { return filepath.Join(l.State, "libexec", "gopls") }

// goplsScript returns the POSIX shell script that gonb finds on PATH as
// gopls: the pinned gopls with -listen.timeout, so that it exits once no
// kernel is connected.
func goplsScript(l layout.Layout) []byte {
	return fmt.Appendf(nil, `#!/bin/sh
# beamnote gopls: written by "beamnote-kernel install"; do not edit.
# The pinned gopls, ending %s after its last client (its kernel) is gone.
exec %s -listen.timeout=%s "$@"
`, goplsIdleTimeout, shellQuote(goplsBinary(l)), goplsIdleTimeout)
}

// launcherPath is the kernel launcher's path, argv[0] of kernel.json.
func launcherPath(l layout.Layout) string { return filepath.Join(l.Bin(), "gonb-kernel") }

// shimPath is the wrapper's path.
func shimPath(l layout.Layout) string { return filepath.Join(l.ShimDir(), "go") }

// shellQuote quotes s for a POSIX shell.
func shellQuote(s string) string {
	return "'" + strings.ReplaceAll(s, "'", `'\''`) + "'"
}
