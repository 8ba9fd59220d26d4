"""Duty profiles: the drive at the load point, as a time history or as cycles.

A duty is given one of three ways, each turned into SI values here:
- a time history read from a CSV file (one column of drive samples), later counted
  by `flexcycle.spectra.rainflow.rainflow_cycles`;
- a block table of (min, max, count) rows, already cycles;
- a constant-amplitude duty (one block of identical cycles).

This layer knows no units: the caller passes values in SI, or for a file the factor
that turns the file's numbers into SI (e.g. 1e-3 for a column in mm). Bundled demo
profiles (invented data, labelled as such in their header) ship as package data.
"""
from __future__ import annotations

import csv
import io
import math
import re
from collections.abc import Sequence
from dataclasses import dataclass
from importlib import resources
from pathlib import Path

import numpy as np
import pandas as pd

from .cycles import Cycles
from .errors import InputError

COMMENT = "#"  # a line whose first character is this is a comment (common practice for CSV headers)


@dataclass(frozen=True, eq=False)  # eq=False: `==` on arrays has no single truth value
class TimeHistory:
    """A drive signal read from a file.

    Attributes
    ----------
    values : np.ndarray — drive samples in file order [unit of the drive, SI: m for a
        deflection, N for a force]; read-only
    source : str — name of the file read
    column : str — name of the column read
    """

    values: np.ndarray
    source: str
    column: str


def _data_lines(text: str) -> tuple[str, list[int]]:
    """The CSV text without comment and blank lines, and each kept line's number (1-based)."""
    kept, numbers = [], []
    for number, line in enumerate(text.splitlines(), start=1):
        if line.startswith(COMMENT) or not line.strip():
            continue
        kept.append(line)
        numbers.append(number)
    return "\n".join(kept) + "\n", numbers


def refuse_headerless(path: Path, where: str) -> None:
    """Refuse a profile whose first line that is not a comment holds numbers only: data without a header.

    Without this check the first sample would be taken for the column names, and the message would say
    that the column is missing. A file that cannot be read passes: the reader says what is wrong with it.
    """
    try:
        with open(path, encoding="utf-8-sig") as fh:
            for number, line in enumerate(fh, start=1):
                if line.startswith(COMMENT) or not line.strip():
                    continue
                try:
                    [float(cell) for cell in line.split(",")]
                except ValueError:
                    return  # a header of names
                raise InputError(f"{where}, line {number}: {line.strip()!r} is data, not a header; the first line "
                                 "that is not a comment must name the columns, e.g. time_s,deflection")
    except (OSError, UnicodeDecodeError):
        return


def read_time_history(path: Path, column: str, scale: float, where: str) -> TimeHistory:
    """Read one column of a CSV file as a drive signal in SI.

    Parameters
    ----------
    path : Path — CSV file: a header line of column names, then one sample per line;
        lines starting with ``#`` and blank lines are skipped
    column : str — name of the column holding the drive
    scale : float — factor from the file's numbers to SI [SI unit per file unit], e.g.
        1e-3 for a deflection in mm; must be finite and non-zero
    where : str — what asked for the file (e.g. ``"ride.toml [duty] profile"``); every
        error message starts with it

    Returns
    -------
    TimeHistory — ``values`` = file numbers × ``scale`` [SI]

    Raises
    ------
    InputError — the file is missing or unreadable; the column is absent (the message
        lists the columns there); a cell is empty, not a number or not finite (the
        message gives its line number in the file); fewer than 2 samples.

    Notes
    -----
    One record per line (no quoted line breaks). Other columns are not checked.
    """
    path = Path(path)
    if not math.isfinite(scale) or scale == 0.0:
        raise InputError(f"{where}: scale to SI must be a finite non-zero number, got {scale}")
    try:
        text = path.read_text(encoding="utf-8-sig")  # -sig: drop a byte-order mark some spreadsheets write
    except FileNotFoundError:
        raise InputError(f"{where}: profile file '{path}' not found; give the path of an existing CSV file") from None
    except UnicodeDecodeError:
        raise InputError(f"{where}: profile file '{path}' is not UTF-8 text; save it as a UTF-8 CSV file") from None
    except OSError as exc:
        raise InputError(f"{where}: profile file '{path}' cannot be read ({exc.strerror})") from None

    data, line_of = _data_lines(text)  # line_of[0] is the header, line_of[k] the k-th sample
    if not line_of:
        raise InputError(f"{where}: profile file '{path}' has no header line; the first line that is not a comment must name the columns")
    header = [name.strip() for name in next(csv.reader([data.split("\n", 1)[0]]))]
    twice = sorted({name for name in header if header.count(name) > 1})
    if twice:  # pandas would rename the second one silently ("d" → "d.1")
        raise InputError(f"{where}: profile file '{path}', line {line_of[0]}: column name "
                         f"{', '.join(repr(n) for n in twice)} appears more than once; give every column its own name")
    try:
        table = pd.read_csv(io.StringIO(data), dtype=str, na_filter=False, skipinitialspace=True)
    except pd.errors.ParserError as exc:
        found = re.search(r"line (\d+)", str(exc))
        line = f", line {line_of[int(found.group(1)) - 1]}" if found else ""
        reason = " ".join(str(exc).split())  # one line
        raise InputError(f"{where}: profile file '{path}'{line}: not a valid CSV row ({reason}); "
                         f"every row needs the same fields as the header") from None
    names = [str(name).strip() for name in table.columns]
    if column not in names:
        listed = ", ".join(f"'{name}'" for name in names)
        raise InputError(f"{where}: profile file '{path}' has no column '{column}'; the columns there are {listed}")
    cells = table.iloc[:, names.index(column)].str.strip()

    values = pd.to_numeric(cells, errors="coerce").to_numpy(dtype=float)
    bad = np.flatnonzero(~np.isfinite(values))
    if bad.size:
        k = int(bad[0])
        line, cell = line_of[k + 1], cells.iloc[k]
        if cell == "":
            problem = "is empty; every sample needs a number"
        else:
            try:
                float(cell)
                problem = f"is '{cell}', not finite; every sample must be a finite number"
            except ValueError:
                problem = f"is '{cell}', not a number"
        raise InputError(f"{where}: profile file '{path}', line {line}: column '{column}' {problem}")
    if values.size < 2:
        raise InputError(f"{where}: profile file '{path}': column '{column}' has {values.size} sample(s); "
                         f"a time history needs at least 2")

    with np.errstate(over="ignore"):  # an overflow is reported just below, with its line
        values = values * scale
    if not np.all(np.isfinite(values)):
        k = int(np.flatnonzero(~np.isfinite(values))[0])
        raise InputError(f"{where}: profile file '{path}', line {line_of[k + 1]}: column '{column}' "
                         f"times the scale {scale} is not finite; check the unit")
    values.flags.writeable = False
    return TimeHistory(values=values, source=path.name, column=column)


def block_table(rows: Sequence[tuple[float, float, float]], where: str) -> Cycles:
    """Cycles from a block table of (min, max, count) rows.

    Parameters
    ----------
    rows : Sequence[tuple[float, float, float]] — per row: cycle minimum [SI], cycle
        maximum [SI], number of cycles [-] (> 0, fractional allowed)
    where : str — what the table came from (e.g. ``"ride.toml [duty] cycles"``); every
        error message starts with it and names the row (1-based)

    Returns
    -------
    Cycles — one entry per row, in table order, without the rows where min == max.

    Raises
    ------
    InputError — no rows; a row that is not three finite numbers; min > max; count <= 0.

    Notes
    -----
    A row with min == max is a steady drive: it has no range, does no fatigue damage
    and is left out of the result (it is not an error). A table of only such rows gives
    empty Cycles.
    """
    if len(rows) == 0:
        raise InputError(f"{where}: the block table has no rows; give at least one (min, max, count) row")
    lo, hi, count = [], [], []
    for k, row in enumerate(rows, start=1):
        try:
            minimum, maximum, n = (float(value) for value in row)
        except (TypeError, ValueError):
            raise InputError(f"{where}: row {k}: expected three numbers (min, max, count), got {row!r}") from None
        if not all(math.isfinite(value) for value in (minimum, maximum, n)):
            raise InputError(f"{where}: row {k}: min, max and count must be finite, got {row!r}")
        if minimum > maximum:
            raise InputError(f"{where}: row {k}: min > max ({minimum} > {maximum}); swap them")
        if n <= 0.0:
            raise InputError(f"{where}: row {k}: count must be > 0 (fractional allowed), got {n}")
        if minimum == maximum:
            continue  # no range, no damage: see Notes
        lo.append(minimum)
        hi.append(maximum)
        count.append(n)
    return Cycles(lo=np.array(lo, dtype=float), hi=np.array(hi, dtype=float), count=np.array(count, dtype=float))


def constant_amplitude(lo: float, hi: float, count: float) -> Cycles:
    """A constant-amplitude duty: ``count`` identical cycles between lo and hi.

    Parameters
    ----------
    lo : float — cycle minimum [unit of the drive, SI]
    hi : float — cycle maximum, >= lo [unit of the drive, SI]
    count : float — number of cycles [-], > 0 (fractional allowed)

    Returns
    -------
    Cycles — one entry; empty when lo == hi (a steady drive does no fatigue damage,
    as for a block-table row).
    """
    where = "constant-amplitude duty"
    if not all(math.isfinite(value) for value in (lo, hi, count)):
        raise InputError(f"{where}: lo, hi and count must be finite, got {lo}, {hi}, {count}")
    if lo > hi:
        raise InputError(f"{where}: lo > hi ({lo} > {hi}); swap them")
    if count <= 0.0:
        raise InputError(f"{where}: count must be > 0 (fractional allowed), got {count}")
    if lo == hi:
        return Cycles(lo=np.empty(0), hi=np.empty(0), count=np.empty(0))
    return Cycles(lo=np.array([lo], dtype=float), hi=np.array([hi], dtype=float), count=np.array([count], dtype=float))


def _data_dir() -> Path:
    return Path(str(resources.files("flexcycle.spectra") / "data"))


def bundled_profiles() -> list[str]:
    """Names of the bundled demo profiles (CSV files in ``spectra/data``), sorted."""
    return sorted(path.stem for path in _data_dir().glob("*.csv"))


def bundled_profile(name: str) -> Path:
    """Path of a bundled demo profile.

    Parameters
    ----------
    name : str — profile name, e.g. ``"cargo-bike-ride"`` (a trailing ``.csv`` is accepted)

    Returns
    -------
    Path — ``spectra/data/<name>.csv``

    Raises
    ------
    InputError — no such profile; the message lists the available names.
    """
    stem = name[: -len(".csv")] if name.endswith(".csv") else name
    available = bundled_profiles()
    if stem not in available:
        raise InputError(f"no bundled profile '{name}'; available: {', '.join(available) or '(none)'}")
    return _data_dir() / f"{stem}.csv"
