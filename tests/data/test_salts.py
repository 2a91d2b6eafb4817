"""Tests of cryoplan.data.salts: the bundled salt files and the reader's located errors.

Every expected number names its source; every tolerance says why it is that wide.
"""

from __future__ import annotations

import math
import sys
from pathlib import Path

import numpy as np
import pytest
from scipy import constants

from cryoplan.data import salts
from cryoplan.errors import InputError, UnknownNameError

if sys.version_info >= (3, 11):
    import tomllib
else:  # pragma: no cover
    import tomli as tomllib

R = constants.R
MU_B_OVER_K = constants.physical_constants["Bohr magneton"][0] / constants.k
FOUR = ["cerium-magnesium-nitrate", "chromium-potassium-alum", "ferric-ammonium-alum",
        "gadolinium-gallium-garnet"]  # fmt: skip
VALUE_KEYS = [
    "spin",
    "g_factor",
    "molar_mass",
    "ions_per_formula",
    "density",
    "internal_field",
    "ordering_temperature",
]


def test_bundled_salts_and_aliases():
    assert salts.salt_ids() == FOUR
    assert salts.salt("FAA").id == "ferric-ammonium-alum"
    assert salts.salt(" cmn ").id == "cerium-magnesium-nitrate"


def test_unknown_salt_names_the_closest_ids():
    with pytest.raises(UnknownNameError) as info:
        salts.salt("ferric-amonium-alum")
    assert "ferric-ammonium-alum" in info.value.suggestions
    assert "did you mean" in str(info.value)


@pytest.mark.parametrize("sid", FOUR)
def test_every_value_has_its_source(sid):
    # The project's rule: every value beside its source ("from memory" where recalled).
    data = tomllib.loads((salts.salts_folder() / f"{sid}.toml").read_text(encoding="utf-8"))
    for key in VALUE_KEYS:
        assert isinstance(data[key], dict) and data[key]["source"].strip(), key
    assert len(salts.salt(sid).sources) == len(VALUE_KEYS)


@pytest.mark.parametrize(
    "sid,spin,ln_levels",
    [
        # free-ion ground states (Pobell 2007, table 9.1; from memory): Ce3+ doublet,
        # Cr3+ S = 3/2, Fe3+ S = 5/2, Gd3+ S = 7/2; the limit R ln(2J+1) is exact
        ("cerium-magnesium-nitrate", 0.5, math.log(2)),
        ("chromium-potassium-alum", 1.5, math.log(4)),
        ("ferric-ammonium-alum", 2.5, math.log(6)),
        ("gadolinium-gallium-garnet", 3.5, math.log(8)),
    ],
)
def test_spins_and_entropy_limit(sid, spin, ln_levels):
    s = salts.salt(sid)
    assert s.spin == spin
    # at 300 K and zero field the internal field removes less than 1e-5 of R ln(2J+1)
    assert s.entropy(0.0, 300.0) == pytest.approx(R * ln_levels, rel=1e-5)
    assert s.entropy_limit == pytest.approx(R * ln_levels, rel=1e-15)


def test_molar_mass_per_ion_and_ion_density():
    # Per mol of magnetic ions: the formula unit's mass over its ions (CMN has two Ce,
    # GGG three Gd); ion density = density / molar mass.
    cmn = salts.salt("cerium-magnesium-nitrate")
    assert cmn.molar_mass == pytest.approx(cmn.formula_molar_mass / 2, rel=1e-15)
    ggg = salts.salt("gadolinium-gallium-garnet")
    assert ggg.molar_mass == pytest.approx(1.01235 / 3, rel=1e-12)
    assert ggg.ion_density == pytest.approx(7080.0 / (1.01235 / 3), rel=1e-12)
    assert salts.salt("ferric-ammonium-alum").moles(0.48218) == pytest.approx(1.0, rel=1e-12)


@pytest.mark.parametrize(
    "sid,ct2_over_r",
    [
        # the sources' derivations: C T^2 / R = J(J+1) g^2 muB^2 b^2 / (3 k^2) reproduces
        # the quoted specific-heat tails (CMN 6e-6 K^2, CPA delta^2/4 = 0.018 K^2, both
        # from memory) to the one or two digits of b in the files
        ("cerium-magnesium-nitrate", 6e-6),
        ("chromium-potassium-alum", 0.018),
    ],
)
def test_internal_fields_reproduce_their_specific_heat_tails(sid, ct2_over_r):
    s = salts.salt(sid)
    tail = s.spin * (s.spin + 1) * (s.g_factor * MU_B_OVER_K * s.internal_field) ** 2 / 3
    assert tail == pytest.approx(ct2_over_r, rel=0.05)
    # and the Salt's heat capacity has that tail at high temperature (y ~ 1e-3 at 100 K,
    # the next term of relative order y^2)
    assert s.heat_capacity(0.0, 100.0) * 1e4 / R == pytest.approx(tail, rel=1e-5)


def test_state_functions_broadcast():
    s = salts.salt("ferric-ammonium-alum")
    b = np.linspace(0, 5, 7)[:, None]
    t = np.linspace(0.05, 4, 11)
    assert s.entropy(b, t).shape == (7, 11)
    assert s.heat_capacity(b, t).shape == (7, 11)
    assert s.magnetization(b, t).shape == (7, 11)
    # ideal-paramagnet isentrope, T_i b / sqrt(B_i^2 + b^2) (Pobell 2007, eq. 9.12)
    assert s.demagnetization_temperature(1.0, 1.0) == pytest.approx(
        0.05 / math.hypot(1, 0.05), rel=1e-7
    )
    d = s.to_dict()
    assert d["internal_field_T"] == 0.05 and d["sources"]


GOOD = """id = "test-salt"
name = "Test salt"
spin = { value = 2.5, source = "s1" }
g_factor = { value = 2.0, source = "s2" }
molar_mass = { value = "482.18 g/mol", source = "s3" }
ions_per_formula = { value = 1, source = "s4" }
density = { value = "1.71 g/cm^3", source = "s5" }
internal_field = { value = "50 mT", source = "s6" }
ordering_temperature = { value = "26 mK", source = "s7" }
"""


def _write(tmp_path: Path, text: str) -> Path:
    path = tmp_path / "test-salt.toml"
    path.write_text(text, encoding="utf-8")
    return path


def test_good_file_and_units(tmp_path):
    s = salts.read_salt_file(
        _write(tmp_path, GOOD + 'lattice = { value = "1e-3 J/(K^4 mol)", source = "s8" }\n')
    )
    assert s.internal_field == pytest.approx(0.05, rel=1e-15)
    assert s.ordering_temperature == pytest.approx(0.026, rel=1e-15)
    assert s.density == pytest.approx(1710.0, rel=1e-12)
    assert s.lattice == pytest.approx(1e-3, rel=1e-12)
    assert salts.salt("test-salt", folder=tmp_path).name == "Test salt"


@pytest.mark.parametrize(
    "old,new,key,message",
    [
        (
            'value = "50 mT", source = "s6"',
            'value = "-50 mT", source = "s6"',
            "internal_field",
            "below zero",
        ),
        (
            'value = "50 mT", source = "s6"',
            'value = "50 kg", source = "s6"',
            "internal_field",
            "wrong kind",
        ),
        ('{ value = 2.0, source = "s2" }', "2.0", "g_factor", "without its source"),
        ('value = 2.5, source = "s1"', 'value = 2.4, source = "s1"', "spin", "half-integer"),
        ('density = { value = "1.71 g/cm^3", source = "s5" }\n', "", "density", "missing"),
        ('value = "482.18 g/mol"', 'value = "482.18 g"', "molar_mass", "molar mass"),
    ],
)
def test_bad_files_give_located_errors(tmp_path, old, new, key, message):
    assert old in GOOD
    path = _write(tmp_path, GOOD.replace(old, new))
    with pytest.raises(InputError) as info:
        salts.read_salt_file(path)
    err = info.value
    assert err.file == str(path) and err.key == key
    assert message in str(err)
    if new:  # the key is still in the file: its line is named
        line = next(
            i + 1 for i, t in enumerate(path.read_text().splitlines()) if t.startswith(key)
        )
        assert err.line == line


def test_not_toml(tmp_path):
    with pytest.raises(InputError, match="not valid TOML") as info:
        salts.read_salt_file(_write(tmp_path, "id = \n"))
    assert info.value.line == 1
