"""Tests of cryoplan.physics.helium3: vapour pressure, latent heat, the pot's budget.

Every expected number names its source; every tolerance says why it is that wide.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy import constants, integrate

from cryoplan.physics import helium3 as he3

R = constants.R
MMHG = 101325.0 / 760.0


def test_t62_critical_point():
    # Sherman, Sydoriak and Roberts, J. Res. NBS 68A (1964), part I abstract: the critical
    # pressure of helium-3 is 873.0 +- 1.5 mmHg at 3.3240 K (T58); the working equation
    # meets it within the stated uncertainty.
    assert he3.t62_pressure(3.324) / MMHG == pytest.approx(873.0, abs=1.5)


def test_its90_and_t62_differ_by_the_known_scale_offset():
    # Rusby and Durieux, Cryogenics (1984), "Inverted forms of the new helium vapour
    # pressure equations" (public copy): the 1958/1962 helium scales were low against
    # thermodynamic temperature by about 0.2 %. At one pressure T90 - T62 must be
    # positive, a few millikelvin, and smooth (a wrong ITS-90 coefficient, recalled from
    # memory, would break one of the three); bounds: 0 to 8 mK (0.2 % of 3.2 K is 6.4 mK;
    # near 0.65 K the offset is larger in relative terms, 0.45 %), and second differences
    # below 0.2 mK on a 0.1 K grid.
    t = np.arange(0.65, 3.2001, 0.1)
    d = he3.its90_temperature(he3.t62_pressure(t)) - t
    assert np.all(d > 0)
    assert np.all(d < 8e-3)
    assert np.max(np.abs(np.diff(d, 2))) < 2e-4


def test_pressure_is_continuous_at_the_join_and_inverts():
    # The join at 0.65 K is continuous by construction; temperature_at_pressure inverts
    # pressure to the bisection's resolution (1e-12 relative).
    below, above = he3.pressure(0.65 - 1e-9), he3.pressure(0.65)
    assert below == pytest.approx(above, rel=1e-7)
    t = np.linspace(0.2, 3.2, 61)
    np.testing.assert_allclose(he3.temperature_at_pressure(he3.pressure(t)), t, rtol=1e-12)
    assert np.all(np.diff(he3.pressure(t)) > 0)


def test_its90_branch_is_the_its90_equation():
    # pressure() above 0.65 K is the numerical inverse of the ITS-90 equation itself.
    t = np.array([0.65, 0.8, 1.0, 1.5, 2.0, 3.0, 3.2])
    np.testing.assert_allclose(he3.its90_temperature(he3.pressure(t)), t, rtol=1e-12)


def test_vapour_pressure_published_points():
    # Helium-3's vapour pressure near 0.3 K is about 0.2 Pa and near 1 K about 1.2 kPa
    # (Pobell 2007, fig. 2.4 and table 6.1 of the helium-3 cryostat; from memory): within
    # 25 %, the reading accuracy of a logarithmic figure.
    assert he3.pressure(0.3) == pytest.approx(0.22, rel=0.25)
    assert he3.pressure(1.0) == pytest.approx(1.2e3, rel=0.25)


def test_latent_heat_is_clausius_clapeyron_of_the_pressure_curve():
    # L = R T^2 dln p/dT: the analytic derivative against a central difference of ln p
    # (step 1e-6 K; agreement 1e-6).
    for t in (0.25, 0.3, 0.5, 0.7, 1.0, 1.5, 2.5):
        h = 1e-6
        dlnp = (math.log(he3.pressure(t + h)) - math.log(he3.pressure(t - h))) / (2 * h)
        assert he3.latent_heat_molar(t) == pytest.approx(R * t**2 * dlnp, rel=1e-6)


def test_latent_heat_zero_temperature_limit_and_published_size():
    # T -> 0: L -> -R a_-1 = 2.49174 R = 20.7 J/mol, the zero-temperature latent heat the
    # T62 equation was built on (Sherman et al. 1964); L rises from it with T, so at the
    # equation's lower end, 0.2 K, it lies above 20.7 J/mol and below L(1 K).
    # Near 1 K about 40 J/mol (Pobell 2007, chapter 6, from memory; 10 %).
    assert 2.49174 * R < he3.latent_heat_molar(0.2) < he3.latent_heat_molar(1.0)
    assert he3.latent_heat_molar(1.0) == pytest.approx(40.0, rel=0.1)


def test_liquid_heat_capacity_shape():
    # Greywall (1983): C/R of the saturated liquid rises with T over 0.1-2.5 K, and C/RT
    # falls from its zero-temperature value 2.78 /K (Greywall 1986, gamma at zero
    # pressure) as T rises (the paramagnon term): below 2.78 at 0.1 K, positive.
    t = np.linspace(0.1, 2.5, 50)
    c = he3.liquid_heat_capacity(t)
    assert np.all(np.diff(c) > 0)
    assert 0 < he3.liquid_heat_capacity(0.1) / (R * 0.1) < 2.784
    with pytest.raises(ValueError, match="outside"):
        he3.liquid_heat_capacity(3.0)


def test_evaporated_fraction_against_an_ode_integration():
    # dn/dT = n C_l / L (the liquid cooled by its own evaporation), integrated from T_c
    # down to T_pot with scipy's solve_ivp (rtol 1e-10): the module's quadrature agrees
    # to 1e-6 (the integrator steps across the 0.6 % step of L at 0.65 K, which limits it
    # to a few 1e-8).
    tc, tp = 1.6, 0.3

    def rhs(t, n):
        return n * he3.liquid_heat_capacity(t) / he3.latent_heat_molar(t)

    sol = integrate.solve_ivp(rhs, (tc, tp), [1.0], rtol=1e-10, atol=1e-14)
    assert he3.evaporated_fraction(tc, tp) == pytest.approx(1 - sol.y[0, -1], rel=1e-6)
    assert he3.evaporated_fraction(tp, tp) == 0.0


def test_pot_hold_time_formula():
    # t = n phi (1 - f) L(T_pot) / Q (the brief's model).
    n, q, tc, tp, phi = 0.2, 50e-6, 1.5, 0.35, 0.9
    f = he3.evaporated_fraction(tc, tp)
    expected = n * phi * (1 - f) * he3.latent_heat_molar(tp) / q
    assert he3.pot_hold_time(n, q, tc, tp, phi) == pytest.approx(expected, rel=1e-12)


def test_recycling_heats():
    # Sorption: n q_ads; recondensation: n [5/2 R (T_gas - T_c) + L(T_c)] (ideal gas).
    assert he3.sorption_pump_heat(0.5) == pytest.approx(0.5 * he3.HELIUM_ON_CARBON_ADSORPTION_HEAT)
    expected = 0.1 * (2.5 * R * (40.0 - 1.5) + he3.latent_heat_molar(1.5))
    assert he3.recondensation_heat(0.1, 40.0, 1.5) == pytest.approx(expected, rel=1e-12)


def test_out_of_range_refused():
    with pytest.raises(ValueError, match="outside"):
        he3.pressure(0.1)
    with pytest.raises(ValueError, match="outside"):
        he3.pressure(3.3)
    with pytest.raises(ValueError, match="outside"):
        he3.temperature_at_pressure(2e5)
    with pytest.raises(ValueError, match="above the condensation"):
        he3.evaporated_fraction(0.3, 1.0)


@settings(max_examples=100, deadline=None)
@given(t=st.floats(0.2, 3.2))
def test_latent_heat_positive_and_pressure_finite(t):
    # Positive latent heat and finite pressure over the whole range of the equations.
    assert he3.latent_heat_molar(t) > 0
    assert math.isfinite(he3.pressure(t)) and he3.pressure(t) > 0
