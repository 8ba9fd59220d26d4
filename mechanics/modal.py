"""Natural frequency: the first bending mode of the part as built, by a small finite-element eigenproblem.

The part vibrates as an Euler–Bernoulli beam of bending stiffness EI(x) = b(x)·Db(x) (Db the laminate's
bending stiffness per width, the same narrow-beam or plate value the static analysis uses) and mass per
length m'(x) = b(x)·Σ ρ_k·t_k over the plies present at x, so width taper, ply drops and hybrid stacks all
enter. Cubic Hermite elements (two nodes, deflection and slope at each) give the stiffness and consistent
mass matrices; the ends are held as the support holds them:

===========  =====================================  ==============================================
support      beam modelled                          ends
===========  =====================================  ==============================================
cantilever   clamp (x = 0) → free tip (x = L)       w = w' = 0 at the clamp
guided       clamp (x = 0) → guided end (x = L)     w = w' = 0 at the clamp, w' = 0 at the guide
three-point  support → support, the whole span      w = 0 at both supports (simply supported)
four-point   support → support, the whole span      w = 0 at both supports (simply supported)
===========  =====================================  ==============================================

The mass of whatever the part carries (a bowl, a bracket, a foot shell), the fixtures' compliance, shear
deformation and rotary inertia are not modelled: the frequency is that of the part alone, an upper bound
when the part carries mass (Rayleigh's principle), and Euler–Bernoulli overestimates it further for a deep
beam (Timoshenko). The free overhang of a three-/four-point coupon beyond its supports is left out.
"""
from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from scipy import linalg

from .beam import Beam, segments, validate
from .errors import InputError

ELEMENTS = 64  # about this many elements over the beam (every segment gets at least two)
_GAUSS, _WEIGHTS = np.polynomial.legendre.leggauss(4)  # exact for the element integrands (degree ≤ 7)
ITERATIONS = 60  # inverse-iteration steps before giving up (a handful are needed; see ``first_mode``)
BAND = 3  # upper bandwidth of K: an element's four degrees of freedom are neighbours
SETTLED = 1e-13  # the Rayleigh quotient settled: its change per step below this share


@dataclass(frozen=True)
class Mode:
    """The first bending mode.

    frequency : float — first natural frequency of bending [Hz]
    x : np.ndarray — node positions along the modelled beam [m] (three-/four-point: from one support)
    shape : np.ndarray — deflection at the nodes, largest |w| scaled to 1 [-]
    elements : int — elements used
    """

    frequency: float
    x: np.ndarray
    shape: np.ndarray
    elements: int


def _sections(beam: Beam, elements: int) -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray, np.ndarray]:
    """Element edges over the modelled beam and, per element, Db of its laminate [N·m], its areal mass [kg/m²]
    and the width line's two end values b(x0), b(x1) [m]."""
    segs = segments(beam)
    L = beam.length
    counts = [max(2, int(math.ceil(elements * (seg.x1 - seg.x0) / (L * beam.halves)))) for seg in segs]
    # element edges from the root outward (root-to-end coordinate), each segment cut into equal elements
    starts = np.concatenate([np.linspace(seg.x0, seg.x1, n + 1)[:-1] for seg, n in zip(segs, counts)])
    edges = np.append(starts, segs[-1].x1)
    D = np.repeat([seg.bending.bending_stiffness for seg in segs], counts)
    rho = np.repeat([seg.lam.areal_mass for seg in segs], counts)
    b0, b1 = beam.width(edges[:-1]), beam.width(edges[1:])
    if beam.halves == 2:  # the whole span, support to support: the half mirrored about mid-span
        edges = np.concatenate([L - edges[::-1], L + edges[1:]])
        D, rho = np.concatenate([D[::-1], D]), np.concatenate([rho[::-1], rho])
        b0, b1 = np.concatenate([b1[::-1], b0]), np.concatenate([b0[::-1], b1])
    return edges, D, rho, b0, b1


def _elements(length: np.ndarray, D: np.ndarray, rho: np.ndarray, b0: np.ndarray, b1: np.ndarray
              ) -> tuple[np.ndarray, np.ndarray]:
    """Stiffness and consistent mass matrices of Hermite beam elements, EI and m' linear in x, shape (e, 4, 4).

    Notes
    -----
    Cubic Hermite shape functions N(ξ) on ξ ∈ [0, 1] (Przemieniecki, Theory of Matrix Structural Analysis,
    1968, ch. 5 and 11): K = ∫ EI·N''ᵀN'' dx, M = ∫ m'·NᵀN dx, by 4-point Gauss–Legendre quadrature (exact:
    the integrands are polynomials of degree ≤ 7). For constant EI and m' they are the textbook matrices
    (EI/l³)[[12, 6l, −12, 6l], …] and (m'l/420)[[156, 22l, 54, −13l], …].
    """
    l = length[:, None]  # (e, 1): every element at the quadrature points (e, g)
    xi = 0.5 * (_GAUSS + 1.0)
    w = 0.5 * _WEIGHTS
    b = b0[:, None] + (b1 - b0)[:, None] * xi
    one = np.ones_like(l)
    N = np.stack([one * (1 - 3 * xi**2 + 2 * xi**3), l * (xi - 2 * xi**2 + xi**3), one * (3 * xi**2 - 2 * xi**3),
                  l * (-xi**2 + xi**3)], axis=1)
    d2N = np.stack([one * (-6 + 12 * xi), l * (-4 + 6 * xi), one * (6 - 12 * xi), l * (-2 + 6 * xi)], axis=1) / l[:, None]**2
    K = np.einsum("eig,eg,ejg->eij", d2N, w * D[:, None] * b, d2N) * l[:, None]
    M = np.einsum("eig,eg,ejg->eij", N, w * rho[:, None] * b, N) * l[:, None]
    return K, M


def first_mode(beam: Beam, elements: int = ELEMENTS) -> Mode:
    """The first bending frequency of the part as built [Hz], and its mode shape.

    elements : int — about this many elements over the beam (>= 2); every segment gets at least two

    Notes
    -----
    Generalised symmetric eigenproblem K·φ = ω²·M·φ, its lowest eigenpair by inverse iteration: φ ← K⁻¹·M·φ
    on a banded Cholesky factor of K, ω² the Rayleigh quotient φᵀKφ/φᵀMφ formed without K (Bathe, Finite Element
    Procedures, 1996, sec. 11.2.1; recalled); f = ω/2π. The start is the deflection under the part's own weight, which has a
    component along the first mode (neither changes sign along the beam); each step shrinks the others by
    ω₁²/ω_k² (about 1/40 for a cantilever) and the Rayleigh quotient's error is of the square of the vector's,
    so it stops when ω² changes by less than SETTLED. With the slopes scaled by the element length the round-off
    floor is about 1e-7 of f₁ at 64 elements and grows as the elements shrink.
    Uniform beams give Blevins' f₁ = λ₁²/(2πL²)·√(EI/m') (Blevins, Formulas for Natural Frequency and Mode
    Shape, 1979, Table 8-1: λ₁ = 1.87510 clamped-free, 2.36502 clamped-sliding, π pinned-pinned; recalled),
    to 10⁻⁶ with these elements (the tests check it).
    """
    validate(beam)
    if elements < 2:
        raise InputError(f"natural frequency: elements must be >= 2, got {elements}")
    edges, D, rho, b0, b1 = _sections(beam, elements)
    count = D.size
    nodes = edges.size
    k_e, m_e = _elements(np.diff(edges), D, rho, b0, b1)
    # slopes as deflection per element length (a diagonal change of variables): K and M then hold numbers of
    # one size, and the lowest eigenvalue keeps its digits with hundreds of elements
    scale = np.ones(2 * nodes)
    scale[1::2] = (edges[-1] - edges[0]) / count
    dofs = 2 * np.arange(count)[:, None] + np.arange(4)[None, :]  # (e, 4): each element's degrees of freedom
    inverse = 1.0 / scale[dofs]
    K = np.zeros((2 * nodes, 2 * nodes))
    M = np.zeros_like(K)
    rows, cols = np.broadcast_to(dofs[:, :, None], k_e.shape), np.broadcast_to(dofs[:, None, :], k_e.shape)
    np.add.at(K, (rows, cols), k_e * inverse[:, :, None] * inverse[:, None, :])
    np.add.at(M, (rows, cols), m_e * inverse[:, :, None] * inverse[:, None, :])
    last = 2 * (nodes - 1)
    held = {"cantilever": [0, 1], "guided": [0, 1, last + 1], "three-point": [0, last],
            "four-point": [0, last]}[beam.support]
    free = np.setdiff1d(np.arange(2 * nodes), held)
    K, M = K[np.ix_(free, free)], M[np.ix_(free, free)]
    # K is banded (an element couples four neighbouring degrees of freedom): its upper band, row u − d holding
    # the d-th diagonal, factorised in O(n) (LAPACK pbtrf)
    band = np.zeros((BAND + 1, K.shape[0]))
    for d in range(BAND + 1):
        band[BAND - d, d:] = np.diagonal(K, d)
    try:
        factor = (linalg.cholesky_banded(band), False)
    except linalg.LinAlgError:
        raise InputError("natural frequency: the beam has no positive bending stiffness") from None
    y = M @ (free % 2 == 0)  # M·x₀: x₀ moves every node alike, so K⁻¹·M·x₀ is the deflection under the own weight
    omega2 = math.inf
    for _ in range(ITERATIONS):
        vector = linalg.cho_solve_banded(factor, y)  # K·x̄ = y
        y_new = M @ vector
        step = float(vector @ y_new)
        rayleigh = float(vector @ y) / step  # x̄ᵀK x̄ / x̄ᵀM x̄ with K·x̄ = y: no product with K (Bathe, Eq. 11.15)
        y = y_new / math.sqrt(step)
        if abs(rayleigh - omega2) <= SETTLED * rayleigh:
            break
        omega2 = rayleigh
    else:
        raise InputError("natural frequency: the inverse iteration did not settle on the first mode")
    phi = np.zeros(2 * nodes)
    phi[free] = vector / scale[free]
    shape = phi[0::2]
    shape = shape / shape[np.argmax(np.abs(shape))]
    return Mode(math.sqrt(rayleigh) / (2.0 * math.pi), edges, shape, count)
