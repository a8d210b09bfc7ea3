"""Earth-fault disconnection in TN systems: IEC 60364-4-41:2005 411.4.4 and Table 41.1."""

from __future__ import annotations

import pytest
from cablewright.core.errors import OutOfRangeError, UnknownKeyError
from cablewright.sizing.conductor_resistance import dc_resistance_20c_ohm_per_km
from cablewright.sizing.disconnection import (
    GG_GATES,
    breaker_ia_a,
    check_disconnection_tn,
    fault_loop_temperature_c,
    fuse_ia_a,
    loop_resistance_ohm_per_m,
    max_disconnection_time_s,
    max_length_m,
)
from hypothesis import given, settings
from hypothesis import strategies as st


@pytest.mark.parametrize(
    ("u0", "tn", "tt"),
    [
        # IEC 60364-4-41:2005 Table 41.1, a.c., final circuits <= 32 A.
        (110, 0.8, 0.3), (230, 0.4, 0.2), (400, 0.2, 0.07), (690, 0.1, 0.04),
    ],
)
def test_table_41_1_times(u0, tn, tt):
    assert max_disconnection_time_s(u0, 16, True, "TN") == tn
    assert max_disconnection_time_s(u0, 16, True, "TT") == tt


def test_distribution_and_large_circuits_5_s():
    # IEC 60364-4-41:2005 411.3.2.3 (TN 5 s) and 411.3.2.4 (TT 1 s).
    assert max_disconnection_time_s(230, 40) == 5.0
    assert max_disconnection_time_s(230, 16, final_circuit=False) == 5.0
    assert max_disconnection_time_s(230, 63, earthing="TT") == 1.0
    with pytest.raises(UnknownKeyError):
        max_disconnection_time_s(230, 16, earthing="IT")
    with pytest.raises(OutOfRangeError):
        max_disconnection_time_s(40, 16)


@pytest.mark.parametrize(
    ("curve", "zs_max"),
    [
        # BS 7671:2018+A2:2022 Table 41.3, 10 A circuit-breakers, 0.4 s, U0 230 V,
        # Cmin 0.95 (as reproduced on a public max-Zs page): B 4.37, C 2.19, D 1.09 Ω.
        ("B", 4.37), ("C", 2.19), ("D", 1.09),
    ],
)
def test_max_zs_of_10_a_breakers(curve, zs_max):
    ia, _ = breaker_ia_a(10, curve)  # IEC 60898-1:2015 Table 7 upper limits
    assert round(0.95 * 230 / ia, 2) == zs_max


def test_conventional_method_example_58_6_m():
    # Published TN design course ("Earthing system TN and IT, design",
    # simplified method 1, resistive loop): 10 A type C breaker, 3-core
    # 1.5 mm² copper (m = 1), rho 22.5 mΩ·mm²/m, 80 % of U0 = 220 V:
    # maximum length 58.6 m (contact voltage 88 V).
    r_loop = 0.0225 * (1 + 1) / 1.5
    lmax = max_length_m(220, breaker_ia_a(10, "C")[0], 0.0, r_loop, voltage_factor=0.8)
    assert lmax == pytest.approx(58.6, abs=0.1)
    assert 0.8 * 220 / 2 == pytest.approx(88)  # the contact voltage of the same example


def test_max_cable_run_example_57_9_m():
    # Public worked example (max Zs for a 10 A type C MCB): Zs 2.19 Ω, testing
    # limit 80 % = 1.75 Ω, Ze 0.35 Ω, 1.5 mm² line and cpc R1+R2 = 24.2 mΩ/m
    # at 20 °C -> 57.9 m.  R1+R2 here from IEC 60228:2004 Table 2 (12.1 Ω/km);
    # the page rounds 1.748 to 1.75 Ω before dividing, hence abs 0.2.
    r = loop_resistance_ohm_per_m(1.5, 1.5, "Cu", 20.0)
    assert r * 1000 == pytest.approx(2 * dc_resistance_20c_ohm_per_km(1.5, "Cu"))
    assert r * 1000 == pytest.approx(24.2)
    lmax = max_length_m(230, 100, 0.35, r, voltage_factor=0.95 * 0.8)
    assert lmax == pytest.approx(57.9, abs=0.2)


def test_fault_loop_temperature_is_mean_of_table_52_1_and_43a():
    # (70 + 160)/2 and (90 + 250)/2: IEC 60364-5-52 Table 52.1, IEC 60364-4-43 Table 43A.
    assert fault_loop_temperature_c("PVC") == 115.0
    assert fault_loop_temperature_c("XLPE") == 170.0


def test_fuse_gates_are_ordered():
    # Structure of IEC 60269-1 Table 3 gates: Imin(10 s) < Imax(5 s) <= Imin(0.1 s) < Imax(0.1 s).
    prev = 0
    for g in GG_GATES:
        assert g.rating_a > prev
        assert g.imin_10s_a < g.imax_5s_a <= g.imin_0_1s_a < g.imax_0_1s_a
        prev = g.rating_a
    assert fuse_ia_a(100, 5.0)[0] == 580.0
    with pytest.raises(OutOfRangeError):
        fuse_ia_a(10, 0.4)


def test_failing_circuit_reports_max_length():
    r = check_disconnection_tn(230, 60, 1.5, 1.5, "Cu", "PVC", "breaker", 16, 0.35, curve="C")
    assert not r.passed
    assert r.zs_max_ohm == pytest.approx(230 / 160)
    assert r.max_length_m < 60
    at_max = check_disconnection_tn(230, r.max_length_m, 1.5, 1.5, "Cu", "PVC", "breaker", 16,
                                    0.35, curve="C")
    assert at_max.zs_ohm == pytest.approx(at_max.zs_max_ohm)


@settings(max_examples=60, deadline=None)
@given(l1=st.floats(1, 500), l2=st.floats(1, 500), csa=st.sampled_from([1.5, 2.5, 4, 10, 35]),
       ze=st.floats(0, 0.8))
def test_longer_run_never_raises_max_length(l1, l2, csa, ze):
    short, long_ = sorted((l1, l2))
    a = check_disconnection_tn(230, short, csa, csa, "Cu", "XLPE", "breaker", 20, ze, curve="B")
    b = check_disconnection_tn(230, long_, csa, csa, "Cu", "XLPE", "breaker", 20, ze, curve="B")
    assert b.max_length_m <= a.max_length_m + 1e-9
    assert b.zs_ohm >= a.zs_ohm
    assert (not b.passed) or a.passed
