"""flexcycle: fatigue life and stored elastic energy of flexing composite parts.

From Python::

    import flexcycle
    design = flexcycle.load_design("spring.toml")   # a validated Design, or flexcycle.InputError
    result = flexcycle.estimate(design)             # a LifeResult
    result.summary()                                # the summary.json object
    result.location_table                           # locations.csv as a pandas DataFrame
    result.figure("fatigue-curve")                  # a report figure as a matplotlib Figure

The names below are imported when first used (PEP 562), so that ``import flexcycle`` and the command's
``--help`` load neither numpy nor pandas nor matplotlib.
"""
from __future__ import annotations

import importlib
import sys
import types

# public name → the module that defines it
_EXPORTS = {
    "load_design": "flexcycle.design",
    "parse_design": "flexcycle.design",
    "Design": "flexcycle.design",
    "Duty": "flexcycle.design",
    "estimate": "flexcycle.estimate",
    "LifeResult": "flexcycle.estimate",
    "InputError": "flexcycle.errors",
    "CAUTION": "flexcycle.caution",
    "FIGURES": "flexcycle.report.figures",
    "comparison_table": "flexcycle.explore.compare",
    "example_path": "flexcycle.examples",
    "example_names": "flexcycle.examples",
}

__all__ = sorted([*_EXPORTS, "__version__"])


def __getattr__(name: str) -> object:
    if name == "__version__":
        from importlib.metadata import PackageNotFoundError, version

        try:
            return version("flexcycle")
        except PackageNotFoundError:  # a clone that is not installed
            return "unknown"
    if name in _EXPORTS:
        value = getattr(importlib.import_module(_EXPORTS[name]), name)
        globals()[name] = value
        return value
    raise AttributeError(f"module 'flexcycle' has no attribute {name!r}")


def __dir__() -> list[str]:
    return __all__


class _Package(types.ModuleType):
    """The flexcycle package keeps ``flexcycle.estimate`` the function, though a module has that name too.

    Python sets a package's attribute to each submodule it imports (``flexcycle.estimate`` the module, once any
    code imports it); here that attribute becomes the module's function ``estimate`` instead, so that
    ``flexcycle.estimate(design)`` works whatever was imported before. ``from flexcycle.estimate import X``
    is unaffected (it reads the module from ``sys.modules``).
    """

    def __setattr__(self, name: str, value: object) -> None:
        if name == "estimate" and isinstance(value, types.ModuleType):
            value = value.estimate
        super().__setattr__(name, value)


sys.modules[__name__].__class__ = _Package  # a module may set its own class (Python >= 3.5)
