"""Time the bundled example's estimate under both theories, interleaved, and print the ratio.

Run: ``.venv/bin/python benchmarks/bench_large_deflection.py [ROUNDS]``. Each round times, in turn,
``estimate()`` of the bundled cargo-bike example (life/examples/cargo-bike-rear-spring.toml, invented demo data)
under ``theory = "large-deflection"`` (as shipped) and under ``theory = "linear"``; the linear figure is given
twice: as a user gets it (its warning past 10 % of the span runs the large-deflection estimate too, to say how
much it differs) and the linear work alone (that comparison left out). Interleaving keeps a busy machine's
drift out of the ratio; the median of the rounds is printed. Target: large deflection at most 3 times the
linear work alone.
"""
from __future__ import annotations

import statistics
import sys
import time
from dataclasses import replace
from importlib import resources

import flexcycle.estimate as estimate_module
from flexcycle.design import load_design
from flexcycle.estimate import estimate

TARGET_RATIO = 3.0


def _timed(fn) -> float:
    start = time.perf_counter()
    fn()
    return time.perf_counter() - start


def main(rounds: int = 5) -> None:
    design = load_design(resources.files("flexcycle") / "examples" / "cargo-bike-rear-spring.toml")
    large = replace(design, theory="large-deflection")
    linear = replace(design, theory="linear")
    comparison = estimate_module._with_comparison
    estimate(large), estimate(linear)  # warm caches (imports, library data)
    times: dict[str, list[float]] = {"large-deflection": [], "linear (as run)": [], "linear alone": []}
    for _ in range(rounds):
        times["large-deflection"].append(_timed(lambda: estimate(large)))
        times["linear (as run)"].append(_timed(lambda: estimate(linear)))
        estimate_module._with_comparison = lambda result: result.warnings  # the linear work alone
        try:
            times["linear alone"].append(_timed(lambda: estimate(linear)))
        finally:
            estimate_module._with_comparison = comparison
    median = {name: statistics.median(values) for name, values in times.items()}
    for name, value in median.items():
        print(f"{name:18s} median {value:.3f} s over {rounds} interleaved rounds "
              f"(min {min(times[name]):.3f}, max {max(times[name]):.3f})")
    ratio = median["large-deflection"] / median["linear alone"]
    print(f"ratio large-deflection / linear alone: {ratio:.2f} (target <= {TARGET_RATIO:g})")


if __name__ == "__main__":
    main(int(sys.argv[1]) if len(sys.argv) > 1 else 5)
