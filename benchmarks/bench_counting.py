"""Speed of rainflow counting: samples per second for a 1e6-sample drive signal.

    .venv/bin/python benchmarks/bench_counting.py

The signal is a seeded random walk (about one reversal every two samples: a harsh case,
far more reversals than a smooth measured ride) and, for comparison, a repeat of the
bundled demo ride (invented demo data) up to 1e6 samples.
"""
from __future__ import annotations

import time

import numpy as np

from flexcycle.spectra.merging import merge_identical
from flexcycle.spectra.profiles import bundled_profile, read_time_history
from flexcycle.spectra.rainflow import rainflow_cycles
from flexcycle.spectra.reversals import reversals

N = 1_000_000  # samples


def rate(name: str, signal: np.ndarray, repeats: int = 3) -> None:
    """Print the best of ``repeats`` runs of counting ``signal``, in samples per second."""
    best = float("inf")
    for _ in range(repeats):
        start = time.perf_counter()
        cycles = rainflow_cycles(signal)
        best = min(best, time.perf_counter() - start)
    merged = merge_identical(cycles)
    print(f"{name:<28} {signal.size:>9d} samples  {reversals(signal).size:>8d} reversals  "
          f"{cycles.n_total:>10.1f} cycles ({merged.lo.size} distinct)  "
          f"{best:6.3f} s  {signal.size / best:12.0f} samples/s")


def main() -> None:
    walk = np.cumsum(np.random.default_rng(2024).normal(size=N))  # seeded
    rate("random walk", walk)
    ride = read_time_history(bundled_profile("cargo-bike-ride"), "deflection_mm", 1e-3, "benchmark").values
    rate("cargo-bike ride, repeated", np.resize(ride, N))


if __name__ == "__main__":
    main()
