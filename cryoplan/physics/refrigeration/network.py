"""The network of stages: capacity, load and links as fast functions of the stage-temperature
vector, shared by the cooldown integration and the steady state.
"""

from __future__ import annotations

from collections.abc import Callable, Sequence

import numpy as np

from .. import checks
from ..errors import InputError
from .capacity import CapacityCurve, CapacityMap
from .links import Link


class CoolingShortfallError(InputError):
    """A stage whose cooler capacity is below its load at every temperature up to ambient.

    The stage never gets cold. ``shortfall`` is the smallest amount [W] by which the
    capacity falls short of the load over the range, and ``temperature`` [K] where it is
    smallest; ``stage`` names the stage. A subclass of
    :class:`~cryoplan.errors.InputError`: the command line shows it and exits with code 2;
    the caller may set ``file``, ``line`` and ``key``.

    Examples
    --------
    >>> from cryoplan.physics.refrigeration import CapacityCurve, steady_state
    >>> curve = CapacityCurve([[4.2, 1.5], [10, 5], [300, 5]])
    >>> try:
    ...     steady_state([curve], [7.0], targets=[4.2], ambient=300.0, names=["cold plate"])
    ... except CoolingShortfallError as err:
    ...     print(err.stage, round(err.shortfall, 3))
    cold plate 2.0
    """

    def __init__(
        self, message: str, *, stage: str, shortfall: float, temperature: float, **where
    ) -> None:
        self.stage = stage
        self.shortfall = shortfall
        self.temperature = temperature
        super().__init__(message, **where)


# the network of stages: capacity, load and links as fast functions of T (n, k)


def _resolve_stage(ref, names: Sequence[str]) -> int:
    if isinstance(ref, str):
        if ref not in names:
            from ..errors import UnknownNameError

            raise UnknownNameError("stage", ref, names)
        return list(names).index(ref)
    if not isinstance(ref, (int, np.integer)) or not 0 <= int(ref) < len(names):
        raise InputError(
            "a link names a stage that does not exist",
            expected=f"a stage index 0 to {len(names) - 1} or a stage name",
            found=checks.short(ref),
        )
    return int(ref)


def _column_safe(func: Callable, n: int, probe: np.ndarray, what: str) -> Callable:
    """Wrap ``func(T)`` so that it takes (n, k) arrays, calling it per column if it must."""
    out1 = np.asarray(func(probe), dtype=float)
    if out1.shape != (n,):
        raise InputError(
            f"the {what} function must return one value per stage",
            expected=f"an array of {n} values in W",
            found=f"shape {out1.shape}",
        )
    probe2 = np.stack([probe, probe], axis=1)
    try:
        out2 = np.asarray(func(probe2), dtype=float)
        ok = (
            out2.shape == (n, 2)
            and np.allclose(out2[:, 0], out1)
            and np.allclose(out2[:, 1], out1)
        )
    except Exception:  # not vectorised over columns: call column by column
        ok = False
    if ok:
        return lambda T: np.asarray(func(T), dtype=float)

    def per_column(T: np.ndarray) -> np.ndarray:
        if T.ndim == 1:
            return np.asarray(func(T), dtype=float)
        return np.stack([np.asarray(func(T[:, c]), dtype=float) for c in range(T.shape[1])], 1)

    return per_column


class _Network:
    """Capacity, load and links of ``n`` stages, evaluated fast on (n,) or (n, k) arrays."""

    def __init__(self, n, names, capacity, load, links, grid, probe):
        self.n = n
        self.grid = grid
        self._cap = self._capacity(capacity, n, probe)
        self._load = self._loads(load, n, probe)
        self._links = []
        for link in links:
            if not isinstance(link, Link):
                raise InputError(
                    "a link between stages must be a Link",
                    expected="Link(first, second, conductance=...)",
                    found=checks.short(link),
                )
            a = _resolve_stage(link.first, names)
            b = _resolve_stage(link.second, names)
            if a == b:
                raise InputError(
                    "a link must join two different stages",
                    expected="two different stages",
                    found=f"stage {names[a]!r} twice",
                )
            if link.conductance is not None:
                self._links.append((a, b, float(link.conductance), None))
            else:
                geometry = float(link.area) / float(link.length)
                if link.conductivity is not None:
                    k = np.asarray(link.conductivity(grid), dtype=float)
                    F = np.concatenate([[0.0], np.cumsum(0.5 * (k[1:] + k[:-1]) * np.diff(grid))])
                else:
                    # F(T) = integral of k from the grid's foot to T; F(foot) = 0
                    integral = link.conductivity_integral
                    try:
                        rest = np.asarray(integral(grid[0], grid[1:]), dtype=float)
                        if rest.shape != grid[1:].shape:
                            raise ValueError("not vectorised")
                    except (TypeError, ValueError):
                        rest = np.array([float(integral(grid[0], t)) for t in grid[1:]])
                    F = np.concatenate([[0.0], rest])
                self._links.append((a, b, geometry, F))

    @staticmethod
    def _capacity(capacity, n, probe):
        if isinstance(capacity, CapacityMap):
            if n != 2:
                raise InputError(
                    "a two-stage capacity map needs exactly two stages",
                    expected="2 stages",
                    found=f"{n}",
                )
            return capacity.stage_capacities
        if isinstance(capacity, CapacityCurve):
            capacity = [capacity]
        if callable(capacity):
            return _column_safe(capacity, n, probe, "cooler capacity")
        if isinstance(capacity, Sequence) and not isinstance(capacity, str):
            if len(capacity) != n:
                raise InputError(
                    "the cooler needs one capacity curve per stage (None for a stage it "
                    "does not cool)",
                    expected=f"{n} entries",
                    found=f"{len(capacity)}",
                )
            rows = []
            for c in capacity:
                if c is None:
                    rows.append(None)
                elif isinstance(c, CapacityCurve):
                    rows.append(c._fast)
                elif callable(c):
                    rows.append(lambda t, c=c: np.asarray(c(t), dtype=float) * np.ones_like(t))
                else:
                    raise InputError(
                        "a stage's capacity must be a CapacityCurve, a function of its "
                        "temperature, or None",
                        expected="a CapacityCurve",
                        found=checks.short(c),
                    )

            def per_stage(T: np.ndarray) -> np.ndarray:
                out = np.zeros_like(T)
                for i, f in enumerate(rows):
                    if f is not None:
                        out[i] = f(T[i])
                return out

            return per_stage
        raise InputError(
            "the cooler capacity must be a CapacityMap, a list of CapacityCurve, or a function",
            expected="a CapacityMap or a list of CapacityCurve",
            found=checks.short(capacity),
        )

    @staticmethod
    def _loads(load, n, probe):
        if load is None:
            return lambda T: np.zeros_like(T)
        if callable(load):
            return _column_safe(load, n, probe, "load")
        q = np.asarray(load, dtype=float)
        if q.shape != (n,) or not np.all(np.isfinite(q)):
            raise InputError(
                "constant loads must give one value per stage",
                expected=f"{n} loads in W",
                found=checks.short(load),
            )
        col = q[:, None]
        return lambda T: np.broadcast_to(col if T.ndim == 2 else q, T.shape).copy()

    def capacity(self, T: np.ndarray) -> np.ndarray:
        return self._cap(T)

    def load(self, T: np.ndarray) -> np.ndarray:
        return self._load(T)

    def link_heat(self, T: np.ndarray) -> np.ndarray:
        """Net heat into each stage through the links, [W]."""
        out = np.zeros_like(T)
        for a, b, g, F in self._links:
            if F is None:
                q = g * (T[b] - T[a])
            else:
                q = g * (np.interp(T[b], self.grid, F) - np.interp(T[a], self.grid, F))
            out[a] += q
            out[b] -= q
        return out

    def net_cooling(self, T: np.ndarray) -> np.ndarray:
        """Capacity minus load minus heat arriving through links, [W], per stage."""
        return self.capacity(T) - self.load(T) - self.link_heat(T)


def _check_gets_cold(net, names, targets, highs, probe_others, points=400):
    """Refuse a stage whose capacity is below its load at every temperature up to ambient.

    Stage ``i`` is scanned from its target to ``highs[i]`` with the other stages at
    ``probe_others`` (their targets): the most favourable case a plan can hope for.
    """
    n = len(names)
    for i in range(n):
        lo = targets[i]
        hi = max(highs[i], lo * 1.0001)
        scan = np.geomspace(lo, hi, points)
        T = np.repeat(probe_others[:, None], points, axis=1)
        T[i] = scan
        margin = net.net_cooling(T)[i]
        if np.all(margin < 0.0):
            k = int(np.argmax(margin))
            short = float(-margin[k])
            raise CoolingShortfallError(
                f"stage {names[i]!r} never gets cold: its cooler capacity is below its load "
                f"at every temperature from {lo:g} K to {hi:g} K; it falls short by at "
                f"least {short:.3g} W (the least shortfall, at {scan[k]:.3g} K)",
                stage=names[i],
                shortfall=short,
                temperature=float(scan[k]),
                expected="a cooler capacity above the stage's load at some temperature",
                found=f"a shortfall of {short:.3g} W or more",
            )


# --------------------------------------------------------------------------------------
