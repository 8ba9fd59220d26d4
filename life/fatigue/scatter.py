"""Scatter of fatigue lives: lives at a probability of survival, and one-sided tolerance factors.

Fatigue lives of fibre composites scatter log-normally about the median S-N curve: log10 N at one
amplitude is normal with a standard deviation ``sd_log10N`` (decades) taken the same at every
amplitude (ASTM E739, the model of its least-squares fit; common practice). Two uses follow:

- the life that a fraction p of parts reaches (survival p), from the median curve and its scatter::

      N_p = N_median · 10^(−z_p · sd),   z_p = Φ⁻¹(p)     (z_0.9 = 1.2816, z_0.99 = 2.3263)

  applied per curve, so that each material and mode keeps its own scatter (``curve_at_survival``);
- the design curve at survival p with confidence γ from n test results: log10 N lowered by k·sd, k the
  one-sided normal tolerance factor (``tolerance_factor``; NIST/SEMATECH e-Handbook of Statistical
  Methods, section 7.2.6.3; ISO 12107 uses such bounds for design S-N curves, recalled).

Adding Δ to a curve's log10 N (Δ < 0 lowers the lives) keeps its slope and moves it along the cycles
axis; in the curve's own parameters (forms of ``flexcycle.fatigue.curves.SNCurve``):

- power, a = S1·N^(−1/m):  S1' = S1·10^(Δ/m), knee' = knee·10^Δ, m and m2 unchanged;
- log-linear, a = S1·(1 − b·log10 N):  S1' = S1·(1 + b·Δ), b' = b/(1 + b·Δ), b2' = b2/(1 + b·Δ),
  knee' = knee·10^Δ;

a fatigue limit (an amplitude) stays where it is. Worked by substituting log10 N + Δ for log10 N in the
curve's equations (algebra in the Notes of ``shift_log_life``).
"""
from __future__ import annotations

import dataclasses
import math
from collections.abc import Iterable, Mapping
from dataclasses import dataclass
from statistics import NormalDist
from types import MappingProxyType

from flexcycle.errors import InputError
from flexcycle.mechanics.materials import TABLE_LABELS, Material

MEDIAN = 0.5
LARGE_SCATTER = 1.0  # sd_log10N past a decade: scatter beyond any consistent coupon series (common practice:
# composite S-N data show about 0.1-0.6 decades)


def survival_z(survival: float) -> float:
    """z_p = Φ⁻¹(p) [-], the standard normal quantile of the survival probability p (0 < p < 1).

    Notes
    -----
    N_p = N_median · 10^(−z_p·sd): a fraction p of parts lives longer than N_p when log10 N is normal
    about the median curve (standard normal quantile; z_0.9 = 1.2816, z_0.95 = 1.6449, z_0.99 = 2.3263).
    """
    _check_probability(survival, "survival")
    return NormalDist().inv_cdf(survival)  # Wichura's algorithm AS 241, about 1e-16 relative: no scipy at load


def tolerance_factor(n: int, survival: float, confidence: float, dof: int) -> float:
    """One-sided normal tolerance factor k [-]: a fraction ``survival`` lies above mean − k·sd with
    probability ``confidence``.

    n : int — number of results the mean and sd come from, >= 2
    survival : float — proportion p covered, 0 < p < 1
    confidence : float — confidence γ, 0 < γ < 1
    dof : int — degrees of freedom ν of the standard deviation, >= 1 (n − 1 for a plain sample,
        n − 2 for a straight-line fit)

    Notes
    -----
    k = t'_γ(ν, δ)/√n with δ = z_p·√n, t' the non-central t distribution's γ quantile (NIST/SEMATECH
    e-Handbook of Statistical Methods, section 7.2.6.3, "Tolerance intervals for a normal distribution";
    there ν = n − 1: p = 0.95, γ = 0.95 gives k = 2.911 at n = 10, 2.396 at n = 20).
    """
    if isinstance(n, bool) or not isinstance(n, int) or n < 2:
        raise InputError(f"tolerance factor: the number of results must be a whole number >= 2, got {n!r}")
    if isinstance(dof, bool) or not isinstance(dof, int) or dof < 1:
        raise InputError(f"tolerance factor: the degrees of freedom must be a whole number >= 1, got {dof!r}")
    _check_probability(survival, "survival")
    _check_probability(confidence, "confidence")
    from scipy import stats  # here: `flexcycle check` and `run` load no scipy.stats (its import takes 0.3 s)

    delta = survival_z(survival) * math.sqrt(n)
    return float(stats.nct.ppf(confidence, dof, delta)) / math.sqrt(n)


def shift_log_life(curve: Mapping[str, object], shift: float, where: str) -> Mapping[str, object]:
    """A curve mapping (``Material.fatigue`` form, SI) with every log10 N moved by ``shift`` [decades].

    curve : Mapping — keys form, R, basis, S1, m, b, limit, knee, m2, b2, source (and sd_log10N)
    shift : float — Δ added to log10 N at every amplitude [-]; negative lowers the lives
    where : str — the curve's place, for error messages

    Notes
    -----
    The curve's lives become N·10^Δ at every amplitude above the fatigue limit. With L = log10 N:
    power, a = S1·10^(−(L − Δ)/m) = (S1·10^(Δ/m))·10^(−L/m); beyond the knee the amplitude at the
    knee, S1'·knee'^(−1/m), is unchanged. log-linear, a = S1·(1 − b·(L − Δ)) = S1·(1 + b·Δ)·(1 − b·L/(1 + b·Δ));
    beyond the knee the same factor (1 + b·Δ) divides b2. A lowered log-linear curve (1 + b·Δ <= 0) would
    have no life left at any amplitude: refused.
    """
    if shift == 0.0:
        return curve
    out = dict(curve)
    if curve.get("knee") is not None:
        out["knee"] = float(curve["knee"]) * 10.0 ** shift
        if not out["knee"] > 1.0:
            raise InputError(f"{where}: the knee at {curve['knee']:g} cycles falls below one cycle when the lives "
                             f"are moved by {shift:+.3g} decades (scatter at the survival asked); check knee and sd_log10N")
    if curve["form"] == "power":
        out["S1"] = float(curve["S1"]) * 10.0 ** (shift / float(curve["m"]))
    else:
        scale = 1.0 + float(curve["b"]) * shift
        if not scale > 0.0 or not float(curve["b"]) / scale < 1.0:
            raise InputError(f"{where}: the log-linear curve (b = {curve['b']:g}) moved by {shift:+.3g} decades of life "
                             f"leaves no life at any amplitude; check b and sd_log10N")
        out["S1"] = float(curve["S1"]) * scale
        out["b"] = float(curve["b"]) / scale
        if curve.get("b2") is not None:
            out["b2"] = float(curve["b2"]) / scale
    return MappingProxyType(out)


def curve_at_survival(curve: Mapping[str, object], survival: float, where: str) -> Mapping[str, object]:
    """The curve at survival p: every life N_median·10^(−z_p·sd) (the curve's ``sd_log10N``).

    A curve without ``sd_log10N`` is returned as it is (the caller warns). survival : float — 0 < p < 1.
    """
    sd = curve.get("sd_log10N")
    if sd is None or survival == MEDIAN:
        return curve
    return shift_log_life(curve, -survival_z(survival) * float(sd), where)


@dataclass(frozen=True)
class AtSurvival:
    """Materials whose fatigue curves give lives at a survival probability, and what was done.

    materials : tuple[Material, ...] — the materials, each curve with an sd_log10N moved to the survival
    notes : tuple[str, ...] — a warning for every curve that has no sd_log10N (its lives stay median lives)
        when the survival is not 0.5, and for scatter past LARGE_SCATTER
    """

    materials: tuple[Material, ...]
    notes: tuple[str, ...]


def materials_at_survival(materials: Iterable[Material], survival: float) -> AtSurvival:
    """Every fatigue curve of the materials at survival p (``curve_at_survival``), per curve.

    Each curve keeps its own scatter, so a hybrid layup's life at survival p is the shortest of its
    materials' and modes' lives at p, each lowered by its own sd. A curve without ``sd_log10N`` cannot give
    a life at p ≠ 0.5: it is used as a median curve and a note says so (never silently).
    """
    _check_probability(survival, "survival")
    out, notes = [], []
    for material in materials:
        tables = {}
        for table, curves in material.fatigue.items():
            if material.kind == "core" and table != "interlaminar_fatigue":
                tables[table] = curves  # a core's in-plane curves are not used (checked statically)
                continue
            where = f"material {material.name} [{table}]"
            missing = [c for c in curves if c.get("sd_log10N") is None]
            if missing and survival != MEDIAN:
                which = ", ".join(f"R = {c['R']:g}" for c in missing)
                notes.append(f"{material.name}: the {TABLE_LABELS[table]} curve ({which}) has no sd_log10N: its lives "
                             f"are median lives, not lives at survival {survival:g}; give its scatter to have them")
            large = [c for c in curves if c.get("sd_log10N") is not None and c["sd_log10N"] > LARGE_SCATTER]
            if large:
                notes.append(f"{material.name}: the {TABLE_LABELS[table]} curve has sd_log10N = {large[0]['sd_log10N']:g}, "
                             f"more than {LARGE_SCATTER:g} decade: scatter beyond a consistent coupon series; check it")
            tables[table] = tuple(curve_at_survival(c, survival, where) for c in curves)
        out.append(dataclasses.replace(material, fatigue=MappingProxyType(tables)))
    return AtSurvival(tuple(out), tuple(notes))


def _check_probability(value: float, name: str) -> None:
    if isinstance(value, bool) or not isinstance(value, (int, float)) or not 0.0 < value < 1.0:
        raise InputError(f"{name}: a probability strictly between 0 and 1 (e.g. 0.9 or 0.95), got {value!r}")
