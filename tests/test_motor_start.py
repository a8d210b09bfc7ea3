"""Motor starting dip (IEC 60364-5-52:2009 Annex G formula at the starting current)."""

from __future__ import annotations

import math

import pytest
from cablewright.core.errors import UnknownKeyError
from cablewright.sizing.conductor_resistance import dc_resistance_20c_ohm_per_km
from cablewright.sizing.config import SizingConfig
from cablewright.sizing.model import CircuitSpec, Load, Stretch
from cablewright.sizing.motor_start import DEFAULT_STARTERS, starter_data, starting_dip_percent
from cablewright.sizing.select import size_circuit


def test_dol_default_in_the_common_range():
    # Common practice: DOL 6-7 x In at cos φ about 0.3.
    dol = starter_data("direct-on-line")
    assert 6 <= dol.current_multiple <= 7 and dol.power_factor == 0.3
    assert starter_data("Star-Delta").current_multiple < dol.current_multiple
    with pytest.raises(UnknownKeyError):
        starter_data("autotransformer")


def test_dip_by_hand_with_iec_60228_resistance():
    # ΔU = √3 I_st L (R cos φ + X sin φ), R from IEC 60228:2004 Table 2 (16 mm²
    # Cu 1.15 Ω/km) corrected to 90 °C with Annex B's (234.5 + θ)/254.5,
    # X = 0.08 mΩ/m (IEC 60364-5-52 Annex G).
    r90 = dc_resistance_20c_ohm_per_km(16, "Cu") / 1000 * (234.5 + 90) / 254.5
    i_st = 7 * 55
    sin_phi = math.sqrt(1 - 0.3**2)
    by_hand = 100 * math.sqrt(3) * i_st * 100 * (r90 * 0.3 + 0.08e-3 * sin_phi) / 400
    dip = starting_dip_percent(55, DEFAULT_STARTERS["dol"], 100, 16, "Cu", 400)
    assert dip == pytest.approx(by_hand, rel=1e-3)


def test_source_impedance_adds_to_the_dip():
    base = starting_dip_percent(55, DEFAULT_STARTERS["dol"], 100, 16, "Cu", 400)
    stiff = starting_dip_percent(55, DEFAULT_STARTERS["dol"], 100, 16, "Cu", 400, source_fault_ka=50)
    weak = starting_dip_percent(55, DEFAULT_STARTERS["dol"], 100, 16, "Cu", 400, source_fault_ka=5)
    assert base < stiff < weak


def _motor(length_m=150.0, **extra):
    return CircuitSpec("M-1", Load(30, "kW"), 400, load_type="motor", design_length_m=length_m,
                       stretches=(Stretch(method="E"),), extra=tuple(extra.items()))


def test_motor_failing_start_is_upsized():
    # disconnection upsizing off: this test is about the dip alone
    cfg = SizingConfig(motor_start_dip_pct=10.0, disconnection_upsize=False)
    r = size_circuit(_motor(), cfg)
    assert r.cable.governed_by == "motor_start"
    assert r.motor_start_dip_pct <= 10.0
    smaller = size_circuit(_motor(), SizingConfig(motor_start_dip_pct=100.0, disconnection_upsize=False))
    assert smaller.cable.csa_mm2 < r.cable.csa_mm2
    # the size the capacity and voltage drop gave fails the dip limit
    assert starting_dip_percent(r.load_current_a, DEFAULT_STARTERS["dol"], 150,
                                smaller.cable.csa_mm2, "Cu", 400, source_fault_ka=None) > 10.0


def test_soft_starter_needs_no_upsizing():
    # disconnection upsizing off: this test is about the dip alone
    cfg = SizingConfig(motor_start_dip_pct=10.0, disconnection_upsize=False)
    r = size_circuit(_motor(starter="soft"), cfg)
    assert r.cable.governed_by != "motor_start"
    assert r.motor_start_dip_pct < 10.0


def test_unreachable_limit_is_reported_as_fail():
    r = size_circuit(_motor(), SizingConfig(motor_start_dip_pct=0.01, max_parallel=2))
    assert r.status == "fail"
    check = next(c for c in r.checks if c.name == "motor_start")
    assert not check.passed and "starting dip" in check.message


def test_bad_starter_is_a_circuit_error():
    r = size_circuit(_motor(starter="magic"))
    assert r.status == "error" and "starter" in r.messages[0]
