"""Fits to a cryostat's record (cryoplan/physics/logfit.py), against known truths.

The synthetic logs are made here with fixed random states from a known heat load, transfer loss or
cooldown time constant; the fluid properties that turn a heat load into litres come from
CoolProp through the project's fluid layer (``cryoplan.cryogen``), the outside reference.
"""

from __future__ import annotations

import numpy as np
import pytest
from scipy import optimize, stats

import cryoplan
from cryoplan.physics import logfit
from cryoplan.physics.errors import InputError

DAY = 86400.0


@pytest.fixture(scope="module")
def helium():
    return cryoplan.cryogen("helium")


def _bath_record(rate, noise, state, days=30.0, step=600.0, fill_every=8.0, top=0.095):
    """Volume [m^3] of a bath boiling at ``rate`` [m^3/s], refilled to ``top`` every
    ``fill_every`` days over one hour (six readings), with normal reading noise."""
    rng = np.random.default_rng(state)
    t = np.arange(0.0, days * DAY, step)
    phase = t % (fill_every * DAY)
    v = top - rate * phase
    v[phase > (fill_every * DAY - 3600.0)] = np.nan  # the hour of the fill: not logged
    keep = np.isfinite(v)
    return t[keep], v[keep] + rng.normal(0.0, noise, keep.sum())


def test_heat_load_fitted_back_within_its_uncertainty(helium):
    # Truth: 0.25 W on a vented helium bath at 1 atm; the level falls at Q / (L rho_l),
    # with L and rho_l from CoolProp (cryoplan.cryogen). 0.3 L noise, 10-min readings.
    q_true = 0.25
    rate = q_true / (helium.latent_heat * helium.liquid_density)
    t, v = _bath_record(rate, 0.3e-3, state=17)
    fit = logfit.fit_boiloff(t, v)
    assert len(fit.fills) == 3  # 30 days, a fill every 8 days
    q = logfit.heat_load_from_level_rate(fit.rate, helium.latent_heat, helium.liquid_density)
    q_sigma = logfit.heat_load_from_level_rate(
        fit.rate_sigma, helium.latent_heat, helium.liquid_density
    )
    assert abs(q - q_true) / q_sigma < 3.0  # z-score: within 3 stated standard deviations
    assert q_sigma / q_true < 0.02  # and the uncertainty is informative (a real fit)


def test_stated_rate_uncertainty_is_calibrated():
    # Over many synthetic intervals the z-scores of the fitted rate must have a standard
    # deviation near 1 (the stated sigma is neither too small nor too large). With 300
    # intervals the sd of the z-scores is itself uncertain by 1/sqrt(2*300) = 4 %: 0.8-1.2
    # leaves five of those.
    rng = np.random.default_rng(3)
    t = np.arange(0.0, 2 * DAY, 600.0)
    rate = -1.2e-7
    z = []
    for _ in range(300):
        v = 0.08 + rate * t + rng.normal(0.0, 3e-4, t.size)
        f = logfit.fit_level_interval(t, v)
        z.append((f.rate - rate) / f.rate_sigma)
    assert 0.8 < np.std(z) < 1.2
    assert abs(np.mean(z)) < 0.2  # unbiased: 0.2 is 3.5 standard errors of the mean


def test_vented_bath_formula_is_the_first_law_exactly(helium):
    # First law for the inner vessel at constant pressure, evaluated with CoolProp's
    # saturated properties (h_l, h_v, rho_l, rho_v at 1 atm; u = h - p/rho):
    # Q dt = dU + h_v dm_out. The closed form L rho_l |dV_l| must equal it to rounding.
    p, rl, rv = helium.pressure, helium.liquid_density, helium.vapor_density
    hl, hv = helium.liquid_enthalpy, helium.saturated_vapor_enthalpy
    ul, uv = hl - p / rl, hv - p / rv
    v_total, v1, v2, dt = 0.1, 0.06, 0.059, 3600.0

    def energy(vl):
        return rl * ul * vl + rv * uv * (v_total - vl)

    def mass(vl):
        return rl * vl + rv * (v_total - vl)

    q_first_law = (energy(v2) - energy(v1) + hv * (mass(v1) - mass(v2))) / dt
    q_closed = logfit.heat_load_from_level_rate((v2 - v1) / dt, helium.latent_heat, rl)
    assert q_closed == pytest.approx(q_first_law, rel=1e-9)  # an identity: rounding only
    # the (rho_l - rho_v) form would be 13.6 % low for helium: the test can tell them apart
    assert abs(q_closed * (1 - rv / rl) - q_first_law) > 0.1 * q_first_law
    # the vent's mass flow over the same hour gives the same load through its own form
    m_dot = (mass(v1) - mass(v2)) / dt
    q_vent = logfit.heat_load_from_vent_flow(m_dot, helium.latent_heat, rl, rv)
    assert q_vent == pytest.approx(q_first_law, rel=1e-9)


def test_transfer_loss_recovered_from_fills(helium):
    # Truth: each fill loses 22 % of what is delivered (sd 3 % between fills); the
    # delivered volume is what the rise and the static boil-off during the hour-long fill
    # need, over (1 - loss).
    rng = np.random.default_rng(5)
    rate = 0.3 / (helium.latent_heat * helium.liquid_density)
    t, v = _bath_record(rate, 0.2e-3, state=9, days=41.0)
    fit = logfit.fit_boiloff(t, v)
    assert len(fit.fills) == 5
    true_losses = 0.22 + rng.normal(0.0, 0.03, len(fit.fills))
    durations = np.array([f.time_after - f.time_before for f in fit.fills])
    # from the last reading before a fill (8 days less the span) back to the top, 95 L
    true_rise = rate * (8 * DAY - durations)
    delivered = (true_rise + rate * durations) / (1.0 - true_losses)
    pairs = logfit.pair_deliveries([f.time_after for f in fit.fills], delivered, fit.fills)
    assert [i for i, _ in pairs] == list(range(len(fit.fills)))
    loss = logfit.fill_transfer_losses(
        [d for _, d in pairs], fit.rises, durations, fit.rate, fit.rate_sigma, fit.noise
    )
    # each fill's loss within 3 of its stated sigmas (from the noise and the rate's sigma)
    assert np.all(np.abs(loss.losses - true_losses) < 3 * loss.sigmas)
    # the spread over fills is the spread we put in: sample sd of 5 draws of sd 0.03
    assert loss.sd == pytest.approx(np.std(true_losses, ddof=1), abs=3e-3)
    assert abs(loss.mean - 0.22) < 3 * loss.sigma_mean


def test_exponential_cooldown_fitted_back_to_its_time_constant():
    # Truth: T(t) = T_inf + (T0 - T_inf) exp(-t / tau), tau = 5.5 h, 0.5 K noise.
    tau, t0, tinf = 5.5 * 3600.0, 295.0, 3.2
    t = np.linspace(0.0, 40 * 3600.0, 400)
    rng = np.random.default_rng(11)
    y = tinf + (t0 - tinf) * np.exp(-t / tau) + rng.normal(0.0, 0.5, t.size)

    def model(p, t):
        return p[1] + (t0 - p[1]) * np.exp(-t / p[0])

    fit = logfit.fit_curve(model, t, y, [3 * 3600.0, 10.0])
    assert fit.success
    assert abs(fit.params[0] - tau) / fit.sigmas[0] < 3.0
    assert abs(fit.params[1] - tinf) / fit.sigmas[1] < 3.0
    assert fit.residual_sd == pytest.approx(0.5, rel=0.15)  # 400 points: s to ~4 %
    # the covariance is scipy.optimize.curve_fit's (absolute_sigma=False), the reference
    _, pcov = optimize.curve_fit(lambda t, a, b: model([a, b], t), t, y, p0=[1e4, 10.0])
    assert np.allclose(fit.covariance, pcov, rtol=1e-3)


def test_level_meter_reads_a_share_of_its_sensor_not_of_the_dewar():
    # 45 % of a 50 cm sensor is 22.5 cm; at 2 L/cm that is 45 L plus the 8 L below it.
    v = logfit.level_to_volume(0.45, 0.5, volume_per_length=2e-3 / 1e-2, volume_below=8e-3)
    assert v == pytest.approx(53e-3, rel=1e-12)
    # a calibration table (a narrow neck above 40 cm) interpolates like numpy.interp
    h, vol = np.array([0.0, 0.2, 0.4, 0.5]), np.array([0.0, 0.04, 0.08, 0.085])
    f = np.array([0.1, 0.5, 0.9])
    got = logfit.level_to_volume(f, 0.5, calibration=(h, vol))
    assert np.allclose(got, np.interp(f * 0.5, h, vol), rtol=0, atol=0)
    with pytest.raises(InputError):
        logfit.level_to_volume(0.5, 0.5)  # neither litres per length nor a table
    with pytest.raises(InputError):
        logfit.level_to_volume(0.5, 0.5, calibration=([0, 0.2, 0.1], [0, 1, 2]))


def test_fills_are_rises_and_a_spike_is_not():
    t = np.arange(200.0) * 600
    v = 0.05 - 1e-8 * t
    v[100:] += 0.04  # a fill
    v[50] += 0.02  # one spike up and back
    fills = logfit.find_fills(t, v, noise=1e-5)
    assert [(f.before, f.after) for f in fills] == [(99, 100)]
    fit = logfit.fit_boiloff(t, v, noise=1e-5)
    assert 50 in fit.intervals[0].outliers.tolist()  # the spike is named as an outlier
    assert fit.rate == pytest.approx(-1e-8, rel=1e-9)  # exact line through the rest


def test_theil_sen_matches_scipy():
    rng = np.random.default_rng(2)
    t = np.arange(300.0) * 600
    v = 0.07 - 2e-8 * t + rng.normal(0, 1e-4, t.size)
    f = logfit.fit_level_interval(t, v, method="theil-sen")
    ref = stats.theilslopes(v, t - t[0], alpha=0.6827)  # the reference estimator
    assert f.rate == ref[0]
    assert f.rate_sigma == pytest.approx(0.5 * (ref[3] - ref[2]))
    with pytest.raises(InputError):
        logfit.fit_level_interval(t, v, method="least-median")


def test_combine_rates_weighted_mean_and_birge_ratio():
    # consistent rates: the plain inverse-variance mean, sigma 1/sqrt(sum w)
    m, s, rb = logfit.combine_rates([1.0, 1.0, 1.0], [1.0, 2.0, 2.0])
    assert (m, s) == (1.0, pytest.approx(1 / np.sqrt(1.5)))
    assert rb == 0.0
    # scattered rates: sigma scaled up by R_B = sqrt(chi^2 / (n - 1)) (Birge 1932)
    m, s, rb = logfit.combine_rates([0.0, 4.0], [1.0, 1.0])
    assert rb == pytest.approx(np.sqrt(8.0))
    assert s == pytest.approx(np.sqrt(8.0) / np.sqrt(2.0))


def test_forecast_closed_form_and_bands():
    # 60 L now, 10 +- 1 L/day, refill at 20 L: 4 days (40 L / 10 L/day); the 1-sigma band
    # is 40/11 to 40/9 days, the 90 % band 40/(10 +- 1.645) days.
    r, s = -0.01 / DAY, 0.001 / DAY
    f = logfit.forecast_level(0.06, r, s, 0.02, 0.1, transfer_loss=0.2)
    assert f.time_to_refill / DAY == pytest.approx(4.0)
    assert np.allclose(np.array(f.refill_1sigma) / DAY, [40 / 11, 40 / 9])
    z = stats.norm.ppf(0.95)  # 1.645, the two-sided 90 % normal factor
    assert np.allclose(np.array(f.refill_90) / DAY, [40 / (10 + z), 40 / (10 - z)])
    assert f.time_to_empty / DAY == pytest.approx(6.0)
    assert f.refill_volume_to_order == pytest.approx(0.08 / 0.8)
    # a rate whose band reaches zero: the late edge is infinite, not negative
    g = logfit.forecast_level(0.06, r, 0.02 / DAY, 0.02, 0.1)
    assert g.refill_1sigma[1] == np.inf
    assert logfit.forecast_level(0.01, r, s, 0.02, 0.1).time_to_refill == 0.0


def test_rail_runs_flag_a_disconnected_meter_only():
    v = np.array([60.0, 59.9, 0.0, 0.0, 0.0, 59.6, 59.5, 100.0, 99.9, 99.8])
    # the 0 % run jumps in and out: flagged; 100 % after a jump but left smoothly: kept
    assert logfit.find_rail_runs(v, (0.0, 100.0), 5.0).tolist() == [2, 3, 4]
    boiled_dry = np.array([2.0, 1.0, 0.4, 0.0, 0.0])
    assert logfit.find_rail_runs(boiled_dry, (0.0, 100.0), 5.0).size == 0
    assert logfit.find_rail_runs(np.zeros(5), (0.0,), 5.0).size == 0


def test_no_usable_interval_is_an_input_error():
    t = np.arange(5.0)
    with pytest.raises(InputError, match="no usable interval"):
        logfit.fit_boiloff(t, np.linspace(0.05, 0.049, 5))
    with pytest.raises(InputError):
        logfit.fit_boiloff(t, [0.05, 0.05, np.nan, 0.05, 0.05])
    with pytest.raises(InputError):
        logfit.heat_load_from_vent_flow(1e-5, 2e4, 10.0, 20.0)  # vapour denser than liquid
