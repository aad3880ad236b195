#!/usr/bin/python3
"""Drive the installed beamnote kernel for the real-kernel tests of kernel/run and kernel/install.

    kernelclient.py errors     execute a cell that does not compile with nbclient
    kernelclient.py complete   complete_request and inspect_request with jupyter_client

Each mode prints one JSON object on stdout, which kerneltest.Client decodes; the
Go tests check it (errors: kernel/run/execute_test.go, complete:
kernel/install/completion_test.go). The Jupyter data directory comes from the environment (JUPYTER_PATH), as
for `beamnote-kernel run`. Only Debian's nbformat, nbclient and jupyter_client.
"""
import json
import os
import sys
import time

KERNEL = "beamnote"

# A cell that does not compile, and the cell after it.
COMPILE_ERROR = "%%\nx := 1\nnosuchname(x)"
AFTER = '%%\nfmt.Println("still running")'

# The set-up cell of a notebook: imports of opticslib, executed once.
SETUP = """import (
	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

%%
b := paraxial.NewBuilder()
g, err := beam.FromWaist(beam.WaistSpec{Wavelength: 488 * units.Nanometer, WaistRadius: 0.42 * units.Millimeter})
fmt.Println(b != nil, g.Wavelength > 0, err)
"""

COMPLETE = 'import "github.com/beamnote/beamnote/opticslib/paraxial"\n\n%%\nb := paraxial.NewBuil'
COMPLETE_AGAIN = 'import "github.com/beamnote/beamnote/opticslib/beam"\n\n%%\nb := beam.FromWai'
INSPECT = ('import "github.com/beamnote/beamnote/opticslib/beam"\n\n%%\n'
           'g, err := beam.FromWaist(beam.WaistSpec{})\n_, _ = g, err')


def errors():
    import nbformat
    from nbclient import NotebookClient
    from nbclient.exceptions import CellExecutionError

    nb = nbformat.v4.new_notebook()
    nb.cells = [nbformat.v4.new_code_cell(COMPILE_ERROR), nbformat.v4.new_code_cell(AFTER)]
    nb.metadata["kernelspec"] = {"name": KERNEL, "display_name": KERNEL, "language": "go"}
    # What `jupyter nbconvert --execute` prints in a terminal when a cell fails.
    terminal = ""
    try:
        NotebookClient(nb, kernel_name=KERNEL, timeout=300).execute()
    except CellExecutionError as e:
        terminal = str(e)
    # With allow_errors, as `beamnote-kernel run` runs, for the outputs.
    nb.cells = [nbformat.v4.new_code_cell(COMPILE_ERROR), nbformat.v4.new_code_cell(AFTER)]
    NotebookClient(nb, kernel_name=KERNEL, timeout=300, allow_errors=True).execute()
    return {
        "terminal": terminal,
        "outputs": [c.outputs for c in nb.cells],
    }


def children(pid):
    """The processes whose parent is pid, as (pid, comm)."""
    out = []
    for d in os.listdir("/proc"):
        if not d.isdigit():
            continue
        try:
            with open(f"/proc/{d}/stat") as f:
                stat = f.read()
        except OSError:
            continue
        comm = stat[stat.index("(") + 1:stat.rindex(")")]
        fields = stat[stat.rindex(")") + 2:].split()
        if int(fields[1]) == pid:
            out.append((int(d), comm))
    return out


def usage(pid):
    """RSS, peak RSS (kB) and user+system CPU seconds of process pid."""
    kb = {}
    with open(f"/proc/{pid}/status") as f:
        for line in f:
            name, _, value = line.partition(":")
            if name in ("VmRSS", "VmHWM"):
                kb[name] = int(value.split()[0])
    with open(f"/proc/{pid}/stat") as f:
        stat = f.read()
    fields = stat[stat.rindex(")") + 2:].split()
    tick = os.sysconf("SC_CLK_TCK")
    # utime, stime, then cutime, cstime: the go list runs it waited for.
    return {"rss_kb": kb.get("VmRSS"), "peak_rss_kb": kb.get("VmHWM"),
            "cpu_s": (int(fields[11]) + int(fields[12])) / tick,
            "children_cpu_s": (int(fields[13]) + int(fields[14])) / tick}


def request(kc, method, code, timeout=120):
    t = time.monotonic()
    msg_id = getattr(kc, method)(code, len(code))
    while True:
        reply = kc.get_shell_msg(timeout=timeout)
        if reply["parent_header"].get("msg_id") == msg_id:
            return reply["content"], time.monotonic() - t


def complete():
    from jupyter_client.manager import start_new_kernel

    start = time.monotonic()
    km, kc = start_new_kernel(kernel_name=KERNEL, startup_timeout=120)
    res = {"kernel_start_s": time.monotonic() - start}
    try:
        pid = km.provisioner.pid if getattr(km, "provisioner", None) else km.kernel.pid
        gopls = [p for p, comm in children(pid) if comm == "gopls"]
        res["gopls_running_at_start"] = bool(gopls)

        t = time.monotonic()
        reply = kc.execute_interactive(SETUP, timeout=300, output_hook=lambda m: None)
        res["setup_cell_s"] = time.monotonic() - t
        res["setup_status"] = reply["content"]["status"]

        # BEAMNOTE_COMPLETE_DELAY=20 waits until 20 s after the kernel
        # started before the first completion (to tell gonb's wait for gopls
        # from gopls's own loading).
        delay = float(os.environ.get("BEAMNOTE_COMPLETE_DELAY", "0"))
        time.sleep(max(0, delay - (time.monotonic() - start)))
        res["first_complete_at_s"] = time.monotonic() - start
        first, res["first_complete_s"] = request(kc, "complete", COMPLETE)
        res["first_complete"] = first
        gopls = gopls or [p for p, comm in children(pid) if comm == "gopls"]
        if gopls:
            res["gopls_after_first"] = usage(gopls[0])
        again, res["later_complete_s"] = request(kc, "complete", COMPLETE)
        res["later_complete"] = again
        other, res["other_complete_s"] = request(kc, "complete", COMPLETE_AGAIN)
        res["other_complete"] = other
        # The cursor inside "FromWaist" (Jupyter inspects the name at the cursor).
        pos = INSPECT.index("FromWaist") + 4
        t = time.monotonic()
        msg_id = kc.inspect(INSPECT, pos)
        while True:
            reply = kc.get_shell_msg(timeout=120)
            if reply["parent_header"].get("msg_id") == msg_id:
                break
        res["inspect_s"] = time.monotonic() - t
        res["inspect"] = reply["content"]
        if gopls:
            res["gopls_at_end"] = usage(gopls[0])
    finally:
        kc.stop_channels()
        km.shutdown_kernel(now=True)
    return res


if __name__ == "__main__":
    mode = sys.argv[1] if len(sys.argv) > 1 else ""
    if mode == "errors":
        out = errors()
    elif mode == "complete":
        out = complete()
    else:
        sys.exit(__doc__)
    json.dump(out, sys.stdout, indent=1, default=str)
    print()
