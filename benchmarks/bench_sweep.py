"""Sweep throughput of the bundled example: candidates per second with one and two Dask workers, under linear
theory and under large deflection, against the aims (100 candidates/s on a 2-core machine under linear
theory, at most 3 times slower under large deflection; two workers at least 1.7 × one).

    .venv/bin/python benchmarks/bench_sweep.py [--candidates 400] [--repeats 2]

Not part of the test run. The sweep varies the bundled cargo-bike spring's span, root width and the two
unidirectional ply counts (a grid cut to ``--candidates``); the duty is read and counted once. The base design
is the bundled file with [beam] theory set to "linear", and as it is ("large-deflection"). Each round runs
each sweep in this process without Dask and with no cluster alive (the floor), then on a LocalCluster of one
worker and on one of two (single-threaded worker processes running this clone's code), in alternating order
round by round; only the cluster measured is alive (an idle cluster's scheduler, nannies and workers poll: 0.07
CPU-seconds a second in this process and 0.03 in each worker, measured), and its workers are warmed by a
sweep of eight candidates (a worker's first task imports flexcycle) before the clock starts. Each Dask run gives two rates: the whole sweep (to sweep.html written) and the
rows alone (to the last row on disk; the final table and the page are one process's work whatever the
workers). Figures are medians of the rounds. The machine is shared: the load average is printed beside the
figures.
"""
from __future__ import annotations

import argparse
import os
import statistics
import sys
import tempfile
import time
from pathlib import Path

REPO = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(REPO))
import conftest  # noqa: E402,F401  (this clone's code under the name flexcycle)

sys.path.append(str(REPO / "tests"))  # after the root conftest: tests/ has a conftest.py of its own

AIM_RATE = 100.0  # candidates per second, 2-core machine, linear theory
AIM_SCALING = 1.7  # two workers over one
AIM_SLOWER = 3.0  # large deflection at most this many times slower than linear theory

SWEEP = """\
design = "{design}"
[vary]
"beam.span" = ["270 mm", "285 mm", "300 mm", "315 mm", "330 mm"]
"beam.width.root" = ["50 mm", "55 mm", "60 mm", "65 mm"]
"ply.2.count" = [4, 5, 6, 7]
"ply.4.count" = [3, 4, 5, 6, 7]
"""


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    parser.add_argument("--candidates", type=int, default=400)
    parser.add_argument("--repeats", type=int, default=2)
    args = parser.parse_args()

    from dataclasses import replace

    from sweep_cases import clone_cluster

    from flexcycle.explore.sweep import evaluate_batch, prepare, run_sweep

    bundled = (REPO / "life" / "examples" / "cargo-bike-rear-spring.toml").read_text()
    theories = ("linear", "large-deflection")
    rates: dict[tuple[str, str], list[float]] = {}
    with tempfile.TemporaryDirectory() as folder:
        sweeps = {}
        for theory in theories:
            base = Path(folder) / f"{theory}.toml"
            base.write_text(bundled.replace('theory = "large-deflection"', f'theory = "{theory}"'))
            sweep = Path(folder) / f"sweep-{theory}.toml"
            sweep.write_text(SWEEP.format(design=base.as_posix()))
            prepared = prepare(sweep)
            space = replace(prepared.space, candidates=prepared.space.candidates[:args.candidates])
            sweeps[theory] = replace(prepared, space=space)
        n = len(sweeps["linear"].space.candidates)
        for round_number in range(args.repeats):
            for theory, prepared in sweeps.items():  # no cluster alive: the floor
                start = time.perf_counter()
                evaluate_batch(prepared.context, prepared.duty, list(enumerate(prepared.space.candidates, start=1)))
                rates.setdefault((theory, "this process, no Dask"), []).append(n / (time.perf_counter() - start))
            order = (1, 2) if round_number % 2 == 0 else (2, 1)  # alternate, so that drift in the load evens out
            for workers in order:
                name = "1 Dask worker" if workers == 1 else f"{workers} Dask workers"
                with clone_cluster(workers) as client:  # only the cluster measured is alive
                    for theory, prepared in sweeps.items():  # warm the workers (their first task imports flexcycle)
                        few = replace(prepared, space=replace(prepared.space, candidates=prepared.space.candidates[:8]))
                        run_sweep(few, Path(folder) / f"warm-{theory}-{workers}-{round_number}", client, batch=1)
                    for theory, prepared in sweeps.items():
                        out = Path(folder) / f"out-{theory}-{workers}-{round_number}"
                        last_row = []

                        def progress(done, total, last_row=last_row):
                            if done == total:
                                last_row.append(time.perf_counter())

                        start = time.perf_counter()
                        run_sweep(prepared, out, client, progress=progress)
                        rates.setdefault((theory, name), []).append(n / (time.perf_counter() - start))
                        rates.setdefault((theory, name + ", rows"), []).append(n / (last_row[0] - start))
    load = os.getloadavg()[0]
    print(f"sweep of the bundled example, {n} candidates, {args.repeats} interleaved rounds; load average {load:.1f} "
          f"on {os.cpu_count()} cores (shared machine: medians)")
    print(f"{'candidates/s':<24}{'linear':>10}{'large defl.':>13}{'linear/large':>14}{'aim':>10}")
    median = {key: statistics.median(values) for key, values in rates.items()}
    for name in ("this process, no Dask", "1 Dask worker", "2 Dask workers", "1 Dask worker, rows",
                 "2 Dask workers, rows"):
        a, b = median[("linear", name)], median[("large-deflection", name)]
        aim = f"{AIM_RATE:g}/s, <= {AIM_SLOWER:g}" if name == "2 Dask workers" else ""
        print(f"{name:<24}{a:>10.1f}{b:>13.1f}{a / b:>14.2f}{aim:>16}")
    for suffix in ("", ", rows"):
        scaling = [median[(t, "2 Dask workers" + suffix)] / median[(t, "1 Dask worker" + suffix)] for t in theories]
        print(f"{'2 workers / 1' + suffix:<24}{scaling[0]:>10.2f}{scaling[1]:>13.2f}{'':>14}{AIM_SCALING:>10g}")
    print("(the whole sweep, start to sweep.html written; \", rows\": until the last row is on disk, before the "
          "table and the page, which one process writes whatever the workers)")


if __name__ == "__main__":
    main()
