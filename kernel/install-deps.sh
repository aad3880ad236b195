#!/bin/sh
# Install the operating-system packages that beamnote's notebooks need:
# Jupyter Notebook, nbconvert/nbclient (headless execution) and jupyter-client
# from Debian/Ubuntu packages (no Python package index is used), plus numpy
# and scipy for the comparison scripts, and Chromium and python3-tornado for
# the browser test (kernel/browser: headless Chromium driven over the DevTools
# protocol with tornado's websocket client). Used by `make notebook`,
# `make test`, .ci/run and docker/Dockerfile alike.
#
# It does nothing when everything is present. Set BEAMNOTE_TEST_DEPS=0 to
# skip numpy/scipy and Chromium. BEAMNOTE_PYTHON and BEAMNOTE_JUPYTER, the
# interpreter and jupyter command that beamnote-kernel uses, are checked
# instead of Debian's when set, so a conda or pip installation passes without
# root; so is BEAMNOTE_CHROMIUM, the browser the browser test starts
# (default /usr/bin/chromium).
#
# Installing needs root: run as root, or with sudo. When standard input is not
# a terminal (CI, docker build) sudo is asked not to prompt (sudo -n), so a
# missing password fails at once instead of hanging.
set -eu

PY=${BEAMNOTE_PYTHON:-/usr/bin/python3}
JUPYTER=${BEAMNOTE_JUPYTER:-/usr/bin/jupyter}
CHROMIUM=${BEAMNOTE_CHROMIUM:-/usr/bin/chromium}
need=""
have_module() { [ -x "$PY" ] && "$PY" -c "import $1" >/dev/null 2>&1; }
have_module nbconvert || need="$need jupyter-nbconvert python3-nbconvert"
have_module nbclient || need="$need python3-nbclient"
have_module jupyter_client || need="$need jupyter-client"
have_module notebook || need="$need jupyter-notebook"
have_module tornado.websocket || need="$need python3-tornado"
[ -x "$JUPYTER" ] || need="$need jupyter-core"
# Chromium is needed by the browser test only, which skips without it
# (outside CI): failing to install it is a warning, not an error (Ubuntu,
# for one, has no chromium deb: its chromium-browser installs a snap).
browser=""
if [ "${BEAMNOTE_TEST_DEPS:-1}" = 1 ]; then
	have_module numpy || need="$need python3-numpy"
	have_module scipy || need="$need python3-scipy"
	[ -x "$CHROMIUM" ] || browser="chromium"
fi

if [ -z "$need$browser" ]; then
	exit 0
fi

if ! command -v apt-get >/dev/null 2>&1; then
	if [ -z "$need" ]; then
		echo "beamnote: no Chromium at $CHROMIUM; the browser test (kernel/browser) skips without it. Install Chromium or Chrome and set BEAMNOTE_CHROMIUM=/path/to/it" >&2
		exit 0
	fi
	cat >&2 <<MSG
beamnote: missing:$need
This is not a Debian/Ubuntu system. Install with your package manager:
  Jupyter Notebook 6.x (or 7), nbconvert, nbclient, jupyter_client, tornado
  (and numpy, scipy for the comparison scripts), e.g. with conda:
  conda install notebook nbconvert nbclient jupyter_client tornado numpy scipy
  and, for the browser test, Chromium or Chrome.
Then point beamnote at them: BEAMNOTE_JUPYTER=/path/to/jupyter BEAMNOTE_PYTHON=/path/to/python3
BEAMNOTE_CHROMIUM=/path/to/chromium
MSG
	exit 1
fi

SUDO=""
if [ "$(id -u)" != 0 ]; then
	if command -v sudo >/dev/null 2>&1; then
		SUDO=sudo
		if [ ! -t 0 ] || [ -n "${CI:-}" ]; then
			SUDO="sudo -n"
		fi
	elif [ -n "$need" ]; then
		echo "beamnote: need root to install:$need (as root, run: apt-get install$need)" >&2
		exit 1
	else
		echo "beamnote: no Chromium for the browser test, which skips without it (as root, run: apt-get install chromium)" >&2
		exit 0
	fi
fi
echo "beamnote: installing Debian packages:$need${browser:+ $browser}" >&2
# env passes DEBIAN_FRONTEND through sudo, which otherwise drops it.
if ! $SUDO env DEBIAN_FRONTEND=noninteractive apt-get update -q; then
	echo "beamnote: apt-get update failed; as root, run: apt-get update && apt-get install$need${browser:+ $browser}" >&2
	[ -z "$need" ] || exit 1
	exit 0
fi
if [ -n "$need" ] && ! $SUDO env DEBIAN_FRONTEND=noninteractive apt-get install -y -q --no-install-recommends $need; then
	echo "beamnote: installing the Debian packages failed; as root, run: apt-get install$need" >&2
	exit 1
fi
if [ -n "$browser" ] && ! $SUDO env DEBIAN_FRONTEND=noninteractive apt-get install -y -q --no-install-recommends $browser; then
	echo "beamnote: warning: installing $browser failed; the browser test (kernel/browser) skips without it, and fails under CI=true" >&2
fi
