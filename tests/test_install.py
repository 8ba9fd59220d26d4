"""The install claims one top-level import name (pyproject.toml: ``flexcycle`` = life/, ``flexcycle.mechanics``,
``flexcycle.spectra``), so it sits beside other distributions' top-level ``spectra``, ``mechanics`` or ``life``.

The wheel is built from a copy of this clone's sources (pip, setuptools: the project's own build), installed
with ``pip install --no-deps --target`` into a fresh folder beside stand-in top-level packages ``spectra``,
``mechanics`` and ``life``, and a fresh interpreter that sees only that folder (and the running environment's
dependencies: numpy, pandas, … — nothing is downloaded for them) imports both sides and runs the bundled example
from the installed package data.
"""
from __future__ import annotations

import importlib.metadata
import json
import os
import shutil
import subprocess
import sys
import textwrap
import zipfile
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parent.parent
SOURCES = ("life", "mechanics", "spectra", "pyproject.toml", "README.md")
STAND_INS = ("spectra", "mechanics", "life")  # top-level names other distributions install
SETUPTOOLS_NEEDED = (77,)  # pyproject.toml's build-system: the license as a string (PEP 639)


def _pip(*args: str, cwd: Path) -> subprocess.CompletedProcess:
    return subprocess.run([sys.executable, "-m", "pip", *args], cwd=cwd, capture_output=True, text=True, timeout=300)


def _setuptools_version() -> tuple[int, ...]:
    try:
        return tuple(int(part) for part in importlib.metadata.version("setuptools").split(".")[:1])
    except importlib.metadata.PackageNotFoundError:
        return (0,)


@pytest.fixture(scope="module")
def wheel(tmp_path_factory) -> Path:
    """The project's wheel, built by pip from a copy of the clone's sources (the clone itself stays clean)."""
    if _pip("--version", cwd=ROOT).returncode != 0:
        pytest.skip("pip is not available to this interpreter: the wheel cannot be built")
    work = tmp_path_factory.mktemp("install")
    source = work / "source"
    source.mkdir()
    for name in SOURCES:
        copy = shutil.copytree if (ROOT / name).is_dir() else shutil.copy2
        copy(ROOT / name, source / name, **({"ignore": shutil.ignore_patterns("__pycache__")}
                                            if (ROOT / name).is_dir() else {}))
    wheels = work / "wheels"
    if _setuptools_version() >= SETUPTOOLS_NEEDED:  # build here, nothing fetched
        built = _pip("wheel", "--no-deps", "--no-build-isolation", "-w", str(wheels), str(source), cwd=work)
    else:  # pip builds in an isolated environment with setuptools from its configured index
        built = _pip("wheel", "--no-deps", "--timeout", "10", "--retries", "0", "-w", str(wheels), str(source),
                     cwd=work)
    if built.returncode != 0:
        pytest.skip("setuptools>=77 is not installed and pip could not fetch it for an isolated build "
                    f"(offline?): {built.stderr.strip().splitlines()[-1] if built.stderr.strip() else ''}")
    (found,) = wheels.glob("flexcycle-*.whl")
    return found


def test_the_wheel_holds_only_flexcycle_at_the_top(wheel):
    with zipfile.ZipFile(wheel) as archive:
        names = archive.namelist()
    tops = {name.split("/", 1)[0] for name in names}
    assert tops == {"flexcycle", f"{wheel.name.split('-')[0]}-{wheel.name.split('-')[1]}.dist-info"}
    for data in ("flexcycle/examples/cargo-bike-rear-spring.toml", "flexcycle/mechanics/data/materials.toml",
                 "flexcycle/spectra/data/cargo-bike-ride.csv"):
        assert data in names  # the package data ships


def test_installed_beside_stand_in_top_level_packages_both_import_their_own(wheel, tmp_path):
    target = tmp_path / "site"
    installed = _pip("install", "--no-deps", "--no-index", "--target", str(target), str(wheel), cwd=tmp_path)
    assert installed.returncode == 0, installed.stderr
    for name in STAND_INS:  # another distribution's top-level package of that name
        (target / name).mkdir()
        (target / name / "__init__.py").write_text(f"STAND_IN = {name!r}\n", encoding="utf-8")
        (target / name / "profiles.py").write_text("OWN = True\n", encoding="utf-8")
    probe = textwrap.dedent(f"""
        import json, sys
        from pathlib import Path
        target = Path({str(target)!r}).resolve()
        import spectra, spectra.profiles, mechanics, life
        import flexcycle, flexcycle.spectra.profiles, flexcycle.mechanics.laminate
        from flexcycle.spectra import rainflow
        def where(modules):
            return {{m.__name__: Path(m.__file__).resolve().relative_to(target).as_posix() for m in modules}}
        theirs = where((spectra, spectra.profiles, mechanics, life))
        ours = where((flexcycle, flexcycle.spectra.profiles, flexcycle.mechanics.laminate, rainflow))
        result = flexcycle.estimate(flexcycle.load_design(flexcycle.example_path()))
        print(json.dumps({{"theirs": theirs, "stand_in": spectra.STAND_IN, "ours": ours,
                          "life_blocks": result.summary()["life_blocks"]}}))
    """)
    env = {**os.environ, "PYTHONPATH": str(target)}
    ran = subprocess.run([sys.executable, "-c", probe], cwd=tmp_path, env=env, capture_output=True, text=True,
                         timeout=300)
    assert ran.returncode == 0, ran.stderr
    seen = json.loads(ran.stdout.strip().splitlines()[-1])
    assert seen["theirs"] == {"spectra": "spectra/__init__.py", "spectra.profiles": "spectra/profiles.py",
                              "mechanics": "mechanics/__init__.py", "life": "life/__init__.py"}
    assert seen["stand_in"] == "spectra"
    assert seen["ours"] == {"flexcycle": "flexcycle/__init__.py",
                            "flexcycle.spectra.profiles": "flexcycle/spectra/profiles.py",
                            "flexcycle.mechanics.laminate": "flexcycle/mechanics/laminate.py",
                            "flexcycle.spectra.rainflow": "flexcycle/spectra/rainflow.py"}
    assert seen["life_blocks"] > 0
    script = target / "bin" / "flexcycle"  # the console script runs from the installed package too
    helped = subprocess.run([sys.executable, str(script), "--help"], cwd=tmp_path, env=env, capture_output=True,
                            text=True, timeout=120)
    assert helped.returncode == 0 and "Usage: flexcycle" in helped.stdout, helped.stderr
