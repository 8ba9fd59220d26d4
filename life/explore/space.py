"""The design space of a sweep file: the base design, the varied keys and their values, the candidates.

A sweep file (TOML) names a base design and the design-file keys to vary::

    design = "spring.toml"                 # path relative to the sweep file
    [vary]
    "beam.span" = ["280 mm", "300 mm"]     # a dotted key of the design file -> the values it takes
    "ply.2.count" = [4, 5, 6]              # ply.N: the N-th [[ply]] entry of the base design, from 1
    [sample]                               # optional: a seeded Latin-hypercube sample instead of the grid
    method = "latin-hypercube"
    count = 200
    seed = 1
    [objectives]                           # optional: the Pareto front over these summary keys
    life_blocks = "maximise"
    mass_kg = "minimise"
    [require]                              # optional: constraints on summary keys (SI numbers)
    static_reserve = ">= 1.5"
    stiffness_n_per_m = [">= 25e3", "<= 32e3"]

Without ``[sample]`` every combination of the listed values is a candidate (the grid). With it, ``count``
candidates are drawn by a Latin-hypercube sample (McKay, Beckman & Conover, Technometrics 21 (1979) 239–245;
scipy.stats.qmc.LatinHypercube), seeded so that the same file gives the same candidates: a continuous range
``{ from = "250 mm", to = "350 mm" }`` is sampled uniformly (the value written to 4 significant digits in the
unit of ``from``), a whole-number range ``{ from = 4, to = 8 }`` uniformly over its whole numbers, and a
list over its entries.

Every value is written into the design as the user wrote it (or as the sample wrote it), so a candidate
is the design file it describes; its kind is checked here, once, and a candidate that is not a valid design
(a ply drop beyond the span, say) is a row with its message, not a failed sweep.
"""
from __future__ import annotations

import copy
import hashlib
import itertools
import json
import math
import os
import re
import tomllib
from collections.abc import Mapping, Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import Any

import numpy as np
import tomlkit

from flexcycle.design import BUNDLED_PREFIX, read_document
from flexcycle.errors import InputError
from flexcycle.mechanics import errors as mechanics_errors
from flexcycle.mechanics.errors import did_you_mean
from flexcycle.mechanics.materials import resolve_materials
from flexcycle.mechanics.theory import THEORIES
from flexcycle.mechanics.units import parse_quantity

SWEEP_KEYS = {"design", "vary", "sample", "objectives", "require"}
SAMPLE_KEYS = {"method", "count", "seed"}
SAMPLE_METHODS = ("latin-hypercube",)
BEAM_VARIED = {"span": "length", "width": "width", "width.root": "length", "width.tip": "length",
               "load_spacing": "length", "theory": "theory"}
PLY_VARIED = {"thickness": "length", "count": "count", "angle": "angle", "material": "material",
              "ends_at": "length"}
MAX_CANDIDATES = 10_000_000  # a grid past this is a slip of the pen, not a design space (common practice)
DIRECTIONS = {"maximise": 1.0, "maximize": 1.0, "minimise": -1.0, "minimize": -1.0}
COMPARISONS = (">=", "<=")


@dataclass(frozen=True)
class Objective:
    """One objective of the Pareto front: a numeric summary key and its direction (+1 maximise, -1 minimise)."""

    key: str
    sign: float


@dataclass(frozen=True)
class Requirement:
    """One constraint on a summary key: ``key >= bound`` or ``key <= bound``.

    bound : float — SI, in the unit the key's name gives (``stiffness_n_per_m`` in N/m)
    """

    key: str
    comparison: str
    bound: float

    def __str__(self) -> str:
        return f"{self.key} {self.comparison} {self.bound:g}"


@dataclass(frozen=True)
class SweepSpace:
    """A parsed sweep file.

    path : Path — the sweep file; design_path : Path — the base design file
    design_text : str — the base design file's text; document : dict — the same, parsed
    keys : tuple[str, ...] — the varied dotted keys, in the file's order
    candidates : tuple[tuple, ...] — every candidate's values, as written, in the order of ``keys``
    method : str — "grid" or "latin-hypercube"
    objectives : tuple[Objective, ...] — default: longest life_blocks, smallest mass_kg
    requirements : tuple[Requirement, ...]
    fingerprint : str — SHA-256 of the sweep file's and the base design's bytes (a resumed sweep must match)
    """

    path: Path
    design_path: Path
    design_text: str
    document: dict
    keys: tuple[str, ...]
    candidates: tuple[tuple, ...]
    method: str
    objectives: tuple[Objective, ...]
    requirements: tuple[Requirement, ...]
    fingerprint: str


DEFAULT_OBJECTIVES = (Objective("life_blocks", 1.0), Objective("mass_kg", -1.0))


def read_space(path: Path) -> SweepSpace:
    """Read and check a sweep file and its base design; the candidates' values are checked for their kind.

    Objective and requirement keys are checked against the summary keys later (`check_summary_keys`), once
    the base design has been estimated.
    """
    path = Path(path)
    if not path.is_file():
        raise InputError(f"{path}: no such sweep file")
    raw = path.read_bytes()
    try:
        sweep = tomllib.loads(raw.decode("utf-8"))
    except (tomllib.TOMLDecodeError, UnicodeDecodeError) as exc:
        raise InputError(f"{path.name}: not a valid UTF-8 TOML file ({exc})") from None
    name = path.name
    _unknown(sweep, SWEEP_KEYS, name)
    design = sweep.get("design")
    if not isinstance(design, str) or not design.strip():
        raise InputError(f"{name}: missing key 'design', the base design file as a path relative to {name}, "
                         'e.g. design = "spring.toml"')
    design_path = (path.parent / design).resolve()
    document = read_document(design_path)
    design_text = design_path.read_text(encoding="utf-8")
    vary = sweep.get("vary")
    if not isinstance(vary, Mapping) or not vary:
        raise InputError(f"{name} [vary]: empty or missing; give at least one design-file key and its values, "
                         'e.g. "beam.span" = ["280 mm", "300 mm"]')
    flat = _flatten(vary)
    kinds = {key: _kind_of(key, document, f"{name} [vary]") for key in flat}
    materials = _material_names(document, design_path.name)
    sample = sweep.get("sample")
    if sample is None:
        for key, values in flat.items():
            if not isinstance(values, list):
                raise InputError(f"{name} [vary] {key}: a list of values, e.g. [\"280 mm\", \"300 mm\"]"
                                 + ("; a range {from, to} needs a [sample] table" if isinstance(values, Mapping) else ""))
        levels = {key: _checked_list(key, values, kinds[key], materials, name) for key, values in flat.items()}
        total = math.prod(len(v) for v in levels.values())
        if total > MAX_CANDIDATES:
            raise InputError(f"{name} [vary]: {total:.3g} combinations, more than {MAX_CANDIDATES:.0e}; "
                             "list fewer values or draw a [sample]")
        candidates = tuple(itertools.product(*levels.values()))
        method = "grid"
    else:
        candidates = _latin_hypercube(sample, flat, kinds, materials, name)
        method = "latin-hypercube"
    objectives = _objectives(sweep.get("objectives"), name)
    requirements = _requirements(sweep.get("require"), name)
    fingerprint = hashlib.sha256(raw + b"\0" + design_path.read_bytes()).hexdigest()
    return SweepSpace(path, design_path, design_text, document, tuple(flat), candidates, method, objectives,
                      requirements, fingerprint)


def check_summary_keys(space: SweepSpace, summary: Mapping[str, Any]) -> None:
    """Every objective and requirement key must be a numeric key of the base design's summary."""
    numeric = sorted(k for k, v in summary.items() if v is None or (isinstance(v, (int, float))
                                                                    and not isinstance(v, bool)))
    named = [("objectives", o.key) for o in space.objectives] + [("require", r.key) for r in space.requirements]
    for table, key in named:
        if key not in numeric:
            hint = did_you_mean(key, numeric)
            raise InputError(f"{space.path.name} [{table}] {key}: not a numeric summary key; {hint}"
                             f"numeric keys: {', '.join(numeric)}")


# --- the varied keys --------------------------------------------------------------------------------------

def _unknown(table: Mapping, allowed: set, where: str) -> None:
    for key in table:
        if key not in allowed:
            hint = did_you_mean(str(key), allowed) or f"allowed: {', '.join(sorted(allowed))}"
            raise InputError(f"{where}: unknown key {key!r}; {hint.rstrip()}")


def _flatten(vary: Mapping, prefix: str = "") -> dict[str, Any]:
    """``{"beam": {"span": [...]}}`` (TOML's bare dotted keys) and ``{"beam.span": [...]}`` alike, as dotted keys.

    A table with ``from``/``to`` is a range (a leaf), as is a width table ``{root, tip}`` inside a list.
    """
    flat: dict[str, Any] = {}
    for key, value in vary.items():
        dotted = f"{prefix}{key}"
        if isinstance(value, Mapping) and not ({"from", "to"} & set(value)):
            flat.update(_flatten(value, dotted + "."))
        else:
            flat[dotted] = value
    return flat


def _allowed_keys(document: Mapping) -> list[str]:
    rows = document.get("ply") if isinstance(document.get("ply"), list) else []
    return ([f"beam.{k}" for k in BEAM_VARIED]
            + [f"ply.{n}.{k}" for n in range(1, len(rows) + 1) for k in PLY_VARIED])


def _kind_of(key: str, document: Mapping, where: str) -> str:
    """The kind of value a dotted key takes; an unknown key names the nearest known one."""
    parts = key.split(".")
    kind = None
    if parts[0] == "beam":
        kind = BEAM_VARIED.get(".".join(parts[1:]))
    elif parts[0] == "ply" and len(parts) == 3:
        rows = document.get("ply") if isinstance(document.get("ply"), list) else []
        if not parts[1].isdigit() or not 1 <= int(parts[1]) <= len(rows):
            raise InputError(f"{where} {key}: the base design has {len(rows)} [[ply]] entries; ply.N takes N from "
                             f"1 to {len(rows)} (the N-th [[ply]] entry, from the tension face)")
        kind = PLY_VARIED.get(parts[2])
    if kind is None:
        hint = did_you_mean(key, _allowed_keys(document), cutoff=0.5)
        raise InputError(f"{where}: unknown key {key!r}; {hint}a sweep varies beam.span, beam.width, "
                         "beam.width.root, beam.width.tip, beam.load_spacing, beam.theory and ply.N.thickness, ply.N.count, "
                         "ply.N.angle, ply.N.material, ply.N.ends_at")
    return kind


def _material_names(document: Mapping, name: str) -> list[str]:
    user = document.get("material", {})
    try:
        return sorted(resolve_materials(user if isinstance(user, Mapping) else {}, name))
    except mechanics_errors.InputError as exc:
        raise InputError(str(exc)) from None


def _check_value(key: str, value: Any, kind: str, materials: Sequence[str], where: str) -> None:
    """A value of the right kind for its key (its validity in the design is the candidate's business)."""
    try:
        if kind == "length":
            parse_quantity(value, "length", where)
        elif kind == "width":
            if isinstance(value, Mapping):
                _unknown(value, {"root", "tip"}, where)
                for end in ("root", "tip"):
                    if end not in value:
                        raise InputError(f"{where}: a tapered width needs both root and tip, got {value!r}")
                    parse_quantity(value[end], "length", f"{where} {end}")
            else:
                parse_quantity(value, "length", where)
        elif kind == "count":
            if isinstance(value, bool) or not isinstance(value, int) or value < 1:
                raise InputError(f"{where}: a whole number of plies >= 1, got {value!r}")
        elif kind == "angle":
            if isinstance(value, bool) or not isinstance(value, (int, float)) or not -90 <= value <= 180:
                raise InputError(f"{where}: a fibre angle in degrees as a bare number (-90 … 180), got {value!r}")
        elif kind == "theory":
            if value not in THEORIES:
                raise InputError(f"{where}: a beam theory, one of {', '.join(map(repr, THEORIES))}, got {value!r}")
        elif kind == "material":
            if not isinstance(value, str) or value not in materials:
                hint = did_you_mean(str(value), materials)
                raise InputError(f"{where}: unknown material {value!r}; {hint}see `flexcycle materials`")
    except mechanics_errors.InputError as exc:
        raise InputError(str(exc)) from None


def _checked_list(key: str, values: list, kind: str, materials: Sequence[str], name: str) -> list:
    if not values:
        raise InputError(f"{name} [vary] {key}: an empty list; give at least one value")
    for k, value in enumerate(values, start=1):
        _check_value(key, value, kind, materials, f"{name} [vary] {key} value {k} ({value!r})")
    return list(values)


# --- the Latin-hypercube sample ---------------------------------------------------------------------------

NUMBER_AND_UNIT = re.compile(r"^\s*([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*(.*?)\s*$")


def _latin_hypercube(sample: Any, flat: Mapping[str, Any], kinds: Mapping[str, str], materials: Sequence[str],
                     name: str) -> tuple[tuple, ...]:
    from scipy.stats import qmc

    where = f"{name} [sample]"
    if not isinstance(sample, Mapping):
        raise InputError(f"{where}: must be a table with method, count and seed")
    _unknown(sample, SAMPLE_KEYS, where)
    method = sample.get("method", "latin-hypercube")
    if method not in SAMPLE_METHODS:
        raise InputError(f"{where} method: {method!r}; must be one of {', '.join(map(repr, SAMPLE_METHODS))}")
    count, seed = sample.get("count"), sample.get("seed", 0)
    if isinstance(count, bool) or not isinstance(count, int) or not 1 <= count <= MAX_CANDIDATES:
        raise InputError(f"{where} count: the number of candidates to draw, a whole number 1 … {MAX_CANDIDATES:.0e}, "
                         f"got {count!r}")
    if isinstance(seed, bool) or not isinstance(seed, int) or seed < 0:
        raise InputError(f"{where} seed: a whole number >= 0, got {seed!r}")
    axes = [_axis(key, values, kinds[key], materials, name) for key, values in flat.items()]
    unit = qmc.LatinHypercube(d=len(axes), seed=np.random.default_rng(seed)).random(count)  # (count, keys) in [0, 1)
    columns = [axis(unit[:, j]) for j, axis in enumerate(axes)]
    return tuple(zip(*columns))


def _axis(key: str, values: Any, kind: str, materials: Sequence[str], name: str):
    """A function from uniform numbers in [0, 1) to the key's values, as written."""
    where = f"{name} [vary] {key}"
    if isinstance(values, list):
        levels = _checked_list(key, values, kind, materials, name)
        return lambda u: [levels[i] for i in np.minimum((u * len(levels)).astype(int), len(levels) - 1)]
    if not isinstance(values, Mapping):
        raise InputError(f"{where}: a list of values or a range {{ from = …, to = … }}, got {values!r}")
    _unknown(values, {"from", "to"}, where)
    if "from" not in values or "to" not in values:
        raise InputError(f"{where}: a range needs both 'from' and 'to', got {values!r}")
    lo, hi = values["from"], values["to"]
    if kind == "count":
        for v in (lo, hi):
            _check_value(key, v, kind, materials, where)
        if hi < lo:
            raise InputError(f"{where}: 'to' ({hi}) is below 'from' ({lo})")
        return lambda u: [int(lo + i) for i in np.minimum((u * (hi - lo + 1)).astype(int), hi - lo)]
    if kind == "angle":
        for v in (lo, hi):
            _check_value(key, v, kind, materials, where)
        return lambda u: [float(f"{lo + (hi - lo) * x:.4g}") for x in u]
    if kind in ("length", "width"):
        for v in (lo, hi):
            _check_value(key, v, "length", materials, f"{where} range")
        found = NUMBER_AND_UNIT.match(lo)
        if not found or not found.group(2):
            raise InputError(f"{where} from: a number and a unit, e.g. \"250 mm\", got {lo!r}")
        unit = found.group(2)
        per_unit = parse_quantity(f"1 {unit}", "length", where)
        a, b = parse_quantity(lo, "length", where) / per_unit, parse_quantity(hi, "length", where) / per_unit
        if b < a:
            raise InputError(f"{where}: 'to' ({hi}) is below 'from' ({lo})")
        return lambda u: [f"{a + (b - a) * x:.4g} {unit}" for x in u]
    raise InputError(f"{where}: a {kind} takes a list of values, not a range")


# --- objectives and requirements --------------------------------------------------------------------------

def _objectives(table: Any, name: str) -> tuple[Objective, ...]:
    if table is None:
        return DEFAULT_OBJECTIVES
    where = f"{name} [objectives]"
    if not isinstance(table, Mapping) or not table:
        raise InputError(f"{where}: a table of summary keys, each \"maximise\" or \"minimise\"")
    out = []
    for key, direction in table.items():
        if direction not in DIRECTIONS:
            raise InputError(f"{where} {key}: {direction!r}; must be \"maximise\" or \"minimise\"")
        out.append(Objective(str(key), DIRECTIONS[direction]))
    return tuple(out)


REQUIREMENT = re.compile(r"^\s*(>=|<=)\s*(\S+)\s*$")


def _requirements(table: Any, name: str) -> tuple[Requirement, ...]:
    if table is None:
        return ()
    where = f"{name} [require]"
    if not isinstance(table, Mapping):
        raise InputError(f"{where}: a table of summary keys, each \">= number\", \"<= number\" or a list of both")
    out = []
    for key, conditions in table.items():
        for condition in conditions if isinstance(conditions, list) else [conditions]:
            found = REQUIREMENT.match(condition) if isinstance(condition, str) else None
            bound = _float(found.group(2)) if found else None
            if bound is None:
                raise InputError(f"{where} {key}: {condition!r}; write \">= 1.5\" or \"<= 3e4\" (a bare SI number "
                                 "in the key's unit)")
            out.append(Requirement(str(key), found.group(1), bound))
    return tuple(out)


def _float(text: str) -> float | None:
    try:
        value = float(text)
    except ValueError:
        return None
    return value if math.isfinite(value) else None


# --- a candidate as a design ------------------------------------------------------------------------------

def candidate_document(document: Mapping, keys: Sequence[str], values: Sequence) -> dict:
    """The parsed design document with the candidate's values set (the base document is not changed)."""
    doc = copy.deepcopy(dict(document))
    for key, value in zip(keys, values):
        _set(doc, key, copy.deepcopy(value))
    return doc


def _set(doc, key: str, value: Any) -> None:
    """Set one dotted key in a parsed (dict) or tomlkit document."""
    parts = key.split(".")
    if parts[0] == "beam":
        beam = doc["beam"]
        if parts[1] == "width" and len(parts) == 3:
            width = beam.get("width")
            if not isinstance(width, Mapping):  # a uniform width becomes a taper with one end changed
                width = {"root": width, "tip": width}
            width = dict(width)
            width[parts[2]] = value
            beam["width"] = _inline(doc, width)
        else:
            beam[parts[1]] = _inline(doc, value) if isinstance(value, Mapping) else value
    else:
        doc["ply"][int(parts[1]) - 1][parts[2]] = value


def _inline(doc, table: Mapping):
    if isinstance(doc, dict):
        return dict(table)
    inline = tomlkit.inline_table()
    inline.update(table)
    return inline


def candidate_text(space: SweepSpace, values: Sequence, written_to: Path, number: int) -> str:
    """The design file of one candidate: the base design's text with the values set (comments kept), its
    profile path rewritten relative to the folder the file is written to, and a header naming the sweep."""
    doc = tomlkit.parse(space.design_text)
    for key, value in zip(space.keys, values):
        _set(doc, key, value)
    duty = doc.get("duty")
    profile = duty.get("profile") if duty is not None else None
    if isinstance(profile, str) and not profile.startswith(BUNDLED_PREFIX):
        absolute = (space.design_path.parent / profile).resolve()
        duty["profile"] = Path(os.path.relpath(absolute, Path(written_to).resolve())).as_posix()
    header = (f"# candidate {number} of the sweep {space.path.name} (base design {space.design_path.name}): "
              + ", ".join(f"{k} = {format_value(v)}" for k, v in zip(space.keys, values)) + "\n")
    return header + tomlkit.dumps(doc)


def format_value(value: Any) -> str:
    """A value as written in the sweep file (TOML syntax), for the table and the page."""
    if isinstance(value, Mapping):
        return "{ " + ", ".join(f"{k} = {json.dumps(v) if isinstance(v, str) else format_value(v)}"
                                for k, v in value.items()) + " }"
    if isinstance(value, str):
        return value
    return repr(value)
