"""The beam theories flexcycle solves, and which supports each covers (light: no numerical imports).

``linear``: small deflection, every support (Roark, 7th ed., Table 8.1; ``flexcycle.mechanics.beam``).
``large-deflection``: the inextensible elastica (``flexcycle.mechanics.elastica``) for a cantilever and a guided
beam under an end load of fixed direction; three- and four-point bending, whose rolling supports and load noses
move as the beam bends, are not solved under it.
"""
from __future__ import annotations

from .errors import InputError

THEORIES = ("linear", "large-deflection")
LARGE_SUPPORTS = ("cantilever", "guided")


def refuse_unsolved(support: str) -> None:
    """Three- and four-point bending are not solved under large deflection: say so (an InputError)."""
    if support not in LARGE_SUPPORTS:
        raise InputError(
            f'[beam] theory = "large-deflection" solves support = {" or ".join(map(repr, LARGE_SUPPORTS))}; '
            f"{support!r} (rolling supports and load noses whose contact points move as the beam bends) is not "
            'solved under large deflection: use theory = "linear" (ASTM D790 and D6272 keep the deflection small)'
        )
