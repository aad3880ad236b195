package setup

import (
	"bytes"
	"fmt"
	"path/filepath"
	"strings"
)

const shimMarker = "# beamnote go wrapper"

// shimScript returns the POSIX shell wrapper installed as "go" first on the
// kernel's PATH. See the package documentation, section "Cell module".
func (l Layout) shimScript() []byte {
	var b bytes.Buffer
	fmt.Fprintf(&b, `#!/bin/sh
%s: written by "beamnote-kernel install"; do not edit.
# Only in gonb's cell module ($GONB_TMP_DIR) does it do anything of its own:
# - "go mod init": make the checkout importable offline (require and replace
#   %s, copy the checkout's go.sum);
# - "go build" and "go test": add the cell build flags %s;
# - a bare "go get" (what gonb runs per cell) with GOPROXY=off: skipped, as it
#   could fetch nothing and "go build -mod=mod" adds any requirement the
#   module cache holds.
# Every other call, and every call elsewhere, goes to the real go command
# unchanged.
REAL_GO=%s
ROOT=%s
FLAGS=%s
if [ -n "$GONB_TMP_DIR" ] && [ "$(pwd -P)" = "$(cd "$GONB_TMP_DIR" 2>/dev/null && pwd -P)" ]; then
	case "$1" in
	build | test)
		cmd=$1
		shift
		# $FLAGS is split into words on purpose.
		exec "$REAL_GO" "$cmd" $FLAGS "$@"
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
	esac
fi
exec "$REAL_GO" "$@"
`, shimMarker, ModulePath, CellGoFlags, shellQuote(l.RealGo), shellQuote(l.Root), shellQuote(CellGoFlags), ModulePath, ModulePath)
	return b.Bytes()
}

// shimRealGo reads REAL_GO back from a wrapper script, or returns "".
func shimRealGo(script []byte) string { return shimVar(script, "REAL_GO") }

// shimRoot reads ROOT (the checkout) back from a wrapper script, or returns "".
func shimRoot(script []byte) string { return shimVar(script, "ROOT") }

// shimVar reads back an assignment name='value' written with [shellQuote].
func shimVar(script []byte, name string) string {
	if !bytes.Contains(script, []byte(shimMarker)) {
		return ""
	}
	for _, line := range strings.Split(string(script), "\n") {
		if v, ok := strings.CutPrefix(line, name+"="); ok {
			v = strings.TrimSuffix(strings.TrimPrefix(v, "'"), "'")
			return strings.ReplaceAll(v, `'\''`, "'")
		}
	}
	return ""
}

const launcherMarker = "# beamnote kernel launcher"

// launcherScript returns the POSIX shell script that kernel.json runs to
// start gonb: it puts [Layout.kernelPathDirs] before the PATH that the kernel
// inherits from the notebook server, so that "!" shell commands in cells keep
// the user's PATH. (Kernelspec env values are taken literally, and a PATH
// there would replace the user's.)
func (l Layout) launcherScript() []byte {
	dirs := make([]string, 0, 3)
	for _, d := range l.kernelPathDirs() {
		dirs = append(dirs, shellQuote(d))
	}
	return fmt.Appendf(nil, `#!/bin/sh
%s: written by "beamnote-kernel install"; do not edit.
# Starts gonb with the go wrapper, the pinned tools and the go command first
# on the PATH the kernel inherits, which "!" commands in cells keep.
PATH=%s:${PATH:-%s}
export PATH
exec %s "$@"
`, launcherMarker, strings.Join(dirs, ":"), defaultPath, shellQuote(filepath.Join(l.Bin(), "gonb")))
}

// launcherPath is the kernel launcher's path, argv[0] of kernel.json.
func (l Layout) launcherPath() string { return filepath.Join(l.Bin(), "gonb-kernel") }

// shimPath is the wrapper's path.
func (l Layout) shimPath() string { return filepath.Join(l.ShimDir(), "go") }

// shellQuote quotes s for a POSIX shell.
func shellQuote(s string) string {
	return "'" + strings.ReplaceAll(s, "'", `'\''`) + "'"
}
