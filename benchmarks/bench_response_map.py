"""Time flexcycle.mechanics.beam.respond() on a large response map: 200 stations × 40 plies, six ply drops, a taper.

Run: ``.venv/bin/python benchmarks/bench_response_map.py``. Prints the best of 5 runs of ``respond()`` for
the large beam and for a tiny 2-ply beam in the same run, and their ratio. Target: under 0.2 s for the
large beam. The beam is an invented test case (glass/epoxy and carbon/epoxy library plies), not a design.
"""
from __future__ import annotations

import time

from flexcycle.mechanics.beam import Beam, Ply, respond
from flexcycle.mechanics.materials import library

TARGET_S = 0.2
REPEATS = 5


def large_beam() -> Beam:
    """A 0.6 m tapered cantilever, 40 plies of 0.2 mm (±45 and 0 glass, 0 carbon), six drops from the top face."""
    lib = library()
    glass, carbon = lib["e-glass-epoxy"], lib["carbon-epoxy"]
    plies = []
    for k in range(40):
        material = carbon if k % 5 == 0 else glass
        angle = (0.0, 45.0, -45.0, 0.0)[k % 4]
        plies.append(Ply(material, angle, 0.2e-3))
    # drops: the six plies nearest the compression face stop at 0.1 … 0.5 m from the root
    for j, x in enumerate((0.1, 0.18, 0.26, 0.34, 0.42, 0.5)):
        i = 39 - j
        plies[i] = Ply(plies[i].material, plies[i].angle, plies[i].thickness, ends_at=x)
    return Beam("cantilever", 0.6, 60e-3, 25e-3, tuple(plies), stations=200)


def worst_beam() -> Beam:
    """The worst case for segments: 38 of the 40 plies drop, each at its own place (39 laminates), guided support."""
    lib = library()
    glass, carbon = lib["e-glass-epoxy"], lib["carbon-epoxy"]
    plies = tuple(
        Ply(carbon if k % 2 else glass, (0.0, 45.0, -45.0, 90.0)[k % 4], 0.2e-3,
            ends_at=None if k in (0, 39) else 0.05 + 0.4 * k / 40)
        for k in range(40)
    )
    return Beam("guided", 0.5, 50e-3, 20e-3, plies, stations=200)


def tiny_beam() -> Beam:
    glass = library()["e-glass-epoxy"]
    return Beam("cantilever", 0.3, 20e-3, 20e-3, (Ply(glass, 0.0, 1e-3), Ply(glass, 0.0, 1e-3)), stations=20)


def best_of(beam: Beam, repeats: int = REPEATS) -> tuple[float, object]:
    best, resp = float("inf"), None
    for _ in range(repeats):
        t0 = time.perf_counter()
        resp = respond(beam)
        best = min(best, time.perf_counter() - t0)
    return best, resp


def main() -> None:
    tiny = tiny_beam()
    respond(tiny)  # warm-up (imports, caches)
    t_tiny, _ = best_of(tiny)
    for label, beam in (("large beam", large_beam()), ("worst beam", worst_beam())):
        t_big, r_big = best_of(beam)
        n, p = r_big.present.shape
        print(f"{label}: {beam.support}, {n} stations x {p} plies, {int(r_big.segment.max()) + 1} segments")
        print(f"  respond() best of {REPEATS}: {t_big * 1e3:.1f} ms; tiny 2-ply beam {t_tiny * 1e3:.2f} ms; "
              f"ratio {t_big / t_tiny:.1f}")
        verdict = "OK" if t_big < TARGET_S else "SLOWER THAN TARGET"
        print(f"  target < {TARGET_S * 1e3:.0f} ms: {verdict}")


if __name__ == "__main__":
    main()
