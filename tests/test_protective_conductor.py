"""Protective conductor: IEC 60364-5-54:2011 Table 54.2 and 543.1.2."""

from __future__ import annotations

import pytest
from cablewright.core.errors import OutOfRangeError, UnknownKeyError
from cablewright.sizing.protective_conductor import (
    protective_conductor,
    table_54_2_min_csa_mm2,
)


@pytest.mark.parametrize(
    ("line", "pe"),
    [
        # IEC 60364-5-54:2011 Table 54.2 (same rule restated in "Basic Electrical
        # Installation Work", protective conductor size): S <= 16 -> S;
        # 16 < S <= 35 -> 16; S > 35 -> S/2.
        (1.5, 1.5), (2.5, 2.5), (16, 16), (25, 16), (35, 16), (50, 25), (70, 35),
        (95, 47.5), (240, 120),
    ],
)
def test_table_54_2_rule(line, pe):
    assert table_54_2_min_csa_mm2(line) == pe


@pytest.mark.parametrize(("line", "standard"), [(95, 50), (120, 70), (150, 95), (185, 95), (300, 150)])
def test_half_size_rounds_up_to_an_iec_60228_size(line, standard):
    # S/2 rounded up to the next size of IEC 60228:2004 Table 2 (95 -> 47.5 -> 50).
    assert protective_conductor(line).csa_mm2 == standard


def test_adiabatic_rule_543_1_2():
    # 543.1.2: S = sqrt(I² t)/k; 4 kA for 0.4 s on a Cu/XLPE core (k 143,
    # Table A.54.3) needs 17.7 mm², so 25 mm² — below the 50 mm² of Table 54.2.
    pe = protective_conductor(95, "Cu", "XLPE", "adiabatic", 4000, 0.4)
    assert pe.required_mm2 == pytest.approx(4000 * 0.4**0.5 / 143)
    assert pe.csa_mm2 == 25
    # never above the Table 54.2 value, which always satisfies 543.1
    big = protective_conductor(16, "Cu", "PVC", "adiabatic", 20000, 1.0)
    assert big.csa_mm2 == 16


def test_bad_inputs_raise():
    with pytest.raises(UnknownKeyError):
        protective_conductor(10, rule="guess")
    with pytest.raises(OutOfRangeError):
        protective_conductor(10, rule="adiabatic")
    with pytest.raises(OutOfRangeError):
        table_54_2_min_csa_mm2(0)
