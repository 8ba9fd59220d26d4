"""The cost per sample of a long history in a whole `flexcycle run`, against `pandas.read_csv` plus the `rainflow`
package's counting of the same file, as the slope between two sizes (start-up does not count); and the peak
memory of each process.

    .venv/bin/python benchmarks/bench_history_slope.py [--sizes 1e6 1e7] [--repeats 3] [--stream 1e8]

Not part of the test run. The histories are force histories with noise written to three decimals (about as
many distinct cycles as cycles: the merging of distinct cycles is not spared), seeded, generated into a
temporary folder; the design is the bundled cargo-bike spring with its [duty] a force history. Every figure is
a fresh process (this clone's code for ours), the wall time from start to exit; ours and the reference run
interleaved, size by size, round by round. The slope is taken between the fastest run of each (the Python
documentation's advice for ``timeit``: a slower repeat is other processes interfering, not the code) and, beside
it, between the medians. Peak memory is the process's
maximum resident set size (``os.wait4``'s rusage). ``--stream N`` also runs ours once on N samples (streamed)
for its peak memory. The machine is shared: the load average is printed beside the figures.
"""
from __future__ import annotations

import argparse
import os
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import numpy as np

REPO = Path(__file__).resolve().parent.parent
AIM_SLOPE_RATIO = 0.25  # our cost per sample at most this share of the reference's
AIM_MEMORY_MB = 1500.0
WRITE_CHUNK = 1_000_000

DESIGN = """\
title = "Cargo-bike spring under a force history (benchmark)"
[beam]
support = "cantilever"
span = "300 mm"
width = {{ root = "60 mm", tip = "36 mm" }}
[[ply]]
material = "glass-epoxy-woven"
thickness = "0.25 mm"
[[ply]]
material = "e-glass-epoxy"
thickness = "0.8 mm"
count = 14
[[ply]]
material = "glass-epoxy-woven"
thickness = "0.25 mm"
[duty]
drive = "force"
profile = "{profile}"
column = "force_n"
unit = "N"
"""


def write_history(path: Path, n: int, seed: int = 2026) -> None:
    """An invented rider's load on the spring [N]: a slow ride plus noise, written to three decimals."""
    with open(path, "w") as stream:
        stream.write("force_n\n")
        for start in range(0, n, WRITE_CHUNK):
            k = min(WRITE_CHUNK, n - start)
            rng = np.random.default_rng([seed, start])
            t = (start + np.arange(k)) / 500.0
            force = 600 + 250 * np.sin(2 * np.pi * 1.7 * t) + 80 * np.sin(2 * np.pi * 0.23 * t) + rng.normal(0, 20, k)
            np.savetxt(stream, force, fmt="%.3f")


def timed(code: str) -> tuple[float, float]:
    """Wall time [s] and peak resident memory [MB] of a fresh Python process running ``code``."""
    start = time.perf_counter()
    process = subprocess.Popen([sys.executable, "-c", code], cwd=REPO, stdout=subprocess.DEVNULL)
    _, status, usage = os.wait4(process.pid, 0)
    elapsed = time.perf_counter() - start
    if status != 0:
        raise RuntimeError(f"benchmark process failed ({status}): {code}")
    return elapsed, usage.ru_maxrss / 1024.0


def ours(design: Path, out: Path) -> str:
    return (f"import sys; sys.path.insert(0, {str(REPO)!r}); import conftest; "
            f"sys.argv = ['flexcycle', 'run', {str(design)!r}, '--out', {str(out)!r}]; "
            "from flexcycle.cli.app import main; main()")


def reference(csv: Path) -> str:
    return (f"import pandas, rainflow; values = pandas.read_csv({str(csv)!r})['force_n'].to_list(); "
            "sum(1 for _ in rainflow.extract_cycles(values))")


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    parser.add_argument("--sizes", nargs=2, type=float, default=[1e6, 1e7])
    parser.add_argument("--repeats", type=int, default=5)
    parser.add_argument("--stream", type=float, default=None)
    args = parser.parse_args()
    sizes = [int(s) for s in args.sizes]
    with tempfile.TemporaryDirectory() as folder:
        folder = Path(folder)
        files = {}
        for n in sizes:
            csv = folder / f"force-{n}.csv"
            write_history(csv, n)
            design = folder / f"design-{n}.toml"
            design.write_text(DESIGN.format(profile=csv.as_posix()))
            files[n] = (csv, design)
        times = {(who, n): [] for who in ("ours", "reference") for n in sizes}
        memory = {(who, n): 0.0 for who in ("ours", "reference") for n in sizes}
        for round_number in range(args.repeats):
            for n in sizes:
                csv, design = files[n]
                for who, code in (("ours", ours(design, folder / f"out-{n}-{round_number}")),
                                  ("reference", reference(csv))):
                    elapsed, peak = timed(code)
                    times[(who, n)].append(elapsed)
                    memory[(who, n)] = max(memory[(who, n)], peak)
        streamed = None
        if args.stream:
            n = int(args.stream)
            csv, design = folder / "force-stream.csv", folder / "design-stream.toml"
            write_history(csv, n)
            design.write_text(DESIGN.format(profile=csv.as_posix()))
            streamed = (n, *timed(ours(design, folder / "out-stream")))
    load = os.getloadavg()[0]
    print(f"force histories, noise at three decimals; {args.repeats} interleaved rounds; load average "
          f"{load:.1f} on {os.cpu_count()} cores (shared machine)")
    print(f"{'samples':>10}{'flexcycle run':>22}{'read_csv + rainflow':>24}{'peak MB, ours':>15}{'peak MB, ref':>14}")
    print(f"{'':>10}{'fastest   median':>22}{'fastest   median':>24}")
    for n in sizes:
        print(f"{n:>10.0e}{min(times[('ours', n)]):>13.2f} s{statistics.median(times[('ours', n)]):>6.2f} s"
              f"{min(times[('reference', n)]):>15.2f} s{statistics.median(times[('reference', n)]):>6.2f} s"
              f"{memory[('ours', n)]:>15.0f}{memory[('reference', n)]:>14.0f}")
    a, b = sizes
    for name, pick in (("fastest", min), ("median", statistics.median)):
        slope = {who: (pick(times[(who, b)]) - pick(times[(who, a)])) / (b - a) for who in ("ours", "reference")}
        print(f"cost per sample between {a:.0e} and {b:.0e} ({name} runs): ours {slope['ours'] * 1e6:.3f} µs, "
              f"reference {slope['reference'] * 1e6:.3f} µs, ratio {slope['ours'] / slope['reference']:.2f} "
              f"(aim ≤ {AIM_SLOPE_RATIO})")
    if streamed:
        n, elapsed, peak = streamed
        print(f"streamed {n:.0e} samples: {elapsed:.1f} s, peak memory {peak:.0f} MB (aim ≤ {AIM_MEMORY_MB:g} MB)")


if __name__ == "__main__":
    main()
