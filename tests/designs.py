"""Design-file text shared by the tests: the invented user material of docs/design.md's design-file example, and
the isotropic strip of the strain-gauge checks."""
from __future__ import annotations


def user_glass(name: str = "my-glass", nu12: float = 0.28, extra: str = "") -> str:
    """The ``[material.NAME]`` table of docs/design.md's example (E1 40 GPa, Xt 1000 / Xc 600 MPa, an R = −1 power
    curve S1 = 800 MPa, m = 10), with ``extra`` lines added to the material table (e.g. ``'G13 = "4 GPa"'``)."""
    more = f"{extra}\n" if extra else ""
    return f"""\
[material.{name}]
E1 = "40 GPa"
E2 = "10 GPa"
G12 = "4 GPa"
{more}nu12 = {nu12}
density = "1900 kg/m^3"
Xt = "1000 MPa"
Xc = "600 MPa"
Yt = "40 MPa"
Yc = "140 MPa"
S12 = "70 MPa"
[material.{name}.fatigue]
form = "power"
R = -1
S1 = "800 MPa"
m = 10
"""


# An isotropic strip (E = 40 GPa, ν = 0.3, G = E/2(1+ν)) for the strain-gauge checks: 4 plies of 1 mm, 30 mm wide,
# 200 mm long, EI = 6.4 N·m² (invented test data)
ISOTROPIC = """
[material.iso]
E1 = "40 GPa"
E2 = "40 GPa"
G12 = "15.384615384615385 GPa"
nu12 = 0.3
density = "1800 kg/m^3"
Xt = "1000 MPa"
Xc = "800 MPa"
Yt = "1000 MPa"
Yc = "800 MPa"
S12 = "400 MPa"
[material.iso.fatigue]
form = "power"
R = -1
S1 = "800 MPa"
m = 10
"""
