#!/bin/sh
# Install the operating-system packages that beamnote's notebooks need:
# Jupyter Notebook, nbconvert/nbclient (headless execution) and jupyter-client
# from Debian/Ubuntu packages (no Python package index is used), plus numpy
# and scipy for the comparison scripts. Used by `make notebook`, `make test`,
# .ci/run and docker/Dockerfile alike.
#
# It does nothing when everything is present. Set BEAMNOTE_TEST_DEPS=0 to
# skip numpy/scipy. BEAMNOTE_PYTHON and BEAMNOTE_JUPYTER, the interpreter and
# jupyter command that beamnote-kernel uses, are checked instead of Debian's
# when set, so a conda or pip installation passes without root.
#
# Installing needs root: run as root, or with sudo. When standard input is not
# a terminal (CI, docker build) sudo is asked not to prompt (sudo -n), so a
# missing password fails at once instead of hanging.
set -eu

PY=${BEAMNOTE_PYTHON:-/usr/bin/python3}
JUPYTER=${BEAMNOTE_JUPYTER:-/usr/bin/jupyter}
need=""
have_module() { [ -x "$PY" ] && "$PY" -c "import $1" >/dev/null 2>&1; }
have_module nbconvert || need="$need jupyter-nbconvert python3-nbconvert"
have_module nbclient || need="$need python3-nbclient"
have_module jupyter_client || need="$need jupyter-client"
have_module notebook || need="$need jupyter-notebook"
[ -x "$JUPYTER" ] || need="$need jupyter-core"
if [ "${BEAMNOTE_TEST_DEPS:-1}" = 1 ]; then
	have_module numpy || need="$need python3-numpy"
	have_module scipy || need="$need python3-scipy"
fi

if [ -z "$need" ]; then
	exit 0
fi

if ! command -v apt-get >/dev/null 2>&1; then
	cat >&2 <<MSG
beamnote: missing:$need
This is not a Debian/Ubuntu system. Install with your package manager:
  Jupyter Notebook 6.x (or 7), nbconvert, nbclient, jupyter_client
  (and numpy, scipy for the comparison scripts), e.g. with conda:
  conda install notebook nbconvert nbclient jupyter_client numpy scipy
Then point beamnote at them: BEAMNOTE_JUPYTER=/path/to/jupyter BEAMNOTE_PYTHON=/path/to/python3
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
	else
		echo "beamnote: need root to install:$need (as root, run: apt-get install$need)" >&2
		exit 1
	fi
fi
echo "beamnote: installing Debian packages:$need" >&2
# env passes DEBIAN_FRONTEND through sudo, which otherwise drops it.
if ! $SUDO env DEBIAN_FRONTEND=noninteractive apt-get update -q ||
	! $SUDO env DEBIAN_FRONTEND=noninteractive apt-get install -y -q --no-install-recommends $need; then
	echo "beamnote: installing the Debian packages failed; as root, run: apt-get install$need" >&2
	exit 1
fi
