"""Tray and duct fill (sizing/fill.py), computed by hand.

Outer diameters: sizing/fill.py DEFAULT_CABLE_OD_MM, typical 0.6/1 kV XLPE/PVC
multi-core copper cables from makers' data sheets, from memory (the table says so).
"""

from __future__ import annotations

import math

import pytest
from cablewright.core.errors import OutOfRangeError
from cablewright.sizing.fill import (
    DEFAULT_CABLE_OD_MM,
    OD_SOURCE,
    duct_fill_pct,
    outer_diameter_mm,
    segment_fill,
    tray_fill_pct,
)


def test_the_diameter_table_names_its_source():
    assert "from memory" in OD_SOURCE
    assert DEFAULT_CABLE_OD_MM["4x95"] == 42.0


def test_tray_fill_of_one_segment_by_hand():
    # three 4C 95 (42 mm each, typical maker data, from memory) and one 4C 25 (26 mm)
    # on a 300 mm tray, one layer: (3 x 42 + 26) / 300 = 152 / 300 = 50.67 %
    d = [outer_diameter_mm(4, 95)] * 3 + [outer_diameter_mm(4, 25)]
    assert tray_fill_pct(d, 300.0) == pytest.approx(152.0 / 300.0 * 100.0)
    fill = segment_fill("S1", "tray", 300.0, d, 80.0)
    assert fill.result == "pass" and fill.percent == pytest.approx(50.667, abs=1e-3)


def test_duct_fill_by_hand():
    # two 4C 16 (22 mm) in a 100 mm duct: 2 x 22² / 100² = 9.68 % (areas pi d²/4 cancel)
    assert duct_fill_pct([22.0, 22.0], 100.0) == pytest.approx(9.68)


def test_limits_warning_and_fail():
    assert segment_fill("S", "tray", 100.0, [42.0, 42.0], 80.0).result == "warning"  # 84 %
    assert segment_fill("S", "tray", 100.0, [42.0, 42.0, 42.0], 80.0).result == "fail"  # 126 %
    assert segment_fill("S", "duct", 50.0, [42.0], 40.0).result == "warning"  # 70.6 %
    assert segment_fill("S", "buried", None, [42.0], 40.0).result == "not_applicable"


def test_unknown_diameter_or_size_is_not_checked():
    assert outer_diameter_mm(7, 2.5) is None
    assert segment_fill("S", "tray", 300.0, [42.0], 80.0, missing=["7x2.5"]).result == "not_checked"
    assert segment_fill("S", "tray", None, [42.0], 80.0).result == "not_checked"
    with pytest.raises(OutOfRangeError):
        tray_fill_pct([10.0], 0.0)


def test_project_diameters_win_over_the_defaults():
    assert outer_diameter_mm(4, 95, {"4x95": 40.5}) == 40.5
    assert outer_diameter_mm(4, 16, {"4x95": 40.5}) == DEFAULT_CABLE_OD_MM["4x16"]
    assert math.isclose(duct_fill_pct([50.0], 100.0), 25.0)
