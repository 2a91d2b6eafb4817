"""Shared pieces of the heat-load modules: scipy imported on first use, physical constants,
the area-ratio check, properties as vectorised functions, Gauss-Legendre quadrature.
"""

from __future__ import annotations

import math
from collections.abc import Callable

import numpy as np

from ..errors import InputError


def solve_ivp(*args, **kwargs):
    """scipy.integrate.solve_ivp, imported on first use (keeps ``cryoplan print`` fast)."""
    from scipy.integrate import solve_ivp as _solve_ivp

    return _solve_ivp(*args, **kwargs)


def brentq(*args, **kwargs):
    """scipy.optimize.brentq, imported on first use."""
    from scipy.optimize import brentq as _brentq

    return _brentq(*args, **kwargs)


class _Constants:
    """scipy.constants, imported on first use (keeps ``cryoplan print`` fast)."""

    def __getattr__(self, name):
        from scipy import constants

        return getattr(constants, name)


_const = _Constants()


_TORR = 101325.0 / 760.0  # Pa per torr (exact by definition)


def _area_ratio(value) -> np.ndarray:
    arr = np.asarray(value, dtype=float)
    if arr.size and (not np.all(np.isfinite(arr)) or np.any(arr < 0.0) or np.any(arr > 1.0)):
        raise InputError(
            "area_ratio (cold area / warm area) must lie in [0, 1]: the cold surface is the "
            "enclosed one",
            key="area_ratio",
            expected="0 <= value <= 1",
            found=repr(value),
        )
    return arr


def _as_function(f, name: str) -> Callable[[np.ndarray], np.ndarray]:
    """A property as a vectorised function of T: a constant becomes a constant function."""
    if callable(f):

        def vectorised(T):
            T = np.asarray(T, dtype=float)
            try:
                out = np.asarray(f(T), dtype=float)
            except TypeError:  # a callable that only takes scalars
                out = None
            if out is None or out.shape != T.shape:
                out = np.array([float(f(float(t))) for t in T.ravel()]).reshape(T.shape)
            return out

        return vectorised
    value = float(f)
    if not math.isfinite(value):
        raise InputError(f"{name} must be finite", key=name, found=repr(f))
    return lambda T: np.full(np.shape(T), value)


# composite Gauss-Legendre quadrature: 16 nodes per panel
_GL_X, _GL_W = np.polynomial.legendre.leggauss(16)


def _gauss(a: float, b: float, panels: int = 24, geometric: bool = False):
    """Nodes and weights of composite Gauss-Legendre quadrature on [a, b]."""
    if geometric and a > 0.0:
        edges = np.geomspace(a, b, panels + 1)
    else:
        edges = np.linspace(a, b, panels + 1)
    mid = 0.5 * (edges[1:] + edges[:-1])
    half = 0.5 * (edges[1:] - edges[:-1])
    x = (mid[:, None] + half[:, None] * _GL_X).ravel()
    w = (half[:, None] * _GL_W).ravel()
    return x, w
