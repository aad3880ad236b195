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
# When gonb creates its cell module ("go mod init" in $GONB_TMP_DIR), make the
# checkout importable offline: require and replace %s and copy the
# checkout's go.sum. With GOPROXY=off, gonb's per-cell "go get" (no package
# arguments) is skipped: it could fetch nothing, and "go build -mod=mod" adds
# any requirement that the module cache can satisfy by itself.
# Every other call goes to the real go command unchanged.
REAL_GO=%s
ROOT=%s
if [ "$1" = get ] && [ "$GOPROXY" = off ] && { [ $# = 1 ] || { [ $# = 2 ] && [ "$2" = -t ]; }; } &&
	[ -n "$GONB_TMP_DIR" ] && [ "$(pwd -P)" = "$(cd "$GONB_TMP_DIR" && pwd -P)" ]; then
	exit 0
fi
if [ "$1" = mod ] && [ "$2" = init ] && [ -n "$GONB_TMP_DIR" ] &&
	[ "$(pwd -P)" = "$(cd "$GONB_TMP_DIR" && pwd -P)" ]; then
	"$REAL_GO" "$@" || exit $?
	"$REAL_GO" mod edit -require=%s@v0.0.0 -replace=%s="$ROOT" || exit $?
	cp "$ROOT/go.sum" go.sum || exit $?
	exit 0
fi
exec "$REAL_GO" "$@"
`, shimMarker, ModulePath, shellQuote(l.RealGo), shellQuote(l.Root), ModulePath, ModulePath)
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

// shimPath is the wrapper's path.
func (l Layout) shimPath() string { return filepath.Join(l.ShimDir(), "go") }

// shellQuote quotes s for a POSIX shell.
func shellQuote(s string) string {
	return "'" + strings.ReplaceAll(s, "'", `'\''`) + "'"
}
