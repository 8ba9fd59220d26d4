"""One linear estimate of the bundled example, and its parts, against the 10 ms aim.

    .venv/bin/python benchmarks/bench_estimate.py [--repeats 30]

Not part of the test run. The bundled design is loaded once (its duty read and counted once) and set to
theory = "linear"; then, interleaved round by round so that the shared machine's drift touches every figure
alike: the estimate as a sweep runs it (``compare_theories=False``), the same with the elastica comparison a
linear run past its range adds to its warning, the estimate under large deflection (the bundled file as it
is), and the linear estimate's parts: the beam response, the locations, the worst-location pass the life
needs (``worst_damage``), the damage at every location that the files and figures ask for afterwards
(``miner_damage``), the first mode. Each figure is the median of the rounds (and the fastest round beside it).
"""
from __future__ import annotations

import argparse
import os
import statistics
import sys
import time
from dataclasses import replace
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
    from flexcycle.mechanics.modal import first_mode

    large = load_design(REPO / "life" / "examples" / "cargo-bike-rear-spring.toml")
    design = replace(large, theory="linear")
    response = respond(design.beam)
    per_drive = force_per_drive(response.compliance, design.duty.drive)
    models = damage.build_models(list(design.materials.values()), design.mean_stress)
    places = damage.locations(response, models, 1.0)
    cycles, factor = design.duty.cycles, design.stress_factor
    parts = {
        "linear estimate": lambda: estimate(design, compare_theories=False),
        "  + elastica check": lambda: estimate(design),
        "large deflection": lambda: estimate(large),
        "beam response": lambda: respond(design.beam),
        "locations": lambda: damage.locations(response, models, 1.0),
        "worst pass": lambda: damage.worst_damage(places, cycles, per_drive, factor),
        "every location": lambda: damage.miner_damage(places, cycles, per_drive, factor),
        "first mode": lambda: first_mode(replace(design.beam)),  # a new beam: its segments built again
    }
    times: dict[str, list[float]] = {name: [] for name in parts}
    for work in parts.values():
        work()  # warm: first-call imports and caches
    for _ in range(args.repeats):
        for name, work in parts.items():
            start = time.perf_counter()
            work()
            times[name].append(time.perf_counter() - start)
    print(f"bundled example: {len(design.beam.plies)} plies, {response.x.size} stations, {places.station.size} "
          f"locations, {cycles.lo.size} counted cycles; {args.repeats} interleaved rounds; load average "
          f"{os.getloadavg()[0]:.1f} on {os.cpu_count()} cores (shared machine: medians)")
    print(f"{'part':<20}{'median':>10}{'fastest':>10}{'aim':>10}")
    for name, values in times.items():
        aim = f"{AIM_S * 1e3:.0f} ms" if name == "linear estimate" else ""
        print(f"{name:<20}{statistics.median(values) * 1e3:>8.1f} ms{min(values) * 1e3:>7.1f} ms{aim:>10}")
    ratio = statistics.median(times["large deflection"]) / statistics.median(times["linear estimate"])
    print(f"{'large / linear':<20}{ratio:>10.1f}")


if __name__ == "__main__":
    main()
