"""The sized design written as a design file: the original's comments and layout kept, the new figures in.

Values are written to 6 significant digits in the unit the original used (mm when none); the written file is
read back (``read_back``) and its estimate is the answer, so the rounding is in what is reported.
"""
from __future__ import annotations

import copy
import math
from pathlib import Path

import tomlkit

from flexcycle.design import BUNDLED_PREFIX, Design, parse_design
from flexcycle.mechanics.beam import Beam
from flexcycle.mechanics.units import UREG


def design_rows(design: Design) -> tuple[int, ...]:
    """The design-file row of every ply of the expanded stack (each repeat of ``count`` its own ply)."""
    rows = [r for r, row in enumerate(design.document["ply"]) for _ in range(int(row.get("count", 1)))]
    if len(rows) != len(design.beam.plies):
        raise RuntimeError("the design's [[ply]] rows do not expand to its stack")
    return tuple(rows)


def _length_text(value: float, like: object) -> str:
    """``value`` [m] as a string in the unit of ``like`` (a design-file length), 6 digits; mm when none."""
    unit = UREG.Unit("mm")
    if isinstance(like, str):
        try:
            unit = UREG.Quantity(like.replace("^", "**")).units
        except Exception:  # the loader has read it already; a unit pint re-reads differently falls back to mm
            pass
    return f"{UREG.Quantity(value, 'm').to(unit).magnitude:.6g} {unit:~}"


def design_file(design: Design, beam: Beam, header: list[str], title: str,
                rows: tuple[int, ...] | None = None) -> str:
    """The design file of ``design`` with the ply thicknesses, drops and width of ``beam`` (tomlkit: the
    original comments and layout kept; a ``count`` row split where its plies now end at different places).

    ``rows`` gives the design-file [[ply]] row (0-based, non-decreasing) each ply of ``beam`` came from, for a
    stack with plies added or removed (``restack``); None: the design's own rows, ply for ply. A row left with no
    ply is left out; a ply of its row's own thickness keeps the row's thickness text as written."""
    if design.path is not None:
        doc = tomlkit.parse(design.path.read_text(encoding="utf-8"))
        base = design.path.parent
    else:
        doc = tomlkit.document()
        doc.update(copy.deepcopy(design.document))
        base = Path.cwd()
    own = design_rows(design)
    rows = own if rows is None else tuple(rows)
    if len(rows) != len(beam.plies) or list(rows) != sorted(rows):
        raise RuntimeError("design_file: one non-decreasing row index per ply is needed")
    real = {r: design.beam.plies[own.index(r)].thickness for r in set(own)}  # each row's own ply thickness
    new_rows = tomlkit.aot()
    for r, row in enumerate(doc["ply"]):
        group = [p for p, q in zip(beam.plies, rows) if q == r]
        runs: list[list] = []  # [thickness, ends_at, n]
        for p in group:
            if runs and runs[-1][0] == p.thickness and runs[-1][1] == p.ends_at:
                runs[-1][2] += 1
            else:
                runs.append([p.thickness, p.ends_at, 1])
        for thickness, ends_at, n in runs:
            new = row if len(runs) == 1 else copy.deepcopy(row)
            if thickness != real[r]:
                new["thickness"] = _length_text(thickness, row.get("thickness"))
            if n > 1:
                new["count"] = n
            elif "count" in new:
                del new["count"]
            if ends_at is not None:
                new["ends_at"] = _length_text(ends_at, row.get("ends_at"))
            elif "ends_at" in new:
                del new["ends_at"]
            new_rows.append(new)
    doc["ply"] = new_rows
    like = doc["beam"]["width"]
    like = like if isinstance(like, str) else like.get("root")
    if math.isclose(beam.width_root, beam.width_tip, rel_tol=1e-12):
        doc["beam"]["width"] = _length_text(beam.width_root, like)
    else:
        width = tomlkit.inline_table()
        width.update({"root": _length_text(beam.width_root, like), "tip": _length_text(beam.width_tip, like)})
        doc["beam"]["width"] = width
    profile = doc.get("duty", {}).get("profile")
    if isinstance(profile, str) and not profile.startswith(BUNDLED_PREFIX) and not Path(profile).is_absolute():
        doc["duty"]["profile"] = str((base / profile).resolve())  # the sized file lives elsewhere
    doc["title"] = title
    return "".join(f"# {line}\n" for line in header) + tomlkit.dumps(doc)


def read_back(text: str, design: Design, name: str) -> Design:
    """The written design file parsed again: its figures are the answer (values rounded to 6 digits)."""
    base = design.path.parent if design.path else Path.cwd()
    return parse_design(tomlkit.parse(text).unwrap(), name, base)
