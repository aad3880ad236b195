#!/bin/sh
# Install the operating-system packages that beamnote's notebooks need:
# Jupyter Notebook, nbconvert/nbclient (headless execution) and jupyter-client
# from Debian/Ubuntu packages (no Python package index is used), plus numpy
# and scipy for the comparison scripts. Used by `make notebook`, `make test`,
# .ci/run and docker/Dockerfile alike.
#
# It does nothing when everything is present. Set BEAMNOTE_TEST_DEPS=0 to
# skip numpy/scipy.
set -eu

PY=/usr/bin/python3
need=""
have_module() { [ -x "$PY" ] && "$PY" -c "import $1" >/dev/null 2>&1; }
have_module nbconvert || need="$need jupyter-core jupyter-nbconvert python3-nbconvert"
have_module nbclient || need="$need python3-nbclient"
have_module jupyter_client || need="$need jupyter-client"
have_module notebook || need="$need jupyter-notebook"
[ -x /usr/bin/jupyter ] || need="$need jupyter-core"
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
	else
		echo "beamnote: need root to install:$need (run: apt-get install$need)" >&2
		exit 1
	fi
fi
echo "beamnote: installing Debian packages:$need" >&2
$SUDO apt-get update -q
DEBIAN_FRONTEND=noninteractive $SUDO apt-get install -y -q --no-install-recommends $need
