"""Tests of cryoplan.physics.nuclear: copper's nuclear heat capacity in a field.

Every expected number names its source; every tolerance says why it is that wide.
"""

from __future__ import annotations

import numpy as np
import pytest
from scipy import constants

from cryoplan.physics import nuclear

R = constants.R


def test_copper_coefficient_against_pobell():
    # Pobell (2007), table 10.1: C_n T^2 / (n B^2) = 3.22 uJ K/(mol T^2) for copper
    # (from memory). Computed here from the isotopes' moments and abundances (also from
    # memory); 2 % covers the rounding of the moments and the book's value.
    a = nuclear.nuclear_heat_capacity_coefficient()
    assert a == pytest.approx(3.22e-6, rel=0.02)
    assert nuclear.nuclear_curie_constant() == pytest.approx(constants.mu_0 * a, rel=1e-15)


def test_tail_is_the_high_temperature_limit_of_the_exact_form():
    # The T^-2 tail is the first term of the Brillouin heat capacity's expansion: at
    # 1 K in 9 T (mu B / kT ~ 7e-3) they agree to the next term's size, 1e-4.
    exact = nuclear.nuclear_heat_capacity(9.0, 1.0, exact=True)
    tail = nuclear.nuclear_heat_capacity(9.0, 1.0)
    assert tail == pytest.approx(exact, rel=1e-4)
    # and the exact form stays finite at 0 K (third law: C -> 0)
    assert nuclear.nuclear_heat_capacity(9.0, 0.0, exact=True) == 0.0


def test_entropy_limit_and_field_reduction():
    # Spin 3/2: R ln 4 at high temperature and zero field (exact); a field lowers it.
    assert nuclear.nuclear_entropy(0.0, 1.0) == pytest.approx(R * np.log(4), rel=1e-9)
    assert nuclear.nuclear_entropy(9.0, 0.01) < nuclear.nuclear_entropy(0.0, 0.01)


def test_per_kilogram_uses_copper_molar_mass():
    # 63.546 g/mol (IUPAC, from memory; the copper material file carries the same value).
    c_mol = nuclear.nuclear_heat_capacity(5.0, 0.05)
    assert nuclear.copper_nuclear_heat_capacity(5.0, 0.05, exact=False) == pytest.approx(
        c_mol / 63.546e-3, rel=1e-12
    )
