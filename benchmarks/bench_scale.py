"""flexcycle at scale: counting speed, the whole run, peak memory and scaling on long histories.

    .venv/bin/python benchmarks/bench_scale.py                  # 1e5, 1e6, 1e7 samples
    .venv/bin/python benchmarks/bench_scale.py --sizes 1e5 1e6  # a quicker subset
    .venv/bin/python benchmarks/bench_scale.py --stream 1e8     # also the 1e8-sample run, streamed (minutes)

Not part of the test run. Each history is generated (seeded) as a CSV file in a temporary folder:
an invented leaf-spring deflection logged at 500 Hz — a slow ride (two sines and a random-walk
drift) plus sensor noise, quantised to the sensor's 0.01 mm — with a design file that is the bundled
example with its [duty] pointed at the file. Measured side by side in one run, for each size:

- counting alone, in memory, the best of three runs each: the `rainflow` package (`extract_cycles` on the
  samples as a list) against `flexcycle.spectra.rainflow.rainflow_cycles` (the same cycles, checked as a multiset), and their ratio;
- the whole `flexcycle run` (the console script's code in a fresh process: start, read, count, estimate,
  report, files, exit) against a fresh process doing only `pandas.read_csv` of the same file plus the
  package's `extract_cycles`, the best of three each, and their ratio;
- peak memory (maximum resident set size) of the `flexcycle run` process (a separate run through
  `flexcycle.cli.app.main`, which reports it before the interpreter's clean-up);
- time per sample of the run, which stays flat when the run scales linearly.
"""
from __future__ import annotations

import argparse
import compileall
import os
import re
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import numpy as np

REPO = Path(__file__).resolve().parent.parent
EXAMPLE = REPO / "life" / "examples" / "cargo-bike-rear-spring.toml"
RATE_HZ = 500.0  # logging rate of the invented history [1/s]
RESOLUTION_MM = 0.01  # sensor resolution: values are written with two decimals [mm]
WRITE_CHUNK = 2_000_000  # samples generated and written at once


def history(n: int, seed: int = 2026, start: int = 0) -> np.ndarray:
    """Samples start .. start+n of the invented deflection history [mm] (seeded: same file every run)."""
    rng = np.random.default_rng([seed, start])
    t = (start + np.arange(n)) / RATE_HZ
    ride = 28.0 + 9.0 * np.sin(2 * np.pi * 1.7 * t) + 4.0 * np.sin(2 * np.pi * 0.23 * t + 1.0)
    drift = np.cumsum(rng.normal(scale=0.02, size=n))
    drift -= np.linspace(0.0, drift[-1], n)  # each chunk returns to its start: the history stays bounded
    noise = rng.normal(scale=0.15, size=n)
    return np.round((ride + drift + noise) / RESOLUTION_MM) * RESOLUTION_MM


def write_history(path: Path, n: int) -> None:
    """The history as a one-column CSV (header deflection_mm), written in chunks."""
    with open(path, "w", encoding="utf-8") as fh:
        fh.write("# invented demo history for the scale benchmark (not measured)\ndeflection_mm\n")
        for start in range(0, n, WRITE_CHUNK):
            x = history(min(WRITE_CHUNK, n - start), start=start)
            np.savetxt(fh, x, fmt="%.2f")


def write_design(path: Path, profile: Path) -> None:
    """The bundled example design with [duty] pointed at ``profile`` (residue as half cycles)."""
    text = EXAMPLE.read_text(encoding="utf-8")
    text = re.sub(r'(?m)^profile\s*=.*$', f'profile = "{profile.as_posix()}"', text)
    text = re.sub(r'(?m)^column\s*=.*$', 'column = "deflection_mm"', text)
    text = re.sub(r'(?m)^unit\s*=.*$', 'unit = "mm"', text)
    text = re.sub(r'(?m)^residue\s*=.*$', 'residue = "half"', text)
    path.write_text(text, encoding="utf-8")


# Peak memory: VmHWM of /proc/self/status, the resident high-water mark of this program (ru_maxrss would
# carry the parent's size over from the fork).
CHILD = """
import sys, time
start = time.perf_counter()
{body}
sys.stdout.flush()
hwm = [line.split()[1] for line in open("/proc/self/status") if line.startswith("VmHWM")][0]
print("BENCH", time.perf_counter() - start, hwm, file=sys.stderr)
"""

RUN = "from flexcycle.cli.app import main\nsys.argv = ['flexcycle', 'run', {design!r}, '--out', {out!r}]\ntry:\n    main()\nexcept SystemExit as e:\n    assert not e.code, e.code"
# the `flexcycle` console script itself (flexcycle.cli.app.entry, which leaves without the interpreter's clean-up)
COMMAND = "import sys\nsys.argv = ['flexcycle', 'run', {design!r}, '--out', {out!r}]\nfrom flexcycle.cli.app import entry\nentry()"
IN_MEMORY = ("from flexcycle.spectra.streaming import count_history\n"
             "h = count_history({csv!r}, 'deflection_mm', 1e-3, 'bench', keep_signal=10**9)\nassert h.signal is not None")
REFERENCE = ("import pandas as pd, rainflow\nframe = pd.read_csv({csv!r}, comment='#')\n"
             "cycles = list(rainflow.extract_cycles(frame['deflection_mm'].tolist()))")


def child(body: str, repeats: int = 2) -> tuple[float, float, float]:
    """Best of ``repeats`` runs of ``body`` in a fresh Python: (wall time with start-up [s], time inside [s],
    peak RSS [MB]) — the best, as the machine is shared."""
    runs = [_child(body) for _ in range(repeats)]
    return min(runs)


def command(code: str, repeats: int = 3) -> float:
    """Best of ``repeats`` wall times [s] of a fresh Python running ``code`` (start-up and exit included)."""
    env = dict(os.environ, PYTHONPATH=str(REPO))
    best = np.inf
    for _ in range(repeats):
        begin = time.perf_counter()
        done = subprocess.run([sys.executable, "-c", code], cwd=REPO, env=env, capture_output=True, text=True)
        best = min(best, time.perf_counter() - begin)
        if done.returncode:
            raise RuntimeError(done.stderr)
    return best


def _child(body: str) -> tuple[float, float, float]:
    """One run of ``body`` in a fresh Python: (wall time with start-up [s], time inside [s], peak RSS [MB])."""
    env = dict(os.environ, PYTHONPATH=str(REPO))
    begin = time.perf_counter()
    done = subprocess.run([sys.executable, "-c", CHILD.format(body=body)], cwd=REPO, env=env,
                          capture_output=True, text=True)
    wall = time.perf_counter() - begin
    if done.returncode:
        raise RuntimeError(done.stderr)
    line = [ln for ln in done.stderr.splitlines() if ln.startswith("BENCH")][-1]
    _, inside, rss_kb = line.split()
    return wall, float(inside), float(rss_kb) / 1024.0


def counting(csv: Path) -> tuple[float, float, int]:
    """Counting times on the samples in memory [s], each the best of three runs: the package and ours; and the
    number of cycles. Ours are checked identical to the package's as a multiset of (min, max, count) rows (the
    order of the rows carries no meaning)."""
    import pandas as pd
    import rainflow

    from flexcycle.spectra.rainflow import rainflow_cycles

    x = pd.read_csv(csv, comment="#")["deflection_mm"].to_numpy(dtype=float)
    t_ours = np.inf
    for _ in range(3):  # best of three: the machine is shared; ours first, before the package's Python floats
        begin = time.perf_counter()
        ours = rainflow_cycles(x)
        t_ours = min(t_ours, time.perf_counter() - begin)
    samples = x.tolist()
    t_package = np.inf
    for _ in range(3):  # best of three for the package too
        begin = time.perf_counter()
        reference = list(rainflow.extract_cycles(samples))
        t_package = min(t_package, time.perf_counter() - begin)
    start = np.array([r[3] for r in reference], dtype=np.intp)
    end = np.array([r[4] for r in reference], dtype=np.intp)
    lo, hi = np.minimum(x[start], x[end]), np.maximum(x[start], x[end])
    count = np.array([r[2] for r in reference])
    mine, theirs = np.lexsort((ours.count, ours.hi, ours.lo)), np.lexsort((count, hi, lo))  # the same multiset
    if not (np.array_equal(ours.lo[mine], lo[theirs]) and np.array_equal(ours.hi[mine], hi[theirs])
            and np.array_equal(ours.count[mine], count[theirs])):
        raise AssertionError(f"{csv.name}: the cycles differ from the rainflow package's")
    return t_package, t_ours, len(reference)


def counting_apart(csv: Path) -> tuple[float, float, int]:
    """`counting` in a fresh Python: how memory is reused depends on what a process did before."""
    args = [sys.executable, str(Path(__file__).resolve()), "--count", str(csv)]
    done = subprocess.run(args, cwd=REPO, env=dict(os.environ, PYTHONPATH=str(REPO)), capture_output=True, text=True)
    if done.returncode:
        raise RuntimeError(done.stderr)
    line = [ln for ln in done.stdout.splitlines() if ln.startswith("COUNT")][-1].split()
    return float(line[1]), float(line[2]), int(line[3])


def main() -> None:
    sys.path.insert(0, str(REPO))  # this tree's flexcycle, not an installed one
    parser = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    parser.add_argument("--sizes", nargs="*", type=float, default=[1e5, 1e6, 1e7])
    parser.add_argument("--stream", type=float, default=None, help="also run flexcycle on this many samples (e.g. 1e8)")
    parser.add_argument("--keep", type=Path, default=None, help="folder for the generated files (kept between runs)")
    parser.add_argument("--count", type=Path, default=None, help=argparse.SUPPRESS)  # one counting run, in its own process
    args = parser.parse_args()
    if args.count:
        print("COUNT", *counting(args.count))
        return
    # this tree's modules compiled to bytecode once, as `pip install` does for an installed flexcycle (with
    # PYTHONDONTWRITEBYTECODE set, every fresh process would otherwise compile them again)
    compileall.compile_dir(str(REPO / "life"), quiet=1)
    compileall.compile_dir(str(REPO / "mechanics"), quiet=1)
    compileall.compile_dir(str(REPO / "spectra"), quiet=1)
    folder = args.keep or Path(tempfile.mkdtemp(prefix="flexcycle-bench-"))
    folder.mkdir(parents=True, exist_ok=True)
    rows = []
    for size in [int(s) for s in args.sizes]:
        csv, design = folder / f"history-{size}.csv", folder / f"design-{size}.toml"
        if not csv.exists():
            write_history(csv, size)
        write_design(design, csv)
        run_wall = command(COMMAND.format(design=str(design), out=str(folder / f"out-{size}")))
        _, _, run_rss = child(RUN.format(design=str(design), out=str(folder / f"out-{size}")), repeats=1)
        ref_wall, ref_inside, ref_rss = child(REFERENCE.format(csv=str(csv)), repeats=3)
        _, _, memory_rss = child(IN_MEMORY.format(csv=str(csv)))
        t_package, t_ours, n_cycles = counting_apart(csv)
        rows.append((size, n_cycles, t_package, t_ours, run_wall, ref_wall, run_rss, memory_rss, ref_rss))
    print(f"\nflexcycle scale benchmark ({os.cpu_count()} CPUs, Python {sys.version.split()[0]}); files in {folder}")
    print("counting [s], best of 3, each size in a fresh process: package = rainflow.extract_cycles; ours = "
          "rainflow_cycles\nrun, read+ref [s]: fresh processes, best of 3;"
          " peak memory [MB]: run, in-memory count (count_history keeping the signal), read+ref")
    print(f"{'samples':>8} {'cycles':>8} | {'package':>7} {'ours':>6} {'ratio':>6} | {'run':>6} "
          f"{'read+ref':>8} {'ratio':>5} | {'run':>5} {'memory':>6} {'ref':>5} | {'run/sample':>11} {'marginal':>10}")
    first = rows[0]
    for size, n_cycles, t_package, t_ours, run_wall, ref_wall, run_rss, memory_rss, ref_rss in rows:
        print(f"{size:>8.0e} {n_cycles:>8d} | {t_package:>7.2f} {t_ours:>6.3f} {t_package / t_ours:>5.1f}x | "
              f"{run_wall:>6.2f} {ref_wall:>8.2f} "
              f"{run_wall / ref_wall:>5.2f} | {run_rss:>5.0f} {memory_rss:>6.0f} {ref_rss:>5.0f} | "
              f"{run_wall / size * 1e6:>8.3f} µs "
              + (f"{(run_wall - first[4]) / (size - first[0]) * 1e6:>7.3f} µs" if size > first[0] else f"{'':>10}"))
    print("marginal: (run - run of the smallest) / (samples - samples of the smallest): the cost of each further "
          "sample, without start-up, report and mechanics")
    if args.stream:
        size = int(args.stream)
        csv, design = folder / f"history-{size}.csv", folder / f"design-{size}.toml"
        if not csv.exists():
            write_history(csv, size)
        write_design(design, csv)
        run_wall = command(COMMAND.format(design=str(design), out=str(folder / f"out-{size}")), repeats=1)
        _, _, run_rss = child(RUN.format(design=str(design), out=str(folder / f"out-{size}")), repeats=1)
        print(f"{size:>10.0e} streamed: flexcycle run {run_wall:.1f} s, peak RSS {run_rss:.0f} MB, "
              f"{run_wall / size * 1e6:.3f} µs per sample")


if __name__ == "__main__":
    main()
