"""Peak memory of a large sweep: `flexcycle sweep` over a seeded Latin-hypercube sample of the bundled example
(linear theory), the resident memory of the whole process tree (the command, its scheduler and its Dask
workers) sampled from /proc every 0.2 s, against the aim of 1.5 GB for 10⁵ candidates.

    .venv/bin/python benchmarks/bench_sweep_memory.py [--candidates 100000]

Not part of the test run; Linux only (/proc). Prints the peak of the summed resident memory, the command's own
peak, the wall time and the candidates per second.
"""
from __future__ import annotations

import argparse
import os
import subprocess
import sys
import tempfile
import time
from pathlib import Path

REPO = Path(__file__).resolve().parent.parent
AIM_MB = 1500.0

SWEEP = """\
design = "base.toml"
[vary]
"beam.span" = {{ from = "260 mm", to = "340 mm" }}
"beam.width.root" = {{ from = "48 mm", to = "66 mm" }}
"ply.2.count" = {{ from = 4, to = 7 }}
"ply.4.count" = {{ from = 3, to = 7 }}
[sample]
method = "latin-hypercube"
count = {count}
seed = 7
"""


def tree_rss_mb(root: int) -> tuple[float, float]:
    """Resident memory of ``root`` and of all its descendants, summed, and of ``root`` alone [MB]."""
    children: dict[int, list[int]] = {}
    rss: dict[int, float] = {}
    for entry in os.listdir("/proc"):
        if not entry.isdigit():
            continue
        try:
            with open(f"/proc/{entry}/stat") as fh:
                fields = fh.read().rsplit(")", 1)[1].split()
        except OSError:
            continue
        pid, parent = int(entry), int(fields[1])
        children.setdefault(parent, []).append(pid)
        rss[pid] = int(fields[21]) * os.sysconf("SC_PAGE_SIZE") / 2**20
    total, todo = 0.0, [root]
    while todo:
        pid = todo.pop()
        total += rss.get(pid, 0.0)
        todo += children.get(pid, [])
    return total, rss.get(root, 0.0)


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    parser.add_argument("--candidates", type=int, default=100_000)
    args = parser.parse_args()
    bundled = (REPO / "life" / "examples" / "cargo-bike-rear-spring.toml").read_text()
    with tempfile.TemporaryDirectory() as folder:
        folder = Path(folder)
        (folder / "base.toml").write_text(bundled.replace('theory = "large-deflection"', 'theory = "linear"'))
        (folder / "sweep.toml").write_text(SWEEP.format(count=args.candidates))
        code = (f"import sys; sys.path.insert(0, {str(REPO)!r}); import conftest; "
                f"sys.argv = ['flexcycle', 'sweep', {str(folder / 'sweep.toml')!r}, '--out', {str(folder / 'out')!r}]; "
                "from flexcycle.cli.app import main; main()")
        start = time.perf_counter()
        process = subprocess.Popen([sys.executable, "-c", code], cwd=REPO, stdout=subprocess.DEVNULL,
                                   stderr=subprocess.DEVNULL)
        peak_tree = peak_own = 0.0
        while process.poll() is None:
            tree, own = tree_rss_mb(process.pid)
            peak_tree, peak_own = max(peak_tree, tree), max(peak_own, own)
            time.sleep(0.2)
        elapsed = time.perf_counter() - start
        rows = sum(1 for _ in open(folder / "out" / "sweep.csv")) - 1 if (folder / "out" / "sweep.csv").exists() else 0
    print(f"sweep of {args.candidates} candidates (bundled example, linear theory, Latin hypercube): exit "
          f"{process.returncode}, {rows} rows, {elapsed:.0f} s ({rows / elapsed:.0f} candidates/s); load average "
          f"{os.getloadavg()[0]:.1f} on {os.cpu_count()} cores")
    print(f"peak resident memory: {peak_tree:.0f} MB for the process tree (aim <= {AIM_MB:g} MB), {peak_own:.0f} MB "
          "for the command itself")


if __name__ == "__main__":
    main()
