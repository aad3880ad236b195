package install

// shimQueryDir is the directory, inside gonb's cell module, where the go
// wrapper keeps the answers of module queries (see [shimQueryFuncs]). It
// goes away with the cell module when the kernel ends. The go command and
// gopls ignore directories whose names start with a dot.
const shimQueryDir = ".beamnote-queries"

// shimQueryFuncs is the part of the go wrapper that answers goimports'
// module queries in the cell module from earlier answers.
//
// For every cell whose main.go leaves an import of an earlier cell unused
// (any body cell after a declaration cell), goimports has to learn the
// real package names of the imports, and to do so it runs, in the cell
// module, "go env -json <12 variables>", "go list -m -f <main module>",
// "go env GOFLAGS" and "go list -m -e -json ...": 4–13 ms each on two
// cores, 25–30 ms per cell, with the same answers every time. These
// answers depend only on
//
//   - the environment (compared whole: "export -p"),
//   - the arguments,
//   - files: the cell module's go.mod and go.sum, its vendor directory,
//     the go.work that applies ($GOWORK, else the first one in the cell
//     directory or above it), the go.mod of every local directory that a
//     replace or use directive of those names (the checkout, for a start),
//     the go env file (go env -w), $GOROOT/go.env and the go command,
//   - and the module cache, whose modules do not change once downloaded.
//
// q_query keeps each answer (stdout of a query that succeeded and printed
// nothing on stderr) in a file of its own under $GONB_TMP_DIR/shimQueryDir
// together with the arguments, the environment and which of those files
// existed, and gives it again, without running go, while the arguments and
// the environment are the same, the same files exist and every one of them
// is older than the answer (strictly: a file changed within the clock tick
// of the answer makes it stale). An answer is kept only if every file was
// older than the start of the query, so one that ran while go.mod changed
// is not kept. Writes go through a temporary file and a rename, so a reader
// running at the same time (gopls shares the directory) sees an old answer
// or a new one, never a part. Anything else, or anything unusual (a path
// with a newline, a quoted replacement path with an escape, -modfile in
// GOFLAGS, "go list -m -u", "go env -w"), runs the real go command.
//
// What the key does not cover: a module downloaded into the module cache
// by hand (for instance "!GOPROXY=… go mod download m") while the cell
// module's go.mod and go.sum stay the same is listed by "go list -m" as
// not downloaded until one of them changes; goimports then takes the
// package name from the import path, and go build sees the module anyway.
// A file replaced by one with an older modification time (a copy that
// keeps times, an unpacked archive) is not noticed.
//
// A hit runs no program but the shell (about 2 ms, most of it starting
// the shell, against 4–13 ms for the query); a miss adds a rename to the
// query. Names start with q_ (functions and their variables) and k_ (an
// answer's fields).
const shimQueryFuncs = `nl='
'
QDIR=$GONB_TMP_DIR/` + shimQueryDir + `

# q_cacheable ARGS...: whether "go ARGS" is a module query whose answer
# q_inputs covers: "go env" of named variables whose values come from the
# environment, the go env files and the module layout (not CC or
# CGO_ENABLED, which depend on the tools installed), or "go list -m" with
# -e, -json, -f and patterns (not -u, -versions or -retracted, which ask
# the network).
q_cacheable() {
	case "$GOFLAGS" in *-modfile*) return 1 ;; esac
	case "$1" in
	env)
		shift
		q_n=0
		for q_a; do
			case "$q_a" in
			-json) ;;
			GO111MODULE | GOFLAGS | GOINSECURE | GOMOD | GOMODCACHE | GONOPROXY | GONOSUMDB | GOPATH | GOPRIVATE | GOPROXY | GOROOT | GOSUMDB | GOWORK) q_n=1 ;;
			*) return 1 ;;
			esac
		done
		[ $q_n = 1 ]
		;;
	list)
		[ "$2" = -m ] || return 1
		shift 2
		while [ $# -gt 0 ]; do
			case "$1" in
			-e | -json) ;;
			-f) [ $# -gt 1 ] || return 1; shift ;;
			-*) return 1 ;;
			esac
			shift
		done
		;;
	*) return 1 ;;
	esac
}

q_add() { for q_a; do q_in=$q_in$q_a$nl; done; }

# q_inputs sets q_in to the files a module query in the cell module reads,
# one a line, or fails where it cannot tell.
q_inputs() {
	case "$GONB_TMP_DIR$REAL_GO$GOROOT$GOENV$GOWORK$HOME$XDG_CONFIG_HOME" in *"$nl"*) return 1 ;; esac
	q_in=
	q_add "$GONB_TMP_DIR/go.mod" "$GONB_TMP_DIR/go.sum" "$GONB_TMP_DIR/vendor" "$GONB_TMP_DIR/vendor/modules.txt" "$REAL_GO"
	case "$REAL_GO" in */bin/go) q_add "${REAL_GO%/bin/go}/go.env" ;; esac
	[ -z "$GOROOT" ] || q_add "$GOROOT/go.env"
	case "$GOENV" in
	off) ;;
	"") q_add "${XDG_CONFIG_HOME:-$HOME/.config}/go/env" "$HOME/Library/Application Support/go/env" ;;
	*) q_add "$GOENV" ;;
	esac
	[ ! -f "$GONB_TMP_DIR/go.mod" ] || q_local "$GONB_TMP_DIR/go.mod" || return 1
	case "$GOWORK" in
	off) ;;
	"")
		q_d=$GONB_TMP_DIR
		while :; do
			q_add "$q_d/go.work"
			if [ -f "$q_d/go.work" ]; then
				q_local "$q_d/go.work" || return 1
				break
			fi
			case "$q_d" in */*) q_d=${q_d%/*} ;; *) break ;; esac
		done
		;;
	*)
		q_add "$GOWORK"
		[ ! -f "$GOWORK" ] || q_local "$GOWORK" || return 1
		;;
	esac
}

# q_local FILE adds to q_in the go.mod of every local directory that a
# replace or use directive of FILE (a go.mod or go.work) names, relative
# paths taken from FILE's directory; it fails on a line with both a quote
# and "//", and on a quoted path with a backslash.
q_local() {
	q_base=${1%/*}
	q_block=
	while IFS= read -r q_l || [ -n "$q_l" ]; do
		case "$q_l" in *\"*//* | *//*\"*) return 1 ;; esac
		q_l=${q_l%%//*}
		# Split into words on purpose, without globbing.
		set -f
		set -- $q_l
		set +f
		case "$1" in
		"") continue ;;
		")") q_block= ; continue ;;
		"replace(" | "use(") q_block=${1%"("}; continue ;;
		replace | use)
			if [ "$2" = "(" ]; then
				q_block=$1
				continue
			fi
			q_kind=$1
			q_l=${q_l#*"$1"}
			;;
		*)
			[ -n "$q_block" ] || continue
			q_kind=$q_block
			;;
		esac
		if [ "$q_kind" = replace ]; then
			case "$q_l" in *"=>"*) q_l=${q_l#*=>} ;; *) continue ;; esac
		fi
		q_l=${q_l#"${q_l%%[! 	]*}"}
		case "$q_l" in
		\"*)
			q_l=${q_l#\"}
			case "$q_l" in *\\*) return 1 ;; esac
			q_p=${q_l%%\"*}
			q_l=${q_l#*\"}
			;;
		*)
			q_p=${q_l%%[ 	]*}
			q_l=${q_l#"$q_p"}
			;;
		esac
		# A replacement followed by a version is a module, not a directory.
		q_l=${q_l#"${q_l%%[! 	]*}"}
		[ -z "$q_l" ] || continue
		case "$q_p" in
		/*) ;;
		. | .. | ./* | ../*) q_p=$q_base/$q_p ;;
		*) continue ;;
		esac
		q_add "$q_p/go.mod"
	done <"$1"
}

# q_split STAMP sets q_present and q_absent to the files of q_in that exist
# and that do not, and fails if one that exists is not older than STAMP.
q_split() {
	q_present= q_absent= q_ok=0
	q_ifs=$IFS
	IFS=$nl
	set -f
	for q_f in $q_in; do
		if [ -e "$q_f" ] || [ -L "$q_f" ]; then
			[ "$1" -nt "$q_f" ] || { q_ok=1; break; }
			q_present=$q_present$q_f$nl
		else
			q_absent=$q_absent$q_f$nl
		fi
	done
	set +f
	IFS=$q_ifs
	return $q_ok
}

# q_valid ANSWER: whether the files that existed for ANSWER all exist and
# are older than it, and the others still do not exist.
q_valid() {
	q_ok=0
	q_ifs=$IFS
	IFS=$nl
	set -f
	for q_f in $k_present; do
		[ "$1" -nt "$q_f" ] || { q_ok=1; break; }
	done
	if [ $q_ok = 0 ]; then
		for q_f in $k_absent; do
			if [ -e "$q_f" ] || [ -L "$q_f" ]; then
				q_ok=1
				break
			fi
		done
	fi
	set +f
	IFS=$q_ifs
	return $q_ok
}

# q_quote VALUE sets q_q to VALUE quoted for the shell.
q_quote() {
	q_q= q_s=$1
	while :; do
		case "$q_s" in
		*\'*) q_q=$q_q${q_s%%\'*}\'\\\'\'; q_s=${q_s#*\'} ;;
		*) break ;;
		esac
	done
	q_q=\'$q_q$q_s\'
}

# q_query ARGS... answers "go ARGS" from QDIR, or runs it and keeps the
# answer there.
q_query() {
	q_key=
	for q_a; do q_key="$q_key ${#q_a}:$q_a"; done
	q_env=$(export -p)
	q_bucket=$QDIR/$1.$#
	q_stale=
	for q_e in "$q_bucket".*; do
		[ -f "$q_e" ] || continue
		k_key= k_env= k_present= k_absent= k_out=
		command . "$q_e" 2>/dev/null || continue
		[ "$k_key" = "$q_key" ] && [ "$k_env" = "$q_env" ] || continue
		if q_valid "$q_e"; then
			printf %s "$k_out"
			return 0
		fi
		q_stale=$q_e
		break
	done
	[ -d "$QDIR" ] || mkdir "$QDIR" 2>/dev/null
	q_tmp=$QDIR/tmp.$$
	# The temporary file, created now, is the query's start time and
	# receives its standard error.
	{ true >"$q_tmp"; } 2>/dev/null || exec "$REAL_GO" "$@"
	q_out=$("$REAL_GO" "$@" 2>>"$q_tmp"; echo ".$?")
	q_rc=${q_out##*.}
	q_out=${q_out%.*}
	printf %s "$q_out"
	if [ -s "$q_tmp" ] || [ "$q_rc" != 0 ] || ! q_inputs || ! q_split "$q_tmp"; then
		[ ! -s "$q_tmp" ] || cat "$q_tmp" >&2
		rm -f "$q_tmp"
		return "$q_rc"
	fi
	{
		q_quote "$q_key"
		printf 'k_key=%s\n' "$q_q"
		q_quote "$q_env"
		printf 'k_env=%s\n' "$q_q"
		q_quote "$q_present"
		printf 'k_present=%s\n' "$q_q"
		q_quote "$q_absent"
		printf 'k_absent=%s\n' "$q_q"
		q_quote "$q_out"
		printf 'k_out=%s\n' "$q_q"
	} >"$q_tmp" && mv -f "$q_tmp" "${q_stale:-$q_bucket.$$}"
	return 0
}
`
