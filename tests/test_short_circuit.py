"""Short-circuit withstand: IEC 60364-4-43:2008 434.5.2 and Table 43A; IEC 60909-0:2016 Table 1."""

from __future__ import annotations

import math

import pytest
from cablewright.core.errors import OutOfRangeError, UnknownKeyError
from cablewright.sizing.short_circuit import (
    VOLTAGE_FACTOR_LV,
    adiabatic_min_csa_mm2,
    adiabatic_withstand_time_s,
    fault_current_ka,
    k_value,
    source_impedance_ohm,
)
from hypothesis import given, settings
from hypothesis import strategies as st


@pytest.mark.parametrize(
    ("conductor", "insulation", "csa", "k"),
    [
        # IEC 60364-4-43:2008 Table 43A (the same values are printed in
        # BS 7671:2018 Table 43.1): PVC 70 °C <= 300 mm², > 300 mm², thermosetting 90 °C.
        ("Cu", "PVC", 2.5, 115),
        ("Cu", "PVC", 300, 115),
        ("Cu", "PVC", 400, 103),
        ("Al", "PVC", 95, 76),
        ("Al", "PVC", 400, 68),
        ("Cu", "XLPE", 16, 143),
        ("Cu", "EPR", 16, 143),
        ("Al", "XLPE", 240, 94),
    ],
)
def test_k_values_of_table_43a(conductor, insulation, csa, k):
    assert k_value(conductor, insulation, csa) == k


def test_unknown_material_raises():
    with pytest.raises(UnknownKeyError):
        k_value("Fe", "PVC", 10)
    with pytest.raises(UnknownKeyError):
        k_value("Cu", "rubber", 10)


def test_worked_example_3ka_xlpe():
    # Public worked example ("how to size a cable" page): Isc 3 kA, t 0.1 s,
    # Cu/XLPE k = 143 -> S_min = 6.6 mm², choose 10 mm².
    s = adiabatic_min_csa_mm2(3000, 0.1, k_value("Cu", "XLPE", 10))
    assert round(s, 1) == 6.6


def test_worked_example_2500a_pvc():
    # Public worked example ("electrical cable calculation" page): 2500 A,
    # 0.1 s, PVC copper k = 115 -> about 6.9 mm².
    s = adiabatic_min_csa_mm2(2500, 0.1, k_value("Cu", "PVC", 10))
    assert s == pytest.approx(6.9, abs=0.05)


def test_withstand_time_inverts_the_equation():
    # t = (kS/I)^2 of 434.5.2 and S = I sqrt(t)/k are the same equation.
    t = adiabatic_withstand_time_s(10, 4000, 115)
    assert adiabatic_min_csa_mm2(4000, t, 115) == pytest.approx(10)


def test_time_outside_5_s_raises():
    # 434.5.2 holds for durations up to 5 s.
    with pytest.raises(OutOfRangeError):
        adiabatic_min_csa_mm2(1000, 6.0, 115)


def test_voltage_factors_of_iec_60909_table_1():
    # IEC 60909-0:2016 Table 1, low voltage: cmax 1.05 (+6 %), 1.10 (+10 %), cmin 0.95.
    assert VOLTAGE_FACTOR_LV == {"max_6pct": 1.05, "max_10pct": 1.10, "min": 0.95}


def test_source_impedance_gives_back_the_fault_level():
    # IEC 60909-0:2016 (3): I''k = c Un / (sqrt 3 ZQ); zero cable length returns it.
    zq = source_impedance_ohm(20, 400, 1.05)
    assert 1.05 * 400 / (math.sqrt(3) * zq) == pytest.approx(20000)
    assert fault_current_ka(20, 400, 0.0, 95, "Cu") == pytest.approx(20)


def test_load_end_fault_is_lower_and_min_below_max():
    i_max = fault_current_ka(20, 400, 80, 50, "Cu", conductor_temp_c=20, c=1.05)
    i_min = fault_current_ka(20, 400, 80, 50, "Cu", conductor_temp_c=250, c=0.95)
    assert i_min < i_max < 20


@settings(max_examples=60, deadline=None)
@given(
    i1=st.floats(100, 50000), i2=st.floats(100, 50000),
    t1=st.floats(0.01, 5.0), t2=st.floats(0.01, 5.0),
)
def test_higher_fault_or_longer_time_never_needs_less(i1, i2, t1, t2):
    lo_i, hi_i = sorted((i1, i2))
    lo_t, hi_t = sorted((t1, t2))
    assert adiabatic_min_csa_mm2(hi_i, lo_t, 143) >= adiabatic_min_csa_mm2(lo_i, lo_t, 143)
    assert adiabatic_min_csa_mm2(lo_i, hi_t, 143) >= adiabatic_min_csa_mm2(lo_i, lo_t, 143)
