"""Stored elastic energy: U(drive), the energy a cycle takes in and gives back, and how well the part stores it.

Linear elastic, so the energy along the load path is U = ∫F dδ = ½·F·δ = ½·C·F² = ½·δ²/C
(Clapeyron's theorem; Timoshenko & Goodier, *Theory of Elasticity*, 3rd ed., sec. 88), with C the
load-point compliance (bending plus shear).
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .beam import BeamResponse
from .errors import InputError

DRIVES = ("force", "deflection")


def force_per_drive(compliance: float, drive: str) -> float:
    """Drive force per unit drive: 1 for a force drive, the stiffness 1/C [N/m] for a deflection drive."""
    if drive == "force":
        return 1.0
    if drive == "deflection":
        return 1.0 / compliance
    raise InputError(f"[duty] drive: must be one of {', '.join(DRIVES)}, got {drive!r}")


def stored_energy(compliance: float, force: np.ndarray) -> np.ndarray:
    """Elastic energy at a load-point force, U = ½·C·F² [J].

    compliance : float — load-point deflection per unit force [m/N]
    force : np.ndarray — load-point force [N]
    """
    return 0.5 * compliance * np.asarray(force, float) ** 2


def cycle_energy(compliance: float, lo: np.ndarray, hi: np.ndarray) -> np.ndarray:
    """Energy taken in and given back over a cycle of force lo → hi [J].

    lo, hi : np.ndarray — the cycle's extreme forces [N], lo <= hi

    Notes
    -----
    From the lowest-energy state the cycle passes to its highest: U is convex in F with its minimum 0 at
    F = 0, so a cycle that crosses zero starts from U = 0; otherwise from the smaller of U(lo), U(hi).
    """
    lo = np.asarray(lo, float)
    hi = np.asarray(hi, float)
    u_lo, u_hi = stored_energy(compliance, lo), stored_energy(compliance, hi)
    low = np.where((lo <= 0.0) & (hi >= 0.0), 0.0, np.minimum(u_lo, u_hi))
    return np.maximum(u_lo, u_hi) - low


@dataclass(frozen=True)
class StorageFigures:
    """Energy figures at the peak drive.

    energy : float — elastic energy at the peak force [J]
    specific_energy : float — energy per mass of the part [J/kg]
    peak_strain_x : float — largest |εx| along the beam axis at the peak force [-]
    efficiency : float — U_bending / (½·Σ E_x,k·ε_max²·V_k): the fraction of the energy the part would hold
        were all of it strained to the peak axial strain; 1/9 for a uniform end-loaded cantilever, 1/3 for a
        triangular planform or constant moment, 1 for pure tension [-]. The bending energy alone is compared
        with the axial reference (the shear energy of a deep beam or a core would push the ratio past 1).
    """

    energy: float
    specific_energy: float
    peak_strain_x: float
    efficiency: float


def storage_figures(response: BeamResponse, peak_force: float) -> StorageFigures:
    """Energy, specific energy and energy-storage efficiency at the peak drive force [N].

    Notes
    -----
    For one homogeneous material the efficiency is U/((σ_max²/2E)·V), the spring designer's utilisation
    figure (1/9, 1/3: derived from the beam formulas; common practice in spring design). For a laminate
    each ply is credited with its own axial modulus at the part's peak axial strain.
    """
    energy = float(stored_energy(response.compliance, peak_force))
    eps_max = np.abs(response.strain_x).max() * abs(peak_force)  # numpy floats: an absurd drive gives inf, not a fault
    reference = response.reference_energy * eps_max**2
    bending = float(stored_energy(response.bending_compliance, peak_force))
    return StorageFigures(
        energy=energy,
        specific_energy=energy / response.mass,
        peak_strain_x=float(eps_max),
        efficiency=float(bending / reference) if 0 < reference < np.inf else 0.0,
    )
