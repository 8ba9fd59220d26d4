"""Tests of life.parallel: two pieces of work at once, the same results as one after the other.

No outside reference is needed here: the check is that forking changes nothing — each result equals the
piece run in this process, and the output files of a run are the same byte for byte either way.
"""
import os
import re

import pytest

from life import parallel
from life.cli import example_design
from life.design import load_design
from life.errors import InputError
from life.estimate import estimate
from life.outputs import render

needs_fork = pytest.mark.skipif(not parallel.forking(), reason="forks only on Linux with two or more processors")


@needs_fork
def test_the_second_piece_runs_in_another_process_and_both_results_come_back():
    here, there = parallel.both(lambda: ("here", os.getpid()), lambda: ("there", os.getpid()))
    assert here == ("here", os.getpid())
    assert there[0] == "there" and there[1] != os.getpid()


@needs_fork
def test_an_exception_in_the_child_is_raised_here_with_its_message():
    def fails():
        raise InputError("profile.csv line 7: 'abc' is not a number")

    with pytest.raises(InputError, match="line 7: 'abc' is not a number"):
        parallel.both(lambda: 1, fails)


@needs_fork
def test_a_child_that_dies_without_a_word_has_its_piece_run_here():
    parent = os.getpid()

    def dies_in_the_child():
        if os.getpid() != parent:
            os._exit(3)  # killed: no answer through the pipe
        return "run here"

    assert parallel.both(lambda: "mine", dies_in_the_child) == ("mine", "run here")


def test_one_process_when_asked(monkeypatch):
    monkeypatch.setenv("BENDLIFE_PROCESSES", "1")
    assert not parallel.forking()
    assert parallel.both(lambda: os.getpid(), lambda: os.getpid()) == (os.getpid(), os.getpid())


def _without_stamp(text: str) -> str:
    return re.sub(r"\d{4}-\d{2}-\d{2} \d{2}:\d{2} UTC", "DATE", text)


@needs_fork
def test_the_files_are_the_same_drawn_in_two_processes_or_one(monkeypatch):
    result = estimate(load_design(example_design()))
    two = render(result)
    monkeypatch.setenv("BENDLIFE_PROCESSES", "1")
    one = render(result)
    assert set(one) == set(two) == {"summary.json", "cycles.csv", "locations.csv", "stations.csv", "report.html"}
    for name in one:
        assert _without_stamp(two[name]) == _without_stamp(one[name]), name


def test_preload_imports_in_the_background_and_keeps_quiet_about_a_failure():
    import sys

    preload = parallel.Preload("json.tool", "no_such_module_here", "calendar")
    preload.start()
    preload.start()  # a second start does nothing
    preload.join()
    assert "json.tool" in sys.modules
    assert "no_such_module_here" not in sys.modules  # the failure ends the preload; the caller's import says why


def test_preload_joined_without_a_start_runs_first():
    import sys

    preload = parallel.Preload("email.mime.text")
    preload.join()
    assert "email.mime.text" in sys.modules
