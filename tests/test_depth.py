"""Depth-of-laying correction for buried cables, from IEC 60287-2-1:2015 4.2.3.2."""

from __future__ import annotations

import math

import pytest
from cablewright.core.errors import OutOfRangeError, UnknownKeyError
from cablewright.sizing.depth import (
    TYPICAL_INTERNAL_RATIO,
    depth_factor,
    depth_factor_for_method,
    external_thermal_resistance_k_m_w,
)
from cablewright.sizing.model import CircuitSpec, Load, Stretch
from cablewright.sizing.select import size_circuit, stretch_rating

# IEC 60502-2:2014 Annex B Table B.12, correction factors for depths of laying
# (to the cable axis) for direct buried cables, normalised to 0.8 m; columns
# nominal conductor size <= 185 mm² and > 185 mm².  From memory: no public copy
# of the table was found to check the cells.
TABLE_B12 = {
    0.5: (1.04, 1.06), 0.6: (1.02, 1.04), 1.0: (0.98, 0.97), 1.25: (0.96, 0.95),
    1.5: (0.95, 0.93), 1.75: (0.94, 0.91), 2.0: (0.93, 0.90), 2.5: (0.91, 0.88),
    3.0: (0.90, 0.86),
}


@pytest.mark.parametrize("depth", sorted(TABLE_B12))
def test_against_iec_60502_2_table_b12_within_3_percent(depth):
    # Typical outer diameters of the three-core cables of that table: about
    # 60 mm up to 185 mm², 90 mm above (common practice); k the module's D2 value.
    small, large = TABLE_B12[depth]
    k = TYPICAL_INTERNAL_RATIO["D2"]
    assert depth_factor(depth, 0.8, 0.06, k) == pytest.approx(small, rel=0.03)
    assert depth_factor(depth, 0.8, 0.09, k) == pytest.approx(large, rel=0.03)


def test_t4_formula_of_iec_60287_2_1():
    # T4 = rho/(2 pi) ln(u + sqrt(u² - 1)), u = 2L/De; for large u about
    # rho/(2 pi) ln(2u) (IEC 60287-2-1:2015 4.2.3.2 and its approximation).
    t4 = external_thermal_resistance_k_m_w(1.0, 0.04, 2.5)
    u = 2 * 1.0 / 0.04
    assert t4 == pytest.approx(2.5 / (2 * math.pi) * math.acosh(u))
    assert t4 == pytest.approx(2.5 / (2 * math.pi) * math.log(2 * u), rel=1e-3)


def test_reference_is_one_and_deeper_is_lower():
    assert depth_factor(0.7) == 1.0
    values = [depth_factor(d) for d in (0.4, 0.7, 1.0, 1.5, 2.0, 3.0)]
    assert values == sorted(values, reverse=True)


@pytest.mark.parametrize("depth", [0.1, 3.5])
def test_outside_range_raises(depth):
    with pytest.raises(OutOfRangeError):
        depth_factor(depth)


def test_method_other_than_d_raises():
    with pytest.raises(UnknownKeyError):
        depth_factor_for_method("E", 1.0)


def test_select_applies_a_depth_factor_on_d2():
    spec = CircuitSpec("D-1", Load(55, "kW"), 400, design_length_m=50,
                       stretches=(Stretch(method="D2", depth_m=1.5),))
    deep = stretch_rating(spec.stretches[0], spec, 35, 1, _cfg())
    ref = stretch_rating(Stretch(method="D2"), spec, 35, 1, _cfg())
    factor = next(f for f in deep[2] if f.name == "depth")
    assert factor.value == pytest.approx(depth_factor_for_method("D2", 1.5).value)
    assert deep[0] == pytest.approx(ref[0] * factor.value)
    assert not any(f.name == "depth" for f in ref[2])
    result = size_circuit(spec)
    assert any(f.name == "depth" for f in result.factors)


def _cfg():
    from cablewright.sizing.config import SizingConfig
    return SizingConfig()
