"""The argument checks shared by every physics module: one place, one wording.

Each check takes the value first and the argument's name second, accepts a float or an
array (checked element by element), and returns it as a float ndarray (0-d for a scalar), so
the caller computes with the result directly. A bad value raises
:class:`~cryoplan.physics.errors.InputError` (or
:class:`~cryoplan.physics.errors.TemperatureError` for a temperature) whose message names
the argument; ``expected`` says what would do and ``found`` the first bad element, in the
unit given. ``key`` is set only where the caller passes one (the heat-load functions name
their argument, which the evaluation reports as the key of the plan).

A plain Python float takes a short path without array reductions: the cooldown integrators
check arguments tens of thousands of times.

Examples
--------
>>> float(positive(2.5, "length", "m"))
2.5
>>> nonnegative([1.0, -2.0], "area", "m^2")
Traceback (most recent call last):
    ...
cryoplan.physics.errors.InputError: area must not be negative (expected 0 m^2 or more; found -2 m^2)
"""

from __future__ import annotations

import math

import numpy as np

from .errors import InputError, TemperatureError

__all__ = [
    "as_array",
    "first_bad",
    "temperature",
    "nonnegative",
    "positive",
    "fraction",
    "scalar",
    "is_number",
    "short",
]


def as_array(value, name: str) -> np.ndarray:
    """``value`` as a float ndarray; :class:`InputError` "<name> is not a number" otherwise.

    >>> as_array("lots", "volume")
    Traceback (most recent call last):
        ...
    cryoplan.physics.errors.InputError: volume is not a number (expected a number; found 'lots')
    """
    try:
        return np.asarray(value, dtype=float)
    except (TypeError, ValueError):
        raise InputError(
            f"{name} is not a number", expected="a number", found=repr(value)
        ) from None


def first_bad(arr: np.ndarray, bad: np.ndarray) -> float:
    """The first element of ``arr`` where ``bad`` holds, as a float (for the message)."""
    return float(arr[bad].flat[0]) if arr.ndim else float(arr)


def _with_unit(number: float, unit: str) -> str:
    return f"{number:g} {unit}" if unit else f"{number:g}"


def temperature(value, name: str) -> np.ndarray:
    """A thermodynamic temperature: finite and above 0 K, [K].

    >>> temperature(-1.0, "T_cold")
    Traceback (most recent call last):
        ...
    cryoplan.physics.errors.TemperatureError: T_cold must be above 0 K, found -1 K
    """
    if type(value) is float and 0.0 < value < math.inf:
        return np.asarray(value)
    arr = as_array(value, name)
    if not np.all(np.isfinite(arr)):
        raise TemperatureError(f"{name} must be a finite temperature in K, found {value!r}")
    if np.any(arr <= 0.0):
        raise TemperatureError(f"{name} must be above 0 K, found {float(np.min(arr)):g} K")
    return arr


def _bounded(value, name, unit, key, *, zero: bool, inf: bool) -> np.ndarray:
    if (
        type(value) is float
        and (value > 0.0 or (zero and value == 0.0))
        and (inf or value != math.inf)
    ):
        return np.asarray(value)
    arr = as_array(value, name)
    ok = arr >= 0.0 if zero else arr > 0.0
    if not inf:
        ok &= np.isfinite(arr)
    bad = ~ok
    if np.any(bad):
        found = first_bad(arr, bad)
        if zero:
            message, expected = f"{name} must not be negative", f"0 {unit} or more"
        else:
            message, expected = f"{name} must be above zero", f"more than 0 {unit}"
        if math.isnan(found) or (found == math.inf and not inf):
            message = f"{name} must be finite"
        raise InputError(
            message, key=key, expected=" ".join(expected.split()), found=_with_unit(found, unit)
        )
    return arr


def nonnegative(value, name: str, unit: str = "", *, key: str | None = None, inf: bool = False):
    """A quantity that may be zero but not negative (nor NaN; nor infinite unless ``inf``).

    >>> nonnegative(-1.0, "ventilation", "m^3/s")
    Traceback (most recent call last):
        ...
    cryoplan.physics.errors.InputError: ventilation must not be negative (expected 0 m^3/s or more; found -1 m^3/s)
    """
    return _bounded(value, name, unit, key, zero=True, inf=inf)


def positive(value, name: str, unit: str = "", *, key: str | None = None, inf: bool = False):
    """A quantity above zero (not NaN; not infinite unless ``inf``).

    >>> positive(0.0, "length", "m", key="length")
    Traceback (most recent call last):
        ...
    cryoplan.physics.errors.InputError: key 'length': length must be above zero (expected more than 0 m; found 0 m)
    """
    return _bounded(value, name, unit, key, zero=False, inf=inf)


def fraction(value, name: str, *, key: str | None = None, zero: bool = False) -> np.ndarray:
    """A fraction in (0, 1], or in [0, 1] with ``zero=True``.

    >>> fraction(1.5, "emissivity")
    Traceback (most recent call last):
        ...
    cryoplan.physics.errors.InputError: emissivity must lie in (0, 1] (expected 0 < value <= 1; found 1.5)
    """
    if type(value) is float and (0.0 < value <= 1.0 or (zero and value == 0.0)):
        return np.asarray(value)
    arr = as_array(value, name)
    low = arr >= 0.0 if zero else arr > 0.0
    bad = ~(low & (arr <= 1.0))
    if np.any(bad):
        interval, expected = (
            ("[0, 1]", "0 <= value <= 1") if zero else ("(0, 1]", "0 < value <= 1")
        )
        raise InputError(
            f"{name} must lie in {interval}",
            key=key,
            expected=expected,
            found=_with_unit(first_bad(arr, bad), ""),
        )
    return arr


def scalar(value):
    """A 0-d result back to a Python float; arrays stay arrays.

    >>> scalar(np.asarray(2.0)), scalar(np.array([1.0, 2.0]))
    (2.0, array([1., 2.]))
    """
    arr = np.asarray(value)
    return float(arr) if arr.ndim == 0 else arr


def is_number(x) -> bool:
    """A real number given as such: int or float (numpy's too), not a bool, not a string.

    >>> is_number(4.2), is_number(True), is_number("4.2")
    (True, False, False)
    """
    return isinstance(x, (int, float, np.integer, np.floating)) and not isinstance(
        x, (bool, np.bool_)
    )


def short(obj, limit: int = 60) -> str:
    """``repr(obj)`` cut to ``limit`` characters, for the ``found`` part of a message.

    >>> short(list(range(30)), 20)
    '[0, 1, 2, 3, 4, 5...'
    """
    text = repr(obj)
    return text if len(text) <= limit else text[: limit - 3] + "..."
