"""Fuzzing the design-file loader and the command: every mutated design ends in a result (exit 0) or
one clear input error (exit 2), never a traceback or an internal fault (exit 1).

Seeds: the bundled example designs (life/examples/*.toml) and a small cantilever of the invented user
material of tests/designs.py. Each case applies 1-3 random mutations to the parsed document — drop a key,
duplicate a [[ply]], change a value's type (string, number, table, list), rescale a number or the number of a
quantity string (×0, ×−1, ×1e6, ×1e-6, ×1e300, ×1e-300), make a number NaN or infinite, garble a unit ("mm" → "mn", "m m", "kg", ""), swap a name for
another key's name — writes it as TOML (tomlkit) and runs `flexcycle check` (most cases) or `flexcycle run`
(every eighth) in-process.

The normal test run tries FUZZ_EXAMPLES cases (default 120, about 25 s of CPU on this machine); set the environment
variable FLEXCYCLE_FUZZ_EXAMPLES to try more (the figures in the issue note come from 2000).
"""
from __future__ import annotations

import os
import re
import tempfile
import tomllib
from importlib import resources
from pathlib import Path

import tomlkit
from cli_runner import run_cli
from designs import user_glass
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

FUZZ_EXAMPLES = int(os.environ.get("FLEXCYCLE_FUZZ_EXAMPLES", "120"))

SMALL = """\
title = "fuzz cantilever"
[beam]
support = "cantilever"
span = "150 mm"
width = { root = "20 mm", tip = "10 mm" }
stations = 4

[[ply]]
material = "my-glass"
angle = 0
thickness = "0.5 mm"
count = 3

[[ply]]
material = "e-glass-epoxy"
angle = 45
thickness = "0.4 mm"
ends_at = "100 mm"

[[ply]]
material = "my-glass"
thickness = "0.5 mm"
count = 2

[duty]
drive = "deflection"
cycles = [ { min = "1 mm", max = "8 mm", count = 1000 }, { min = "-2 mm", max = "3 mm", count = 20 } ]
blocks_per_day = 4

[fatigue]
mean_stress = "goodman"
miner_limit = 1.0
stress_factor = 1.2

""" + user_glass("my-glass").replace("m = 10", 'm = 10\nlimit = "20 MPa"')


def _seeds() -> list[dict]:
    folder = resources.files("flexcycle") / "examples"
    texts = [(folder / name).read_text(encoding="utf-8") for name in sorted(
        p.name for p in folder.iterdir() if p.name.endswith(".toml") and not p.name.endswith("-sweep.toml"))]
    return [tomllib.loads(text) for text in texts + [SMALL]]


SEEDS = _seeds()
NAMES = ["cantilever", "three-point", "four-point", "guided", "beam", "plate", "deflection", "force",
         "goodman", "gerber", "none", "cld", "power", "log-linear", "e-glass-epoxy", "carbon-epoxy",
         "structural-foam", "half", "repeat", "ply", "core", "span", "width", "count", "bundled:feeder-flexure"]
FACTORS = [0.0, -1.0, 1e6, 1e-6, 1e300, 1e-300]  # the four, and two at the ends of the float range
GARBLES = [("mm", "mn"), ("mm", "m m"), ("mm", "kg"), ("GPa", "GPA"), ("MPa", "Mpa"), ("MPa", "kg/m^3"),
           ("kg/m^3", "kg"), (" ", ""), ("N", "N*m"), ("mm", "")]
NUMBER = re.compile(r"^\s*([-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?)")


def _paths(node, prefix=()) -> list[tuple]:
    """Every key path in the document (tables, lists and leaves)."""
    out = []
    items = node.items() if isinstance(node, dict) else enumerate(node) if isinstance(node, list) else ()
    for key, value in items:
        out.append(prefix + (key,))
        out.extend(_paths(value, prefix + (key,)))
    return out


def _parent(doc, path):
    node = doc
    for key in path[:-1]:
        node = node[key]
    return node


def _rescale(value, factor):
    if isinstance(value, bool):
        return not value
    if isinstance(value, (int, float)):
        return value * factor
    if isinstance(value, str):
        found = NUMBER.match(value)
        if found:
            return f"{float(found.group(1)) * factor:g}{value[found.end():]}"
    return value


def _retype(value, choice: int):
    if isinstance(value, str):
        found = NUMBER.match(value)
        return [float(found.group(1)) if found else 1.5, {"value": value}, [value], True, "nan mm"][choice % 5]
    if isinstance(value, (int, float)):
        return [str(value), f"{value} mm", {"value": value}, [value], float("nan"), float("-inf")][choice % 6]
    if isinstance(value, dict):
        return ["a table", 1.0, [value] if value else [1], list(value)][choice % 4]
    if isinstance(value, list):
        return ["a list", 2, {"first": value[0]} if value else {}, value[0] if value else 0][choice % 4]
    return "text"


@st.composite
def mutated(draw):
    """A seed design with 1-3 mutations; returns (document, command)."""
    doc = tomllib.loads(tomlkit.dumps(draw(st.sampled_from(SEEDS))))  # a fresh deep copy
    for _ in range(draw(st.integers(min_value=1, max_value=3))):
        paths = _paths(doc)
        path = draw(st.sampled_from(paths))
        parent, key = _parent(doc, path), path[-1]
        op = draw(st.sampled_from(["drop", "duplicate ply", "retype", "rescale", "garble", "swap name"]))
        if op == "drop":
            del parent[key]
        elif op == "duplicate ply" and isinstance(doc.get("ply"), list) and doc["ply"]:
            k = draw(st.integers(min_value=0, max_value=len(doc["ply"]) - 1))
            doc["ply"].insert(k, dict(doc["ply"][k]) if isinstance(doc["ply"][k], dict) else doc["ply"][k])
        elif op == "retype":
            parent[key] = _retype(parent[key], draw(st.integers(min_value=0, max_value=5)))
        elif op == "rescale":
            parent[key] = _rescale(parent[key], draw(st.sampled_from(FACTORS)))
        elif op == "garble" and isinstance(parent[key], str):
            old, new = draw(st.sampled_from(GARBLES))
            parent[key] = parent[key].replace(old, new)
        elif op == "swap name":
            name = draw(st.sampled_from(NAMES))
            if isinstance(parent, dict) and draw(st.booleans()):  # rename the key itself
                parent[name] = parent.pop(key)
            else:
                parent[key] = name
    command = "run" if draw(st.integers(min_value=0, max_value=7)) == 0 else "check"
    return doc, command


def check_outcome(doc: dict, command: str) -> None:
    with tempfile.TemporaryDirectory() as folder:
        design = Path(folder) / "fuzzed.toml"
        design.write_text(tomlkit.dumps(doc), encoding="utf-8")
        args = [command, str(design)] + (["--out", str(Path(folder) / "out")] if command == "run" else [])
        code, out, err = run_cli(args)
    assert code in (0, 2), f"exit {code}: {err}\n{tomlkit.dumps(doc)}"
    assert "Traceback" not in err and "Traceback" not in out
    assert "internal fault" not in err
    if code == 2:
        assert err.startswith("flexcycle: fuzzed.toml"), err
        assert len(err.strip().splitlines()) == 1, err
        assert out == ""


@settings(max_examples=FUZZ_EXAMPLES, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(case=mutated())
def test_every_mutated_design_is_a_result_or_a_clear_error(case):
    doc, command = case
    check_outcome(doc, command)


def test_the_seeds_themselves_give_results():
    """The unmutated seeds are valid designs: `check` exits 0 on each, so every exit 2 above is the mutation's."""
    for doc in SEEDS:
        check_outcome(doc, "check")
        with tempfile.TemporaryDirectory() as folder:
            design = Path(folder) / "seed.toml"
            design.write_text(tomlkit.dumps(doc), encoding="utf-8")
            assert run_cli(["check", str(design)])[0] == 0
