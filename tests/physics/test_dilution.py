"""Tests of cryoplan.physics.dilution: the mixing chamber's enthalpy balance, still, precooling.

Every expected number names its source; every tolerance says why it is that wide.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy import constants

from cryoplan.physics import dilution as dr
from cryoplan.physics import helium3 as he3

R = constants.R


def test_published_coefficients():
    # Pobell (2007), "Matter and Methods at Low Temperatures", 3rd ed., section 7.3:
    # Q = n3 (95 T_mc^2 - 11 T_ex^2) W, and 84 n3 T_mc^2 with a perfect exchanger
    # (from memory).
    assert dr.DILUTE_ENTHALPY_COEFFICIENT == 95.0
    assert dr.CONCENTRATED_ENTHALPY_COEFFICIENT == 11.0
    assert dr.PERFECT_EXCHANGER_COEFFICIENT == 84.0
    assert dr.mixing_chamber_cooling_power(1.0, 1.0, 1.0) == 84.0
    assert dr.mixing_chamber_cooling_power(1e-4, 0.02, 0.03) == pytest.approx(
        1e-4 * (95 * 0.02**2 - 11 * 0.03**2), rel=1e-15
    )


def test_concentrated_coefficient_is_half_of_greywall_gamma_r():
    # The 11 is the enthalpy of the Fermi liquid H = gamma R T^2 / 2 with gamma = 2.784 /K
    # (Greywall, Phys. Rev. B 33, 7520 (1986), at zero pressure): 11.57 J/(mol K^2); the
    # book's round 11 is 5 % below, so 6 % is the tolerance.
    assert dr.CONCENTRATED_ENTHALPY_COEFFICIENT == pytest.approx(2.784 * R / 2, rel=0.06)


def test_temperature_under_load_inverts_the_cooling_power():
    # Closed-form inversion against the forward formula, both exchanger cases (rounding).
    n = np.array([50e-6, 100e-6, 500e-6])
    q = np.array([1e-6, 10e-6, 100e-6])[:, None]
    t = dr.mixing_chamber_temperature(n, q)
    np.testing.assert_allclose(dr.mixing_chamber_cooling_power(n, t), q * np.ones(3), rtol=1e-12)
    t2 = dr.mixing_chamber_temperature(n, q, 0.05)
    np.testing.assert_allclose(
        dr.mixing_chamber_cooling_power(n, t2, 0.05), q * np.ones(3), rtol=1e-12
    )
    assert dr.mixing_chamber_temperature(100e-6, 0.84e-6) == pytest.approx(0.01, rel=1e-12)


def test_circulation_for_power_and_the_exchanger_limit():
    # n3 = Q / (95 T^2 - 11 T_ex^2); no circulation helps when T_ex >= sqrt(95/11) T_mc.
    assert dr.circulation_for_cooling_power(0.84e-6, 0.01) == pytest.approx(100e-6, rel=1e-12)
    with pytest.raises(ValueError, match="too high"):
        dr.circulation_for_cooling_power(1e-6, 0.01, 0.01 * math.sqrt(95 / 11) * 1.001)


def test_still_heat_is_latent_heat_times_circulation():
    # Q_still = n3 L3(T_still) (Pobell 2007, section 7.4), L3 from the helium-3 module.
    assert dr.still_heat(100e-6, 0.7) == pytest.approx(
        100e-6 * he3.latent_heat_molar(0.7), rel=1e-12
    )
    # about 30-40 J/mol at the still (Pobell, from memory): a few mW per 100 umol/s
    assert 3e-3 < dr.still_heat(100e-6) < 4e-3


def test_precooling_uses_the_ideal_monatomic_heat_capacity():
    # c_p = 5R/2 for a monatomic ideal gas; CoolProp's helium(-4) at 300 K and 1 bar has
    # the same molar c_p to 0.1 % (the isotopes share it: translation only).
    from CoolProp.CoolProp import PropsSI

    cp_molar = PropsSI("CPMOLAR", "T", 300.0, "P", 1e5, "Helium")
    assert cp_molar == pytest.approx(2.5 * R, rel=1e-3)
    assert dr.precooling_load(100e-6, 50.0, 4.0) == pytest.approx(
        100e-6 * 2.5 * R * 46.0, rel=1e-12
    )


def test_condensing_load():
    # n3 [5/2 R (T_in - T_c) + L3(T_c)]
    expected = 100e-6 * (2.5 * R * (4.2 - 1.5) + he3.latent_heat_molar(1.5))
    assert dr.condensing_load(100e-6, 4.2, 1.5) == pytest.approx(expected, rel=1e-12)


def test_bad_arguments():
    with pytest.raises(ValueError):
        dr.mixing_chamber_cooling_power(-1.0, 0.01)
    with pytest.raises(ValueError):
        dr.mixing_chamber_temperature(0.0, 1e-6)
    with pytest.raises(ValueError):
        dr.precooling_load(1e-4, 3.0, 4.0)
