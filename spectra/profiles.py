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
DELIMITERS = {",": "comma", ";": "semicolon", "\t": "tab"}  # the column delimiters logger exports use (common practice)
SAMPLE_LINES = 20  # data lines read after the header to tell the delimiter and the decimal mark
_DECIMAL_COMMA = re.compile(r"^\s*[-+]?\d*,\d+([eE][-+]?\d+)?\s*$")  # a number written with a decimal comma


@dataclass(frozen=True)
class Dialect:
    """How a CSV file writes its table.

    sep : str — the column delimiter: ``","``, ``";"`` or ``"\\t"``
    decimal : str — the decimal mark: ``"."``, or ``","`` (only with ``sep = ";"``)
    """

    sep: str = ","
    decimal: str = "."

    @property
    def name(self) -> str:
        """The delimiter in words, for messages (``"semicolon"``)."""
        return DELIMITERS[self.sep]


def _fields(line: str, sep: str) -> list[str]:
    return [cell.strip() for cell in next(csv.reader([line], delimiter=sep))]


def detect_dialect(lines: Sequence[str], where: str) -> Dialect:
    """The delimiter and decimal mark of a CSV table from its header line and the first data lines.

    Parameters
    ----------
    lines : Sequence[str] — the header line, then up to SAMPLE_LINES data lines (comments and blank lines
        already left out)
    where : str — what the file is, e.g. ``"ride.toml [duty] profile: ride.csv"``; the message starts with it

    Returns
    -------
    Dialect — the delimiter that splits the header into more than one name (a file of one column: comma);
    when more than one does, the one that splits every sampled data line into as many fields as the header.
    A decimal comma is taken only with a semicolon delimiter (common practice in logger exports of locales
    that write 1,5: a comma cannot be both the delimiter and the decimal mark, and a tab-separated file with
    decimal commas is refused rather than guessed).

    Raises
    ------
    InputError — the delimiter cannot be told (the message names the delimiters tried and what each gave);
        decimal commas in a file not separated by semicolons.
    """
    if not lines:
        return Dialect()
    header, data = lines[0], list(lines[1:])
    splits = {sep: len(_fields(header, sep)) for sep in DELIMITERS}
    candidates = [sep for sep, count in splits.items() if count > 1]
    if len(candidates) > 1:
        fitting = [sep for sep in candidates if all(len(_fields(line, sep)) == splits[sep] for line in data)]
        if len(fitting) != 1:
            tried = ", ".join(f"{DELIMITERS[sep]} ({splits[sep]} names)" for sep in candidates)
            raise InputError(f"{where}: cannot tell the column delimiter: the header line splits at more than one "
                             f"of them ({tried}) and the data lines do not settle it; separate the columns by one "
                             "delimiter only: comma, semicolon or tab")
        candidates = fitting
    if not candidates:  # one column, or a header that no delimiter splits while the data lines are split
        if any(_DECIMAL_COMMA.match(line) for line in data):
            raise InputError(f"{where}: numbers written with a decimal comma in a file of one column; a decimal "
                             "comma is accepted only with semicolons between the columns: write the numbers with "
                             "a decimal point")
        split_data = [sep for sep in DELIMITERS if any(len(_fields(line, sep)) > 1 for line in data)]
        if split_data:
            named = " or ".join(DELIMITERS[sep] for sep in split_data)
            raise InputError(f"{where}: cannot tell the column delimiter: the data lines are split by {named}, "
                             f"but the header line {header.strip()!r} is not; name every column in the header, "
                             "separated as the data are (comma, semicolon or tab)")
        candidates = [","]
    sep = candidates[0]
    cells = [cell for line in data for cell in _fields(line, sep)]
    decimal_comma = any(_DECIMAL_COMMA.match(cell) for cell in cells)
    if decimal_comma and sep != ";":
        raise InputError(f"{where}: numbers written with a decimal comma in a file separated by "
                         f"{DELIMITERS[sep]}; a decimal comma is accepted only with semicolons between the "
                         "columns: write the numbers with a decimal point, or separate the columns by semicolons")
    return Dialect(sep, "," if decimal_comma else ".")


def file_dialect(path: Path, where: str) -> Dialect:
    """`detect_dialect` on the first lines of a file; a file that cannot be read gives the default dialect
    (its reader then says what is wrong with it)."""
    lines: list[str] = []
    try:
        with open(path, encoding="utf-8-sig") as fh:
            for line in fh:
                if line.startswith(COMMENT) or not line.strip():
                    continue
                lines.append(line.rstrip("\r\n"))
                if len(lines) > SAMPLE_LINES:
                    break
    except (OSError, UnicodeDecodeError):
        return Dialect()
    return detect_dialect(lines, where)


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
    dialect = file_dialect(path, where)
    try:
        with open(path, encoding="utf-8-sig") as fh:
            for number, line in enumerate(fh, start=1):
                if line.startswith(COMMENT) or not line.strip():
                    continue
                try:
                    [float(cell.replace(dialect.decimal, ".")) for cell in _fields(line.rstrip("\r\n"), dialect.sep)]
                except ValueError:
                    return  # a header of names
                raise InputError(f"{where}, line {number}: {line.strip()!r} is data, not a header; the first line "
                                 "that is not a comment must name the columns, e.g. time_s,deflection")
    except (OSError, UnicodeDecodeError):
        return


def read_time_history(path: Path, column: str, to_si: float, where: str) -> TimeHistory:
    """Read one column of a CSV file as a drive signal in SI.

    Parameters
    ----------
    path : Path — CSV file: a header line of column names, then one sample per line;
        lines starting with ``#`` and blank lines are skipped
    column : str — name of the column holding the drive
    to_si : float — factor from the file's numbers to SI [SI unit per file unit], e.g.
        1e-3 for a deflection in mm; must be finite and non-zero
    where : str — what asked for the file (e.g. ``"ride.toml [duty] profile"``); every
        error message starts with it

    Returns
    -------
    TimeHistory — ``values`` = file numbers × ``to_si`` [SI]

    Raises
    ------
    InputError — the file is missing or unreadable; the column is absent (the message
        lists the columns there); a cell is empty, not a number or not finite (the
        message gives its line number in the file); fewer than 2 samples.

    Notes
    -----
    One record per line (no quoted line breaks). Other columns are not checked. The column delimiter
    (comma, semicolon or tab) and the decimal mark are found by `detect_dialect`.
    """
    path = Path(path)
    if not math.isfinite(to_si) or to_si == 0.0:
        raise InputError(f"{where}: the factor to SI must be a finite non-zero number, got {to_si}")
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
    dialect = detect_dialect(data.split("\n", SAMPLE_LINES + 1)[: SAMPLE_LINES + 1], f"{where}: profile file '{path}'")
    header = _fields(data.split("\n", 1)[0], dialect.sep)
    twice = sorted({name for name in header if header.count(name) > 1})
    if twice:  # pandas would rename the second one silently ("d" → "d.1")
        raise InputError(f"{where}: profile file '{path}', line {line_of[0]}: column name "
                         f"{', '.join(repr(n) for n in twice)} appears more than once; give every column its own name")
    try:
        table = pd.read_csv(io.StringIO(data), sep=dialect.sep, dtype=str, na_filter=False, skipinitialspace=True)
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
    if dialect.decimal != ".":
        cells = cells.str.replace(dialect.decimal, ".", regex=False)

    try:  # Python's float() on each cell: correctly rounded (pandas' own converter may miss by a few ulps)
        values = cells.to_numpy(dtype=object).astype(np.float64)
    except ValueError:  # a cell that is not a number: found below, with its line
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
                if "," in cell and dialect.sep != ";":
                    problem += (f" (the file is separated by {dialect.name}; a decimal comma is accepted only "
                                "with semicolons between the columns)")
        raise InputError(f"{where}: profile file '{path}', line {line}: column '{column}' {problem}")
    if values.size < 2:
        raise InputError(f"{where}: profile file '{path}': column '{column}' has {values.size} sample(s); "
                         f"a time history needs at least 2")

    with np.errstate(over="ignore"):  # an overflow is reported just below, with its line
        values = values * to_si
    if not np.all(np.isfinite(values)):
        k = int(np.flatnonzero(~np.isfinite(values))[0])
        raise InputError(f"{where}: profile file '{path}', line {line_of[k + 1]}: column '{column}' "
                         f"times the factor to SI {to_si} is not finite; check the unit")
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
