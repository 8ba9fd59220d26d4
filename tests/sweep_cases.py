"""A small sweep shared by the sweep tests (invented test data): a glass/epoxy cantilever under a noisy
force history, and Dask clusters whose workers import this clone's code."""
from __future__ import annotations

import contextlib
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parent.parent

# Run by each Dask worker as it starts (and restarts): the clone's folders under the import name flexcycle,
# as the root conftest.py does for the tests (an installed flexcycle elsewhere is not the code under test).
CLONE_PRELOAD = f"import runpy; runpy.run_path({str(ROOT / 'conftest.py')!r})"

BASE = """\
title = "Sweep test spring (invented)"
[beam]
support = "cantilever"
span = "300 mm"
width = "40 mm"
[[ply]]
material = "e-glass-epoxy"
thickness = "0.8 mm"
count = 3
[[ply]]
material = "e-glass-epoxy"
thickness = "0.8 mm"
count = 2
ends_at = "200 mm"
[[ply]]
material = "e-glass-epoxy"
thickness = "0.8 mm"
count = 3
[duty]
drive = "force"
profile = "histories/duty.csv"
column = "force_n"
unit = "N"
"""

# 2 × 2 × 2 candidates; a drop at 280 mm lies beyond the 250 mm span: two candidates are not valid designs
SWEEP = """\
design = "base.toml"
[vary]
"beam.span" = ["250 mm", "300 mm"]
"ply.2.ends_at" = ["150 mm", "280 mm"]
"ply.1.count" = [2, 3]
"""


def write_case(folder: Path, sweep: str = SWEEP) -> Path:
    """The base design, its force history (400 samples, noise at three decimals) and the sweep file in
    ``folder``; returns the sweep file."""
    (folder / "histories").mkdir(parents=True, exist_ok=True)
    rng = np.random.default_rng(1)
    force = 150 + 120 * np.sin(np.arange(400) / 5) + rng.normal(0, 15, 400)
    (folder / "histories" / "duty.csv").write_text("force_n\n" + "\n".join(f"{v:.3f}" for v in force) + "\n")
    (folder / "base.toml").write_text(BASE)
    path = folder / "sweep.toml"
    path.write_text(sweep)
    return path


@contextlib.contextmanager
def clone_cluster(workers: int = 2):
    """A LocalCluster of single-threaded worker processes running this clone's code, and its client; both
    stop on leaving."""
    from distributed import Client, LocalCluster

    with LocalCluster(n_workers=workers, threads_per_worker=1, processes=True, dashboard_address=":0",
                      preload=[CLONE_PRELOAD]) as cluster, Client(cluster) as client:
        yield client
