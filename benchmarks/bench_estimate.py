"""One linear estimate of the bundled example, and its parts, against the 10 ms aim.

    .venv/bin/python benchmarks/bench_estimate.py [--repeats 30]

Not part of the test run. The design is loaded once (its duty read and counted once); then, interleaved
round by round so that the shared machine's drift touches every figure alike, the whole
`flexcycle.estimate.estimate` and its parts: the beam response, the locations, the Miner damage, the static
check. Each figure is the median of the rounds (and the fastest round beside it).
"""
from __future__ import annotations

import argparse
import statistics
import sys
import time
from pathlib import Path

REPO = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(REPO))
import conftest  # noqa: E402,F401  (this clone's code under the name flexcycle)

AIM_S = 0.010  # one linear estimate of the bundled example


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    parser.add_argument("--repeats", type=int, default=30)
    args = parser.parse_args()

    from flexcycle.design import load_design
    from flexcycle.estimate import estimate
    from flexcycle.fatigue import damage
    from flexcycle.mechanics.beam import respond
    from flexcycle.mechanics.energy import force_per_drive

    design = load_design(REPO / "life" / "examples" / "cargo-bike-rear-spring.toml")
    response = respond(design.beam)
    per_drive = force_per_drive(response.compliance, design.duty.drive)
    models = damage.build_models(list(design.materials.values()), design.mean_stress)
    places = damage.locations(response, models, 1.0)
    parts = {
        "whole estimate": lambda: estimate(design),
        "beam response": lambda: respond(design.beam),
        "fatigue models": lambda: damage.build_models(list(design.materials.values()), design.mean_stress),
        "locations": lambda: damage.locations(response, models, 1.0),
        "Miner damage": lambda: damage.miner_damage(places, design.duty.cycles, per_drive, design.stress_factor),
    }
    times: dict[str, list[float]] = {name: [] for name in parts}
    for work in parts.values():
        work()  # warm: first-call imports and caches
    for _ in range(args.repeats):
        for name, work in parts.items():
            start = time.perf_counter()
            work()
            times[name].append(time.perf_counter() - start)
    cycles = design.duty.cycles.lo.size
    print(f"bundled example: {len(design.beam.plies)} plies, {response.x.size} stations, {places.station.size} "
          f"locations, {cycles} counted cycles; {args.repeats} interleaved rounds (shared machine: medians)")
    print(f"{'part':<18}{'median':>10}{'fastest':>10}{'aim':>10}")
    for name, values in times.items():
        aim = f"{AIM_S * 1e3:.0f} ms" if name == "whole estimate" else ""
        print(f"{name:<18}{statistics.median(values) * 1e3:>8.1f} ms{min(values) * 1e3:>7.1f} ms{aim:>10}")


if __name__ == "__main__":
    main()
