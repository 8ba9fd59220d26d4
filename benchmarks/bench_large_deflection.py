"""Time the bundled example's estimate under both theories and its elastica tabulation, interleaved.

Run: ``.venv/bin/python benchmarks/bench_large_deflection.py [ROUNDS]``. Each round times, in turn, the
elastica's drive table alone (``flexcycle.mechanics.drive_table.tabulate`` with the arguments the estimate
gives it) and ``estimate()`` of the bundled cargo-bike example (life/examples/cargo-bike-rear-spring.toml,
invented demo data) under ``theory = "large-deflection"`` (as shipped) and under ``theory = "linear"``; the
linear figure is given twice: as a user gets it (its warning past 10 % of the span runs the large-deflection
estimate too, to say how much it differs) and the linear work alone (that comparison left out). Interleaving
keeps a busy machine's drift out of the ratio; the median of the rounds is printed, with the load average.
Target: large deflection at most 3 times the linear work alone.
"""
from __future__ import annotations

import os
import statistics
import sys
import time
from dataclasses import replace
from importlib import resources

from flexcycle.design import load_design
from flexcycle.estimate import estimate
from flexcycle.mechanics.beam import respond, segments
from flexcycle.mechanics.drive_table import tabulate
from flexcycle.mechanics.elastica import prepare

TARGET_RATIO = 3.0
estimate_module = sys.modules["flexcycle.estimate"]  # the module: the package's attribute of that name is the function


def _timed(fn) -> float:
    start = time.perf_counter()
    fn()
    return time.perf_counter() - start


def main(rounds: int = 5) -> None:
    design = load_design(resources.files("flexcycle") / "examples" / "cargo-bike-rear-spring.toml")
    large = replace(design, theory="large-deflection")
    linear = replace(design, theory="linear")
    response = respond(design.beam)
    lo, hi = design.duty.extremes

    def table():  # as ``flexcycle.response_map.response_map`` calls it
        model = prepare(design.beam, segments(design.beam))
        return tabulate(model, design.duty.drive, min(lo, 0.0), max(hi, 0.0), response.x, response.segment,
                        stiffness=response.stiffness)

    comparison = estimate_module._with_comparison
    table(), estimate(large), estimate(linear)  # warm caches (imports, library data)
    times: dict[str, list[float]] = {"tabulate": [], "large-deflection": [], "linear (as run)": [], "linear alone": []}
    for _ in range(rounds):
        times["tabulate"].append(_timed(table))
        times["large-deflection"].append(_timed(lambda: estimate(large)))
        times["linear (as run)"].append(_timed(lambda: estimate(linear)))
        estimate_module._with_comparison = lambda result: result.warnings  # the linear work alone
        try:
            times["linear alone"].append(_timed(lambda: estimate(linear)))
        finally:
            estimate_module._with_comparison = comparison
    median = {name: statistics.median(values) for name, values in times.items()}
    print(f"load average {' '.join(f'{v:.2f}' for v in os.getloadavg())}; {table().drive.size} drive levels")
    for name, value in median.items():
        print(f"{name:18s} median {value * 1e3:7.1f} ms over {rounds} interleaved rounds "
              f"(min {min(times[name]) * 1e3:.1f}, max {max(times[name]) * 1e3:.1f})")
    ratio = median["large-deflection"] / median["linear alone"]
    print(f"ratio large-deflection / linear alone: {ratio:.2f} (target <= {TARGET_RATIO:g})")


if __name__ == "__main__":
    main(int(sys.argv[1]) if len(sys.argv) > 1 else 5)
