"""Run the ``flexcycle`` console entry point in-process (fast; no subprocess) for the CLI tests."""
from __future__ import annotations

import contextlib
import io
import sys
from typing import NamedTuple

import numpy as np

from flexcycle.cli import app as cli


class Ran(NamedTuple):
    """What a command gave: exit code, stdout, stderr."""

    code: int
    out: str
    err: str


def run_cli(args: list) -> Ran:
    """``flexcycle ARGS`` in-process without pytest fixtures (for hypothesis tests, which run many cases
    in one test function): exit code, stdout, stderr."""
    out, err = io.StringIO(), io.StringIO()
    saved_argv, saved_err = sys.argv, np.geterr()
    sys.argv = ["flexcycle", *map(str, args)]
    try:
        with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
            try:
                cli.main()
                code = 0
            except SystemExit as exc:
                code = 0 if exc.code is None else int(exc.code)
    finally:
        sys.argv = saved_argv
        np.seterr(**saved_err)
    return Ran(code, out.getvalue(), err.getvalue())


def flexcycle(args: list, monkeypatch, capsys) -> Ran:
    """Run ``flexcycle ARGS`` through ``flexcycle.cli.app.main`` (the fixtures are taken for the tests' signatures;
    the output is captured by `run_cli` itself)."""
    return run_cli(args)
