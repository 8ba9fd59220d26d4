"""Chebyshev–Lobatto nodes on an interval and the matrices that integrate and interpolate a function from its values.

A function sampled at the n Chebyshev–Lobatto points of [−1, 1], x_i = −cos(π·i/(n − 1)), is represented by
its interpolating polynomial of degree n − 1 in the Chebyshev basis (coefficients by the inverse of the
Vandermonde matrix T_j(x_i)). Integrating that polynomial term by term gives the cumulative integral ∫₋₁^x f
at the nodes (Greengard, "Spectral integration and two-point boundary value problems", SIAM J. Numer. Anal. 28
(1991) 1071–1080), whose last row is the Clenshaw–Curtis quadrature (Clenshaw & Curtis, Numer. Math. 2 (1960)
197–205); evaluating it elsewhere interpolates. For a smooth function the error falls geometrically with n
(Trefethen, *Spectral Methods in MATLAB*, SIAM 2000, ch. 6 and 12).

Range: n from 2 to 400 nodes (the Vandermonde matrix of these points stays well conditioned: it is a cosine
transform); interpolation points inside [−1, 1].
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache

import numpy as np
from numpy.polynomial import chebyshev

MAX_NODES = 400


@dataclass(frozen=True)
class Rule:
    """n Chebyshev–Lobatto nodes on [−1, 1] with their matrices.

    x : np.ndarray — the nodes, ascending, shape (n,)
    integrate : np.ndarray — values at the nodes → ∫₋₁^x_i f, shape (n, n)
    to_coefficients : np.ndarray — values at the nodes → Chebyshev coefficients, shape (n, n)
    """

    x: np.ndarray
    integrate: np.ndarray
    to_coefficients: np.ndarray

    def interpolation(self, t: np.ndarray) -> np.ndarray:
        """The matrix from values at the nodes to values at the points t in [−1, 1], shape (len(t), n)."""
        t = np.asarray(t, float)
        if t.size and (t.min() < -1.0 - 1e-12 or t.max() > 1.0 + 1e-12):
            raise ValueError("Chebyshev interpolation points must lie in [-1, 1]")
        return chebyshev.chebvander(np.clip(t, -1.0, 1.0), self.x.size - 1) @ self.to_coefficients


@lru_cache(maxsize=64)
def rule(n: int) -> Rule:
    """The rule of n nodes (2 ≤ n ≤ MAX_NODES), built once."""
    if not 2 <= n <= MAX_NODES:
        raise ValueError(f"a Chebyshev rule takes 2 to {MAX_NODES} nodes, not {n}")
    x = -np.cos(np.pi * np.arange(n) / (n - 1))
    to_coefficients = np.linalg.inv(chebyshev.chebvander(x, n - 1))
    # ∫₋₁^x T_j, evaluated at the nodes (term-by-term integration of the Chebyshev series)
    primitives = np.stack([chebyshev.chebval(x, chebyshev.chebint(np.eye(n)[j], lbnd=-1.0)) for j in range(n)], axis=1)
    integrate = primitives @ to_coefficients
    for array in (x, integrate, to_coefficients):
        array.flags.writeable = False
    return Rule(x, integrate, to_coefficients)
