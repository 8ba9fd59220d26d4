"""The Python interface, life/__init__.py: ``import flexcycle``, its lazy exports, the README's example, and
``result.summary()`` equal to summary.json of ``flexcycle run``.
"""
from __future__ import annotations

import json
import re
import subprocess
import sys
from pathlib import Path

import pytest

import flexcycle
from tests.cli_runner import run_cli

ROOT = Path(__file__).resolve().parent.parent


def _python_blocks(markdown: str, heading: str) -> list[str]:
    """The ```python code blocks of the section ``heading`` of a Markdown text."""
    section = markdown.split(f"\n{heading}\n", 1)[1].split("\n## ", 1)[0]
    return re.findall(r"```python\n(.*?)```", section, flags=re.S)


def test_the_readme_example_runs():
    """The README's "From Python" lines, run as a user would type them (on the bundled example)."""
    blocks = _python_blocks((ROOT / "README.md").read_text(encoding="utf-8"), "## From Python")
    assert len(blocks) == 1
    assert len(blocks[0].strip().splitlines()) <= 6  # "five lines": import plus five at most
    names: dict = {}
    exec(compile(blocks[0], "README.md", "exec"), names)  # noqa: S102 — the README's own code
    assert names["result"].summary()["life_blocks"] > 0
    assert list(names["worst"]["damage_per_block"]) == sorted(names["worst"]["damage_per_block"], reverse=True)
    assert names["figure"].axes


@pytest.mark.parametrize("design", [None, "prosthetic-keel"])
def test_summary_equals_summary_json_of_flexcycle_run(tmp_path, design):
    """The contract: result.summary() is the summary.json object of `flexcycle run` on the same design
    (a time history and a block table; JSON round trip, so 1e-3 and 0.001 compare equal)."""
    path = flexcycle.example_path(design) if design else flexcycle.example_path()
    ran = run_cli(["run", path, "--out", tmp_path])
    assert ran.code == 0, ran.err
    written = json.loads((tmp_path / "summary.json").read_text(encoding="utf-8"))
    summary = flexcycle.estimate(flexcycle.load_design(path)).summary()
    assert json.loads(json.dumps(summary, allow_nan=False)) == written


def test_load_design_takes_a_string_or_a_path():
    path = flexcycle.example_path()
    assert flexcycle.load_design(str(path)).title == flexcycle.load_design(path).title


def test_a_wrong_design_is_one_input_error(tmp_path):
    bad = tmp_path / "bad.toml"
    bad.write_text(flexcycle.example_path().read_text(encoding="utf-8").replace("span =", "spna ="),
                   encoding="utf-8")
    with pytest.raises(flexcycle.InputError, match=r"bad\.toml \[beam\]: unknown key 'spna'; did you mean 'span'\?"):
        flexcycle.load_design(bad)


def test_exports_are_listed_and_resolve():
    assert {"load_design", "estimate", "LifeResult", "Design", "InputError", "CAUTION", "FIGURES",
            "example_path"} <= set(flexcycle.__all__)
    assert set(dir(flexcycle)) == set(flexcycle.__all__)
    for name in flexcycle.__all__:
        assert getattr(flexcycle, name) is not None
    with pytest.raises(AttributeError, match="no attribute 'estimat'"):
        flexcycle.estimat  # noqa: B018


def _fresh(code: str) -> str:
    """What a fresh interpreter prints after ``code``, with this clone mapped as the tests map it."""
    proc = subprocess.run([sys.executable, "-c", "import conftest\n" + code], cwd=ROOT, capture_output=True,
                          text=True, timeout=120)
    assert proc.returncode == 0, proc.stderr
    return proc.stdout


def test_import_flexcycle_is_light():
    """`import flexcycle` loads none of numpy, pandas, matplotlib, scipy or pint; the names load them when used."""
    loaded = _fresh("import sys, flexcycle\nprint(' '.join(sys.modules))").split()
    assert not {m for m in loaded if m.split(".")[0] in ("numpy", "pandas", "matplotlib", "scipy", "pint")}


def test_estimate_stays_the_function_after_its_module_is_imported():
    """``flexcycle.estimate`` is both a module and the function: the package keeps the function, whichever
    was imported first."""
    printed = _fresh("import flexcycle.outputs, flexcycle\nimport flexcycle.estimate as e\n"
                     "from flexcycle.estimate import LifeResult\n"
                     "print(callable(flexcycle.estimate), callable(e), LifeResult.__module__)")
    assert printed.split() == ["True", "True", "flexcycle.estimate"]


def test_the_bundled_examples_by_name():
    """Every design file shipped in life/examples is listed, and an unknown name suggests the nearest."""
    shipped = sorted(path.stem for path in (ROOT / "life" / "examples").glob("*.toml"))
    assert list(flexcycle.example_names()) == shipped
    assert flexcycle.example_path().name == "cargo-bike-rear-spring.toml"
    with pytest.raises(flexcycle.InputError, match="did you mean 'feeder-flexure'"):
        flexcycle.example_path("feeder-flexur")
