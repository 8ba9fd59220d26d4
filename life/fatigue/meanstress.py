"""Mean-stress rules: cycles to failure of local cycles (lo, hi) from fatigue curves.

A local cycle runs between its extremes lo <= hi (in the curve's basis: stress [Pa] or strain
[-]); its amplitude and mean are σa = (hi − lo)/2 and σm = (hi + lo)/2, and it lies on the ray
σm/σa = (1 + R)/(1 − R) of its stress ratio R = lo/hi (common practice). The rules:

- ``goodman``: linear constant-life lines to the static strengths Xt (tension) and Xc
  (compression, a magnitude), with unequal strengths;
- ``gerber``: parabolic constant-life lines, the parabola with Xt on the tension side and, our
  choice, the mirrored parabola with Xc on the compression side (so that a compressive mean
  shortens life, as it does in fibre composites);
- ``none``: the amplitude alone on the curve, at the curve's own R (no conversion);
- ``cld``: the piecewise-linear constant-life diagram of Philippidis & Vassilopoulos (recalled)
  through the curves at two or more R.

Fatigue limits, one rule for all four: a cycle does no damage (N = inf) when it lies at or inside
the rule's *fatigue-limit diagram*, the rule's constant-life diagram drawn through the curves'
fatigue-limit amplitudes instead of the amplitudes at a life N (see ``FatigueModel``); outside it
N comes from the rule's constant-life diagram.

Sources: the linear Goodman lines with unequal tension and compression strengths, reaching zero
amplitude at the static strengths (Burton et al., *Wind Energy Handbook*, Wiley, p. 387, for
composite strain-life; common practice); the Gerber parabola (common practice); the piecewise-linear
constant-life diagram of Philippidis & Vassilopoulos (recalled).
Everything is vectorized over the cycles: Goodman and Gerber are inverted in closed form; the
constant-life diagram is solved with exact ray geometry (see ``FatigueModel``).
"""
from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np

from flexcycle.errors import InputError
from flexcycle.fatigue.curves import SNCurve

RULES = ("goodman", "gerber", "none", "cld")

# Constant-life diagram: tolerance of the root in log10 N [-] in the sectors between two tested
# rays, and the cap on bracketing iterations (Illinois converges in well under 20 for smooth curves).
CLD_TOL_LOG10N = 1e-9
CLD_MAX_ITER = 100


def mean_ratio(R: float) -> float:
    """Mean over amplitude σm/σa [-] on the ray of a stress ratio R [-] (R != 1).

    Notes
    -----
    With σmax = σm + σa, σmin = σm − σa and R = σmin/σmax: σm/σa = (1 + R)/(1 − R)
    (common practice). R = −1 gives 0, R = 0.1 gives 1.222, R = 10 gives −1.222.
    """
    if R == 1.0:
        raise InputError("R = 1 is a constant (static) load, not a cycle; use e.g. R = -1, 0.1 or 10")
    return (1.0 + R) / (1.0 - R)


# ---------------------------------------------------------------------------------------------
# Goodman and Gerber in closed form, both ways.

def goodman_amplitude_at_zero_mean(sa: np.ndarray, sm: np.ndarray, Xt: float, Xc: float) -> np.ndarray:
    """Equivalent fully reversed amplitude σa0 [Pa or -] of cycles (σa, σm) by linear Goodman.

    sa : np.ndarray — amplitude σa [Pa or -], >= 0
    sm : np.ndarray — mean σm [Pa or -]
    Xt : float — static strength in tension [Pa or -], > 0
    Xc : float — static strength in compression, a magnitude [Pa or -], > 0

    Notes
    -----
    Linear Goodman with unequal strengths (Burton et al., Wind Energy Handbook, p. 387; common practice)::

        σa = σa0 (1 − σm/Xt)      σm >= 0
        σa = σa0 (1 − |σm|/Xc)    σm < 0

    solved for σa0. Means at or beyond the strength (σm >= Xt or σm <= −Xc) give σa0 = inf.
    """
    _check_strengths(Xt, Xc, "goodman_amplitude_at_zero_mean")
    sa, sm = np.asarray(sa, dtype=float), np.asarray(sm, dtype=float)
    factor = 1.0 - sm / np.where(sm >= 0.0, Xt, -Xc)  # 1 − σm/Xt, or 1 + σm/Xc: the same doubles, fewer passes
    with np.errstate(divide="ignore", invalid="ignore"):
        return np.where(factor > 0.0, sa / factor, np.inf)


def gerber_amplitude_at_zero_mean(sa: np.ndarray, sm: np.ndarray, Xt: float, Xc: float) -> np.ndarray:
    """Equivalent fully reversed amplitude σa0 [Pa or -] of cycles (σa, σm) by Gerber.

    sa : np.ndarray — amplitude σa [Pa or -], >= 0
    sm : np.ndarray — mean σm [Pa or -]
    Xt : float — static strength in tension [Pa or -], > 0
    Xc : float — static strength in compression, a magnitude [Pa or -], > 0

    Notes
    -----
    Gerber parabola (common practice), σa = σa0 (1 − (σm/Xt)²) for
    σm >= 0; on the compression side our choice is the mirrored parabola with Xc,
    σa = σa0 (1 − (σm/Xc)²), solved for σa0. |σm| at or beyond the strength gives σa0 = inf.
    """
    _check_strengths(Xt, Xc, "gerber_amplitude_at_zero_mean")
    sa, sm = np.asarray(sa, dtype=float), np.asarray(sm, dtype=float)
    X = np.where(sm >= 0.0, Xt, Xc)
    factor = 1.0 - (sm / X) ** 2
    with np.errstate(divide="ignore", invalid="ignore"):
        return np.where(factor > 0.0, sa / factor, np.inf)


def goodman_amplitude_on_ray(sa0: np.ndarray, R: float, Xt: float, Xc: float) -> np.ndarray:
    """Amplitude σa [Pa or -] on the ray of R with the same Goodman life as σa0 at zero mean.

    sa0 : np.ndarray — equivalent fully reversed amplitude σa0 [Pa or -], >= 0
    R : float — stress ratio of the ray [-], R != 1
    Xt, Xc : float — static strengths in tension and compression (magnitude) [Pa or -]

    Notes
    -----
    The inverse of ``goodman_amplitude_at_zero_mean`` along σm = r·σa, r = (1 + R)/(1 − R):
    σa0 = σa/(1 − k·σa) with k = r/Xt (r >= 0) or k = −r/Xc (r < 0), so σa = σa0/(1 + k·σa0).
    The line through (0, σa0) and (Xt, 0) or (−Xc, 0) meets the ray there (linear Goodman, as above).
    """
    _check_strengths(Xt, Xc, "goodman_amplitude_on_ray")
    k = _ray_k(R, Xt, Xc)
    sa0 = np.asarray(sa0, dtype=float)
    with np.errstate(invalid="ignore"):
        return np.where(np.isinf(sa0), 1.0 / k if k > 0 else np.inf, sa0 / (1.0 + k * sa0))


def gerber_amplitude_on_ray(sa0: np.ndarray, R: float, Xt: float, Xc: float) -> np.ndarray:
    """Amplitude σa [Pa or -] on the ray of R with the same Gerber life as σa0 at zero mean.

    sa0 : np.ndarray — equivalent fully reversed amplitude σa0 [Pa or -], >= 0
    R : float — stress ratio of the ray [-], R != 1
    Xt, Xc : float — static strengths in tension and compression (magnitude) [Pa or -]

    Notes
    -----
    The inverse of ``gerber_amplitude_at_zero_mean`` along σm = r·σa: σa0 (1 − (k σa)²) = σa with
    k = r/Xt (r >= 0) or −r/Xc (r < 0), a quadratic whose positive root, written without
    cancellation, is σa = 2 σa0 / (1 + sqrt(1 + 4 (k σa0)²)).
    """
    _check_strengths(Xt, Xc, "gerber_amplitude_on_ray")
    k = _ray_k(R, Xt, Xc)
    sa0 = np.asarray(sa0, dtype=float)
    with np.errstate(invalid="ignore"):
        return np.where(np.isinf(sa0), 1.0 / k if k > 0 else np.inf,
                        2.0 * sa0 / (1.0 + np.sqrt(1.0 + 4.0 * (k * sa0) ** 2)))


def convert_curve_ratio(
    amplitude: np.ndarray, R_from: float, R_to: float, rule: str, Xt: float, Xc: float
) -> np.ndarray:
    """Amplitudes [Pa or -] of a constant-life curve moved from the ray of R_from to that of R_to.

    amplitude : np.ndarray — amplitudes σa at R_from [Pa or -] (e.g. ``curve.amplitude(N)``)
    R_from, R_to : float — stress ratios [-], != 1
    rule : str — "goodman" or "gerber"
    Xt, Xc : float — static strengths in tension and compression (magnitude) [Pa or -]

    Each amplitude keeps its life: it goes to the equivalent fully reversed amplitude by the
    rule's constant-life line, then out along the ray of R_to (closed form both ways).
    """
    rules = {
        "goodman": (goodman_amplitude_at_zero_mean, goodman_amplitude_on_ray),
        "gerber": (gerber_amplitude_at_zero_mean, gerber_amplitude_on_ray),
    }
    if rule not in rules:
        raise InputError(f"convert_curve_ratio: rule must be 'goodman' or 'gerber', got {rule!r}")
    to_zero, to_ray = rules[rule]
    a = np.asarray(amplitude, dtype=float)
    sa0 = to_zero(a, mean_ratio(R_from) * a, Xt, Xc)
    return to_ray(sa0, R_to, Xt, Xc)


# ---------------------------------------------------------------------------------------------
# The model.

@dataclass(frozen=True)
class FatigueModel:
    """Cycles to failure of local cycles (lo, hi) for one material direction/mode.

    rule : str — mean-stress rule, one of ``RULES``
    curves : tuple[SNCurve, ...] — one curve (goodman, gerber, none) or two or more at distinct R
        (cld), all in one basis
    Xt : float — static strength in tension in the curve's basis [Pa or -], > 0
    Xc : float — static strength in compression, a magnitude, in the curve's basis [Pa or -], > 0

    Notes
    -----
    goodman / gerber with a curve at reference R ≠ −1: the constant-life line of a life N passes
    through the curve's point (σm_R, σa_R), σm_R = σa_R (1 + R)/(1 − R), and (Xt, 0) (tension
    side) or (−Xc, 0) (compression side). A cycle's equivalent fully reversed amplitude σa0
    (``goodman_amplitude_at_zero_mean``) is moved to the curve's ray in closed form
    (``goodman_amplitude_on_ray``) and read on the curve: N = curve.cycles(σa_R).

    cld, the piecewise-linear constant-life diagram (Philippidis & Vassilopoulos, recalled): at
    life N join (−Xc, 0), the points (σm_i, σa_i)(N) of the tested R ordered along the diagram,
    and (Xt, 0); a cycle's life is the N at which the diagram, read along the cycle's ray, passes
    through the cycle. The vertices are ordered by ray (r_i = (1 + R_i)/(1 − R_i) ascending),
    which is their order by mean for any diagram that does not fold back on itself
    (``model_warnings`` says when it does). No grid: in the sector between two neighbouring rays
    with unit vectors w_j = (r_j, 1), w_j+1 the cycle is split exactly as
    (σm, σa) = s_j w_j + s_j+1 w_j+1 (s >= 0); it lies on the diagram's segment at life N when

        s_j / a_j(N) + s_j+1 / a_j+1(N) = 1

    (a = the curve amplitudes; for the end vertices w = (±1, 0) and a = Xt or Xc). In the two end
    sectors (one strength vertex) this is solved for the one curve's amplitude in closed form; in
    the sectors between two tested rays the left side rises monotonically with N and is solved
    by a vectorized Illinois (modified regula falsi) iteration in log10 N, bracketed in closed
    form by the two curves' own lives, to |Δ log10 N| < ``CLD_TOL_LOG10N`` (1e-9 decades).

    Fatigue limits (our choice, one rule for every ``rule``): a cycle does no damage, N = inf,
    when it lies at or inside the fatigue-limit diagram read along the cycle's ray; outside it N
    comes from the constant-life diagram above, in which each curve's amplitude is a(N) =
    max(a(N), limit) (``SNCurve``).

    - goodman / gerber: the Goodman lines (Gerber parabolas) through the curve's limit point
      (σm_R, limit) and (Xt, 0) or (−Xc, 0); inside means σa_R <= limit, the single curve's own
      test on the equivalent amplitude. none: σa <= limit at any mean.
    - cld: the piecewise-linear diagram through (−Xc, 0), the limit points limit_i·(r_i, 1) of
      the curves with a limit > 0, ordered by ray, and (Xt, 0), split into sectors exactly like
      the constant-life diagram: inside when s_j/limit_j + s_j+1/limit_j+1 <= 1. A curve without
      a limit, or with a zero limit, contributes no vertex: its ray is crossed by the segment
      joining its neighbouring vertices, so below that segment its cycles do no damage even
      though its own curve, alone, has no limit (``model_warnings`` says so). A zero limit is
      not made a vertex at the origin because that would pinch the diagram to nothing on both
      neighbouring sectors and fold it, so that a limit next to it would protect only the
      cycles lying exactly on its own ray. Without any positive limit nothing is inside. On the
      ray of a curve with a limit, the diagram's radius is that limit, so there the model gives
      exactly that curve's own lives: inf at or below its limit, the curve's life above it.

    Monotone along every ray: the constant-life diagrams shrink as N grows (each a(N) is
    non-increasing), so outside the fatigue-limit diagram N falls with the distance from the
    origin, and the fatigue-limit diagram is star-shaped about the origin, so a cycle inside it
    never lies beyond one outside it on the same ray; N is nowhere capped or raised to a
    saturation life, it continues from the constant-life diagram and jumps from inf to that N at
    the fatigue-limit diagram. In the sectors next to a curve without a limit this N can be far
    below the saturation lives of the limited curves (the constant-life diagram there closes on
    the origin as N grows). Monotone in amplitude at fixed mean (and in tensile mean at fixed
    amplitude) where neither diagram folds back (and both fall with mean on the tension side);
    ``model_warnings`` reports folds of either.
    """

    rule: str
    curves: tuple[SNCurve, ...]
    Xt: float
    Xc: float

    def __post_init__(self) -> None:
        _check_model(self.rule, self.curves, self.Xt, self.Xc, "fatigue model")

    def cycles_to_failure(self, lo: np.ndarray, hi: np.ndarray) -> np.ndarray:
        """Cycles to failure N [-] of each local cycle (lo, hi), same shape as lo and hi.

        lo : np.ndarray — local minimum of each cycle, in the curve's basis [Pa or -]
        hi : np.ndarray — local maximum of each cycle, lo <= hi elementwise [Pa or -]

        N = inf where the cycle does no damage (zero amplitude, or at or inside the fatigue-limit
        diagram, see Notes of ``FatigueModel``); N = 0 where the cycle exceeds static strength
        (hi > Xt or lo < −Xc), which the caller reports, and (cld) where the diagram's end line
        from (−Xc, 0) or (Xt, 0) cannot reach the cycle at any life (possible inside the static
        strengths only when every curve has 0 < R < 1, or every curve has R > 1;
        ``model_warnings`` says so).
        """
        lo, hi = np.asarray(lo, dtype=float), np.asarray(hi, dtype=float)
        if lo.shape != hi.shape:
            raise InputError(f"cycles_to_failure: lo and hi must have one shape, got {lo.shape} and {hi.shape}")
        if not (lo <= hi).all():  # one pass for both checks: NaN fails the comparison too
            if np.isnan(lo).any() or np.isnan(hi).any():
                raise InputError("cycles_to_failure: lo and hi must be numbers, got NaN")
            raise InputError("cycles_to_failure: each cycle needs lo <= hi (local minimum, maximum)")
        sa = 0.5 * (hi - lo)
        sm = 0.5 * (hi + lo)
        static = (hi > self.Xt) | (lo < -self.Xc)
        live = ~static & (sa > 0.0)
        if live.all():  # the usual case: no cycle to leave out, no gathering (flat: _cld_cycles indexes by position)
            return self._cycles(sa.ravel(), sm.ravel()).reshape(sa.shape)
        N = np.where(static, 0.0, np.inf)
        if live.any():
            N[live] = self._cycles(sa[live], sm[live])
        return N

    def _cycles(self, sa: np.ndarray, sm: np.ndarray) -> np.ndarray:
        # cycles inside the static strengths with sa > 0 (so −Xc < σm < Xt)
        if self.rule == "none":
            return self.curves[0].cycles(sa)
        if self.rule == "cld":
            return _cld_cycles(self, sa, sm)
        curve = self.curves[0]
        if self.rule == "goodman":
            sa_R = goodman_amplitude_on_ray(goodman_amplitude_at_zero_mean(sa, sm, self.Xt, self.Xc),
                                            curve.R, self.Xt, self.Xc)
        else:
            sa_R = gerber_amplitude_on_ray(gerber_amplitude_at_zero_mean(sa, sm, self.Xt, self.Xc),
                                           curve.R, self.Xt, self.Xc)
        return curve.cycles(sa_R)


def fatigue_model(rule: str, curves: Sequence[SNCurve], Xt: float, Xc: float, where: str) -> FatigueModel:
    """A checked ``FatigueModel``; ``InputError`` naming ``where`` on an impossible combination.

    rule : str — one of ``RULES``
    curves : Sequence[SNCurve] — one curve, or two or more at distinct R for "cld"
    Xt, Xc : float — static strengths in tension and compression (magnitude), in the curves'
        basis [Pa or -]
    where : str — where the model's data come from (material, table), for error messages
    """
    curves = tuple(curves)
    _check_model(rule, curves, Xt, Xc, where)
    return FatigueModel(rule, curves, float(Xt), float(Xc))


def model_warnings(model: FatigueModel, where: str = "") -> list[str]:
    """Warnings (strings) on a model whose data are beyond what the rule describes well.

    - a curve whose first cycle (N = 1) already peaks beyond the static strength: short lives
      are then set by the static check, not by the curve (common practice: S1 at most the
      static strength);
    - cld: a diagram whose vertices, ordered by ray, are not ordered by mean at some life
      (the diagram folds back; read along rays it is still defined), and the same for the
      fatigue-limit diagram;
    - cld: a curve without a (positive) fatigue limit whose ray the fatigue-limit diagram of the
      other curves crosses: its cycles below that diagram do no damage although its own curve,
      alone, gives them a finite life (Notes of ``FatigueModel``);
    - cld: every curve at 0 < R < 1 (or every curve at R > 1): cycles on the far side of the
      diagram's end line from (−Xc, 0) (or (Xt, 0)) get N = 0 inside the static strengths;
    - any rule: a one-sided cycle from zero (0 → peak, or 0 → −peak) that fails within ten cycles
      at under half the static strength on that side: the diagram is far inside the static
      envelope there (a curve with S1 far below Xc or Xt read through Goodman, say), and cycles on
      that side are judged much more damaging than the strength suggests.
    """
    at = f"{where}: " if where else ""
    out: list[str] = []
    for side, X, name in (("tension", model.Xt, "Xt"), ("compression", model.Xc, "Xc")):
        peak = 0.5 * X  # a 0 → ±X/2 cycle: amplitude and |mean| X/4
        lo, hi = (np.array([0.0]), np.array([peak])) if side == "tension" else (np.array([-peak]), np.array([0.0]))
        N = float(model.cycles_to_failure(lo, hi)[0])
        if 0.0 < N < 10.0:
            out.append(
                f"{at}a {side} cycle from zero to half of {name} fails within {N:.3g} cycles: the diagram lies far "
                f"inside the static strength on the {side} side; give curves at several R (mean_stress = \"cld\")"
            )
    for c in model.curves:
        r = mean_ratio(c.R)
        peak = c.S1 * (1.0 + r) if r >= 0 else c.S1 * (1.0 - r)
        X, name = (model.Xt, "Xt") if r >= 0 else (model.Xc, "Xc")
        if peak > X * (1.0 + 1e-12):  # 1e-12: S1 set equal to the strength must not warn
            out.append(
                f"{at}the curve at R = {c.R:g} peaks at {peak:.4g} on its first cycle, beyond {name} = {X:.4g}; "
                f"lives under a few cycles are set by the static check"
            )
    if model.rule == "cld":
        order = sorted(model.curves, key=lambda c: mean_ratio(c.R))
        for L in np.arange(0.0, 31.0):  # every decade up to 1e30 cycles
            means = [mean_ratio(c.R) * float(c.amplitude_at_log(np.array(L))) for c in order]
            if any(b < a for a, b in zip(means, means[1:])):
                out.append(
                    f"{at}the constant-life diagram folds back at N = 1e{L:.0f} (vertices ordered by R are not "
                    f"ordered by mean); it is read along rays, so lives stay defined but check the curves"
                )
                break
        out += _limit_diagram_warnings(model, order, at)
    return out


def _limit_diagram_warnings(model: FatigueModel, order: list[SNCurve], at: str) -> list[str]:
    # warnings on the cld fatigue-limit diagram and the reach of the diagram's end lines
    out: list[str] = []
    limited = [c for c in order if c.limit]
    means = [mean_ratio(c.R) * c.limit for c in limited]
    if any(b < a for a, b in zip(means, means[1:])):
        out.append(
            f"{at}the fatigue-limit diagram folds back (limit points ordered by R are not ordered by mean); "
            f"it is read along rays, so lives stay defined but check the limits"
        )
    for c in order:
        if c.limit:
            continue
        r = mean_ratio(c.R)
        load = float(_limit_diagram_load(model, np.array([1.0]), np.array([r]))[0])
        if load < math.inf:
            rho = 1.0 / load
            N = float(c.cycles(np.array(rho)))
            out.append(
                f"{at}the curve at R = {c.R:g} has {'a zero' if c.limit == 0.0 else 'no'} fatigue limit, but the fatigue-limit diagram of the other "
                f"curves crosses its ray at amplitude {rho:.4g}: its cycles up to there do no damage, where its "
                f"own curve gives N = {N:.3g} at that amplitude; give it a limit to set this"
            )
    r = [mean_ratio(c.R) for c in order]
    if r[0] > 1.0 or r[-1] < -1.0:
        side, X = ("compression", "(-Xc, 0)") if r[0] > 1.0 else ("tension", "(Xt, 0)")
        out.append(
            f"{at}all curves of the constant-life diagram are at R {'between 0 and 1' if r[0] > 1.0 else 'above 1'}: "
            f"on the {side} side its end line from {X} cannot reach some cycles inside the static strengths, "
            f"which then get N = 0 (failure on first loading); add a curve at R = -1"
        )
    return out


# ---------------------------------------------------------------------------------------------
# Constant-life diagram.

@dataclass(frozen=True)
class _Split:
    """A cycle's sector among ascending rays r and its split (σm, σa) = s_lo u + s_hi v on the
    sector's two vertex directions u, v: (−1, 0) and w_0 (sector 0), w_j and w_j+1 (sector j+1),
    w_n−1 and (1, 0) (sector n), with w_j = (r_j, 1)."""

    sector: np.ndarray
    s_lo: np.ndarray
    s_hi: np.ndarray


def _split(r: np.ndarray, sa: np.ndarray, sm: np.ndarray) -> _Split:
    n = r.size
    sector = np.searchsorted(r, sm / sa, side="right")  # 0: compression end, n: tension end
    s_lo, s_hi = np.empty_like(sa), np.empty_like(sa)
    k = sector == 0  # (−1, 0) and w_0: s_lo = r_0 σa − σm, s_hi = σa
    s_lo[k], s_hi[k] = r[0] * sa[k] - sm[k], sa[k]
    k = sector == n  # w_n−1 and (1, 0): s_lo = σa, s_hi = σm − r_n−1 σa
    s_lo[k], s_hi[k] = sa[k], sm[k] - r[-1] * sa[k]
    for j in range(n - 1):
        k = sector == j + 1
        s_hi[k] = (sm[k] - r[j] * sa[k]) / (r[j + 1] - r[j])
        s_lo[k] = sa[k] - s_hi[k]
    return _Split(sector, s_lo, s_hi)


def _limit_diagram_load(model: FatigueModel, sa: np.ndarray, sm: np.ndarray) -> np.ndarray:
    """s_j/limit_j + s_j+1/limit_j+1 [-] of cycles (σa > 0, σm) on the cld fatigue-limit diagram
    (Notes of ``FatigueModel``): <= 1 at or inside it; inf without a curve with a limit > 0."""
    limited = sorted((c for c in model.curves if c.limit), key=lambda c: mean_ratio(c.R))
    if not limited:
        return np.full_like(sa, np.inf)
    r = np.array([mean_ratio(c.R) for c in limited])
    A = np.array([model.Xc] + [c.limit for c in limited] + [model.Xt])  # vertex amplitudes, by sector end
    split = _split(r, sa, sm)
    return split.s_lo / A[split.sector] + split.s_hi / A[split.sector + 1]


def _cld_cycles(model: FatigueModel, sa: np.ndarray, sm: np.ndarray) -> np.ndarray:
    """Lives [-] of cycles (σa > 0, σm): inf at or inside the fatigue-limit diagram, else the N
    of the piecewise-linear constant-life diagram through the cycle."""
    curves = sorted(model.curves, key=lambda c: mean_ratio(c.R))
    r = np.array([mean_ratio(c.R) for c in curves])
    n = len(curves)
    N = np.full_like(sa, np.inf)
    out = np.flatnonzero(_limit_diagram_load(model, sa, sm) > 1.0)  # beyond the fatigue-limit diagram
    if out.size == 0:
        return N
    sa, sm = sa[out], sm[out]
    split = _split(r, sa, sm)
    life = np.empty_like(sa)
    # compression end sector, vertices (−Xc, 0) and curve 0: s_lo = r_0 σa − σm along (−1, 0)
    k = split.sector == 0
    if k.any():
        life[k] = _one_curve_life(curves[0], split.s_hi[k], split.s_lo[k] / model.Xc)
    # tension end sector, vertices curve n−1 and (Xt, 0): s_hi = σm − r_n−1 σa along (1, 0)
    k = split.sector == n
    if k.any():
        life[k] = _one_curve_life(curves[-1], split.s_lo[k], split.s_hi[k] / model.Xt)
    # sectors between tested rays j and j+1
    for j in range(n - 1):
        k = split.sector == j + 1
        if k.any():
            with np.errstate(over="ignore"):  # lives past 1e308 are inf
                life[k] = 10.0 ** _two_curve_log_life(curves[j], curves[j + 1], split.s_lo[k], split.s_hi[k])
    N[out] = life
    return N


def _one_curve_life(curve: SNCurve, s_curve: np.ndarray, strength_share: np.ndarray) -> np.ndarray:
    # s_curve / a(N) + strength_share = 1  =>  a(N) = s_curve / (1 − strength_share)
    room = 1.0 - strength_share
    with np.errstate(divide="ignore"):
        target = np.where(room > 0.0, s_curve / np.where(room > 0.0, room, 1.0), np.inf)
    with np.errstate(over="ignore"):
        return np.where(np.isinf(target), 0.0, curve.cycles(np.where(np.isinf(target), 0.0, target)))


def _two_curve_log_life(c1: SNCurve, c2: SNCurve, s1: np.ndarray, s2: np.ndarray) -> np.ndarray:
    """log10 N [-] solving s1/a1(N) + s2/a2(N) = 1, s1, s2 >= 0, s1 + s2 > 0 (vectorized)."""
    sigma = s1 + s2
    w1, w2 = s1 / sigma, s2 / sigma

    def excess(i: np.ndarray, L: np.ndarray) -> np.ndarray:
        # log of (s1/a1 + s2/a2): < 0 inside the diagram of life 10**L, > 0 outside
        with np.errstate(divide="ignore", invalid="ignore"):
            a1, a2 = c1.amplitude_at_log(L), c2.amplitude_at_log(L)
            t = np.where(w1[i] > 0, w1[i] / a1, 0.0) + np.where(w2[i] > 0, w2[i] / a2, 0.0)
            return np.clip(np.log(sigma[i] * t), -700.0, 700.0)  # clip keeps ±inf out of the secant

    # bracket in closed form: at the root 1/σ is a weighted mean of 1/a1 and 1/a2, so the
    # root lies between the lives of the two curves at the amplitude σ
    L1, L2 = c1.log_cycles(sigma), c2.log_cycles(sigma)
    lo, hi = np.minimum(L1, L2), np.maximum(L1, L2)
    out = np.full_like(sigma, np.inf)
    # both curves at or below their limits at σ: the cycle is inside every diagram, N = inf
    bounded = np.isfinite(lo)
    # one curve (c) at or below its limit: beyond its saturation life a_c = limit_c, and the
    # other curve (d) alone must reach a_d = w_d / (1/σ − w_c/limit_c)
    for c, d, wc, wd, Lc in ((c1, c2, w1, w2, L1), (c2, c1, w2, w1, L2)):
        open_ = bounded & np.isinf(Lc)
        if open_.any():
            room = 1.0 / sigma[open_] - wc[open_] / c.limit
            with np.errstate(divide="ignore"):
                a_d = np.where(room > 0, wd[open_] / np.where(room > 0, room, 1.0), np.inf)
            L_d = np.where(np.isinf(a_d), np.inf, d.log_cycles(np.where(np.isinf(a_d), 0.0, a_d)))
            hi[open_] = np.maximum(c.saturation_log_cycles(), L_d)
    solve = np.flatnonzero(bounded & np.isfinite(hi))
    if solve.size == 0:
        return out
    a, b = lo[solve], hi[solve]
    fa, fb = excess(solve, a), excess(solve, b)
    root = np.where(fa >= 0.0, a, np.where(fb <= 0.0, b, np.nan))  # a bracket end that is the root
    todo = np.flatnonzero(np.isnan(root))
    # Illinois iteration on the bracket [a, b] with fa < 0 < fb: a secant step, and when the same
    # end of the bracket is kept twice running its function value is halved
    kept = np.zeros(solve.size, dtype=np.int8)  # -1: a was kept last step, +1: b was kept
    for _ in range(CLD_MAX_ITER):
        if todo.size == 0:
            break
        ia, ib, fia, fib = a[todo], b[todo], fa[todo], fb[todo]
        c = ib - fib * (ib - ia) / (fib - fia)
        c = np.where((c > ia) & (c < ib), c, 0.5 * (ia + ib))  # stay strictly inside the bracket
        fc = excess(solve[todo], c)
        move_a = fc < 0.0  # the root lies in (c, b]: c replaces a, b is kept
        again = kept[todo] == np.where(move_a, 1, -1)
        a[todo] = np.where(move_a, c, ia)
        b[todo] = np.where(move_a, ib, c)
        fa[todo] = np.where(move_a, fc, np.where(again, 0.5 * fia, fia))
        fb[todo] = np.where(move_a, np.where(again, 0.5 * fib, fib), fc)
        kept[todo] = np.where(move_a, 1, -1)
        done = (b[todo] - a[todo] < CLD_TOL_LOG10N) | (fc == 0.0)
        root[todo[done]] = np.where(fc[done] == 0.0, c[done], 0.5 * (a[todo[done]] + b[todo[done]]))
        todo = todo[~done]
    if todo.size:  # not converged to 1e-9 decades: the midpoint of the bracket left
        root[todo] = 0.5 * (a[todo] + b[todo])
    out[solve] = root
    return out


# ---------------------------------------------------------------------------------------------
# Checks.

def _ray_k(R: float, Xt: float, Xc: float) -> float:
    r = mean_ratio(R)
    return r / Xt if r >= 0.0 else -r / Xc


def _check_strengths(Xt: float, Xc: float, where: str) -> None:
    for name, X in (("Xt", Xt), ("Xc", Xc)):
        if isinstance(X, bool) or not isinstance(X, (int, float)) or not math.isfinite(X) or X <= 0.0:
            raise InputError(f"{where}: static strength {name} must be a finite number > 0 "
                             f"(Xc as a magnitude) in the curve's basis, got {X!r}")


def _check_model(rule: str, curves: tuple, Xt: float, Xc: float, where: str) -> None:
    if rule not in RULES:
        raise InputError(f"{where}: mean_stress rule must be one of {', '.join(RULES)}, got {rule!r}")
    if not curves or not all(isinstance(c, SNCurve) for c in curves):
        raise InputError(f"{where}: a fatigue model needs SNCurve curves, got {curves!r}")
    _check_strengths(Xt, Xc, where)
    if rule == "cld":
        if len(curves) < 2:
            raise InputError(f"{where}: mean_stress 'cld' needs curves at two or more stress ratios R, "
                             f"got {len(curves)}; give more curves or use 'goodman'")
        Rs = [c.R for c in curves]
        if len(set(Rs)) != len(Rs):
            raise InputError(f"{where}: the curves of a constant-life diagram need distinct R, got R = {Rs}")
    elif len(curves) != 1:
        raise InputError(f"{where}: mean_stress {rule!r} takes one curve, got {len(curves)}; "
                         f"use 'cld' for curves at several R")
    bases = {c.basis for c in curves}
    if len(bases) != 1:
        raise InputError(f"{where}: all curves of one model need one basis (stress or strain), got {sorted(bases)}")
