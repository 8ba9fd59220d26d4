"""Run the ``bendlife`` console entry point in-process (fast; no subprocess) for the CLI tests."""
from __future__ import annotations

import sys
from typing import NamedTuple

import numpy as np

from life import cli


class Ran(NamedTuple):
    """What a command gave: exit code, stdout, stderr."""

    code: int
    out: str
    err: str


def bendlife(args: list, monkeypatch, capsys) -> Ran:
    """Run ``bendlife ARGS`` through ``life.cli.main`` with pytest's monkeypatch and capsys fixtures."""
    monkeypatch.setattr(sys, "argv", ["bendlife", *map(str, args)])
    saved = np.geterr()  # main() silences numpy's floating-point warnings process-wide; give them back
    try:
        cli.main()
        code = 0
    except SystemExit as exc:
        code = 0 if exc.code is None else int(exc.code)
    finally:
        np.seterr(**saved)
    captured = capsys.readouterr()
    return Ran(code, captured.out, captured.err)
