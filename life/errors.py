"""flexcycle's one exception for input a user must correct, and the one place lower layers' errors join it.

The layers below (``flexcycle.mechanics``, ``flexcycle.spectra``) import nothing from flexcycle nor from each
other, so each has its own ``InputError``. ``flexcycle.InputError`` is a subclass of both: whatever catches
a lower layer's error also catches flexcycle's, and a caller of flexcycle needs only
``except flexcycle.InputError``. For that to hold, the library turns a lower layer's error into flexcycle's
where it hands user input down (the design loader, the counting of a profile): `input_errors` does it, the
message kept and the place prefixed.

Library errors name the library's parameters (``out``, ``target_blocks``); ``parameter`` carries that name so
that the command line can show its own flag instead (``--out``, ``--life``) with `InputError.naming`.
"""
from __future__ import annotations

from collections.abc import Iterator, Mapping
from contextlib import contextmanager

from flexcycle.mechanics.errors import InputError as MechanicsInputError
from flexcycle.mechanics.errors import did_you_mean
from flexcycle.spectra.errors import InputError as SpectraInputError

__all__ = ["INPUT_ERRORS", "InputError", "did_you_mean", "input_errors"]


class InputError(MechanicsInputError, SpectraInputError):
    """Bad input to flexcycle: the message names where (file, key, row, parameter) and what would be right.

    parameter : str | None — the library parameter the message starts with (``"out"``, ``"target_blocks"``),
        for a caller that calls it by another name
    """

    def __init__(self, message: str, parameter: str | None = None) -> None:
        super().__init__(message)
        self.parameter = parameter

    def naming(self, names: Mapping[str, str]) -> str:
        """The message with its leading parameter called as ``names`` calls it (``{"out": "--out"}``)."""
        message = str(self)
        if self.parameter in names and message.startswith(self.parameter):
            return names[self.parameter] + message[len(self.parameter):]
        return message


INPUT_ERRORS = (MechanicsInputError, SpectraInputError)  # the family's two roots: together they catch all three


@contextmanager
def input_errors(prefix: str = "", parameter: str | None = None) -> Iterator[None]:
    """Inside, a lower layer's ``InputError`` leaves as flexcycle's, its message after ``prefix``.

    prefix : str — the place the lower layer does not know, e.g. the design file's name and a space
    parameter : str | None — the library parameter the message then starts with (`InputError.parameter`)
    """
    try:
        yield
    except InputError:
        raise
    except INPUT_ERRORS as exc:
        raise InputError(f"{prefix}{exc}", parameter) from exc
