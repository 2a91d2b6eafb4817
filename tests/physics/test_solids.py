"""Tests of cryoplan.physics.solids: the heat-capacity and conductivity models and the tables.

Every expected number names its source; every tolerance says why it is that wide.
"""

from __future__ import annotations

import math
import sys
from pathlib import Path

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy import integrate

from cryoplan.physics import solids

if sys.version_info >= (3, 11):
    import tomllib
else:  # pragma: no cover
    import tomli as tomllib

DATA = Path(__file__).resolve().parents[1] / "reference"
R = solids.R


def test_gas_constant_is_scipy_codata():
    # scipy.constants.R (CODATA 2018, exact N_A k_B); the module keeps its own copy
    # only to avoid importing scipy.constants at start-up.
    import scipy.constants

    assert solids.R == pytest.approx(scipy.constants.R, rel=1e-12)


# Debye heat capacity C_V per mole of atoms [J/(mol K)] against theta_D/T, from the
# Debye-function table of E. S. R. Gopal, "Specific Heats at Low Temperatures" (1966),
# appendix (also the AIP Handbook table of the Debye function); values from memory.
GOPAL_DEBYE_TABLE = [
    (1.0, 23.74),
    (2.0, 20.59),
    (3.0, 16.53),
    (4.0, 12.55),
    (5.0, 9.20),
    (6.0, 6.625),
    (8.0, 3.44),
    (10.0, 1.891),
    (20.0, 0.2430),
]


@pytest.mark.parametrize("x, expected", GOPAL_DEBYE_TABLE)
def test_debye_function_against_published_table(x, expected):
    # 0.3 %: the table is printed to 3-4 significant figures (the 8.0 entry to 3)
    assert solids.debye_heat_capacity(300.0 / x, 300.0) == pytest.approx(expected, rel=3e-3)


def test_dulong_petit_limit():
    # Dulong and Petit (1819): 3R per mole of atoms at T >> theta_D; the series
    # C/3R = 1 - x^2/20 + ... gives 1 - 5e-10 at x = 1e-4, so 1e-9 is the slack.
    c = solids.debye_heat_capacity(1e4 * 300.0, 300.0)
    assert c == pytest.approx(3 * R, rel=1e-9)


@pytest.mark.parametrize("x", [50.0, 100.0, 1000.0])
def test_debye_t_cubed_limit(x):
    # Debye (1912): C = (12 pi^4 R / 5)(T/theta)^3 for T << theta; the exponential tail
    # is below e^-50 at x >= 50, so only rounding (1e-12) separates them.
    expected = 12 * math.pi**4 * R / 5 / x**3
    assert solids.debye_heat_capacity(300.0 / x, 300.0) == pytest.approx(expected, rel=1e-12)


def test_debye_integral_against_quad():
    # independent check of both branches (quadrature and tail series) at 1e-10:
    # scipy.integrate.quad reaches about 1e-13 on this smooth integrand
    for x in [0.01, 0.5, 2.0, 4.99, 5.01, 8.0, 20.0, 60.0]:
        ref = integrate.quad(
            lambda t: t**4 * math.exp(t) / math.expm1(t) ** 2, 0, x, epsabs=0, epsrel=1e-13
        )[0]
        assert solids._debye_integral(np.array([x]))[0] == pytest.approx(ref, rel=1e-10)


def test_debye_scalar_and_array():
    assert isinstance(solids.debye_heat_capacity(10.0, 300.0), float)
    t = np.array([[0.0, 1.0], [10.0, 300.0]])
    out = solids.debye_heat_capacity(t, 300.0)
    assert out.shape == (2, 2)
    assert out[0, 0] == 0.0  # T = 0 K: no heat capacity (third law)


def test_einstein_limits():
    # Einstein (1907): 3R at high T (series 1 - x^2/12: 1e-8 at x = 1e-3 gives the slack)
    assert solids.einstein_heat_capacity(1e5, 100.0) == pytest.approx(3 * R, rel=1e-7)
    # low T: 3R x^2 e^-x exactly to 1e-12 once e^-x << 1 (x = 30)
    x = 30.0
    expected = 3 * R * x * x * math.exp(-x)
    assert solids.einstein_heat_capacity(100.0 / x, 100.0) == pytest.approx(expected, rel=1e-12)


def test_schottky_peak():
    # two-level Schottky peak (g0 = g1): maximum 0.4392 R at T = 0.4168 Delta
    # (Gopal 1966, ch. 5; from memory); 1e-3 because the values are quoted to 4 figures
    t = np.linspace(0.2, 1.0, 4001)
    c = solids.schottky_heat_capacity(t, 1.0)
    assert c.max() / R == pytest.approx(0.4392, rel=1e-3)
    assert t[np.argmax(c)] == pytest.approx(0.4168, rel=2e-3)


def test_superconducting_entropy_is_continuous_at_tc():
    # a second-order transition: the integral of C_es/T from 0 to Tc equals the normal
    # state's gamma Tc (BCS; Corak et al. 1956 form with a = 1/E1(b)); quad to 1e-8
    gamma, tc = 7.79e-3, 9.25
    s_super = integrate.quad(
        lambda t: solids.superconducting_electronic_heat_capacity(t, gamma, tc) / t,
        0,
        tc,
        epsrel=1e-12,
    )[0]
    assert s_super == pytest.approx(gamma * tc, rel=1e-8)
    # above Tc it is the normal gamma T (exact)
    assert solids.superconducting_electronic_heat_capacity(20.0, gamma, tc) == pytest.approx(
        gamma * 20.0, rel=1e-15
    )
    # jump C_es(Tc-)/(gamma Tc) = a e^-b: 2.1 for b = 1.44 (BCS gives 2.43; the
    # exponential law is fitted to 0.3 < T/Tc < 0.8, not to the jump): 5 %
    jump = solids.superconducting_electronic_heat_capacity(tc * (1 - 1e-9), gamma, tc)
    assert jump / (gamma * tc) == pytest.approx(2.1, rel=0.05)


def test_dilation_term():
    # Nernst-Lindemann: C_P - C_V = A C^2 T; for lead with A = 0.0051/T_m (T_m = 600.6 K,
    # CRC, from memory) it is about 1.5 J/(mol K) at 298 K, the gap between lead's
    # 26.65 J/(mol K) (CRC, from memory) and 3R + gamma T; exact arithmetic, 1e-12
    assert solids.dilation_heat_capacity(298.0, 24.7, 0.0051 / 600.6) == pytest.approx(
        0.0051 / 600.6 * 24.7**2 * 298.0, rel=1e-12
    )


def test_varying_debye_temperature_is_log_linear_and_flat_outside():
    kt, kv = [10.0, 100.0], [300.0, 400.0]
    # halfway in ln T (31.62 K) is halfway in theta: exact to rounding
    assert solids.varying_debye_temperature(math.sqrt(1000.0), kt, kv) == pytest.approx(350.0)
    assert solids.varying_debye_temperature(1.0, kt, kv) == 300.0
    assert solids.varying_debye_temperature(1e3, kt, kv) == 400.0
    # below the first knot the model is gamma T + beta T^3 (theta constant): exact
    c = solids.varying_debye_specific_heat(np.array([1.0, 2.0]), kt, kv, 0.05, gamma=1e-3)
    beta = 12 * math.pi**4 * R / 5 / 300.0**3
    np.testing.assert_allclose(c * 0.05, [1e-3 + beta, 2e-3 + 8 * beta], rtol=1e-12)


def test_tabulated_form():
    tt, tv = [4.0, 10.0, 100.0], [0.64, 10.0, 300.0]
    # at the table points: exact
    np.testing.assert_allclose(
        solids.tabulated_specific_heat(np.array(tt), tt, tv), tv, rtol=1e-12
    )
    # between points: power law (log-log); 0.64 -> 10 over 4 -> 10 K has exponent 3
    assert solids.tabulated_specific_heat(5.0, tt, tv) == pytest.approx(0.01 * 125, rel=1e-9)
    # below: gamma T + beta T^3, continuous at 4 K
    g = 0.02
    below = solids.tabulated_specific_heat(np.array([1.0, 4.0 - 1e-9]), tt, tv, gamma=g)
    beta = (0.64 - g * 4) / 64
    assert below[0] == pytest.approx(g + beta, rel=1e-12)
    assert below[1] == pytest.approx(0.64, rel=1e-8)


def test_log_log_interpolation_power_law_beyond_ends():
    # y = T^2 on the table, so the end-segment power law gives T^2 outside: exact
    assert solids.log_log_interpolate(1.0, [2.0, 4.0], [4.0, 16.0]) == pytest.approx(1.0)
    assert solids.log_log_interpolate(8.0, [2.0, 4.0], [4.0, 16.0]) == pytest.approx(64.0)


def test_model_tables_map_names_to_functions():
    assert solids.HEAT_CAPACITY_MODELS == {
        "debye": solids.debye_specific_heat,
        "debye-varying": solids.varying_debye_specific_heat,
        "tabulated": solids.tabulated_specific_heat,
    }
    assert solids.CONDUCTIVITY_MODELS == {
        "nist-log-polynomial": solids.nist_log_polynomial,
        "nist-rational": solids.nist_rational_conductivity,
        "hust-lankford": solids.hust_lankford_conductivity,
        "tabulated": solids.tabulated_conductivity,
    }
    for name, function in solids.HEAT_CAPACITY_MODELS.items():
        assert solids.select_model("heat capacity", name) is function
    for name, function in solids.CONDUCTIVITY_MODELS.items():
        assert solids.select_model("conductivity", name) is function
    with pytest.raises(KeyError):
        solids.select_model("heat capacity", "no-such-model")


def test_check_range_tolerance():
    mask = solids.check_range(np.array([299.0, 301.4, 301.6]), 300.0)
    assert mask.tolist() == [False, False, True]  # 0.5 % of 300 K is 1.5 K


HUST_LANKFORD_COPPER = dict(
    rho_273=1.55e-8,
    p1=1.754e-8,
    p2=2.763,
    p3=1102.0,
    p4=-0.165,
    p5=70.0,
    p6=1.756,
    p7=0.838,
    p7_exponent=0.1661,
)


@pytest.mark.parametrize("rrr", [50, 100, 150, 500])
def test_hust_lankford_copper_against_nist_fits(rrr):
    # Two independent representations of copper's conductivity: Hust & Lankford, NBSIR
    # 84-3007 (1984) (parameters from memory, as in materials/copper.toml) and the NIST
    # OFHC copper fits (tests/reference, checked against the NIST page). 8 %: NIST states
    # 1-2 % fit error, and the two disagree most near the peak (20-40 K) where k
    # depends steeply on RRR.
    nist = tomllib.loads((DATA / "nist_ofhc_copper_conductivity.toml").read_text())
    t = np.geomspace(4.0, 300.0, 40)
    ref = solids.nist_rational_conductivity(t, nist["rrr"][str(rrr)])
    model = solids.hust_lankford_conductivity(t, rrr, **HUST_LANKFORD_COPPER)
    np.testing.assert_allclose(model, ref, rtol=0.08)


def test_hust_lankford_impurity_limit_is_wiedemann_franz():
    # at 1 K the impurity term dominates: k = L0 T RRR / rho_273 (Wiedemann-Franz with
    # L0 = 2.443e-8 W ohm/K^2, Sommerfeld value); the phonon term adds under 1 % there
    k = solids.hust_lankford_conductivity(1.0, 100.0, **HUST_LANKFORD_COPPER)
    assert k == pytest.approx(2.443e-8 * 1.0 * 100.0 / 1.55e-8, rel=0.01)


def _copper_like(t):
    return solids.varying_debye_specific_heat(
        t, [4.0, 20.0, 100.0, 300.0], [343.0, 330.0, 312.0, 300.0], 0.063546, gamma=0.695e-3
    )


def test_cumulative_integral_against_quad():
    # the speed bar's accuracy: agreement with scipy.integrate.quad to 1e-6 relative
    table = solids.CumulativeIntegral(_copper_like, 300.0, breakpoints=[4.0, 20.0, 100.0])
    temps = np.array([1e-4, 0.5, 3.0, 4.2, 17.3, 77.0, 150.0, 299.9, 300.0])
    got = table(temps)
    for t, h in zip(temps, got, strict=True):
        ref = integrate.quad(
            lambda x: float(_copper_like(x)),
            0,
            t,
            points=[4, 20, 100],
            limit=200,
            epsabs=0,
            epsrel=1e-12,
        )[0]
        assert h == pytest.approx(ref, rel=1e-6)


def test_cumulative_integral_with_a_jump():
    # niobium-like electronic term with its jump at Tc: the breakpoint keeps 1e-6
    def f(t):
        return solids.superconducting_electronic_heat_capacity(t, 7.79e-3, 9.25)

    table = solids.CumulativeIntegral(f, 300.0, breakpoints=[9.25])
    for t in [5.0, 9.25, 9.3, 50.0]:
        ref = integrate.quad(
            f, 0, t, points=[9.25] if t > 9.25 else None, epsabs=0, epsrel=1e-12, limit=200
        )[0]
        assert table(t) == pytest.approx(ref, rel=1e-6)


def test_cumulative_integral_scalar_array_and_beyond_top():
    table = solids.CumulativeIntegral(lambda t: 3.0 * t**2, 10.0)
    assert isinstance(table(2.0), float)
    out = table(np.array([[0.0, 1.0], [10.0, 20.0]]))
    assert out.shape == (2, 2)
    # integral of 3 T^2 is T^3; exact cubic, so only rounding remains (1e-9)
    np.testing.assert_allclose(out, [[0.0, 1.0], [1000.0, 8000.0]], rtol=1e-9)


@settings(max_examples=60, deadline=None)
@given(
    theta=st.floats(50.0, 2000.0),
    temps=st.lists(st.floats(0.0, 1000.0), min_size=1, max_size=20),
)
def test_debye_heat_capacity_is_bounded(theta, temps):
    # 0 <= C_V <= 3R everywhere (Debye), and increasing in T
    t = np.sort(np.array(temps))
    c = solids.debye_heat_capacity(t, theta)
    assert np.all(c >= 0.0)
    assert np.all(c <= 3 * R * (1 + 1e-12))
    assert np.all(np.diff(c) >= -1e-12)


@pytest.mark.parametrize("x", [0.5, 1.0, 1.44, 3.0, 5.0])
def test_exponential_integral_against_scipy(x):
    # the series for E1 (Abramowitz & Stegun 5.1.11) against scipy.special.exp1; the
    # alternating series loses about 1e-13 to cancellation at x = 5
    from scipy.special import exp1

    assert solids._exponential_integral_e1(x) == pytest.approx(float(exp1(x)), rel=1e-11)
