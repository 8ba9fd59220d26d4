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


def _sections(beam: Beam, elements: int) -> tuple[np.ndarray, list[tuple[float, float, float, float]]]:
    """Element edges over the modelled beam and, per element, (Db, areal mass) of its laminate and the
    width line's two end values: [(Db [N·m], areal mass [kg/m²], b(x0) [m], b(x1) [m])]."""
    segs = segments(beam)
    L = beam.length
    pieces = []  # (x0, x1, Db, areal mass) from the root outward, in the root-to-end coordinate
    for seg in segs:
        n = max(2, int(math.ceil(elements * (seg.x1 - seg.x0) / (L * beam.halves))))
        edges = np.linspace(seg.x0, seg.x1, n + 1)
        for a, b in zip(edges[:-1], edges[1:]):
            pieces.append((float(a), float(b), seg.bending.bending_stiffness, seg.lam.areal_mass))
    if beam.halves == 2:  # the whole span, support to support: the half mirrored about mid-span
        left = [(L - b, L - a, D, rho) for a, b, D, rho in reversed(pieces)]
        right = [(L + a, L + b, D, rho) for a, b, D, rho in pieces]
        pieces = left + right
    edges = np.array([p[0] for p in pieces] + [pieces[-1][1]])
    out = []
    for a, b, D, rho in pieces:
        root_side = (abs(a - L), abs(b - L)) if beam.halves == 2 else (a, b)
        out.append((D, rho, float(beam.width(root_side[0])), float(beam.width(root_side[1]))))
    return edges, out


def _element(length: float, D: float, rho: float, b0: float, b1: float) -> tuple[np.ndarray, np.ndarray]:
    """Stiffness and consistent mass matrices of a Hermite beam element, EI and m' linear in x.

    Notes
    -----
    Cubic Hermite shape functions N(ξ) on ξ ∈ [0, 1] (Przemieniecki, Theory of Matrix Structural Analysis,
    1968, ch. 5 and 11): K = ∫ EI·N''ᵀN'' dx, M = ∫ m'·NᵀN dx, by 4-point Gauss–Legendre quadrature (exact:
    the integrands are polynomials of degree ≤ 7). For constant EI and m' they are the textbook matrices
    (EI/l³)[[12, 6l, −12, 6l], …] and (m'l/420)[[156, 22l, 54, −13l], …].
    """
    l = length
    xi = 0.5 * (_GAUSS + 1.0)
    w = 0.5 * _WEIGHTS
    b = b0 + (b1 - b0) * xi
    N = np.stack([1 - 3 * xi**2 + 2 * xi**3, l * (xi - 2 * xi**2 + xi**3), 3 * xi**2 - 2 * xi**3,
                  l * (-xi**2 + xi**3)])
    d2N = np.stack([-6 + 12 * xi, l * (-4 + 6 * xi), 6 - 12 * xi, l * (-2 + 6 * xi)]) / l**2
    K = (d2N * (w * D * b)) @ d2N.T * l
    M = (N * (w * rho * b)) @ N.T * l
    return K, M


def first_mode(beam: Beam, elements: int = ELEMENTS) -> Mode:
    """The first bending frequency of the part as built [Hz], and its mode shape.

    elements : int — about this many elements over the beam (>= 2); every segment gets at least two

    Notes
    -----
    Generalised symmetric eigenproblem K·φ = ω²·M·φ (scipy.linalg.eigh, the divide-and-conquer driver: its
    subset driver lost digits of the lowest eigenvalue); f = ω/2π. With the slopes scaled by the element
    length the round-off floor is about 1e-7 of f₁ at 64 elements and grows as the elements shrink
    (the condition number grows as their number to the fourth).
    Uniform beams give Blevins' f₁ = λ₁²/(2πL²)·√(EI/m') (Blevins, Formulas for Natural Frequency and Mode
    Shape, 1979, Table 8-1: λ₁ = 1.87510 clamped-free, 2.36502 clamped-sliding, π pinned-pinned; recalled),
    to 10⁻⁶ with these elements (the tests check it).
    """
    validate(beam)
    if elements < 2:
        raise InputError(f"natural frequency: elements must be >= 2, got {elements}")
    edges, props = _sections(beam, elements)
    nodes = edges.size
    K = np.zeros((2 * nodes, 2 * nodes))
    M = np.zeros_like(K)
    for e, (D, rho, b0, b1) in enumerate(props):
        k_e, m_e = _element(edges[e + 1] - edges[e], D, rho, b0, b1)
        dofs = slice(2 * e, 2 * e + 4)
        K[dofs, dofs] += k_e
        M[dofs, dofs] += m_e
    last = 2 * (nodes - 1)
    held = {"cantilever": [0, 1], "guided": [0, 1, last + 1], "three-point": [0, last],
            "four-point": [0, last]}[beam.support]
    free = np.setdiff1d(np.arange(2 * nodes), held)
    # slopes as deflection per element length (a diagonal change of variables): K and M then hold numbers of
    # one size, and the lowest eigenvalue keeps its digits with hundreds of elements
    scale = np.ones(2 * nodes)
    scale[1::2] = (edges[-1] - edges[0]) / len(props)
    K = K / scale[:, None] * (1 / scale)[None, :]
    M = M / scale[:, None] * (1 / scale)[None, :]
    values, vectors = linalg.eigh(K[np.ix_(free, free)], M[np.ix_(free, free)], driver="gvd")
    if not values[0] > 0:
        raise InputError("natural frequency: the beam has no positive bending stiffness")
    phi = np.zeros(2 * nodes)
    phi[free] = vectors[:, 0] / scale[free]
    shape = phi[0::2]
    shape = shape / shape[np.argmax(np.abs(shape))]
    return Mode(math.sqrt(values[0]) / (2.0 * math.pi), edges, shape, len(props))
