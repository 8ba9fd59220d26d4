"""The bundled example designs (invented demo data), shipped with flexcycle as package data."""
from __future__ import annotations

from importlib import resources
from pathlib import Path

DEFAULT = "cargo-bike-rear-spring"  # the design `flexcycle run` runs when given none


def example_names() -> tuple[str, ...]:
    """The bundled example designs' names (their file names without ``.toml``), sorted."""
    return tuple(sorted(entry.name[:-len(".toml")] for entry in resources.files(__name__).iterdir()
                        if entry.name.endswith(".toml")))


def example_path(name: str = DEFAULT) -> Path:
    """The file of the bundled example design ``name`` (one of `example_names`)."""
    from flexcycle.errors import InputError, did_you_mean

    if name not in example_names():
        raise InputError(f"name {name!r}: no such bundled example; {did_you_mean(name, example_names())}"
                         f"the examples are {', '.join(example_names())}", parameter="name")
    return Path(str(resources.files(__name__) / f"{name}.toml"))
