"""A design-space sweep on Dask: every candidate of a sweep file estimated, rows streamed to disk as they come.

The duty is read and counted once (`flexcycle.design.load_duty`) and scattered to every worker once; the
candidates go to the workers in batches (one task estimates a batch, so that the scheduling overhead of a task
is spread over many estimates); each finished batch is appended to ``sweep-rows.csv`` and flushed at once,
so a crash loses no finished row and ``resume`` goes on from the rows already written. Dask retries the
tasks of a worker that dies. At the end ``sweep.csv`` (every candidate in order, with the requirements and the
Pareto flag) and ``sweep.html`` are written.

The library prints nothing: ``progress(done, total)`` is called as candidates finish.
"""
from __future__ import annotations

import contextlib
import csv
import io
import json
import math
import os
import tempfile
from collections.abc import Callable, Iterator, Mapping, Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import Any

import numpy as np
import pandas as pd

from flexcycle.design import LoadedDuty, load_duty, parse_design
from flexcycle.errors import InputError
from flexcycle.estimate import estimate
from flexcycle.explore.pareto import as_numbers, meets, pareto_front
from flexcycle.explore.space import (
    SweepSpace,
    candidate_document,
    check_summary_keys,
    format_value,
    read_space,
)
from flexcycle.mechanics import errors as mechanics_errors
from flexcycle.spectra import errors as spectra_errors

CANDIDATE_ERRORS = (InputError, mechanics_errors.InputError, spectra_errors.InputError)
FIGURES = ["life_blocks", "life_cycles", "mass_kg", "stiffness_n_per_m", "peak_energy_j",
           "specific_energy_j_per_kg", "static_reserve"]  # the summary figures of every row (DESIGN.md)
ROWS_FILE = "sweep-rows.csv"  # the rows as they finish, in the order they finish
PLAN_FILE = "sweep-plan.json"  # what the rows belong to: a resumed sweep must be the same sweep
CONNECT_TIMEOUT_S = 8.0  # an unreachable scheduler is reported within this time (and the 10 s promised), not waited for
RETRIES = 3  # times Dask re-runs a batch whose worker died


@dataclass(frozen=True)
class SweepContext:
    """What a worker needs to turn a candidate's values into a row (scattered once, with the duty).

    document : dict — the base design, parsed; design_name : str — its file name, for messages
    base_dir : Path — the base design's folder; keys : tuple[str, ...] — the varied dotted keys
    extra : tuple[str, ...] — summary keys the objectives and requirements add to the row
    """

    document: dict
    design_name: str
    base_dir: Path
    keys: tuple[str, ...]
    extra: tuple[str, ...]


def columns_of(context: SweepContext) -> list[str]:
    """The columns of the streamed rows: the varied keys, the figures, the added keys, the message, the number."""
    return [*context.keys, *FIGURES, "critical_mode", *context.extra, "message", "candidate"]


def evaluate_candidate(context: SweepContext, duty: LoadedDuty, number: int, values: Sequence) -> dict[str, Any]:
    """One candidate's row: its values as written, its summary figures, or the message that makes it invalid."""
    row: dict[str, Any] = {key: format_value(v) for key, v in zip(context.keys, values)}
    row["candidate"] = number
    try:
        doc = candidate_document(context.document, context.keys, values)
        design = parse_design(doc, context.design_name, context.base_dir, duty=duty)
        summary = estimate(design, compare_theories=False).summary()  # figures only: no warning texts
    except CANDIDATE_ERRORS as exc:
        row["message"] = str(exc)
        return row
    for key in [*FIGURES, *context.extra]:
        row[key] = summary.get(key)
    row["critical_mode"] = summary["critical"]["mode"]
    return row


def evaluate_batch(context: SweepContext, duty: LoadedDuty, batch: Sequence[tuple[int, tuple]]) -> list[dict]:
    """The rows of a batch of (number, values) candidates (one Dask task)."""
    return [evaluate_candidate(context, duty, number, values) for number, values in batch]


# --- preparing ------------------------------------------------------------------------------------------

@dataclass(frozen=True)
class Prepared:
    """A sweep ready to run: its space, the context and duty the workers share, the base design's summary."""

    space: SweepSpace
    context: SweepContext
    duty: LoadedDuty
    base_summary: dict


def prepare(sweep_file: Path, progress: Callable[[int, int], None] | None = None) -> Prepared:
    """Read the sweep file, read and count the base design's duty once, estimate the base design (its summary
    names the keys objectives and requirements may use)."""
    space = read_space(sweep_file)
    name = space.design_path.name
    drive = space.document.get("duty", {}).get("drive") if isinstance(space.document.get("duty"), Mapping) else None
    if drive == "strain":
        raise InputError(f"{space.path.name}: the base design {name} has a strain-gauge duty, which each candidate's "
                         "section turns into a different force history; a sweep shares one duty: give the base "
                         "design a force or deflection duty")
    duty = load_duty(space.document, name, space.design_path.parent, progress)
    base = estimate(parse_design(space.document, name, space.design_path.parent, space.design_path, duty=duty))
    summary = base.summary()
    check_summary_keys(space, summary)
    fixed = {*FIGURES, "critical_mode"}
    extra = tuple(dict.fromkeys(k for k in [o.key for o in space.objectives] + [r.key for r in space.requirements]
                                if k not in fixed))
    context = SweepContext(space.document, name, space.design_path.parent, space.keys, extra)
    return Prepared(space, context, duty, summary)


# --- running on Dask ------------------------------------------------------------------------------------

@contextlib.contextmanager
def dask_client(scheduler: str | None = None, workers: int | None = None) -> Iterator[Any]:
    """A Dask client: on the scheduler at ``scheduler`` (e.g. ``tcp://host:8786``), or on a local cluster of
    ``workers`` single-threaded worker processes (default: one per core). Closed on leaving.

    An unreachable scheduler is an InputError within CONNECT_TIMEOUT_S, not a hang.
    """
    from distributed import Client, LocalCluster

    if scheduler is not None:
        try:
            client = Client(scheduler, timeout=f"{CONNECT_TIMEOUT_S}s")
        except (OSError, TimeoutError, ValueError) as exc:
            raise InputError(f"--scheduler {scheduler}: no Dask scheduler answered within {CONNECT_TIMEOUT_S:g} s "
                             f"({type(exc).__name__}: {str(exc).splitlines()[0] if str(exc) else 'no answer'}); "
                             "check the address (tcp://HOST:PORT) and that the scheduler is running") from None
        with client:
            yield client
        return
    count = workers or os.cpu_count() or 1
    with LocalCluster(n_workers=count, threads_per_worker=1, processes=True, dashboard_address=":0") as cluster, \
            Client(cluster) as client:
        yield client


LARGEST_BATCH = 100  # candidates per task at most: a worker that dies loses about a second of estimates
SMALLEST_BATCH = 4  # candidates per task at least: a task's own cost (a few ms) stays small beside its estimates


def batches(candidates: int, workers: int) -> list[slice]:
    """The candidates' tasks, in order: guided self-scheduling (Polychronopoulos & Kuck 1987, IEEE Trans.
    Computers C-36(12), 1425–1439) with half its chunk, as factoring takes (Hummel, Schonberg & Flynn 1992,
    Comm. ACM 35(8)): each batch holds the remaining candidates over twice the workers, between
    SMALLEST_BATCH and LARGEST_BATCH, so that the batches shrink towards the end and the workers finish
    together (equal batches of 50 left one of two workers idle for up to a batch's time, 0.3–0.5 s of a 2 s
    sweep, measured), while a large sweep is still cut into few tasks for the scheduler, which shares the
    machine's cores with the workers."""
    cuts, start = [], 0
    while start < candidates:
        size = min(LARGEST_BATCH, max(SMALLEST_BATCH, math.ceil((candidates - start) / (2 * max(1, workers)))))
        cuts.append(slice(start, min(candidates, start + size)))
        start += size
    return cuts


@dataclass(frozen=True)
class SweepOutcome:
    """What a sweep wrote: the table (every candidate in order) and the files.

    table : pd.DataFrame — sweep.csv as written; evaluated : int — candidates estimated by this run (not resumed)
    files : tuple[Path, ...]
    """

    table: pd.DataFrame
    evaluated: int
    files: tuple[Path, ...]


def run_sweep(prepared: Prepared, out: Path, client, resume: bool = False, batch: int | None = None,
              progress: Callable[[int, int], None] | None = None, command: str = "") -> SweepOutcome:
    """Estimate every candidate on the Dask ``client``, stream the rows to ``out``, write sweep.csv and sweep.html.

    resume : bool — go on from the rows already in ``out`` (the same sweep file and base design only)
    batch : int | None — candidates per task (default: shrinking batches, `batches`)
    command : str — the command line that ran the sweep, for the page
    """
    from distributed import as_completed

    out = Path(out)
    space, context = prepared.space, prepared.context
    columns = columns_of(context)
    rows_path, plan_path = out / ROWS_FILE, out / PLAN_FILE
    plan = {"sweep": space.path.name, "design": space.design_path.name, "fingerprint": space.fingerprint,
            "candidates": len(space.candidates), "columns": columns}
    done = _rows_already_written(rows_path, plan_path, plan, resume)
    out.mkdir(parents=True, exist_ok=True)
    if not done:
        _write_atomic(plan_path, json.dumps(plan, indent=1) + "\n")
        rows_path.write_text(_csv_line(columns), encoding="utf-8")
    pending = [(number, values) for number, values in enumerate(space.candidates, start=1) if number not in done]
    total = len(space.candidates)
    if progress:
        progress(len(done), total)
    if pending:
        workers = max(1, len(client.scheduler_info().get("workers", {})))
        cuts = [slice(k, k + batch) for k in range(0, len(pending), batch)] if batch else \
            batches(len(pending), workers)
        shared_context, shared_duty = client.scatter([context, prepared.duty], broadcast=True, hash=False)
        futures = [client.submit(evaluate_batch, shared_context, shared_duty, pending[cut], retries=RETRIES,
                                 pure=False) for cut in cuts]
        finished = len(done)
        with open(rows_path, "a", encoding="utf-8", newline="") as stream:
            try:
                for future in as_completed(futures):
                    rows = future.result()
                    stream.write("".join(_csv_line([_cell(row.get(c)) for c in columns]) for row in rows))
                    stream.flush()
                    finished += len(rows)
                    future.release()
                    if progress:
                        progress(finished, total)
            finally:
                client.cancel(futures)
    table = final_table(rows_path, prepared)
    from flexcycle.explore.sweep_page import sweep_html

    page = sweep_html(table, prepared, command)
    files = (out / "sweep.csv", out / "sweep.html")
    _write_atomic(files[0], table_csv(table))
    _write_atomic(files[1], page)
    return SweepOutcome(table, len(pending), files)


def _rows_already_written(rows_path: Path, plan_path: Path, plan: Mapping, resume: bool) -> set[int]:
    """The candidate numbers already in the rows file (resume), after checking it belongs to this sweep."""
    if not rows_path.exists():
        return set()
    where = rows_path.parent
    if not resume:
        raise InputError(f"--out {where}: holds the rows of a sweep ({ROWS_FILE}); add --resume to go on with it, "
                         "or choose another folder")
    try:
        written = json.loads(plan_path.read_text(encoding="utf-8"))
    except (OSError, ValueError):
        written = None
    if not isinstance(written, dict) or written.get("fingerprint") != plan["fingerprint"] \
            or written.get("columns") != plan["columns"]:
        raise InputError(f"--resume: the rows in {where} belong to another sweep file or base design "
                         f"({PLAN_FILE} does not match {plan['sweep']} and {plan['design']} as they are now); "
                         "choose another --out to start afresh")
    text = rows_path.read_text(encoding="utf-8")
    if not text.endswith("\n"):  # a crash in the middle of a line: drop the unfinished line
        text = text[:text.rfind("\n") + 1]
        rows_path.write_text(text, encoding="utf-8")
    table = pd.read_csv(io.StringIO(text), dtype={"candidate": "Int64"}, keep_default_na=False)
    return set(int(n) for n in table["candidate"])


def _csv_line(cells: Sequence[str]) -> str:
    buffer = io.StringIO()
    csv.writer(buffer, lineterminator="\n").writerow(cells)
    return buffer.getvalue()


def _cell(value: Any) -> str:
    """A row's value as CSV text: numbers as Python writes them (shortest text that reads back exactly)."""
    if value is None:
        return ""
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, float):
        return repr(value)
    return str(value)


def _write_atomic(path: Path, text: str) -> None:
    """Write a whole file or nothing: a temporary file beside it, moved into place."""
    handle, temporary = tempfile.mkstemp(dir=path.parent, prefix=f".{path.name}.")
    try:
        with os.fdopen(handle, "w", encoding="utf-8", newline="") as stream:
            stream.write(text)
        os.replace(temporary, path)
    except BaseException:
        with contextlib.suppress(OSError):
            os.unlink(temporary)
        raise


# --- the final table ------------------------------------------------------------------------------------

def final_table(rows_path: Path, prepared: Prepared) -> pd.DataFrame:
    """Every candidate once, in order, with ``meets_requirements`` and ``pareto`` (pareto.py)."""
    context, space = prepared.context, prepared.space
    text = rows_path.read_text(encoding="utf-8")
    table = pd.read_csv(io.StringIO(text), dtype=str, keep_default_na=False)
    table = table.drop_duplicates("candidate", keep="first")  # a batch retried after its rows were written
    table["candidate"] = table["candidate"].astype(int)
    table = table.sort_values("candidate", kind="stable").reset_index(drop=True)
    missing = len(space.candidates) - len(table)
    if missing:
        raise RuntimeError(f"sweep: {missing} candidates have no row after the sweep")
    valid = (table["message"] == "").to_numpy()
    numbers = {key: np.where(valid, as_numbers([None if v == "" else v for v in table[key]]), np.nan)
               for key in [*FIGURES, *context.extra]}
    ok = meets(numbers, space.requirements, valid)
    front = pareto_front(numbers, space.objectives, ok)
    out = table[[*context.keys]].copy()
    for key in [*FIGURES, "critical_mode"]:
        out[key] = table[key]
    out["pareto"] = np.where(front, "true", "false")
    out["meets_requirements"] = np.where(ok, "true", "false")
    for key in context.extra:
        out[key] = table[key]
    out["message"] = table["message"]
    out["candidate"] = table["candidate"]
    return out


def table_csv(table: pd.DataFrame) -> str:
    """sweep.csv's text: the cells exactly as streamed (numbers as read back exactly)."""
    return table.to_csv(index=False, lineterminator="\n")


def read_sweep_table(path: Path) -> pd.DataFrame:
    """sweep.csv read back with every cell as its text (the values as written, the numbers exactly)."""
    return pd.read_csv(path, dtype=str, keep_default_na=False)
