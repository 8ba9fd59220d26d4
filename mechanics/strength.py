"""First-ply-failure reserve factors of plies from their ply-axis stresses.

A reserve factor R is the load multiplier to first failure: the stresses scale linearly with the drive,
so the ply fails at R times the given stress state. R > 1 is safe, R < 1 has failed, R = inf when the
ply carries no stress. Everything is vectorized over any leading shape of the stress arrays, e.g.
(stations, plies, faces) of ``flexcycle.mechanics.beam.BeamResponse.stress_12``.

Stresses in ply axes, ``stress_12[..., :] = [σ1, σ2, τ12]`` [Pa]; strengths are positive magnitudes
(compressive ones included).

Range of validity: linear elastic plies to first failure under plane stress (σ3 = τ13 = τ23 = 0 for the
in-plane criteria), static load. The criteria say nothing about the progressive failure after the first
ply, nor about fatigue (``life`` does that).
"""
from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np

from .errors import InputError
from .materials import Material

MODES = ("fibre-tension", "fibre-compression", "transverse", "shear")
TSAI_HAHN_F12_STAR = -0.5  # normalised interaction term F12* (Tsai & Hahn, Introduction to Composite Materials, 1980)


@dataclass(frozen=True)
class Strengths:
    """Static ply strengths, each an array broadcastable against the stress arrays' leading shape.

    Xt : np.ndarray — tensile strength along the fibres [Pa]
    Xc : np.ndarray — compressive strength along the fibres, a positive magnitude [Pa]
    Yt : np.ndarray — tensile strength across the fibres [Pa]
    Yc : np.ndarray — compressive strength across the fibres, a positive magnitude [Pa]
    S12 : np.ndarray — in-plane shear strength [Pa]
    """

    Xt: np.ndarray
    Xc: np.ndarray
    Yt: np.ndarray
    Yc: np.ndarray
    S12: np.ndarray

    def expand(self, trailing: int) -> Strengths:
        """The same strengths with ``trailing`` length-1 axes appended.

        Per-ply strengths of shape (p,) become (p, 1) with ``trailing = 1``, which broadcasts against the
        (stations, plies, faces) leading shape of a beam response.
        """
        shape = (...,) + (None,) * trailing
        return Strengths(self.Xt[shape], self.Xc[shape], self.Yt[shape], self.Yc[shape], self.S12[shape])


def strengths_of(materials: Sequence[Material]) -> Strengths:
    """Strengths of a sequence of ply materials, one entry per material, shape (len(materials),) [Pa]."""
    if len(materials) == 0:
        raise InputError("strengths_of: needs at least one material")
    fields = {}
    for key in ("Xt", "Xc", "Yt", "Yc", "S12"):
        values = np.array([getattr(m, key) for m in materials], dtype=float)
        bad = np.flatnonzero(~(values > 0))
        if bad.size:
            m = materials[int(bad[0])]
            raise InputError(
                f"material {m.name!r}: strength {key} must be a positive magnitude > 0 [Pa], got {getattr(m, key)!r}"
            )
        fields[key] = values
    return Strengths(**fields)


def _check_stress(stress_12: np.ndarray) -> np.ndarray:
    stress = np.asarray(stress_12, dtype=float)
    if stress.ndim == 0 or stress.shape[-1] != 3:
        raise InputError(f"ply stresses need a last axis of 3 (σ1, σ2, τ12) [Pa], got shape {stress.shape}")
    if not np.all(np.isfinite(stress)):
        raise InputError("ply stresses must be finite numbers [Pa]")
    return stress


def _check_positive(name: str, value: np.ndarray) -> np.ndarray:
    value = np.asarray(value, dtype=float)
    if not np.all(value > 0):
        raise InputError(f"strength {name} must be a positive magnitude > 0 [Pa], got minimum {np.min(value):g} Pa")
    return value


def _ratio(strength: np.ndarray, stress: np.ndarray) -> np.ndarray:
    """strength/|stress|, inf where the stress is zero."""
    magnitude = np.abs(stress)
    with np.errstate(divide="ignore", over="ignore"):
        return np.where(magnitude > 0.0, strength / np.where(magnitude > 0.0, magnitude, 1.0), np.inf)


@dataclass(frozen=True)
class ReserveResult:
    """Reserve factor to first failure and the mode that governs it.

    factor : np.ndarray — load multiplier to first failure, leading shape of the stresses [-]; inf unstressed
    mode : np.ndarray — the governing mode, one of ``MODES``, same shape (str array)
    """

    factor: np.ndarray
    mode: np.ndarray


def max_stress_reserve(stress_12: np.ndarray, s: Strengths) -> ReserveResult:
    """Maximum-stress reserve factor of plies.

    stress_12 : np.ndarray — ply-axis stresses [σ1, σ2, τ12], shape (..., 3) [Pa]
    s : Strengths — strengths broadcastable to shape (...) [Pa]

    Notes
    -----
    Failure when any of σ1 ≥ Xt, −σ1 ≥ Xc, σ2 ≥ Yt, −σ2 ≥ Yc, |τ12| ≥ S12 (maximum stress criterion,
    Jones, Mechanics of Composite Materials, 2nd ed., sec. 2.9.2; Kaw, 2nd ed., sec. 2.8.1). Stresses scale
    with the load, so the reserve is R = min(Xt/σ1 (σ1 > 0) or Xc/|σ1|, Yt/σ2 (σ2 > 0) or Yc/|σ2|, S12/|τ12|).
    A tie is given to the first of fibre, transverse, shear; an unstressed point has factor inf and, as no mode
    governs, reports "fibre-tension".
    """
    stress = _check_stress(stress_12)
    Xt, Xc = _check_positive("Xt", s.Xt), _check_positive("Xc", s.Xc)
    Yt, Yc = _check_positive("Yt", s.Yt), _check_positive("Yc", s.Yc)
    S12 = _check_positive("S12", s.S12)
    sigma1, sigma2, tau12 = stress[..., 0], stress[..., 1], stress[..., 2]
    fibre = _ratio(np.where(sigma1 > 0, Xt, Xc), sigma1)
    transverse = _ratio(np.where(sigma2 > 0, Yt, Yc), sigma2)
    shear = _ratio(S12, tau12)
    fibre, transverse, shear = np.broadcast_arrays(fibre, transverse, shear)
    stacked = np.stack([fibre, transverse, shear], axis=-1)
    which = np.argmin(stacked, axis=-1)
    factor = np.take_along_axis(stacked, which[..., None], axis=-1)[..., 0]
    fibre_mode = np.where(np.broadcast_to(sigma1, which.shape) >= 0, MODES[0], MODES[1])
    mode = np.where(which == 0, fibre_mode, np.where(which == 1, MODES[2], MODES[3])).astype(str)
    return ReserveResult(factor, mode)


def tsai_wu_reserve(stress_12: np.ndarray, s: Strengths, F12_star: float = TSAI_HAHN_F12_STAR) -> np.ndarray:
    """Tsai-Wu reserve factor of plies under plane stress [-]; inf for an unstressed ply.

    stress_12 : np.ndarray — ply-axis stresses [σ1, σ2, τ12], shape (..., 3) [Pa]
    s : Strengths — strengths broadcastable to shape (...) [Pa]
    F12_star : float — normalised interaction term F12* = F12/sqrt(F11·F22) [-], default −1/2
        (Tsai & Hahn, Introduction to Composite Materials, 1980); must lie in (−1, 1)

    Notes
    -----
    Failure index F1σ1 + F2σ2 + F11σ1² + F22σ2² + F66τ12² + 2F12σ1σ2 = 1 with F1 = 1/Xt − 1/Xc,
    F11 = 1/(Xt·Xc), F2 = 1/Yt − 1/Yc, F22 = 1/(Yt·Yc), F66 = 1/S12², F12 = F12*·sqrt(F11·F22)
    (Kaw, Mechanics of Composite Materials, 2nd ed., sec. 2.8.4, Eq. 2.152 and the strength-ratio form
    that follows it; Jones, 2nd ed., sec. 2.9.6). Scaling the stresses by R gives a R² + b R − 1 = 0 with
    a = F11σ1² + F22σ2² + F66τ12² + 2F12σ1σ2 and b = F1σ1 + F2σ2; the positive root is taken, in the
    cancellation-free form R = 2/(b + sqrt(b² + 4a)) for b ≥ 0 and (−b + sqrt(b² + 4a))/(2a) for b < 0.
    Validity: the criterion is a closed ellipsoid only when F11·F22 − F12² > 0, i.e. |F12*| < 1; otherwise
    it is rejected.
    """
    if not (np.isfinite(F12_star) and -1.0 < F12_star < 1.0):
        raise InputError(
            f"Tsai-Wu F12* must lie in (-1, 1) so that F11·F22 − F12² > 0 (a closed failure surface), "
            f"got {F12_star!r}; Tsai & Hahn (1980) use −0.5"
        )
    stress = _check_stress(stress_12)
    Xt, Xc = _check_positive("Xt", s.Xt), _check_positive("Xc", s.Xc)
    Yt, Yc = _check_positive("Yt", s.Yt), _check_positive("Yc", s.Yc)
    S12 = _check_positive("S12", s.S12)
    F1, F11 = 1.0 / Xt - 1.0 / Xc, 1.0 / (Xt * Xc)
    F2, F22 = 1.0 / Yt - 1.0 / Yc, 1.0 / (Yt * Yc)
    F66 = 1.0 / S12**2
    F12 = F12_star * np.sqrt(F11 * F22)
    sigma1, sigma2, tau12 = stress[..., 0], stress[..., 1], stress[..., 2]
    a = F11 * sigma1**2 + F22 * sigma2**2 + F66 * tau12**2 + 2.0 * F12 * sigma1 * sigma2
    b = F1 * sigma1 + F2 * sigma2
    a, b = np.broadcast_arrays(a, b)
    root = np.sqrt(b * b + 4.0 * a)
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        positive_b = 2.0 / (b + root)
        negative_b = (root - b) / (2.0 * a)
    factor = np.where(b >= 0, positive_b, negative_b)
    return np.where(a > 0, factor, np.inf)


def interlaminar_reserve(tau: np.ndarray, S13: np.ndarray) -> np.ndarray:
    """Reserve factor against interlaminar (or core) shear, S13/|τ13| [-]; inf where τ13 = 0.

    tau : np.ndarray — transverse shear stress τxz = τ13 at the checked points [Pa]
    S13 : np.ndarray — interlaminar (core) shear strength, broadcastable to tau [Pa]

    Notes
    -----
    Maximum-stress check of the transverse shear alone, as in the short-beam shear test (ASTM D2344;
    common practice). The interaction with in-plane stresses is neglected.
    """
    tau = np.asarray(tau, dtype=float)
    if not np.all(np.isfinite(tau)):
        raise InputError("interlaminar shear stresses must be finite numbers [Pa]")
    S13 = _check_positive("S13", S13)
    return _ratio(S13, tau)
