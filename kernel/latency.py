#!/usr/bin/python3
"""Measure beamnote kernel cell latency (wall time from execute_request to idle).

Run through `make latency` (it sets the project-local Jupyter data dir).
Prints, for a freshly started kernel:
  first    the first cell of the kernel: a plotting cell (what a user runs first)
  trivial  median of N warm trivial cells
  plot     median of N warm plotting cells (beam caustic through a system, SVG shown)
and writes the same as JSON to build/latency.json. Repeat with REPEAT=3 to see spread.
The last line is the summary over all runs, medians in seconds:
  latency first_s=<a> trivial_s=<b> plot_s=<c>
(first_s: median of the runs' first cells; trivial_s and plot_s: medians of all
warm cells of all runs).

Uses only jupyter_client from Debian's packages.
"""
import json
import os
import statistics
import sys
import time

from jupyter_client.manager import start_new_kernel

N = int(os.environ.get("N", "10"))
REPEAT = int(os.environ.get("REPEAT", "1"))

TRIVIAL = """%%
fmt.Println(1 + 1)
"""

PLOT = """import (
	"github.com/beamnote/beamnote/kernel/nb"
	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/optplot"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

%%
sys := nb.Must(paraxial.NewBuilder().Space(50*units.Millimeter).ThinLens(-25*units.Millimeter).Label("L1").
	Space(SPACING).ThinLens(100*units.Millimeter).Label("L2").Space(300*units.Millimeter).Build())
in := nb.Must(beam.FromWaist(beam.WaistSpec{WaistRadius: 0.4 * units.Millimeter, Wavelength: 780 * units.Nanometer}))
c := nb.Must(beam.Sample(sys, in, 400))
nb.Show(optplot.Caustic(c, sys, optplot.Caption("latency probe caustic")))
"""


def run_cell(kc, code):
    t0 = time.perf_counter()
    msg_id = kc.execute(code)
    errors = []
    while True:
        msg = kc.get_iopub_msg(timeout=600)
        if msg["parent_header"].get("msg_id") != msg_id:
            continue
        t = msg["msg_type"]
        if t == "error":
            errors.append(msg["content"].get("evalue", ""))
        if t == "stream" and msg["content"]["name"] == "stderr":
            text = msg["content"]["text"]
            if "panic:" in text or "exit status" in text:
                errors.append(text)
        if t == "status" and msg["content"]["execution_state"] == "idle":
            break
    dt = time.perf_counter() - t0
    if errors:
        sys.exit("cell failed: %s" % "\n".join(errors))
    return dt


def one_run():
    km, kc = start_new_kernel(kernel_name="beamnote")
    try:
        first = run_cell(kc, PLOT.replace("SPACING", "75*units.Millimeter"))
        trivial = [run_cell(kc, TRIVIAL) for _ in range(N)]
        plot = [run_cell(kc, PLOT.replace("SPACING", "%d*units.Millimeter" % (70 + i))) for i in range(N)]
    finally:
        kc.stop_channels()
        km.shutdown_kernel(now=False)
    return {
        "trivial_s": [round(x, 4) for x in trivial],
        "plot_s": [round(x, 4) for x in plot],
        "first_plot_cell_s": round(first, 3),
        "warm_trivial_median_s": round(statistics.median(trivial), 3),
        "warm_plot_median_s": round(statistics.median(plot), 3),
        "warm_plot_min_s": round(min(plot), 3),
        "warm_plot_max_s": round(max(plot), 3),
        "n": N,
    }


def main():
    runs = [one_run() for _ in range(REPEAT)]
    for i, r in enumerate(runs):
        print("run %d: first plotting cell %.3f s | warm trivial median %.3f s | "
              "warm plotting median %.3f s (min %.3f, max %.3f, n=%d) | first/warm %.2f"
              % (i + 1, r["first_plot_cell_s"], r["warm_trivial_median_s"], r["warm_plot_median_s"],
                 r["warm_plot_min_s"], r["warm_plot_max_s"], r["n"],
                 r["first_plot_cell_s"] / r["warm_plot_median_s"]))
    os.makedirs("build", exist_ok=True)
    with open("build/latency.json", "w") as f:
        json.dump(runs, f, indent=2)
    first = statistics.median(r["first_plot_cell_s"] for r in runs)
    trivial = statistics.median(x for r in runs for x in r["trivial_s"])
    plot = statistics.median(x for r in runs for x in r["plot_s"])
    print("latency first_s=%.3f trivial_s=%.3f plot_s=%.3f" % (first, trivial, plot))


if __name__ == "__main__":
    main()
