"""The salt commands and the public salt API (cryoplan.salt, cryoplan.salt_ids)."""

from __future__ import annotations

import json
import math

import pytest

import cryoplan
from cryoplan.cli import main
from cryoplan.errors import UnknownNameError

R = 8.314462618  # J/(mol K), the molar gas constant (CODATA 2018, exact by definition)


def test_public_salt_api_contract():
    ids = cryoplan.salt_ids()
    assert "ferric-ammonium-alum" in ids
    s = cryoplan.salt("ferric-ammonium-alum")
    # Fe3+ is an S-state ion: J = 5/2, g = 2 (Pobell 2007, table 9.1; from memory)
    assert s.spin == 2.5 and s.g_factor == pytest.approx(2.0, abs=0.01)
    # zero field, temperature far above the interaction field: R ln(2J+1) (exact limit)
    assert s.entropy(0.0, 50.0) == pytest.approx(R * math.log(6), rel=1e-4)
    with pytest.raises(UnknownNameError) as err:
        cryoplan.salt("ferric-amonium-alum")
    assert "ferric-ammonium-alum" in str(err.value)


def test_salts_lists_every_salt_as_json(capsys):
    assert main(["salts", "--format", "json"]) == 0
    listed = {entry["id"] for entry in json.loads(capsys.readouterr().out)}
    assert listed == set(cryoplan.salt_ids())


def test_salt_demagnetization_matches_the_ideal_paramagnet(capsys):
    # ideal paramagnet with internal field b: T_f = T_i b / sqrt(B_i^2 + b^2)
    # (the isentrope of S(B_eff / T); Pobell 2007, section 9.2)
    assert main(["salt", "faa", "--field", "1 T", "--at", "1 K", "--format", "json"]) == 0
    point = json.loads(capsys.readouterr().out)["points"][0]
    b = cryoplan.salt("faa").internal_field
    assert point["demagnetized_to_K"] == pytest.approx(b / math.hypot(1.0, b), rel=1e-3)


@pytest.mark.parametrize(
    "argv",
    [
        ["salt", "faa", "--field", "1 X"],
        ["salt", "faa", "--field", "-1 T"],
        ["salt", "faa", "--at", "0 K"],
        ["salt", "nonesuch"],
    ],
)
def test_salt_bad_arguments_exit_2_with_one_message(argv, capsys):
    assert main(argv) == 2
    err = capsys.readouterr().err
    assert err.startswith("cryoplan: ") and "Traceback" not in err
