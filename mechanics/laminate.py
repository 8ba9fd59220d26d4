"""Classical laminate theory: Q, Q̄, ABD, midplane strains and curvatures, ply strains and stresses.

Sign and axis conventions (Jones, *Mechanics of Composite Materials*, 2nd ed., ch. 2 and 4;
Kaw, *Mechanics of Composite Materials*, 2nd ed., ch. 2 and 4):

- beam axes x (along the span), y (across the width), z (through the thickness, from the mid-plane);
- ply 1 lies at the bottom, from z = −h/2; the ply angle θ is the fibre direction measured from x;
- strains are engineering strains: ``[εx, εy, γxy]`` and in ply axes ``[ε1, ε2, γ12]``;
- resultants ``N = [Nx, Ny, Nxy]`` [N/m] and ``M = [Mx, My, Mxy]`` [N·m/m] per unit width.

Everything here is linear elastic and per unit width; the beam module scales it by the local moment
and width.
"""
from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np

from .errors import InputError
from .materials import Material

SECTIONS = ("beam", "plate")


@dataclass(frozen=True)
class Layer:
    """One ply of a stack.

    material : Material — the ply's material
    angle : float — fibre angle to the beam axis x [deg]
    thickness : float — ply thickness [m]
    """

    material: Material
    angle: float
    thickness: float


def reduced_stiffness(E1: float, E2: float, nu12: float, G12: float) -> np.ndarray:
    """Plane-stress reduced stiffness matrix Q of an orthotropic ply in its own axes [Pa].

    Notes
    -----
    Q11 = E1/(1−ν12ν21), Q12 = ν12E2/(1−ν12ν21), Q22 = E2/(1−ν12ν21), Q66 = G12, with ν21 = ν12E2/E1
    (Eq. 2.93 in Kaw, 2nd ed.; Eq. 2.61 in Jones, 2nd ed.).
    """
    nu21 = nu12 * E2 / E1
    den = 1.0 - nu12 * nu21
    return np.array(
        [
            [E1 / den, nu12 * E2 / den, 0.0],
            [nu12 * E2 / den, E2 / den, 0.0],
            [0.0, 0.0, G12],
        ]
    )


def stress_transformation(angle: float) -> np.ndarray:
    """Transformation T from beam-axis to ply-axis stresses, σ123 = T σxy.

    angle : float — fibre angle θ to x [deg]

    Notes
    -----
    T = [[c², s², 2sc], [s², c², −2sc], [−sc, sc, c²−s²]] (Eq. 2.94 in Kaw, 2nd ed.; Eq. 2.79 in Jones).
    Engineering strains transform with R T R⁻¹, R = diag(1, 1, 2) (Eq. 2.99 in Kaw).
    """
    t = np.radians(angle)
    c, s = np.cos(t), np.sin(t)
    return np.array(
        [
            [c * c, s * s, 2 * s * c],
            [s * s, c * c, -2 * s * c],
            [-s * c, s * c, c * c - s * s],
        ]
    )


def strain_transformation(angle: float) -> np.ndarray:
    """Transformation of engineering strains, ε123 = T_ε εxy, T_ε = R T R⁻¹ (Eq. 2.99 in Kaw, 2nd ed.).

    Written out: [[c², s², sc], [s², c², −sc], [−2sc, 2sc, c²−s²]] (R = diag(1, 1, 2) applied to T).
    """
    t = np.radians(angle)
    c, s = np.cos(t), np.sin(t)
    return np.array(
        [
            [c * c, s * s, s * c],
            [s * s, c * c, -s * c],
            [-2 * s * c, 2 * s * c, c * c - s * s],
        ]
    )


def transformed_stiffness(Q: np.ndarray, angle: float) -> np.ndarray:
    """Transformed reduced stiffness Q̄ of a ply at ``angle`` [deg] in beam axes [Pa].

    Notes
    -----
    Q̄ = T⁻¹ Q R T R⁻¹ (Eq. 2.103 in Kaw, 2nd ed.; Eq. 2.84 in Jones, 2nd ed.), with T⁻¹(θ) = T(−θ) (a rotation
    back by the same angle; Kaw, Eq. 2.95).
    """
    return stress_transformation(-angle) @ Q @ strain_transformation(angle)


@dataclass(frozen=True)
class Laminate:
    """A ply stack with its laminate stiffness.

    layers : tuple[Layer, ...] — plies from the bottom (z = −h/2) up
    z : np.ndarray — ply interface coordinates, shape (n+1,) [m], z[0] = −h/2
    Qbar : np.ndarray — transformed reduced stiffness per ply, shape (n, 3, 3) [Pa]
    A : np.ndarray — extensional stiffness [N/m] (Pa·m)
    B : np.ndarray — coupling stiffness [N] (Pa·m²)
    D : np.ndarray — bending stiffness [N·m] (Pa·m³)
    ABD : np.ndarray — the 6×6 [[A, B], [B, D]]
    abd : np.ndarray — its inverse, compliance [[a, b], [bᵀ, d]]
    """

    layers: tuple[Layer, ...]
    z: np.ndarray
    Qbar: np.ndarray
    A: np.ndarray
    B: np.ndarray
    D: np.ndarray
    ABD: np.ndarray
    abd: np.ndarray

    @property
    def thickness(self) -> float:
        """Laminate thickness h [m]."""
        return float(self.z[-1] - self.z[0])

    @property
    def areal_mass(self) -> float:
        """Mass per unit area [kg/m²]."""
        return float(sum(p.material.density * p.thickness for p in self.layers))


def laminate(layers: Sequence[Layer]) -> Laminate:
    """Assemble the laminate stiffness of a ply stack, unsymmetric stacks included.

    Notes
    -----
    A = Σ Q̄ₖ(zₖ − zₖ₋₁), B = ½ Σ Q̄ₖ(zₖ² − zₖ₋₁²), D = ⅓ Σ Q̄ₖ(zₖ³ − zₖ₋₁³)
    (Eq. 4.28 in Kaw, 2nd ed.; Eq. 4.24 in Jones, 2nd ed.), z from the mid-plane, ply 1 at the bottom.
    """
    if not layers:
        raise InputError("a laminate needs at least one ply")
    t = np.array([p.thickness for p in layers], dtype=float)
    if np.any(t <= 0):
        raise InputError(f"ply thickness must be > 0 [m], got {t.min():g} m")
    z = np.concatenate([[0.0], np.cumsum(t)]) - t.sum() / 2.0
    Qbar = np.array(
        [
            transformed_stiffness(
                reduced_stiffness(p.material.E1, p.material.E2, p.material.nu12, p.material.G12), p.angle
            )
            for p in layers
        ]
    )
    dz1, dz2, dz3 = np.diff(z), np.diff(z**2), np.diff(z**3)
    A = np.einsum("k,kij->ij", dz1, Qbar)
    B = np.einsum("k,kij->ij", dz2, Qbar) / 2.0
    D = np.einsum("k,kij->ij", dz3, Qbar) / 3.0
    ABD = np.block([[A, B], [B, D]])
    return Laminate(tuple(layers), z, Qbar, A, B, D, ABD, np.linalg.inv(ABD))


def midplane_response(lam: Laminate, N: np.ndarray, M: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Midplane strains ε⁰ [-] and curvatures κ [1/m] under resultants N [N/m] and M [N·m/m].

    Notes
    -----
    [ε⁰; κ] = [[A, B], [B, D]]⁻¹ [N; M] (Eq. 4.29 in Kaw, 2nd ed.).
    """
    x = lam.abd @ np.concatenate([np.asarray(N, float), np.asarray(M, float)])
    return x[:3], x[3:]


@dataclass(frozen=True)
class UnitBending:
    """Laminate response to a unit bending moment Mx = 1 N·m/m (per unit width).

    eps0 : np.ndarray — midplane strains [εx, εy, γxy] per unit Mx [1/(N·m/m)]
    kappa : np.ndarray — curvatures [κx, κy, κxy] per unit Mx [1/m per N·m/m]
    flexural_compliance : float — κx per unit Mx [1/(N·m)]; its inverse is the bending stiffness per width
    section : str — "beam" or "plate"
    """

    eps0: np.ndarray
    kappa: np.ndarray
    flexural_compliance: float
    section: str

    @property
    def bending_stiffness(self) -> float:
        """Bending stiffness per unit width, Mx/κx [N·m]."""
        return 1.0 / self.flexural_compliance


def unit_bending(lam: Laminate, section: str) -> UnitBending:
    """Midplane strains and curvatures of the laminate under Mx = 1 N·m/m.

    section : str — ``"beam"``: narrow beam, Nx = Ny = Nxy = 0 and My = Mxy = 0 (free anticlastic
        curvature and twist), so κx = d11·Mx with d the full 6×6 ABD inverse;
        ``"plate"``: cylindrical bending of a wide plate, w = w(x) only: εy⁰ = κy = κxy = 0 (the width is
        held straight and untwisted), Nx = Nxy = 0; My and Mxy are the reactions that keep it so.

    Notes
    -----
    Narrow beam: bending stiffness per width = 1/d11 (Kaw, 2nd ed., sec. 4.7; Whitney, *Structural Analysis of
    Laminated Anisotropic Plates*, 1987, ch. 6). Cylindrical bending (Whitney 1987, ch. 5; w = w(x)): the 3×3
    sub-system of the ABD relation for (Nx, Nxy, Mx) in (εx⁰, γxy⁰, κx) with εy⁰ = κy = κxy = 0; for any
    symmetric laminate (B = 0) it gives the bending stiffness D11.
    """
    if section == "beam":
        column = lam.abd[:, 3]
        return UnitBending(column[:3].copy(), column[3:].copy(), float(column[3]), section)
    if section == "plate":
        keep = [0, 2, 3]  # εx⁰, γxy⁰, κx are free; εy⁰ = κy = κxy = 0
        sub = np.linalg.inv(lam.ABD[np.ix_(keep, keep)])[:, 2]  # response to Mx = 1 (third resultant)
        full = np.zeros(6)
        full[keep] = sub
        return UnitBending(full[:3], full[3:], float(full[3]), section)
    raise InputError(f"section must be one of {', '.join(SECTIONS)}, got {section!r}")


@dataclass(frozen=True)
class PlyField:
    """Strains and stresses at the bottom and top face of every ply (index 0 = bottom, lower z).

    z : np.ndarray — face coordinates, shape (n, 2) [m]
    strain_xy : np.ndarray — [εx, εy, γxy] in beam axes, shape (n, 2, 3) [-]
    strain_12 : np.ndarray — [ε1, ε2, γ12] in ply axes, shape (n, 2, 3) [-]
    stress_xy : np.ndarray — [σx, σy, τxy] in beam axes, shape (n, 2, 3) [Pa]
    stress_12 : np.ndarray — [σ1, σ2, τ12] in ply axes, shape (n, 2, 3) [Pa]
    """

    z: np.ndarray
    strain_xy: np.ndarray
    strain_12: np.ndarray
    stress_xy: np.ndarray
    stress_12: np.ndarray


def ply_field(lam: Laminate, eps0: np.ndarray, kappa: np.ndarray) -> PlyField:
    """Ply strains and stresses at both faces of every ply from midplane strains and curvatures.

    Notes
    -----
    ε(z) = ε⁰ + z κ (Eq. 4.16 in Kaw, 2nd ed.); σxy = Q̄ ε (Eq. 4.18); ply axes by T and T_ε
    (Eqs. 2.94 and 2.99 in Kaw).
    """
    zf = np.stack([lam.z[:-1], lam.z[1:]], axis=1)  # (n, 2)
    strain_xy = eps0[None, None, :] + zf[:, :, None] * kappa[None, None, :]
    stress_xy = np.einsum("kij,kfj->kfi", lam.Qbar, strain_xy)
    T = np.array([stress_transformation(p.angle) for p in lam.layers])
    Te = np.array([strain_transformation(p.angle) for p in lam.layers])
    stress_12 = np.einsum("kij,kfj->kfi", T, stress_xy)
    strain_12 = np.einsum("kij,kfj->kfi", Te, strain_xy)
    return PlyField(zf, strain_xy, strain_12, stress_xy, stress_12)


@dataclass(frozen=True)
class ShearFlow:
    """Interlaminar shear τxz per unit transverse shear force per width, Vx = 1 N/m.

    z_interfaces : np.ndarray — shape (n+1,) [m]
    tau_interfaces : np.ndarray — τxz at every ply interface, shape (n+1,) [Pa per N/m]; zero at both faces
    z_peak : np.ndarray — z of the largest |τxz| inside each ply, shape (n,) [m]
    tau_peak : np.ndarray — τxz there, shape (n,) [Pa per N/m]
    """

    z_interfaces: np.ndarray
    tau_interfaces: np.ndarray
    z_peak: np.ndarray
    tau_peak: np.ndarray

    @property
    def max_abs(self) -> float:
        """Largest |τxz| through the thickness [Pa per N/m]."""
        return float(max(np.abs(self.tau_interfaces).max(), np.abs(self.tau_peak).max()))


def shear_flow(lam: Laminate, bending: UnitBending) -> ShearFlow:
    """Through-thickness τxz from equilibrium of the ply stresses under a shear force Vx = dMx/dx.

    Notes
    -----
    ∂σx/∂x + ∂τxz/∂z = 0 with σx(z) = Σ Q̄1j (ε⁰j + z κj)·Mx and dMx/dx = Vx, so
    τxz(z) = −Vx ∫_{−h/2}^{z} s(ζ) dζ with s the σx per unit Mx (Whitney, 1987, ch. 6; Kaw, 2nd ed.,
    sec. 4.6 for the equilibrium form; prismatic section assumed locally). Within a ply s(z) is linear, so
    the integral is exact; |τxz| peaks inside a ply where s changes sign (the neutral axis).
    For a homogeneous rectangle it gives τmax = 3V/(2bh) at the mid-plane (Roark, 7th ed., sec. 8.1).
    """
    s_coef = lam.Qbar[:, 0, :]  # (n, 3): σx = s_coef·(ε⁰ + zκ) per unit Mx
    s0 = s_coef @ bending.eps0  # σx at z = 0 per unit Mx, per ply
    s1 = s_coef @ bending.kappa  # dσx/dz per unit Mx, per ply
    z0, z1 = lam.z[:-1], lam.z[1:]
    increments = s0 * (z1 - z0) + s1 * (z1**2 - z0**2) / 2.0
    tau = -np.concatenate([[0.0], np.cumsum(increments)])
    # peak inside a ply where s(z) = s0 + s1 z = 0, if that z lies within the ply
    with np.errstate(divide="ignore", invalid="ignore"):
        zs = np.where(s1 != 0.0, -s0 / s1, np.nan)
    inside = (zs > z0) & (zs < z1)
    z_peak = np.where(inside, zs, np.where(np.abs(tau[:-1]) >= np.abs(tau[1:]), z0, z1))
    tau_peak = tau[:-1] - (s0 * (z_peak - z0) + s1 * (z_peak**2 - z0**2) / 2.0)
    return ShearFlow(lam.z.copy(), tau, z_peak, tau_peak)


GAUSS_3 = np.polynomial.legendre.leggauss(3)  # 3-point Gauss–Legendre: exact for polynomials up to degree 5


def transverse_shear_stiffness(lam: Laminate, section: str = "beam") -> float:
    """Transverse shear stiffness per unit width S [N/m], energy-consistent with the equilibrium τxz.

    Notes
    -----
    The shear strain energy per length of the equilibrium distribution τxz(z) = V·t(z) equals V²/(2S), so
    1/S = ∫ t(z)²/G_xz(z) dz (Whitney, *Structural Analysis of Laminated Anisotropic Plates*, 1987, ch. 6,
    shear correction from the energy of the equilibrium stresses). The ply modulus in the x–z plane is
    G_xz = G13 cos²θ + G23 sin²θ (tensor rotation about z; Jones, 2nd ed., sec. 2.6). For a homogeneous
    section t(z) is the parabola 3/(2h)(1 − 4z²/h²) and this gives exactly S = (5/6)·G·h, Timoshenko's
    shear correction 5/6; for a sandwich it gives G_core·d²/c (Allen 1969, thin faces), where 5/6·ΣG·t
    would overstate it many times. t(z) is quadratic within a ply, so 3-point Gauss–Legendre is exact.
    """
    bending = unit_bending(lam, section)
    return shear_stiffness(lam, bending, shear_flow(lam, bending))


def shear_stiffness(lam: Laminate, bending: UnitBending, flow: ShearFlow) -> float:
    """``transverse_shear_stiffness`` from a unit bending and its shear flow already at hand [N/m]."""
    s_coef = lam.Qbar[:, 0, :]
    s0, s1 = s_coef @ bending.eps0, s_coef @ bending.kappa
    nodes, weights = GAUSS_3
    compliance = 0.0
    for k, p in enumerate(lam.layers):
        z0, z1 = lam.z[k], lam.z[k + 1]
        z = 0.5 * (z1 - z0) * nodes + 0.5 * (z1 + z0)
        tau = flow.tau_interfaces[k] - (s0[k] * (z - z0) + s1[k] * (z**2 - z0**2) / 2.0)
        t = np.radians(p.angle)
        G = p.material.G13 * np.cos(t) ** 2 + p.material.G23 * np.sin(t) ** 2
        compliance += 0.5 * (z1 - z0) * float(weights @ tau**2) / G
    return 1.0 / compliance
