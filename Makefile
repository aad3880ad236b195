# beamnote: the two commands of the README are `make notebook` and `make test`.
# Both do all set-up on a fresh Debian/Ubuntu machine that has only Go.
#
#   make notebook        install what is missing, build and register the kernel, serve notebooks/
#   make test            go vet, go test, and every notebook executed headless with the kernel
#   make rerun NOTEBOOKS='path/to/notes'
#                        re-run notebooks (a folder or files; default notebooks/) headless: check every
#                        cell and design target, keep the record beside each notebook, list what moved;
#                        executed notebooks, HTML exports and the summary page in build/rerun
#   make nbtest          the re-run of notebooks/ as `make test` runs it: every notebook twice (same
#                        targets and byte-identical figures), every notebook with a figure
#   make kernel          build gonb/goimports/gopls at the pinned versions, write the kernelspec, warm the cache
#   make doctor          list what is missing, with the fix for each
#   make bench           Go benchmarks of opticslib
#   make latency         measure notebook cell latency (see DEVELOPERS.md)
#   make compare         the Go and the NumPy version of each speed case side by side, one line each
#
# KERNEL_SCOPE=user installs the kernelspec in the per-user Jupyter data dir
# (`jupyter --data-dir`: $JUPYTER_DATA_DIR, else $XDG_DATA_HOME/jupyter or ~/.local/share/jupyter)
# instead of the project-local .beamnote/jupyter. NOTEBOOK_IP / NOTEBOOK_PORT
# choose the address (loopback only unless BEAMNOTE_ALLOW_REMOTE=1).

GO ?= go
KERNEL_SCOPE ?= project
STATE := .beamnote
BK := $(STATE)/bin/beamnote-kernel
NOTEBOOKS := notebooks
PYTHON ?= /usr/bin/python3

ifeq ($(KERNEL_SCOPE),user)
SCOPE_FLAG := -user
endif

.PHONY: notebook test deps kernel doctor bench latency compare vet gotest nbtest rerun clean

notebook: kernel
	$(BK) serve $(SCOPE_FLAG)

test: vet gotest nbtest

deps:
	@kernel/install-deps.sh

$(BK): go.mod go.sum $(wildcard kernel/layout/*.go kernel/install/*.go kernel/serve/*.go kernel/run/*.go kernel/cmd/beamnote-kernel/*.go internal/*/*.go kernel/*/*.go)
	$(GO) build -o $@ ./kernel/cmd/beamnote-kernel

kernel: deps $(BK)
	$(BK) install $(SCOPE_FLAG)

doctor: $(BK)
	$(BK) doctor $(SCOPE_FLAG)

vet:
	$(GO) vet ./...

gotest: kernel
	$(GO) test ./...

nbtest: kernel
	$(BK) run -twice -require-figure $(SCOPE_FLAG) notebooks

rerun: kernel
	$(BK) run $(SCOPE_FLAG) $(NOTEBOOKS)

bench:
	$(GO) test -run '^$$' -bench . -benchmem ./opticslib/...

# With KERNEL_SCOPE=user the kernelspec is in the per-user data dir, which
# jupyter_client finds by itself.
ifeq ($(KERNEL_SCOPE),user)
LATENCY_ENV :=
else
LATENCY_ENV := JUPYTER_DATA_DIR='$(CURDIR)/$(STATE)/jupyter' JUPYTER_PATH='$(CURDIR)/$(STATE)/jupyter'
endif

latency: kernel
	$(LATENCY_ENV) $(PYTHON) kernel/latency.py

clean:
	rm -rf $(STATE) build

compare:
	BEAMNOTE_PYTHON='$(PYTHON)' $(GO) run ./testdata/bench/compare
