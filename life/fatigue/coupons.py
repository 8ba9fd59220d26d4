"""Coupon fatigue results from a CSV file: the level of each test, its cycles, whether it ran out, its R.

One row per coupon. The level is the cycle's amplitude (``amplitude`` column) or its peak (``maximum``
column, with the stress ratio R); the unit of the level column says the basis: a stress unit (MPa, ksi,
psi, GPa) gives a stress-basis curve, a strain unit (``%``, ``strain``, ``microstrain``) a strain-basis
curve. Cycles are bare numbers; a runout column marks coupons stopped unbroken (1/0, true/false,
yes/no). R is one value for the file (``R``) or a column named ``R`` (several R: one curve each).

Lines starting with ``#`` are comments (a header saying where the data come from is welcome). Every
error names the file, the data row and its line, the column, and what would be right.
"""
from __future__ import annotations

import csv
import hashlib
import math
from dataclasses import dataclass
from pathlib import Path

import numpy as np

from flexcycle.errors import InputError
from flexcycle.mechanics import errors as mechanics_errors
from flexcycle.mechanics.units import parse_quantity

R_COLUMN = "R"
LEVEL_KINDS = ("amplitude", "maximum")
# strain units pint does not know by these names (common practice in strain-life data)
STRAIN_UNITS = {"strain": 1.0, "mm/mm": 1.0, "in/in": 1.0, "m/m": 1.0, "microstrain": 1e-6, "µε": 1e-6, "ue": 1e-6}
TRUE_WORDS = ("1", "true", "yes", "y", "runout")
FALSE_WORDS = ("0", "false", "no", "n", "failed", "")


@dataclass(frozen=True)
class Coupons:
    """Coupon results, SI, one entry per coupon.

    amplitude : np.ndarray — amplitude of the test cycle [Pa or -], > 0
    cycles : np.ndarray — cycles reached (to failure, or to the stop of a runout) [-], > 0
    runout : np.ndarray — True where the coupon was stopped unbroken (right-censored) [bool]
    R : np.ndarray — stress ratio min/max of the test cycle [-]
    row : np.ndarray — the coupon's data row (1 = first row under the header), for messages
    line : np.ndarray — the coupon's line in the file (comments counted), for messages
    basis : str — "stress" or "strain"
    unit : str — the unit of the level column, as given
    scale : float — SI value of one ``unit`` [Pa or -]
    level_column : str — the column the level was read from; level_kind : str — "amplitude" or "maximum"
    cycles_column : str; runout_column : str | None
    path : Path — the file; sha256 : str — SHA-256 of its bytes (hex)
    """

    amplitude: np.ndarray
    cycles: np.ndarray
    runout: np.ndarray
    R: np.ndarray
    row: np.ndarray
    line: np.ndarray
    basis: str
    unit: str
    scale: float
    level_column: str
    level_kind: str
    cycles_column: str
    runout_column: str | None
    path: Path
    sha256: str

    def place(self, k: int, column: str) -> str:
        """``"coupons.csv row 5 (line 7), column 'cycles'"`` for coupon k."""
        return f"{self.path.name} row {int(self.row[k])} (line {int(self.line[k])}), column {column!r}"


def level_basis(unit: str, where: str) -> tuple[str, float]:
    """The basis ("stress" or "strain") a level unit gives, and the SI value of one unit [Pa or -]."""
    text = unit.strip()
    if text.lower() in STRAIN_UNITS:
        return "strain", STRAIN_UNITS[text.lower()]
    for basis in ("stress", "strain"):
        try:
            return basis, parse_quantity(f"1 {text}", basis, where)
        except mechanics_errors.InputError:
            continue
    raise InputError(f"{where}: {unit!r} is neither a stress unit (MPa, ksi, psi, GPa) nor a strain unit "
                     f"(%, strain, microstrain); the level's unit sets the curve's basis")


def amplitude_from_peak(peak: np.ndarray, R: np.ndarray) -> np.ndarray:
    """Amplitude [Pa or -] of cycles of peak magnitude ``peak`` at stress ratio R (R != 1).

    Notes
    -----
    With R = σmin/σmax: for |R| <= 1 the peak is |σmax| and σa = |σmax|·(1 − R)/2; for |R| > 1
    (compression-dominated) the peak is |σmin| = |R|·|σmax| and σa = |σmin|·|1 − R|/(2|R|) (common practice).
    """
    R = np.asarray(R, dtype=float)
    return np.asarray(peak, dtype=float) * np.abs(1.0 - R) / (2.0 * np.maximum(1.0, np.abs(R)))


def read_coupons(path: Path, cycles: str, unit: str, amplitude: str | None = None, maximum: str | None = None,
                 runout: str | None = None, R: float | None = None) -> Coupons:
    """Read and check a coupon CSV file (module docstring).

    path : Path — the CSV file (a header row; ``#`` lines are comments)
    cycles : str — the column of cycles reached [-]
    unit : str — the unit of the level column (MPa, ksi, %, strain, …)
    amplitude, maximum : str | None — the level column, exactly one of them: the cycle's amplitude, or its
        peak magnitude (needs R)
    runout : str | None — the column marking runouts (1/0, true/false, yes/no); None: every coupon failed
    R : float | None — the stress ratio of every test; None: the file's ``R`` column gives it per coupon
    """
    path = Path(path)
    name = path.name
    if (amplitude is None) == (maximum is None):
        raise InputError(f"{name}: give the level column by exactly one of --amplitude COLUMN or --maximum COLUMN")
    level_kind = "amplitude" if amplitude is not None else "maximum"
    level_column = amplitude if amplitude is not None else maximum
    if not unit or not unit.strip():
        raise InputError(f"{name}: --unit: the unit of column {level_column!r}, e.g. MPa, ksi or %")
    basis, scale = level_basis(unit, f"{name}: --unit")
    if R is not None and (not math.isfinite(R) or R == 1.0):
        raise InputError(f"{name}: --R {R:g}: a stress ratio is finite and not 1 (R = 1 is a static load), e.g. -1 or 0.1")
    header, rows, raw = _read_rows(path)
    wanted = [level_column, cycles] + ([runout] if runout is not None else [])
    for column in wanted:
        if column not in header:
            raise InputError(f"{name}: no column {column!r}; the columns there are {', '.join(map(repr, header))}")
    if R is not None and R_COLUMN in header:
        raise InputError(f"{name}: --R {R:g} given, but the file has an {R_COLUMN!r} column too; give R one way only")
    if R is None and R_COLUMN not in header:
        raise InputError(f"{name}: no stress ratio: give --R (e.g. -1 or 0.1) or an {R_COLUMN!r} column"
                         + (" (a --maximum level needs R to give the amplitude)" if level_kind == "maximum" else ""))
    if not rows:
        raise InputError(f"{name}: no data rows under the header")
    at = {column: header.index(column) for column in header}
    level, life, stopped, ratio, lines = [], [], [], [], []
    for row_no, (line_no, cells) in enumerate(rows, start=1):
        def where(column: str) -> str:
            return f"{name} row {row_no} (line {line_no}), column {column!r}"  # noqa: B023 — used at once

        if len(cells) != len(header):
            raise InputError(f"{name} row {row_no} (line {line_no}): {len(cells)} cells, the header has {len(header)}")
        level.append(_level(cells[at[level_column]], unit, scale, basis, where(level_column)))
        life.append(_positive(cells[at[cycles]], where(cycles), "cycles reached"))
        stopped.append(False if runout is None else _flag(cells[at[runout]], where(runout)))
        ratio.append(R if R is not None else _ratio(cells[at[R_COLUMN]], where(R_COLUMN)))
        lines.append(line_no)
    ratios = np.array(ratio, dtype=float)
    values = np.array(level, dtype=float)
    amplitudes = values if level_kind == "amplitude" else amplitude_from_peak(values, ratios)
    return Coupons(
        amplitude=amplitudes, cycles=np.array(life, dtype=float), runout=np.array(stopped, dtype=bool),
        R=ratios, row=np.arange(1, len(rows) + 1), line=np.array(lines), basis=basis, unit=unit.strip(),
        scale=scale, level_column=level_column, level_kind=level_kind, cycles_column=cycles,
        runout_column=runout, path=path, sha256=hashlib.sha256(raw).hexdigest(),
    )


def _read_rows(path: Path) -> tuple[list[str], list[tuple[int, list[str]]], bytes]:
    """The header and the data rows (line number, cells), comment and blank lines skipped; the raw bytes."""
    if not path.is_file():
        raise InputError(f"{path}: no such coupon file")
    raw = path.read_bytes()
    try:
        text = raw.decode("utf-8-sig")
    except UnicodeDecodeError:
        raise InputError(f"{path.name}: not a UTF-8 text file") from None
    numbered = [(k, line) for k, line in enumerate(text.splitlines(), start=1)
                if line.strip() and not line.lstrip().startswith("#")]
    if not numbered:
        raise InputError(f"{path.name}: empty; a coupon file has a header row and one row per coupon")
    parsed = list(csv.reader([line for _, line in numbered]))
    header = [cell.strip() for cell in parsed[0]]
    if any(_is_number(cell) for cell in header):
        raise InputError(f"{path.name} line {numbered[0][0]}: the first row holds numbers; a coupon file starts with "
                         "a header row naming its columns")
    rows = [(k, [cell.strip() for cell in cells]) for (k, _), cells in zip(numbered[1:], parsed[1:])]
    return header, rows, raw


def _is_number(text: str) -> bool:
    try:
        float(text)
    except ValueError:
        return False
    return True


def _number(text: str, where: str, what: str) -> float:
    try:
        value = float(text)
    except ValueError:
        raise InputError(f"{where}: {text!r} is not a number; give the {what} as a bare number") from None
    if not math.isfinite(value):
        raise InputError(f"{where}: {text!r} is not a finite number")
    return value


def _positive(text: str, where: str, what: str) -> float:
    value = _number(text, where, what)
    if not value > 0.0:
        raise InputError(f"{where}: the {what} must be > 0, got {text!r}")
    return value


def _level(text: str, unit: str, scale: float, basis: str, where: str) -> float:
    """A level cell: a bare number in ``unit``, or a number followed by that same unit. Another unit is refused."""
    number, _, written = text.partition(" ") if not _is_number(text) else (text, "", "")
    written = written.strip()
    if written and written.replace(" ", "") != unit.strip().replace(" ", ""):
        raise InputError(f"{where}: {text!r} carries the unit {written!r}, but --unit is {unit!r}: one column, one "
                         f"unit; convert the cell or give its column in one unit")
    value = _number(number, where, f"level (a {basis} in {unit})")
    if not value > 0.0:
        raise InputError(f"{where}: the level must be > 0 (a magnitude, in {unit}), got {text!r}")
    return value * scale


def _flag(text: str, where: str) -> bool:
    word = text.strip().lower()
    if word in TRUE_WORDS:
        return True
    if word in FALSE_WORDS:
        return False
    raise InputError(f"{where}: {text!r} does not say whether the coupon ran out; write 1 or 0 (true/false, yes/no)")


def _ratio(text: str, where: str) -> float:
    value = _number(text, where, "stress ratio R")
    if value == 1.0:
        raise InputError(f"{where}: R = 1 is a static load, not a cycle; e.g. -1, 0.1 or 10")
    return value
