"""Tests run on the code of this clone: the folders map to the one import name as pyproject.toml maps them.

`life/` is imported as ``flexcycle``, `mechanics/` as ``flexcycle.mechanics`` and `spectra/` as
``flexcycle.spectra`` (the same mapping as ``[tool.setuptools] package-dir``), so ``python -m pytest`` in a
clone tests the clone, installed or not, and never a copy in site-packages.
"""
from __future__ import annotations

import importlib.util
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parent
FOLDERS = {"flexcycle": ROOT / "life", "flexcycle.mechanics": ROOT / "mechanics", "flexcycle.spectra": ROOT / "spectra"}


def _map_the_clone() -> None:
    """Import each folder's ``__init__.py`` under its package name, with the folder as its search path."""
    for name, folder in FOLDERS.items():
        loaded = sys.modules.get(name)
        if loaded is not None and Path(loaded.__file__).resolve().parent == folder:
            continue
        spec = importlib.util.spec_from_file_location(name, folder / "__init__.py",
                                                      submodule_search_locations=[str(folder)])
        module = importlib.util.module_from_spec(spec)
        sys.modules[name] = module
        spec.loader.exec_module(module)
        if "." in name:
            parent, child = name.rsplit(".", 1)
            setattr(sys.modules[parent], child, module)


_map_the_clone()
