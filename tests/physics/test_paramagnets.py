"""Tests of cryoplan.physics.paramagnets: the Brillouin paramagnet with an internal field.

Every expected number names its source (an exact limit, a closed form, a thermodynamic
identity, or an independent evaluation with scipy); every tolerance says why it is that wide.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy import constants, integrate, optimize, special

from cryoplan.physics import paramagnets as pm

R = constants.R
K_B = constants.k
MU_B = constants.physical_constants["Bohr magneton"][0]
N_A = constants.N_A
SPINS = [0.5, 1.0, 1.5, 2.5, 3.5, 7.5]


def direct_entropy(field, temperature, spin, g, b):
    """S/R from the sum over the 2J+1 levels with scipy's logsumexp (independent of the module)."""
    y = g * MU_B * math.hypot(field, b) / (K_B * temperature)
    m = np.arange(-spin, spin + 0.5, 1.0)
    ln_z = special.logsumexp(m * y)
    p = np.exp(m * y - ln_z)
    return ln_z - y * float(np.sum(p * m))


# ---------------------------------------------------------------------- exact limits


@pytest.mark.parametrize("spin", SPINS)
def test_zero_field_high_temperature_limit_is_r_ln_2j_plus_1(spin):
    # Exact limit R ln(2J+1) (Pobell 2007, section 9.1): with B = 0 and b = 0.05 T at
    # 300 K, y ~ 2e-4 and S differs from the limit by J(J+1) y^2 / 6 < 1e-6 of R.
    s = pm.entropy(0.0, 300.0, spin, 2.0, 0.05)
    assert s == pytest.approx(R * math.log(2 * spin + 1), rel=1e-6)
    assert pm.spin_entropy_limit(spin) == pytest.approx(R * math.log(2 * spin + 1), rel=1e-15)


@pytest.mark.parametrize("spin", SPINS)
def test_third_law_entropy_and_heat_capacity_vanish(spin):
    # Third law: S -> 0 and C -> 0 as T -> 0 with B_eff > 0; at y = 2000 both are below
    # exp(-2000) ~ 0 in double precision, so exactly 0 is the expected value.
    t = 2.0 * MU_B * 0.05 / (K_B * 2000.0)
    assert pm.entropy(0.0, t, spin, 2.0, 0.05) == 0.0
    assert pm.heat_capacity(0.0, t, spin, 2.0, 0.05) == 0.0
    assert pm.entropy(1.0, 0.0, spin, 2.0, 0.05) == 0.0


@pytest.mark.parametrize("spin", SPINS)
@pytest.mark.parametrize("y", [1e-6, 1e-3, 0.01, 0.3, 1.0, 3.0, 10.0, 40.0])
def test_entropy_against_direct_sum_over_levels(spin, y):
    # Independent evaluation: the partition function summed level by level with
    # scipy.special.logsumexp; the two agree to rounding (1e-9 relative, or 1e-12 of R
    # absolute where S is tiny).
    t = 1.0
    field = y * K_B * t / (2.0 * MU_B)
    expected = R * direct_entropy(field, t, spin, 2.0, 0.0)
    assert pm.entropy(field, t, spin, 2.0, 0.0) == pytest.approx(expected, rel=1e-9, abs=1e-12 * R)


def test_two_level_brillouin_is_the_schottky_anomaly():
    # J = 1/2 in B_eff is a two-level system with gap Delta = g muB B_eff (Kittel and
    # Kroemer, Thermal Physics, ch. 3): the two closed forms agree to rounding.
    t = np.logspace(-3, 1, 50)
    gap = 2.0 * MU_B * math.hypot(0.3, 0.05)
    c_b = pm.heat_capacity(0.3, t, 0.5, 2.0, 0.05)
    s_b = pm.entropy(0.3, t, 0.5, 2.0, 0.05)
    np.testing.assert_allclose(c_b, pm.schottky_heat_capacity(gap, t), rtol=1e-9, atol=1e-300)
    np.testing.assert_allclose(s_b, pm.schottky_entropy(gap, t), rtol=1e-9, atol=1e-300)


def test_schottky_peak_height_and_position():
    # Exact maximum of x^2 e^x / (1 + e^x)^2 (x = Delta / kT): C_max = 0.43922 R at
    # kT / Delta = 0.41678 (the root of x tanh(x/2) = 2, x = 2.39936); the optimizer
    # and the printed digits are good to 1e-4.
    gap = K_B * 1.0
    res = optimize.minimize_scalar(
        lambda t: -pm.schottky_heat_capacity(gap, t),
        bounds=(0.1, 1.0),
        method="bounded",
        options={"xatol": 1e-9},
    )
    assert res.x == pytest.approx(0.41678, abs=1e-4)
    assert -res.fun / R == pytest.approx(0.43922, abs=1e-4)
    x = 1 / res.x
    assert x * math.tanh(x / 2) == pytest.approx(2.0, abs=1e-4)


@pytest.mark.parametrize("spin", SPINS)
def test_high_temperature_heat_capacity_tail(spin):
    # Curie-law tail (Pobell 2007, section 9.2): C T^2 / R -> J(J+1) g^2 muB^2 B_eff^2 / (3 k^2);
    # at y = 1e-4 the next term is of relative order y^2 ~ 1e-8.
    b_eff = 0.1
    t = 2.0 * MU_B * b_eff / (K_B * 1e-4)
    expected = spin * (spin + 1) * (2.0 * MU_B * b_eff / K_B) ** 2 / 3.0
    assert pm.heat_capacity(0.0, t, spin, 2.0, b_eff) * t**2 / R == pytest.approx(
        expected, rel=1e-6
    )


@pytest.mark.parametrize("spin", SPINS)
def test_magnetization_curie_law_and_saturation(spin):
    # Curie law at small y, M = N_A g^2 muB^2 J(J+1) B / (3 k T), and saturation
    # N_A g J muB at large y (Pathria and Beale, section 3.9); 1e-6 covers the y^2 term.
    g, field, t = 2.0, 0.01, 100.0
    curie = N_A * g**2 * MU_B**2 * spin * (spin + 1) * field / (3 * K_B * t)
    assert pm.magnetization(field, t, spin, g) == pytest.approx(curie, rel=1e-6)
    assert pm.magnetization(10.0, 1e-3, spin, g) == pytest.approx(N_A * g * spin * MU_B, rel=1e-12)
    assert pm.magnetization(0.0, 1.0, spin, g, 0.05) == 0.0


# ------------------------------------------------------------ thermodynamic identities


@pytest.mark.parametrize("spin", [0.5, 2.5, 3.5])
@pytest.mark.parametrize("field,t", [(0.2, 0.3), (1.0, 1.0), (3.0, 0.5), (0.0, 0.05)])
def test_heat_capacity_is_t_ds_dt(spin, field, t):
    # C_B = T (dS/dT)_B, by a central difference of step 1e-5 T (error ~ 1e-10 relative,
    # rounding ~ 1e-11 / 1e-5); 1e-6 is ample.
    h = 1e-5 * t
    ds = (
        pm.entropy(field, t + h, spin, 2.0, 0.05) - pm.entropy(field, t - h, spin, 2.0, 0.05)
    ) / (2 * h)
    assert pm.heat_capacity(field, t, spin, 2.0, 0.05) == pytest.approx(t * ds, rel=1e-6)


@pytest.mark.parametrize("spin", [0.5, 2.5])
@pytest.mark.parametrize("field,t", [(0.2, 0.3), (1.0, 1.0), (0.02, 0.05)])
def test_maxwell_relation(spin, field, t):
    # (dS/dB)_T = (dM/dT)_B, the Maxwell relation of the free energy F(B, T); central
    # differences as above.
    hb, ht = 1e-5 * field, 1e-5 * t
    ds_db = (
        pm.entropy(field + hb, t, spin, 2.0, 0.05) - pm.entropy(field - hb, t, spin, 2.0, 0.05)
    ) / (2 * hb)
    dm_dt = (
        pm.magnetization(field, t + ht, spin, 2.0, 0.05)
        - pm.magnetization(field, t - ht, spin, 2.0, 0.05)
    ) / (2 * ht)
    assert ds_db == pytest.approx(dm_dt, rel=1e-6)


def test_lattice_term_adds_a_t_cubed():
    # Debye T^3 lattice: C = a T^3, S = a T^3 / 3 (exact integrals of the T^3 law).
    a, t = 2e-3, 1.5
    assert pm.heat_capacity(1.0, t, 2.5, 2.0, 0.05, a) - pm.heat_capacity(
        1.0, t, 2.5, 2.0, 0.05
    ) == pytest.approx(a * t**3, rel=1e-12)
    assert pm.entropy(1.0, t, 2.5, 2.0, 0.05, a) - pm.entropy(
        1.0, t, 2.5, 2.0, 0.05
    ) == pytest.approx(a * t**3 / 3, rel=1e-12)


# ------------------------------------------------------------------- isentropes


@settings(max_examples=200, deadline=None)
@given(
    t_i=st.floats(0.05, 4.0),
    b_i=st.floats(0.01, 10.0),
    b_f=st.floats(0.0, 1.0),
    b=st.floats(1e-4, 0.5),
    spin=st.sampled_from(SPINS),
)
def test_isentrope_matches_ideal_paramagnet_closed_form(t_i, b_i, b_f, b, spin):
    # Ideal paramagnet with internal field: T_f = T_i sqrt(B_f^2 + b^2) / sqrt(B_i^2 + b^2)
    # (Pobell 2007, eq. 9.12). The bisection resolves ln T to ~1e-16; the isentrope's
    # slope amplifies rounding of S where S is near 0 or near R ln(2J+1), hence 1e-7.
    s = pm.entropy(b_i, t_i, spin, 2.0, b)
    if not 1e-12 * R < s < pm.spin_entropy_limit(spin) * (1 - 1e-9):
        return
    expected = t_i * math.hypot(b_f, b) / math.hypot(b_i, b)
    assert pm.demagnetization_temperature(t_i, b_i, b_f, spin, 2.0, b) == pytest.approx(
        expected, rel=1e-7
    )
    assert pm.ideal_demagnetization_temperature(t_i, b_i, b_f, b) == pytest.approx(
        expected, rel=1e-15
    )


def test_isentrope_vectorised_and_lattice_raises_the_end():
    # Broadcast shapes, and a lattice term hands the lattice's entropy at T_i to the spins,
    # so the end is warmer (second law: no entropy is lost).
    t_i = np.array([0.5, 1.0, 2.0])[:, None]
    b_i = np.array([0.5, 1.0, 2.0, 4.0])
    t_f = pm.demagnetization_temperature(t_i, b_i, 0.0, 2.5, 2.0, 0.05)
    assert t_f.shape == (3, 4)
    np.testing.assert_allclose(t_f, t_i * 0.05 / np.hypot(b_i, 0.05), rtol=1e-7)
    warm = pm.demagnetization_temperature(1.0, 1.0, 0.0, 2.5, 2.0, 0.05, lattice=0.05)
    assert warm > pm.demagnetization_temperature(1.0, 1.0, 0.0, 2.5, 2.0, 0.05)
    s_i = pm.entropy(1.0, 1.0, 2.5, 2.0, 0.05, 0.05)
    assert pm.entropy(0.0, warm, 2.5, 2.0, 0.05, 0.05) == pytest.approx(s_i, rel=1e-9)


def test_isentropic_field_closed_form():
    # Without a lattice S depends on B_eff / T alone: the field at which the isentrope
    # from (B_i, T_i) reaches T is sqrt((B_eff,i T / T_i)^2 - b^2) (Pobell 2007, sec. 9.2).
    b, b_i, t_i = 0.05, 1.0, 1.0
    s = pm.entropy(b_i, t_i, 2.5, 2.0, b)
    t = np.array([0.06, 0.1, 0.5, 0.9])
    expected = np.sqrt((math.hypot(b_i, b) * t / t_i) ** 2 - b**2)
    np.testing.assert_allclose(pm.isentropic_field(s, t, 2.5, 2.0, b), expected, rtol=1e-7)


# ------------------------------------------------------- heat of magnetization, hold


def test_magnetization_heat_is_integral_of_t_dm_dt():
    # Q = n T [S(0,T) - S(B,T)] = -n T int_0^B (dS/dB') dB' = -n T int_0^B (dM/dT) dB'
    # (Maxwell): the integral is done with scipy.integrate.quad over a finite-difference
    # dM/dT, good to 1e-6.
    n, field, t = 2.0, 1.0, 1.2
    ht = 1e-5 * t

    def dm_dt(bp):
        return (
            pm.magnetization(bp, t + ht, 2.5, 2.0, 0.05)
            - pm.magnetization(bp, t - ht, 2.5, 2.0, 0.05)
        ) / (2 * ht)

    integral, _ = integrate.quad(dm_dt, 0.0, field, epsabs=0, epsrel=1e-10)
    assert pm.magnetization_heat(n, field, t, 2.5, 2.0, 0.05) == pytest.approx(
        -n * t * integral, rel=1e-6
    )


def test_hold_time_is_isothermal_entropy_from_the_isentrope_field():
    # The brief's model: t = n [S(0, T_reg) - S(B_start, T_reg)] T_reg / Q with B_start the
    # field where the isentrope from (B_i, T_i) reaches T_reg; evaluated here step by step
    # (B_start by isentropic_field, then the isotherm's entropy) and compared, 1e-6.
    n, b_i, t_i, t_reg, q = 1.5, 2.0, 1.2, 0.1, 2e-6
    s_i = pm.entropy(b_i, t_i, 2.5, 2.0, 0.05)
    b_start = pm.isentropic_field(s_i, t_reg, 2.5, 2.0, 0.05)
    absorbed = (
        n
        * t_reg
        * (pm.entropy(0.0, t_reg, 2.5, 2.0, 0.05) - pm.entropy(b_start, t_reg, 2.5, 2.0, 0.05))
    )
    assert pm.hold_time(n, b_i, t_i, t_reg, q, 2.5, 2.0, 0.05) == pytest.approx(
        absorbed / q, rel=1e-6
    )
    # at the lowest temperature nothing is left to absorb
    lowest = pm.demagnetization_temperature(t_i, b_i, 0.0, 2.5, 2.0, 0.05)
    assert pm.hold_time(n, b_i, t_i, lowest * (1 + 1e-9), q, 2.5, 2.0, 0.05) < 1e-3


def test_bad_arguments_are_refused():
    with pytest.raises(ValueError, match="below zero"):
        pm.entropy(-1.0, 1.0, 2.5, 2.0, 0.05)
    with pytest.raises(ValueError, match="below 0 K"):
        pm.entropy(1.0, -1.0, 2.5, 2.0, 0.05)
    with pytest.raises(ValueError, match="half-integer"):
        pm.entropy(1.0, 1.0, 1.2, 2.0)
    with pytest.raises(ValueError, match="below what the salt reaches"):
        pm.hold_time(1.0, 1.0, 1.0, 0.01, 1e-6, 2.5, 2.0, 0.05)
    with pytest.raises(ValueError, match="above the temperature"):
        pm.hold_time(1.0, 1.0, 1.0, 1.5, 1e-6, 2.5, 2.0, 0.05)
    with pytest.raises(ValueError, match="free-spin limit"):
        pm.isentropic_temperature(R * math.log(6) * 1.01, 0.1, 2.5, 2.0, 0.05)


# ------------------------------------------------------------ properties everywhere


@settings(max_examples=300, deadline=None)
@given(
    field=st.floats(0.0, 50.0),
    t=st.floats(1e-7, 1e3),
    b=st.floats(0.0, 1.0),
    spin=st.sampled_from(SPINS),
    g=st.floats(0.01, 5.0),
)
def test_entropy_bounds_and_heat_capacity_sign(field, t, b, spin, g):
    # 0 <= S <= R ln(2J+1) and C >= 0 for any field and temperature (statistical mechanics
    # of a finite set of levels); finite everywhere.
    s = pm.entropy(field, t, spin, g, b)
    c = pm.heat_capacity(field, t, spin, g, b)
    m = pm.magnetization(field, t, spin, g, b)
    assert 0.0 <= s <= R * math.log(2 * spin + 1) * (1 + 1e-15)
    assert c >= 0.0
    assert all(math.isfinite(v) for v in (s, c, m))


@settings(max_examples=200, deadline=None)
@given(
    b1=st.floats(0.0, 10.0),
    b2=st.floats(0.0, 10.0),
    t1=st.floats(1e-4, 10.0),
    t2=st.floats(1e-4, 10.0),
    spin=st.sampled_from(SPINS),
)
def test_entropy_decreases_with_field_and_rises_with_temperature(b1, b2, t1, t2, spin):
    # Monotonic in B_eff / T (S(y) falls with y); the tolerance 1e-12 R is rounding.
    lo, hi = sorted((b1, b2))
    assert pm.entropy(hi, t1, spin, 2.0, 0.01) <= pm.entropy(lo, t1, spin, 2.0, 0.01) + 1e-12 * R
    cold, warm = sorted((t1, t2))
    assert (
        pm.entropy(b1, cold, spin, 2.0, 0.01) <= pm.entropy(b1, warm, spin, 2.0, 0.01) + 1e-12 * R
    )


def test_no_overflow_for_x_up_to_and_beyond_1e6():
    # x = g J muB B_eff / kT from 1e-300 to 1e300 (teslas at nanokelvin, and 0 K): no NaN,
    # no inf, and no overflow, division by zero or invalid operation (underflow to 0 of
    # exp(-y) is the correct value and is allowed).
    y = np.logspace(-300, 300, 601)
    field = y * K_B * 1.0 / (2.0 * MU_B)
    with np.errstate(over="raise", divide="raise", invalid="raise"):
        for f in (pm.entropy, pm.heat_capacity, pm.magnetization):
            out = f(field, 1.0, 3.5, 2.0)
            assert np.all(np.isfinite(out))
        assert np.all(np.isfinite(pm.entropy(field, 0.0, 3.5, 2.0, 0.05)))
    assert pm.brillouin_argument(1e4, 1e-3, 3.5, 2.0) > 1e6
