"""Design values of a material: partial factors and environmental knock-downs on its strengths and stiffness.

A design review asks for the material's resistance as a design value: its characteristic strengths
divided by a partial factor, and everything the service environment takes away multiplied in as
knock-down factors. flexcycle keeps these apart from ``stress_factor`` (a partial factor on the load,
on every local stress and strain):

- ``[fatigue] static_strength_factor`` γ_s >= 1 — divides every static strength (Xt, Xc, Yt, Yc, S12,
  S13) and the ultimate strains eps1t, eps1c of every material: the static checks, and the strengths
  that close the mean-stress diagrams (Goodman, Gerber, cld), use the design strengths;
- ``[fatigue] fatigue_strength_factor`` γ_f >= 1 — divides the amplitude of every fatigue curve (S1 and
  the fatigue limit; the slope is kept);
- ``[environment.NAME]`` — knock-downs of the material NAME for ``temperature``, ``moisture`` and
  ``ageing``, each a table of ``strength``, ``fatigue_strength`` and ``stiffness`` factors in (0, 1]
  (absent: 1). Their product per property multiplies the static strengths (and ultimate strains), the
  fatigue-curve amplitudes, and the moduli E1, E2, G12, G13, G23.

So a material's static strengths are multiplied by Π(strength)/γ_s, its fatigue amplitudes by
Π(fatigue_strength)/γ_f, and its moduli by Π(stiffness). This is the structure of the design rules for
fibre-composite rotor blades (partial material factor times reduction factors for ageing, temperature and
manufacture, recalled: Germanischer Lloyd, Guideline for the Certification of Wind Turbines, 2010, sec. 5.5;
DNV-GL guidelines alike); the values belong to the designer and the applicable code.

Ultimate strains are taken down with the strengths and not raised by a softer stiffness (our choice,
on the safe side): the strain allowables of a strain-basis fibre curve never grow from a knock-down.
"""
from __future__ import annotations

import dataclasses
import math
from collections.abc import Mapping
from dataclasses import dataclass
from types import MappingProxyType

from flexcycle.errors import InputError
from flexcycle.mechanics.errors import did_you_mean
from flexcycle.mechanics.materials import Material

CAUSES = ("temperature", "moisture", "ageing")
PROPERTIES = ("strength", "fatigue_strength", "stiffness")
STRENGTH_KEYS = ("Xt", "Xc", "Yt", "Yc", "S12", "S13", "eps1t", "eps1c")
STIFFNESS_KEYS = ("E1", "E2", "G12", "G13", "G23")
CURVE_AMPLITUDES = ("S1", "limit")


@dataclass(frozen=True)
class MaterialFactors:
    """The factors on one material's values.

    material : str — the material's name
    static_strength_factor : float — partial factor γ_s on the static strengths [-], >= 1
    fatigue_strength_factor : float — partial factor γ_f on the fatigue strength [-], >= 1
    knockdowns : Mapping[str, Mapping[str, float]] — cause (CAUSES) -> property (PROPERTIES) -> factor in (0, 1]
    """

    material: str
    static_strength_factor: float = 1.0
    fatigue_strength_factor: float = 1.0
    knockdowns: Mapping[str, Mapping[str, float]] = dataclasses.field(default_factory=dict)

    def knockdown(self, prop: str) -> float:
        """The product of the environmental knock-downs of one property [-]."""
        return math.prod(table.get(prop, 1.0) for table in self.knockdowns.values())

    @property
    def strength(self) -> float:
        """Multiplier on the static strengths and ultimate strains: Π(strength)/γ_s [-]."""
        return self.knockdown("strength") / self.static_strength_factor

    @property
    def fatigue_strength(self) -> float:
        """Multiplier on the fatigue-curve amplitudes: Π(fatigue_strength)/γ_f [-]."""
        return self.knockdown("fatigue_strength") / self.fatigue_strength_factor

    @property
    def stiffness(self) -> float:
        """Multiplier on the moduli: Π(stiffness) [-]."""
        return self.knockdown("stiffness")

    @property
    def neutral(self) -> bool:
        """True when every multiplier is 1 (the material is used as given)."""
        return self.strength == 1.0 and self.fatigue_strength == 1.0 and self.stiffness == 1.0


def factored(material: Material, factors: MaterialFactors) -> Material:
    """The material with its design values (module docstring); the same object when every factor is 1."""
    if factors.neutral:
        return material
    values = {key: getattr(material, key) for key in STRENGTH_KEYS + STIFFNESS_KEYS}
    changed = {key: (None if values[key] is None else values[key] * factors.strength) for key in STRENGTH_KEYS}
    changed.update({key: values[key] * factors.stiffness for key in STIFFNESS_KEYS})
    fatigue = {
        table: tuple(_scaled_curve(curve, factors.fatigue_strength) for curve in curves)
        for table, curves in material.fatigue.items()
    }
    note = (f"design value: × {factors.strength:.4g} strengths, × {factors.fatigue_strength:.4g} fatigue, "
            f"× {factors.stiffness:.4g} stiffness")
    sources = {key: f"{text}; {note}" for key, text in material.sources.items()}
    return dataclasses.replace(material, **changed, fatigue=MappingProxyType(fatigue),
                               sources=MappingProxyType(sources))


def _scaled_curve(curve: Mapping[str, object], multiplier: float) -> Mapping[str, object]:
    out = dict(curve)
    for key in CURVE_AMPLITUDES:
        if out.get(key) is not None:
            out[key] = float(out[key]) * multiplier
    return MappingProxyType(out)


def read_factors(fatigue: Mapping, environment: Mapping, materials: Mapping[str, Material],
                 name: str) -> dict[str, MaterialFactors]:
    """The factors of every material from a design file's ``[fatigue]`` and ``[environment]`` tables.

    fatigue : Mapping — the ``[fatigue]`` table (``static_strength_factor``, ``fatigue_strength_factor``)
    environment : Mapping — the ``[environment]`` table: material name -> cause -> property -> factor
    materials : Mapping[str, Material] — the materials the design may use (library and its own)
    name : str — the design file's name, for messages

    Raises InputError on a partial factor below 1, a knock-down outside (0, 1], an unknown material, cause
    or property.
    """
    static = _partial(fatigue, "static_strength_factor", name)
    fatigue_factor = _partial(fatigue, "fatigue_strength_factor", name)
    if not isinstance(environment, Mapping):
        raise InputError(f"{name} [environment]: a table of [environment.MATERIAL] tables, got {environment!r}")
    knockdowns: dict[str, dict[str, dict[str, float]]] = {}
    for material, causes in environment.items():
        where = f"{name} [environment.{material}]"
        if material not in materials:
            hint = did_you_mean(str(material), materials)
            raise InputError(f"{where}: unknown material {material!r}; {hint}name a library material or a "
                             "[material.NAME] of this file")
        if not isinstance(causes, Mapping):
            raise InputError(f"{where}: a table of {', '.join(CAUSES)}, each {{ strength = 0.9, ... }}")
        knockdowns[material] = {}
        for cause, table in causes.items():
            if cause not in CAUSES:
                hint = did_you_mean(str(cause), CAUSES)
                raise InputError(f"{where}: unknown cause {cause!r}; {hint}allowed: {', '.join(CAUSES)}")
            if not isinstance(table, Mapping):
                raise InputError(f"{where} {cause}: a table of knock-downs, e.g. {cause} = {{ strength = 0.9, "
                                 "fatigue_strength = 0.9, stiffness = 0.95 }}")
            knockdowns[material][cause] = {}
            for prop, value in table.items():
                if prop not in PROPERTIES:
                    hint = did_you_mean(str(prop), PROPERTIES)
                    raise InputError(f"{where} {cause}.{prop}: unknown key; {hint}allowed: {', '.join(PROPERTIES)}")
                knockdowns[material][cause][prop] = _knockdown(value, f"{where} {cause}.{prop}")
    return {
        material: MaterialFactors(material, static, fatigue_factor,
                                  MappingProxyType({c: MappingProxyType(t) for c, t in knockdowns.get(material, {}).items()}))
        for material in materials
    }


def _partial(table: Mapping, key: str, name: str) -> float:
    value = table.get(key, 1.0)
    where = f"{name} [fatigue] {key}"
    if isinstance(value, bool) or not isinstance(value, (int, float)) or not math.isfinite(value):
        raise InputError(f"{where}: a bare number >= 1 (e.g. 1.2), got {value!r}")
    if value < 1.0:
        raise InputError(f"{where}: a partial factor is >= 1 (it divides the strength), got {value:g}")
    return float(value)


def _knockdown(value: object, where: str) -> float:
    if isinstance(value, bool) or not isinstance(value, (int, float)) or not math.isfinite(value):
        raise InputError(f"{where}: a bare number in (0, 1] (e.g. 0.9), got {value!r}")
    if not 0.0 < value <= 1.0:
        raise InputError(f"{where}: a knock-down factor lies in (0, 1] (it multiplies the value), got {value:g}")
    return float(value)
