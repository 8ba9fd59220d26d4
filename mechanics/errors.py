"""The mechanics layer's exception for input a user must correct, and the one did-you-mean helper.

``flexcycle.errors.InputError`` (the one a caller of flexcycle catches) is a subclass of this class and of the
spectra layer's, so code of either lower layer that catches its own ``InputError`` also catches flexcycle's.
"""
from __future__ import annotations

import difflib
from collections.abc import Iterable


class InputError(ValueError):
    """Bad input: the message names where (file, key, row) and what would be right."""


def did_you_mean(value: object, names: Iterable[str], cutoff: float = 0.6) -> str:
    """``"did you mean 'x'? "`` for the name of ``names`` nearest to ``value``, or ``""`` when none is near.

    value : object — what was given (only a string can be near a name)
    names : Iterable[str] — the names that would be right
    cutoff : float — the least similarity (difflib's ratio, 0 … 1) for a suggestion [-]
    """
    if not isinstance(value, str):
        return ""
    close = difflib.get_close_matches(value, sorted(names), n=1, cutoff=cutoff)
    return f"did you mean {close[0]!r}? " if close else ""
