"""Two pieces of work at once: one in a forked child process, the other here.

Drawing the report's figures is Python-bound (matplotlib), so threads would take turns on the interpreter
lock; a forked child runs truly alongside on a second processor. The child inherits this process's memory
(nothing is copied or pickled on the way in); its result comes back pickled through a pipe.

Used only where fork is the safe default (Linux), with at least two processors, and unless the
environment variable BENDLIFE_PROCESSES is "1"; elsewhere both pieces run here, one after the other, and
give the same result. If the child fails, its exception is raised here; if it dies without a word (killed,
out of memory), its piece is run here instead.
"""
from __future__ import annotations

import importlib
import os
import pickle
import sys
import threading
import warnings
from typing import Callable, TypeVar

A = TypeVar("A")
B = TypeVar("B")


def forking() -> bool:
    """Whether `both` forks: Linux, two or more processors, BENDLIFE_PROCESSES not "1"."""
    return (sys.platform.startswith("linux") and hasattr(os, "fork") and (os.cpu_count() or 1) >= 2
            and os.environ.get("BENDLIFE_PROCESSES", "") != "1")


def both(here: Callable[[], A], there: Callable[[], B]) -> tuple[A, B]:
    """(here(), there()), with ``there`` run in a forked child process while ``here`` runs in this one.

    ``there`` must return something picklable. Its exceptions are raised here (after ``here`` has run);
    an exception that cannot be pickled comes back as a RuntimeError quoting it.
    """
    if not forking():
        return here(), there()
    read_end, write_end = os.pipe()
    with warnings.catch_warnings():  # Python 3.12+ warns of fork in a process with (idle) helper threads
        warnings.simplefilter("ignore", DeprecationWarning)
        pid = os.fork()
    if pid == 0:  # the child: run ``there``, hand back the outcome, and leave without any clean-up of the parent's
        try:
            os.close(read_end)
            try:
                outcome = ("done", there())
            except BaseException as exc:  # handed to the parent, raised there
                outcome = ("failed", exc)
            try:
                data = pickle.dumps(outcome, protocol=pickle.HIGHEST_PROTOCOL)
            except Exception as exc:  # an unpicklable result or exception
                data = pickle.dumps(("failed", RuntimeError(f"the worker process could not return {outcome[1]!r}: {exc}")))
            with os.fdopen(write_end, "wb") as pipe:
                pipe.write(data)
        finally:
            os._exit(0)  # no atexit handlers, no flushing of the parent's buffers
    os.close(write_end)
    try:
        mine = here()
    finally:
        with os.fdopen(read_end, "rb") as pipe:
            data = pipe.read()  # the child may block on a full pipe until this reads
        os.waitpid(pid, 0)
    try:
        status, value = pickle.loads(data)
    except (EOFError, pickle.UnpicklingError):  # the child died before it could answer: its piece is done here
        return mine, there()
    if status == "failed":
        raise value
    return mine, value


class Preload:
    """Modules imported by a background thread: `start` it when this process turns to work that leaves the
    interpreter lock free, `join` it before `both` forks.

    `bendlife run` starts it when the last chunk of the time history has been read (its pandas parsing keeps
    the lock; the counting, the merging and the estimate that follow are numpy's, which lets go of it), so
    the report modules (matplotlib, about 0.3 s) are imported meanwhile. Everything the reading and the
    estimate import is imported before (the design loader's and the estimate's modules), so the threads never
    wait on each other's imports. A module that fails to import here is imported again, and fails with its
    message, where it is used.
    """

    def __init__(self, *modules: str) -> None:
        self._thread = threading.Thread(target=self._load, args=modules, name="bendlife-preload", daemon=True)
        self._lock = threading.Lock()
        self._started = False

    @staticmethod
    def _load(*modules: str) -> None:
        for name in modules:
            try:
                importlib.import_module(name)
            except Exception:  # raised again where the module is used
                return

    def start(self) -> None:
        """Start the imports (once; later calls do nothing). Safe from any thread."""
        with self._lock:
            if not self._started:
                self._started = True
                self._thread.start()

    def join(self) -> None:
        """Wait until the imports are done (started first if they were not)."""
        self.start()
        self._thread.join()
