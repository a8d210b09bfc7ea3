"""Voltage-drop limits (Table G.52.1), conductor temperature for the drop, device margin.

Issue 15 items 7, 8 and 9, each against its published source.
"""

from __future__ import annotations

import math
import random

import pytest
from cablewright.sizing.conductor_resistance import resistance_ohm_per_km
from cablewright.sizing.config import SizingConfig
from cablewright.sizing.model import CircuitSpec, Load, Stretch
from cablewright.sizing.select import size_circuit
from cablewright.sizing.voltage_drop import (
    MAX_CONDUCTOR_TEMPERATURE_C,
    drop_percent,
    operating_temperature_c,
    voltage_drop_v,
)


# ----------------------------------------------------------- Table G.52.1
@pytest.mark.parametrize("supply, load_type, length_m, limit", [
    # IEC 60364-5-52:2009 Table G.52.1: type A (public LV supply) 3 % lighting, 5 % other uses
    ("public", "lighting", 50.0, 3.0), ("public", "motor", 50.0, 5.0),
    ("public", "general", 100.0, 5.0), ("public", "feeder", 0.0, 5.0),
    # type B (private LV supply) 6 % lighting, 8 % other uses
    ("private", "lighting", 50.0, 6.0), ("private", "general", 50.0, 8.0),
    # note: +0.005 % per metre beyond 100 m: 180 m -> +0.4 %; at most +0.5 % (300 m)
    ("public", "general", 180.0, 5.4), ("public", "lighting", 300.0, 3.5),
    ("private", "motor", 1000.0, 8.5),
])
def test_table_g52_1_limits(supply, load_type, length_m, limit):
    assert SizingConfig(supply=supply).vd_limit_pct(load_type, length_m) == pytest.approx(limit)


def test_limit_precedence():
    # a circuit's vd_limit_pct wins over the config per load type, which wins over Table G.52.1
    cfg = SizingConfig(vd_limits_pct={"lighting": 4.0})
    lit = CircuitSpec("L", Load(10, "A"), 230.0, phases=1, load_type="lighting",
                      design_length_m=20.0, stretches=(Stretch(method="C"),))
    assert size_circuit(lit, cfg).voltage_drop.limit_percent == 4.0
    own = CircuitSpec("L", Load(10, "A"), 230.0, phases=1, load_type="lighting", vd_limit_pct=2.0,
                      design_length_m=20.0, stretches=(Stretch(method="C"),))
    assert size_circuit(own, cfg).voltage_drop.limit_percent == 2.0
    assert size_circuit(lit).voltage_drop.limit_percent == 3.0  # G.52.1, public supply
    vd = next(c for c in size_circuit(lit).checks if c.name == "voltage_drop")
    assert "Table G.52.1, public supply, lighting" in vd.source


def test_no_allowance_when_switched_off():
    assert SizingConfig(vd_long_run_allowance=False).vd_limit_pct("general", 400.0) == 5.0


# ------------------------------------------------ temperature for the drop
def test_operating_temperature_formula():
    """θ = θa + (θmax - θa)(Ib/Iz)²: rise proportional to I² R (IEC 60287-1-1:2006 1.4).

    Hand values: XLPE (θmax 90 °C, IEC 60364-5-52:2009 Table 52.1) in 30 °C air at
    0.8 Iz: 30 + 60 x 0.64 = 68.4 °C; PVC (70 °C) in 20 °C ground at full load: 70 °C;
    no load: the ambient.
    """
    assert operating_temperature_c(30.0, 90.0, 80.0, 100.0) == pytest.approx(68.4)
    assert operating_temperature_c(20.0, 70.0, 100.0, 100.0) == pytest.approx(70.0)
    assert operating_temperature_c(30.0, 90.0, 0.0, 100.0) == pytest.approx(30.0)


def test_operating_and_max_are_both_read():
    """55 kW at 400 V, 60 m, alone on a tray: 16 mm² Cu XLPE either way (Iz 100 A, B.52.12 E);
    the drop at the operating temperature uses R from IEC 60228:2004 Table 2 (1.15 Ω/km)
    corrected to 30 + 60 (Ib/Iz)², the conservative option at 90 °C."""
    spec = CircuitSpec("P-1", Load(55, "kW"), 400, design_length_m=60,
                       stretches=(Stretch(method="E"),))
    op = size_circuit(spec, SizingConfig(conductor_temp_for_vd="operating"))
    mx = size_circuit(spec, SizingConfig(conductor_temp_for_vd="max"))
    assert op.cable.csa_mm2 == mx.cable.csa_mm2 == 16
    ib, iz = op.load_current_a, op.cable.capacity_a
    theta = 30 + 60 * (ib / iz) ** 2
    r_op = 1.15 * (1 + 0.00393 * (theta - 20))
    r_mx = 1.15 * (1 + 0.00393 * 70)
    sin = math.sqrt(1 - 0.85**2)
    for result, r in ((op, r_op), (mx, r_mx)):
        volts = math.sqrt(3) * ib * 60 * (r / 1000 * 0.85 + 0.08e-3 * sin)
        assert result.voltage_drop.volts == pytest.approx(volts, rel=1e-4)
    assert op.voltage_drop.percent < mx.voltage_drop.percent
    bad = size_circuit(spec, SizingConfig(conductor_temp_for_vd="hot"))
    assert bad.status == "error" and "conductor_temp_for_vd" in bad.messages[0]


def test_prepared_drop_equals_the_plain_function_on_10000_circuits():
    """The selection's inline drop (select._size, first_failing) against voltage_drop_v and
    operating_temperature_c, on 10,000 seeded one-stretch circuits: the reported drop, the
    temperature and the pass/fail decision agree."""
    rng = random.Random(15)
    methods = ("A1", "B2", "C", "E", "D1", "D2")
    checked = 0
    for i in range(10_000):
        phases = rng.choice((1, 3))
        method = rng.choice(methods)
        ground = method in ("D1", "D2")
        ambient = rng.uniform(10.0, 30.0 if ground else 45.0)
        temp_rule = rng.choice(("operating", "max"))
        cfg = SizingConfig(conductor_temp_for_vd=temp_rule)
        spec = CircuitSpec(
            f"C{i}", Load(rng.uniform(2.0, 600.0), "A"), 400.0 if phases == 3 else 230.0,
            phases=phases, power_factor=rng.uniform(0.7, 1.0),
            conductor=rng.choice(("Cu", "Al")), insulation=rng.choice(("XLPE", "PVC")),
            design_length_m=rng.uniform(1.0, 250.0),
            stretches=(Stretch(method=method, other_cables=rng.randint(0, 5), ambient_c=ambient),))
        r = size_circuit(spec, cfg)
        if r.cable is None:
            continue
        tmax = MAX_CONDUCTOR_TEMPERATURE_C[spec.insulation]
        theta = (operating_temperature_c(ambient, tmax, r.load_current_a, r.cable.capacity_a)
                 if temp_rule == "operating" else tmax)
        volts = voltage_drop_v(r.load_current_a, spec.design_length_m, r.cable.csa_mm2,
                               spec.conductor, phases, spec.power_factor, r.cable.parallel, theta)
        percent = drop_percent(volts, spec.voltage_v)
        assert r.voltage_drop.percent == pytest.approx(percent, rel=1e-12, abs=1e-12), spec
        vd = next(c for c in r.checks if c.name == "voltage_drop")
        assert vd.passed == (percent <= r.voltage_drop.limit_percent + 1e-9), spec
        assert resistance_ohm_per_km(r.cable.csa_mm2, spec.conductor, theta) > 0
        checked += 1
    assert checked > 9_000


# ---------------------------------------------------------- device margin
def test_device_margin_default_and_per_load_type():
    """IEC 60364-4-43:2008 433.1: Ib <= In, so 93.4 A (55 kW, 400 V, cos φ 0.85) takes 100 A;
    with the 1.25 option (for motors only, by load type) 125 A."""
    spec = CircuitSpec("M", Load(55, "kW"), 400, load_type="motor", design_length_m=20,
                       stretches=(Stretch(method="E"),))
    assert size_circuit(spec).device_rating_a == 100
    cfg = SizingConfig(device_margin_by_load_type={"motor": 1.25})
    assert size_circuit(spec, cfg).device_rating_a == 125
    general = CircuitSpec("G", Load(55, "kW"), 400, design_length_m=20,
                          stretches=(Stretch(method="E"),))
    assert size_circuit(general, cfg).device_rating_a == 100
