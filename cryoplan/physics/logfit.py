"""Fits to a cryostat's own record: boil-off rate, static heat load, transfer loss, forecast.

Pure functions, SI floats and numpy arrays in and out (seconds, cubic metres, watts, kelvin);
no files, no units, no printing. The log reader (:mod:`cryoplan.plan.log_reader`) turns a
log file into these arrays; the evaluation step compares the fitted figures with the plan.

The chain for a bath: a level meter's reading (a share of its sensor's active length) ->
height -> litres (:func:`level_to_volume`) -> fills found as rises larger than the noise
(:func:`find_fills`) -> a robust straight line per interval between fills
(:func:`fit_level_interval`) -> the intervals combined (:func:`combine_rates`), all in one
call of :func:`fit_boiloff` -> the static heat load (:func:`heat_load_from_level_rate`) ->
the transfer loss of each fill (:func:`fill_transfer_losses`) -> the forecast of the next
fill (:func:`forecast_level`). :func:`fit_curve` fits the parameters of any forward model
``model(params, t) -> T(t)`` (the project's cooldown model) to a measured curve.
"""

from __future__ import annotations

from collections.abc import Callable, Sequence
from dataclasses import dataclass, field

import numpy as np
from scipy import optimize, stats

from .errors import InputError

__all__ = [
    "BoiloffFit",
    "CurveFit",
    "FillEvent",
    "Forecast",
    "IntervalFit",
    "TransferLossFit",
    "combine_rates",
    "fill_transfer_losses",
    "find_fills",
    "find_rail_runs",
    "fit_boiloff",
    "fit_curve",
    "fit_level_interval",
    "forecast_level",
    "heat_load_from_level_rate",
    "heat_load_from_vent_flow",
    "level_to_volume",
    "noise_from_differences",
    "pair_deliveries",
]

#: Normal-distribution factor of a central interval holding ~90 % of the probability
#: (scipy.stats.norm.ppf(0.95) = 1.6449).
Z_90 = float(stats.norm.ppf(0.95))

#: The scaled median absolute deviation that estimates a normal standard deviation
#: (1 / Phi^-1(3/4) = 1.4826; Rousseeuw & Croux 1993).
MAD_TO_SIGMA = float(1.0 / stats.norm.ppf(0.75))


def _array(name: str, value) -> np.ndarray:
    a = np.asarray(value, dtype=float)
    if a.ndim != 1:
        raise InputError(f"{name} must be a one-dimensional array", found=f"shape {a.shape}")
    return a


def _pair(time, volume) -> tuple[np.ndarray, np.ndarray]:
    t, v = _array("time", time), _array("volume", volume)
    if t.shape != v.shape:
        raise InputError(
            "time and volume differ in length", expected=str(t.size), found=str(v.size)
        )
    if not (np.all(np.isfinite(t)) and np.all(np.isfinite(v))):
        raise InputError("time and volume must be finite (drop the invalid readings first)")
    if t.size > 1 and np.any(np.diff(t) <= 0):
        raise InputError("time must be strictly increasing")
    return t, v


# --- the level meter ---------------------------------------------------------------------


def level_to_volume(
    fraction,
    sensor_length: float,
    volume_per_length: float | None = None,
    calibration: tuple[Sequence[float], Sequence[float]] | None = None,
    volume_below: float = 0.0,
):
    """Liquid volume from a level meter's reading, a share of its sensor's active length.

    .. math::

        h = f\\,\\ell_s, \\qquad V = V_0 + A\\,h
        \\quad\\text{or}\\quad V = V_0 + \\mathrm{interp}(h;\\ h_i, V_i)

    A level meter (a superconducting wire for helium, a capacitance rod for nitrogen)
    measures the wetted share of its own active length, not a share of the dewar's volume;
    the litres follow from the height through the dewar's litres per centimetre (its
    cross-section) or, for a dewar whose section varies (a neck, a tail, a belly), its
    calibration table.

    Parameters
    ----------
    fraction : float or ndarray
        The reading as a fraction of the sensor's active length, [-] (45 % is 0.45).
    sensor_length : float
        The sensor's active length, [m].
    volume_per_length : float, optional
        Litres per unit height of the dewar (its cross-section), [m^3/m = m^2].
    calibration : (heights, volumes), optional
        The dewar's table: heights above the sensor's bottom [m], increasing, and the
        liquid volumes above the sensor's bottom at those heights [m^3], non-decreasing.
        Linear interpolation between points, held flat beyond the ends (numpy.interp).
    volume_below : float, optional
        Liquid below the sensor's bottom end, which the meter cannot see, [m^3].

    Returns
    -------
    float or ndarray
        The liquid volume, [m^3].

    Notes
    -----
    Exactly one of ``volume_per_length`` and ``calibration`` must be given. A reading above
    1 or below 0 is passed through with the cross-section (a meter's overrange); with a
    table it is held at the table's ends.

    References
    ----------
    .. [1] From memory: the operating principle of superconducting helium level sensors
       (the normal-conducting length above the liquid sets the voltage), as in the
       manuals of the usual level-meter makers.

    Examples
    --------
    A 50 cm sensor in a dewar of 2 L/cm reading 45 %:

    >>> round(level_to_volume(0.45, 0.5, volume_per_length=2e-3 / 1e-2) * 1e3, 6)
    45.0
    """
    height = np.asarray(fraction, dtype=float) * float(sensor_length)
    out = _height_to_volume(height, volume_per_length, calibration) + float(volume_below)
    return float(out) if np.ndim(out) == 0 else out


def _height_to_volume(height, volume_per_length, calibration):
    if (volume_per_length is None) == (calibration is None):
        raise InputError(
            "give either the litres per length or a calibration table",
            expected="exactly one of volume_per_length and calibration",
        )
    if volume_per_length is not None:
        if not float(volume_per_length) > 0:
            raise InputError("litres per length must be positive", found=str(volume_per_length))
        return height * float(volume_per_length)
    h, v = (np.asarray(c, dtype=float) for c in calibration)
    if h.ndim != 1 or h.shape != v.shape or h.size < 2:
        raise InputError("a calibration table needs two or more [height, volume] pairs")
    if np.any(np.diff(h) <= 0) or np.any(np.diff(v) < 0):
        raise InputError(
            "a calibration table must rise in height and not fall in volume",
            found=f"heights {h.tolist()}, volumes {v.tolist()}",
        )
    return np.interp(height, h, v)


def find_rail_runs(values, rails=(0.0,), threshold: float = 5.0) -> np.ndarray:
    """Readings of a disconnected meter: runs of an exact rail value between jumps.

    A meter whose sensor is unplugged, or whose cable breaks, reads exactly its bottom
    (0) or top (100 %) until it is reconnected. A run of readings exactly equal to one of
    ``rails`` is flagged when it is bordered on each side it has (the ends of the record
    count as borders) by a jump larger than ``threshold``; a record that is all rail, and a
    run reached smoothly (a bath boiled dry, a meter saturated at the top after a fill),
    are not flagged.

    Parameters
    ----------
    values : ndarray
        The readings in time order, only valid ones, in the meter's own unit.
    rails : tuple of float, optional
        The values a disconnected meter reads (0; and 100 for a percentage).
    threshold : float, optional
        The smallest jump into and out of the run, in the readings' unit.

    Returns
    -------
    ndarray of int
        Indices of the flagged readings, increasing.

    Notes
    -----
    Common practice for cleaning level records; the threshold should sit well above the
    reading noise and below a fill's rise.

    Examples
    --------
    >>> find_rail_runs(np.array([50.0, 49.9, 0.0, 0.0, 49.7, 49.6]), (0.0, 100.0), 5.0)
    array([2, 3])
    """
    v = np.asarray(values, dtype=float)
    rail = np.isin(v, np.asarray(rails, dtype=float))
    if v.size < 2 or not rail.any() or rail.all():
        return np.zeros(0, dtype=int)
    change = np.flatnonzero(np.diff(v) != 0) + 1  # runs of one value
    starts = np.concatenate(([0], change))
    stops = np.concatenate((change, [v.size]))
    keep = rail[starts]
    flagged = []
    for a, b in zip(starts[keep], stops[keep]):
        before = a == 0 or abs(v[a - 1] - v[a]) > threshold
        after = b == v.size or abs(v[b] - v[a]) > threshold
        if before and after:
            flagged.append(np.arange(a, b))
    return np.concatenate(flagged) if flagged else np.zeros(0, dtype=int)


# --- fills and intervals ---------------------------------------------------------------


@dataclass(frozen=True)
class FillEvent:
    """A fill: a rise of the level larger than the noise.

    ``before`` is the index of the last reading before the rise, ``after`` the first
    reading once it has stopped rising; ``rise`` [m^3] is the median of a few readings
    after minus the median of a few before (the raw step; :func:`fit_boiloff` refines it
    with the fitted lines on either side into :attr:`BoiloffFit.rises`).
    """

    before: int
    after: int
    time_before: float
    time_after: float
    rise: float


@dataclass(frozen=True)
class IntervalFit:
    """A robust straight line V(t) = intercept + rate (t - time[start]) over one interval.

    ``start``/``stop`` index the arrays given (``stop`` exclusive); ``rate`` [m^3/s] is
    negative when the bath boils off; ``rate_sigma`` its standard uncertainty;
    ``outliers`` the indices (into the arrays given) left out of the final fit;
    ``residual_sd`` [m^3] the scatter of the kept readings about the line.
    """

    start: int
    stop: int
    rate: float
    rate_sigma: float
    intercept: float
    time_start: float
    outliers: np.ndarray
    residual_sd: float
    n: int

    def volume_at(self, t):
        """The fitted volume at time ``t`` [s] -> [m^3]."""
        return self.intercept + self.rate * (np.asarray(t, dtype=float) - self.time_start)


@dataclass(frozen=True)
class BoiloffFit:
    """The intervals between fills, each fitted, and their combined rate.

    ``rate`` [m^3/s] (negative when boiling off) is the weighted mean of the intervals'
    rates and ``rate_sigma`` its standard uncertainty, scaled up by ``birge_ratio`` where
    the intervals scatter more than their own uncertainties allow. ``rises`` [m^3] holds,
    for each fill, the level after minus the level before, from the fitted lines of the
    intervals on either side (NaN where a side has no fitted interval).
    """

    intervals: list[IntervalFit]
    fills: list[FillEvent]
    rate: float
    rate_sigma: float
    birge_ratio: float
    noise: float
    rises: np.ndarray = field(default_factory=lambda: np.zeros(0))

    @property
    def boiloff_per_day(self) -> float:
        """The boil-off as a positive volume per day, [m^3/day]."""
        return -self.rate * 86400.0

    def volume_at(self, t: float) -> float:
        """The last interval's fitted volume at ``t`` [s] -> [m^3] (for a forecast)."""
        return float(self.intervals[-1].volume_at(t))


def noise_from_differences(volume) -> float:
    """Robust standard deviation of a reading's noise from successive differences.

    .. math::

        \\sigma = \\frac{1.4826\\,\\mathrm{median}|\\Delta V - \\mathrm{median}\\,\\Delta V|}
        {\\sqrt 2}

    Parameters
    ----------
    volume : ndarray
        The readings in time order, [m^3] (or any unit: the result is in the same one).

    Returns
    -------
    float
        The noise's standard deviation, same unit as ``volume``.

    Notes
    -----
    The difference of two readings carries the noise of both (hence sqrt 2); the median
    absolute deviation ignores the few large steps of fills and faults. A slow trend cancels
    in the median. Valid for white noise; correlated noise reads lower.

    References
    ----------
    .. [1] P. J. Rousseeuw and C. Croux, "Alternatives to the median absolute deviation",
       J. Am. Stat. Assoc. 88 (1993) 1273-1283 (the 1.4826 factor).

    Examples
    --------
    >>> rng = np.random.default_rng(1)
    >>> round(noise_from_differences(rng.normal(0, 0.3, 20000)), 1)
    0.3
    """
    d = np.diff(np.asarray(volume, dtype=float))
    if d.size == 0:
        return 0.0
    return float(MAD_TO_SIGMA * np.median(np.abs(d - np.median(d))) / np.sqrt(2.0))


def find_fills(
    time, volume, noise: float | None = None, rise_sigmas: float = 5.0, window: int = 5
) -> list[FillEvent]:
    """Find the fills in a level record: runs of rising steps that add more than the noise.

    A step is rising when it exceeds ``rise_sigmas`` times the noise of one difference
    (sqrt 2 times the reading noise); consecutive rising steps form one fill; a fill is kept
    when the median of ``window`` readings after it exceeds the median of ``window`` before
    it by more than ``2 rise_sigmas`` noise (a single spike up and back is not a fill).

    Parameters
    ----------
    time : ndarray
        Times, [s], strictly increasing.
    volume : ndarray
        Liquid volumes, [m^3].
    noise : float, optional
        The reading noise's standard deviation, [m^3]; estimated with
        :func:`noise_from_differences` when not given.
    rise_sigmas : float, optional
        The threshold in standard deviations, [-] (5: one false step in ~3.5 million
        readings of normal noise).
    window : int, optional
        Readings on each side used to measure the rise.

    Returns
    -------
    list of FillEvent
        In time order.

    Notes
    -----
    Assumes the readings come often enough that the boil-off between two readings is
    smaller than the threshold; a meter that is only read once a day needs the fills
    given from the log's fill column instead.

    Examples
    --------
    >>> t = np.arange(10.0)
    >>> v = np.array([5, 4.9, 4.8, 4.7, 9.0, 9.9, 9.8, 9.7, 9.6, 9.5]) * 1e-3
    >>> [(f.before, f.after) for f in find_fills(t, v, noise=1e-5)]
    [(3, 5)]
    """
    t, v = _pair(time, volume)
    if t.size < 3:
        return []
    sigma = noise_from_differences(v) if noise is None else float(noise)
    step_sigma = max(sigma * np.sqrt(2.0), np.finfo(float).tiny)
    rising = np.diff(v) > rise_sigmas * step_sigma
    if not rising.any():
        return []
    edges = np.diff(np.concatenate(([0], rising.astype(np.int8), [0])))
    starts, stops = np.flatnonzero(edges == 1), np.flatnonzero(edges == -1)
    events = []
    for s, e in zip(starts, stops):  # steps s..e-1 rise: readings s .. e
        before, after = int(s), int(e)
        lo = np.median(v[max(0, before - window + 1) : before + 1])
        hi = np.median(v[after : after + window])
        if hi - lo > 2.0 * rise_sigmas * sigma:
            events.append(FillEvent(before, after, float(t[before]), float(t[after]), hi - lo))
    return events


def fit_level_interval(
    time, volume, noise: float | None = None, method: str = "huber", outlier_sigmas: float = 4.0
) -> IntervalFit:
    """Robust straight-line fit of volume against time over one interval between fills.

    .. math::

        V(t) = V_0 + r\\,(t - t_0), \\qquad
        \\sigma_r = \\frac{s}{\\sqrt{\\sum (t_i - \\bar t)^2}}

    ``method="huber"``: a least-squares fit with the soft-L1 loss (scipy.optimize.
    least_squares, loss="soft_l1", which behaves as the Huber loss: quadratic inside the
    noise, linear outside) finds the line without being pulled by outliers; readings more
    than ``outlier_sigmas`` robust standard deviations from it are named as outliers, and an
    ordinary least-squares line through the rest gives the rate and its standard error.
    ``method="theil-sen"``: the median of pairwise slopes (scipy.stats.theilslopes), with
    the standard uncertainty from its 68.27 % confidence interval (slow above ~5000
    readings: it forms every pair).

    Parameters
    ----------
    time : ndarray
        Times, [s], strictly increasing.
    volume : ndarray
        Liquid volumes, [m^3].
    noise : float, optional
        The reading noise, [m^3], the soft-L1 loss's scale; estimated when not given.
    method : {"huber", "theil-sen"}
        The robust estimator.
    outlier_sigmas : float, optional
        The distance from the line, in robust standard deviations, beyond which a reading
        is an outlier, [-].

    Returns
    -------
    IntervalFit
        With ``start = 0`` and ``stop = len(time)``.

    Notes
    -----
    The standard error assumes independent noise about a straight line; a level that
    wanders (a meter's drift, pressure changes in the room) makes the true uncertainty
    larger, which the spread between intervals shows (:func:`combine_rates`).

    References
    ----------
    .. [1] P. J. Huber, "Robust estimation of a location parameter", Ann. Math. Statist.
       35 (1964) 73-101.
    .. [2] P. K. Sen, "Estimates of the regression coefficient based on Kendall's tau",
       J. Am. Stat. Assoc. 63 (1968) 1379-1389.

    Examples
    --------
    >>> t = np.linspace(0, 86400, 145)
    >>> v = 0.09 - 1e-7 * t + np.where(np.arange(145) == 70, 0.01, 0.0)
    >>> fit = fit_level_interval(t, v, noise=1e-5)
    >>> round(fit.rate / 1e-7, 6), fit.outliers.tolist()
    (-1.0, [70])
    """
    t, v = _pair(time, volume)
    if t.size < 3:
        raise InputError("an interval needs three or more readings", found=str(t.size))
    t0 = float(t[0])
    x = t - t0
    sigma = noise_from_differences(v) if noise is None else float(noise)
    if method == "theil-sen":
        slope, intercept, lo, hi = stats.theilslopes(v, x, alpha=0.6827)
        resid = v - (intercept + slope * x)
        rsd = MAD_TO_SIGMA * np.median(np.abs(resid))
        out = np.abs(resid) > outlier_sigmas * rsd if rsd > 0 else np.zeros(t.size, bool)
        keep = ~out
        return IntervalFit(
            0,
            t.size,
            float(slope),
            float(0.5 * (hi - lo)),
            float(intercept),
            t0,
            np.flatnonzero(out),
            float(np.std(resid[keep], ddof=2)) if keep.sum() > 2 else 0.0,
            int(keep.sum()),
        )
    if method != "huber":
        raise InputError("unknown fit method", expected="'huber' or 'theil-sen'", found=method)
    scale = max(sigma, 1e-12 * max(np.ptp(v), np.abs(v).max(), 1e-30))
    start = np.polyfit(x, v, 1)
    sol = optimize.least_squares(
        lambda p: p[0] + p[1] * x - v,
        x0=[start[1], start[0]],
        loss="soft_l1",
        f_scale=scale,
        x_scale=[max(np.abs(v).max(), 1e-30), max(np.abs(start[0]), 1e-30)],
    )
    resid = v - (sol.x[0] + sol.x[1] * x)
    rsd = MAD_TO_SIGMA * np.median(np.abs(resid - np.median(resid)))
    limit = outlier_sigmas * max(rsd, sigma if noise is not None else 0.0)
    out = np.abs(resid) > limit if limit > 0 else np.zeros(t.size, bool)
    keep = ~out
    xk, vk = x[keep], v[keep]
    n = xk.size
    if n < 3:
        raise InputError("too few readings left after the outliers", found=str(n))
    xm = xk.mean()
    sxx = float(np.sum((xk - xm) ** 2))
    slope = float(np.sum((xk - xm) * (vk - vk.mean())) / sxx)
    intercept = float(vk.mean() - slope * xm)
    s = float(np.sqrt(np.sum((vk - intercept - slope * xk) ** 2) / (n - 2)))
    return IntervalFit(
        0, t.size, slope, s / np.sqrt(sxx), intercept, t0, np.flatnonzero(out), s, n
    )


def combine_rates(rates, sigmas) -> tuple[float, float, float]:
    """Weighted mean of several rates, with the uncertainty scaled by the Birge ratio.

    .. math::

        \\bar r = \\frac{\\sum r_i/\\sigma_i^2}{\\sum 1/\\sigma_i^2}, \\quad
        \\sigma_{\\bar r} = \\frac{\\max(1, R_B)}{\\sqrt{\\sum 1/\\sigma_i^2}}, \\quad
        R_B = \\sqrt{\\frac{1}{n-1}\\sum \\frac{(r_i - \\bar r)^2}{\\sigma_i^2}}

    Parameters
    ----------
    rates : array_like
        The rates, any unit.
    sigmas : array_like
        Their standard uncertainties, same unit, positive.

    Returns
    -------
    (float, float, float)
        The weighted mean, its standard uncertainty, and the Birge ratio R_B (1 for a
        single rate).

    Notes
    -----
    Scaling by R_B where it exceeds 1 is the averaging practice of the Particle Data Group
    (from memory: the "scale factor" of its Review of Particle Physics, introduction): when
    the rates disagree more than their uncertainties allow, the mean's uncertainty grows
    accordingly rather than claiming a precision the data do not support.

    References
    ----------
    .. [1] R. T. Birge, "The calculation of errors by the method of least squares",
       Phys. Rev. 40 (1932) 207-227.

    Examples
    --------
    >>> m, s, rb = combine_rates([1.0, 3.0], [1.0, 1.0])
    >>> m, round(s, 4), round(rb, 4)
    (2.0, 1.0, 1.4142)
    """
    r, s = np.asarray(rates, dtype=float), np.asarray(sigmas, dtype=float)
    if r.size == 0 or r.shape != s.shape:
        raise InputError("rates and sigmas must be non-empty and of the same length")
    if np.any(~(s > 0)):
        raise InputError("every uncertainty must be positive", found=str(s.tolist()))
    w = 1.0 / s**2
    mean = float(np.sum(w * r) / np.sum(w))
    sigma = float(1.0 / np.sqrt(np.sum(w)))
    birge = float(np.sqrt(np.sum(w * (r - mean) ** 2) / (r.size - 1))) if r.size > 1 else 1.0
    return mean, sigma * max(1.0, birge), birge


def fit_boiloff(
    time,
    volume,
    *,
    fills: Sequence[FillEvent] | None = None,
    noise: float | None = None,
    method: str = "huber",
    rise_sigmas: float = 5.0,
    settle_time: float = 0.0,
    min_points: int = 10,
) -> BoiloffFit:
    """Boil-off rate of a bath from its level record: robust lines between fills, combined.

    Splits the record at its fills (:func:`find_fills`, or the ``fills`` given), fits each
    interval with :func:`fit_level_interval` and combines the rates with
    :func:`combine_rates`.

    Parameters
    ----------
    time : ndarray
        Times, [s], strictly increasing; only valid readings.
    volume : ndarray
        Liquid volumes, [m^3].
    fills : list of FillEvent, optional
        Fills already known; found from the rises when not given.
    noise : float, optional
        The reading noise, [m^3]; estimated when not given.
    method : {"huber", "theil-sen"}
        The per-interval estimator.
    rise_sigmas : float, optional
        The fill threshold, [-].
    settle_time : float, optional
        Readings this long after a fill are left out while the bath settles, [s].
    min_points : int, optional
        Intervals with fewer readings are not fitted.

    Returns
    -------
    BoiloffFit

    Raises
    ------
    InputError
        When no interval has ``min_points`` readings (no usable interval).

    Examples
    --------
    >>> t = np.arange(0.0, 20 * 86400, 600)
    >>> v = np.where(t < 10 * 86400, 0.09, 0.18) - 1e-7 * (t % (10 * 86400))
    >>> fit = fit_boiloff(t, v, noise=1e-6)
    >>> len(fit.fills), len(fit.intervals), round(fit.boiloff_per_day * 1e3, 3)
    (1, 2, 8.64)
    """
    t, v = _pair(time, volume)
    sigma = noise_from_differences(v) if noise is None else float(noise)
    events = list(fills) if fills is not None else find_fills(t, v, sigma, rise_sigmas)
    bounds = [0] + [e for f in events for e in (f.before + 1, f.after)] + [t.size]
    intervals, owner = [], []
    for k in range(0, len(bounds), 2):
        a, b = bounds[k], bounds[k + 1]
        if k > 0 and settle_time > 0:
            a = int(np.searchsorted(t, t[a] + settle_time))
        if b - a >= max(min_points, 3):
            f = fit_level_interval(t[a:b], v[a:b], sigma, method)
            intervals.append(
                IntervalFit(
                    a,
                    b,
                    f.rate,
                    f.rate_sigma,
                    f.intercept,
                    f.time_start,
                    f.outliers + a,
                    f.residual_sd,
                    f.n,
                )
            )
            owner.append(k // 2)
    if not intervals:
        raise InputError(
            "no usable interval between fills",
            expected=f"an interval with {max(min_points, 3)} or more readings",
            found=f"{t.size} readings, {len(events)} fills",
        )
    floor = np.finfo(float).tiny
    mean, msig, birge = combine_rates(
        [f.rate for f in intervals], [max(f.rate_sigma, floor) for f in intervals]
    )
    by_owner = dict(zip(owner, intervals))
    rises = np.full(len(events), np.nan)
    for i, ev in enumerate(events):
        lo, hi = by_owner.get(i), by_owner.get(i + 1)
        if lo is not None and hi is not None:
            rises[i] = float(hi.volume_at(ev.time_after) - lo.volume_at(ev.time_before))
    return BoiloffFit(intervals, events, mean, msig, birge, sigma, rises)


# --- heat loads --------------------------------------------------------------------------


def heat_load_from_level_rate(rate, latent_heat, liquid_density):
    """Static heat load on a vented bath from the rate its liquid volume falls.

    .. math::

        \\dot Q = L\\,\\rho_l\\,\\left|\\frac{dV_l}{dt}\\right|

    Exact for a bath vented at constant pressure, with no :math:`(\\rho_l - \\rho_v)`
    correction. Take the inner vessel (liquid and vapour, total volume :math:`V` fixed) as
    an open system whose only outflow is saturated vapour at the vent, enthalpy
    :math:`h_v`. Mass: :math:`\\dot m_{out} = -dM/dt = -(\\rho_l - \\rho_v)\\,dV_l/dt`.
    Energy (no work on a rigid vessel): :math:`dU/dt = \\dot Q - \\dot m_{out} h_v`, with
    :math:`U = \\rho_l u_l V_l + \\rho_v u_v (V - V_l)`. At constant pressure every
    intensive property is constant, so
    :math:`dU/dt = (\\rho_l u_l - \\rho_v u_v)\\,dV_l/dt = (\\rho_l h_l - \\rho_v h_v)\\,
    dV_l/dt` (using :math:`\\rho u = \\rho h - p`, the two :math:`p` cancel). Then
    :math:`\\dot Q = [\\rho_l h_l - \\rho_v h_v - (\\rho_l - \\rho_v) h_v]\\,dV_l/dt =
    -\\rho_l (h_v - h_l)\\,dV_l/dt = -\\rho_l L\\,dV_l/dt`. In words: the heat evaporates
    all the liquid that disappears, :math:`\\rho_l |dV_l|`; part of that vapour stays to
    fill the space the liquid freed and the rest leaves through the vent, but both parts
    took their latent heat. The :math:`(\\rho_l - \\rho_v)` factor belongs to the vent's
    mass flow (:func:`heat_load_from_vent_flow`), not to the level.

    Parameters
    ----------
    rate : float or ndarray
        dV_l/dt, the liquid volume's rate of change, [m^3/s] (its sign is ignored; a
        standard uncertainty of the rate gives the heat load's, the relation being linear).
    latent_heat : float
        Latent heat of vaporisation at the bath's pressure, [J/kg].
    liquid_density : float
        Saturated liquid density at the bath's pressure, [kg/m^3].

    Returns
    -------
    float or ndarray
        The heat reaching the liquid, [W].

    Notes
    -----
    Holds while the bath's pressure is steady (a vented bath at room pressure); a rise of
    pressure stores heat in the liquid instead (superheating, a closed or throttled vent).
    Heat that reaches the vapour space and warms the leaving gas is not seen by the level.

    References
    ----------
    .. [1] R. F. Barron, Cryogenic Systems, 2nd ed., Oxford University Press (1985): the
       first-law balance of an open storage vessel (from memory, as the derivation above).

    Examples
    --------
    Helium at 1 atm (L = 20.56 kJ/kg, rho_l = 124.7 kg/m^3, CoolProp values rounded):
    1 L/h of boil-off is about 0.71 W.

    >>> round(heat_load_from_level_rate(-1e-3 / 3600, 20.56e3, 124.7), 3)
    0.712
    """
    out = np.abs(np.asarray(rate, dtype=float)) * float(latent_heat) * float(liquid_density)
    return float(out) if np.ndim(out) == 0 else out


def heat_load_from_vent_flow(mass_flow, latent_heat, liquid_density, vapor_density):
    """Static heat load on a vented bath from the measured mass flow of gas at its vent.

    .. math::

        \\dot Q = \\frac{\\dot m\\,L}{1 - \\rho_v/\\rho_l}

    From the balance of :func:`heat_load_from_level_rate`: the vent's flow is
    :math:`\\dot m = (\\rho_l - \\rho_v)|dV_l/dt|`, smaller than the evaporated mass
    :math:`\\rho_l |dV_l/dt|` by the vapour that stays to fill the freed space.

    Parameters
    ----------
    mass_flow : float or ndarray
        Gas mass flow leaving the vent, [kg/s] (a flowmeter's volume flow at its own
        temperature and pressure times the gas density there).
    latent_heat : float
        Latent heat at the bath's pressure, [J/kg].
    liquid_density, vapor_density : float
        Saturated liquid and vapour densities at the bath's pressure, [kg/m^3].

    Returns
    -------
    float or ndarray
        The heat reaching the liquid, [W].

    Notes
    -----
    For helium at 1 atm rho_v/rho_l = 16.9/124.7 = 0.136 (CoolProp values rounded), so
    the correction is 16 %; for nitrogen it is under 1 %.

    References
    ----------
    .. [1] R. F. Barron, Cryogenic Systems, 2nd ed., Oxford University Press (1985), open
       system energy balance (from memory).

    Examples
    --------
    >>> round(heat_load_from_vent_flow(1e-5, 20.56e3, 124.7, 16.9), 4)
    0.2378
    """
    rl, rv = float(liquid_density), float(vapor_density)
    if not (0.0 <= rv < rl):
        raise InputError(
            "the vapour must be less dense than the liquid",
            expected="0 <= vapor_density < liquid_density",
            found=f"{rv} and {rl} kg/m^3",
        )
    out = np.asarray(mass_flow, dtype=float) * float(latent_heat) / (1.0 - rv / rl)
    return float(out) if np.ndim(out) == 0 else out


# --- fills: transfer loss -------------------------------------------------------------


@dataclass(frozen=True)
class TransferLossFit:
    """The transfer loss of each fill and their spread.

    ``losses`` [-] per fill; ``mean`` and ``sd`` (sample standard deviation, 0 for a single
    fill) and ``sigma_mean`` (sd / sqrt(n), or the single fill's own uncertainty).
    """

    losses: np.ndarray
    sigmas: np.ndarray
    mean: float
    sd: float
    sigma_mean: float
    n: int


def fill_transfer_losses(delivered, rise, duration, rate, rate_sigma=0.0, rise_sigma=0.0):
    """Transfer loss of fills: the share of the delivered liquid that never reached the bath.

    .. math::

        \\ell = \\frac{D - (\\Delta V + |r|\\,\\Delta t)}{D}

    with :math:`D` the litres delivered, :math:`\\Delta V` the level's rise over the fill
    and :math:`|r|\\Delta t` the static boil-off during the fill at the fitted rate.

    Parameters
    ----------
    delivered : array_like
        Volume of liquid delivered per fill (from the supply dewar's scale or gauge), [m^3].
    rise : array_like
        The bath's volume after minus before each fill, [m^3].
    duration : array_like
        Each fill's duration, [s].
    rate : float
        The fitted static boil-off rate, [m^3/s] (sign ignored).
    rate_sigma, rise_sigma : float, optional
        Standard uncertainties of the rate [m^3/s] and of each rise [m^3], propagated to
        each fill's loss.

    Returns
    -------
    TransferLossFit

    Notes
    -----
    The loss counts everything that boiled during the transfer beyond the static rate:
    cooling the transfer line, the flash through the valve, the warm bath neck. A loss
    below 0 means the delivered figure is low or the level meter's litres per length high.

    Examples
    --------
    Delivered 100 L, rose 75 L in one hour while boiling 0.5 L/h: 24.5 % lost.

    >>> fit = fill_transfer_losses([0.1], [0.075], [3600.0], 0.5e-3 / 3600)
    >>> round(float(fit.losses[0]), 4)
    0.245
    """
    d = np.atleast_1d(np.asarray(delivered, dtype=float))
    dv = np.atleast_1d(np.asarray(rise, dtype=float))
    dt = np.broadcast_to(np.asarray(duration, dtype=float), d.shape)
    if d.shape != dv.shape or d.size == 0:
        raise InputError("delivered and rise must be non-empty and of the same length")
    if np.any(~(d > 0)):
        raise InputError("every delivered volume must be positive", found=str(d.tolist()))
    boil = abs(float(rate)) * dt
    losses = (d - dv - boil) / d
    sigmas = np.sqrt(float(rise_sigma) ** 2 + (float(rate_sigma) * dt) ** 2) / d
    n = losses.size
    sd = float(np.std(losses, ddof=1)) if n > 1 else 0.0
    sigma_mean = sd / np.sqrt(n) if n > 1 else float(sigmas[0])
    return TransferLossFit(losses, sigmas, float(losses.mean()), sd, float(sigma_mean), n)


def pair_deliveries(
    delivery_times, delivered, fills: Sequence[FillEvent], tolerance: float = 6 * 3600.0
) -> list[tuple[int, float]]:
    """Match logged deliveries to the fills seen in the level: (fill index, volume) pairs.

    Each delivery goes to the fill whose span [time_before, time_after] is nearest in time,
    within ``tolerance`` [s]; several deliveries to one fill are added (a fill from two
    dewars). Deliveries with no fill near them are left out (the caller reports them).

    Parameters
    ----------
    delivery_times : array_like
        When each delivery was logged, [s], same clock as the fills.
    delivered : array_like
        Volume delivered, [m^3].
    fills : list of FillEvent
    tolerance : float, optional
        The largest distance in time between a delivery and its fill, [s].

    Returns
    -------
    list of (int, float)
        Fill index and the volume delivered to it [m^3], by fill index.

    Examples
    --------
    >>> f = [FillEvent(3, 5, 300.0, 500.0, 0.07)]
    >>> pair_deliveries([520.0, 99999.0], [0.09, 0.1], f, tolerance=600)
    [(0, 0.09)]
    """
    times = np.asarray(delivery_times, dtype=float)
    vols = np.asarray(delivered, dtype=float)
    if not fills or times.size == 0:
        return []
    a = np.array([f.time_before for f in fills])
    b = np.array([f.time_after for f in fills])
    dist = np.maximum(0.0, np.maximum(a[None, :] - times[:, None], times[:, None] - b[None, :]))
    best = np.argmin(dist, axis=1)
    near = dist[np.arange(times.size), best] <= tolerance
    totals: dict[int, float] = {}
    for i, v in zip(best[near], vols[near]):
        totals[int(i)] = totals.get(int(i), 0.0) + float(v)
    return sorted(totals.items())


# --- forecast ----------------------------------------------------------------------------


@dataclass(frozen=True)
class Forecast:
    """When the bath reaches its refill level and runs dry, with bands, and the next order.

    Times [s] are from the time of the reading given. ``*_1sigma`` and ``*_90`` are
    (early, late) pairs for the rate at plus and minus one standard uncertainty and at
    the ~90 % two-sided normal band (1.645 sigma); ``inf`` where that rate is not falling.
    ``refill_volume_to_order`` [m^3] fills from the refill level to full through the
    transfer loss.
    """

    time_to_refill: float
    refill_1sigma: tuple[float, float]
    refill_90: tuple[float, float]
    time_to_empty: float
    empty_1sigma: tuple[float, float]
    empty_90: tuple[float, float]
    refill_volume_to_order: float


def forecast_level(
    volume_now: float,
    rate: float,
    rate_sigma: float,
    refill_volume: float,
    full_volume: float,
    transfer_loss: float = 0.0,
) -> Forecast:
    """Forecast of a bath: time to the refill level and to empty, and the next fill's order.

    .. math::

        t_{refill} = \\frac{V_{now} - V_{refill}}{|r|}, \\quad
        t_{empty} = \\frac{V_{now}}{|r|}, \\quad
        V_{order} = \\frac{V_{full} - V_{refill}}{1 - \\ell}

    Bands: the same with :math:`|r| \\pm k\\sigma_r`, :math:`k = 1` and :math:`k = 1.645`
    (the central ~90 % of a normal distribution of the rate).

    Parameters
    ----------
    volume_now : float
        The volume now, [m^3] (best the fitted line's value at the latest reading,
        :meth:`BoiloffFit.volume_at`, rather than one noisy reading).
    rate, rate_sigma : float
        The fitted boil-off rate [m^3/s] (sign ignored) and its standard uncertainty.
    refill_volume : float
        The level at which the bath is refilled, [m^3].
    full_volume : float
        The volume of a full bath, [m^3].
    transfer_loss : float, optional
        The share of the delivered liquid lost in the transfer, [-], in [0, 1).

    Returns
    -------
    Forecast

    Notes
    -----
    Assumes the static rate holds (no transfer, no magnet ramp, no insert). A time of 0
    means the level is already at or below the refill level.

    Examples
    --------
    60 L now, 10 L/day, refill at 20 L: 4 days to the refill level, 6 to empty; a full bath
    of 100 L with 20 % transfer loss needs 100 L ordered.

    >>> f = forecast_level(0.06, -0.01 / 86400, 0.0, 0.02, 0.1, 0.2)
    >>> days = round(f.time_to_refill / 86400, 9), round(f.time_to_empty / 86400, 9)
    >>> days, round(f.refill_volume_to_order, 6)
    ((4.0, 6.0), 0.1)
    """
    if not (0.0 <= float(transfer_loss) < 1.0):
        raise InputError(
            "transfer loss out of range", expected="0 <= loss < 1", found=str(transfer_loss)
        )
    r, s = abs(float(rate)), abs(float(rate_sigma))

    def time_at(rr: float, left: float) -> float:
        left = max(0.0, left)
        if left == 0.0:
            return 0.0
        return left / rr if rr > 0 else float("inf")

    def band(left: float, k: float) -> tuple[float, float]:
        return time_at(r + k * s, left), time_at(r - k * s, left)

    to_refill = float(volume_now) - float(refill_volume)
    to_empty = float(volume_now)
    order = (float(full_volume) - float(refill_volume)) / (1.0 - float(transfer_loss))
    return Forecast(
        time_at(r, to_refill),
        band(to_refill, 1.0),
        band(to_refill, Z_90),
        time_at(r, to_empty),
        band(to_empty, 1.0),
        band(to_empty, Z_90),
        max(0.0, order),
    )


# --- a measured curve against a forward model -----------------------------------------


@dataclass(frozen=True)
class CurveFit:
    """Fitted parameters of a forward model, with their covariance from the Jacobian.

    ``params`` and ``sigmas`` (square roots of the covariance's diagonal), ``covariance``,
    ``residual_sd`` (s, in the curve's unit), ``dof`` (readings minus parameters),
    ``success`` and ``message`` of the optimiser.
    """

    params: np.ndarray
    sigmas: np.ndarray
    covariance: np.ndarray
    residual_sd: float
    dof: int
    success: bool
    message: str


def fit_curve(
    model: Callable[[np.ndarray, np.ndarray], np.ndarray],
    time,
    measured,
    initial,
    bounds=(-np.inf, np.inf),
    x_scale="jac",
) -> CurveFit:
    """Least-squares fit of a forward model's parameters to a measured curve.

    .. math::

        \\hat p = \\arg\\min_p \\sum_i [T(p, t_i) - T_i]^2, \\qquad
        \\mathrm{cov}(\\hat p) = s^2 (J^\\top J)^{-1}, \\quad
        s^2 = \\frac{\\sum_i r_i^2}{n - k}

    Parameters
    ----------
    model : callable
        ``model(params, t) -> T(t)``: the forward model (the project's cooldown model
        with, for example, an effective capacity factor or a cooling power scale as its
        parameters), vectorised over ``t``.
    time : ndarray
        Times of the readings, [s].
    measured : ndarray
        The measured curve, in the model's unit (K for temperatures).
    initial : array_like
        Starting parameters.
    bounds : (lower, upper), optional
        Bounds on the parameters, as for scipy.optimize.least_squares.
    x_scale : array_like or "jac", optional
        Parameter scales, as for scipy.optimize.least_squares.

    Returns
    -------
    CurveFit

    Notes
    -----
    The covariance is the Gauss-Newton one at the solution (the same as
    scipy.optimize.curve_fit with ``absolute_sigma=False``), computed through the
    Jacobian's singular values so that a parameter the curve cannot fix shows as an
    infinite uncertainty rather than a failure. It assumes independent noise of one size
    along the curve; a model that misses the curve's shape inflates s and so the sigmas.

    References
    ----------
    .. [1] W. H. Press et al., Numerical Recipes, 3rd ed., Cambridge University Press
       (2007), section 15.5 (nonlinear models; the covariance from the curvature matrix).

    Examples
    --------
    >>> t = np.linspace(0, 5e4, 200)
    >>> model = lambda p, t: 4.0 + (300.0 - 4.0) * np.exp(-t / p[0])
    >>> fit = fit_curve(model, t, model([1.2e4], t), [8e3])
    >>> round(float(fit.params[0]))
    12000
    """
    t = _array("time", time)
    y = _array("measured", measured)
    if t.shape != y.shape:
        raise InputError("time and measured differ in length")
    keep = np.isfinite(t) & np.isfinite(y)
    t, y = t[keep], y[keep]
    p0 = np.atleast_1d(np.asarray(initial, dtype=float))
    if t.size <= p0.size:
        raise InputError(
            "too few readings for the parameters",
            expected=f"more than {p0.size}",
            found=str(t.size),
        )

    def residuals(p):
        return np.asarray(model(p, t), dtype=float) - y

    sol = optimize.least_squares(residuals, p0, bounds=bounds, x_scale=x_scale)
    dof = t.size - p0.size
    s2 = float(2.0 * sol.cost / dof)
    _, sv, vt = np.linalg.svd(sol.jac, full_matrices=False)
    tiny = np.finfo(float).eps * max(sol.jac.shape) * (sv[0] if sv.size else 0.0)
    inv = np.where(sv > tiny, 1.0 / np.where(sv > tiny, sv, 1.0) ** 2, np.inf)
    if np.all(np.isfinite(inv)):
        cov = (vt.T * inv) @ vt * s2
    else:
        cov = np.full((p0.size, p0.size), np.inf)
    return CurveFit(
        np.asarray(sol.x, dtype=float),
        np.sqrt(np.diag(cov)),
        cov,
        float(np.sqrt(s2)),
        int(dof),
        bool(sol.success),
        str(sol.message),
    )
