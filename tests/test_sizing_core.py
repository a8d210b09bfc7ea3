"""Design current, device selection and voltage drop against their published sources."""

from __future__ import annotations

import math

import pytest
from cablewright.core.errors import CircuitInputError, NoCableLargeEnoughError, UnknownKeyError
from cablewright.sizing.device import (
    STANDARD_RATINGS_A,
    conventional_operating_current_a,
    required_iz_a,
    select_device,
)
from cablewright.sizing.load import design_current_a, parse_load
from cablewright.sizing.model import Load


class TestDesignCurrent:
    def test_three_phase_active_power(self):
        # IEC 60050-131 131-11-42: P = sqrt(3) U I cos(phi) -> I = P / (sqrt(3) U cos(phi)).
        # 55 kW, 400 V, 0.85: 55000 / (1.7320508 * 400 * 0.85) = 93.39 A (hand calculation).
        assert design_current_a(Load(55, "kW"), 400, 3, 0.85) == pytest.approx(93.39, abs=0.01)

    def test_hp_uses_0746_kw_and_efficiency(self):
        # contract.md: 1 hp = 0.746 kW shaft power; input = shaft / efficiency.
        # 100 hp, 0.93, 415 V, pf 0.88: 74600 / 0.93 / (sqrt(3) * 415 * 0.88) = 126.8 A.
        ib = design_current_a(Load(100, "hp"), 415, 3, 0.88, 0.93)
        assert ib == pytest.approx(74600 / 0.93 / (math.sqrt(3) * 415 * 0.88), rel=1e-12)
        assert ib == pytest.approx(126.8, abs=0.05)

    def test_kva_ignores_power_factor(self):
        # IEC 60050-131 131-11-41: S = sqrt(3) U I.  100 kVA at 400 V -> 144.3 A.
        assert design_current_a(Load(100, "kVA"), 400, 3, 0.5) == pytest.approx(144.34, abs=0.01)

    def test_single_phase(self):
        # 1 phase: P = U I cos(phi).  3 kW, 230 V, pf 1 -> 13.04 A.
        assert design_current_a(Load(3, "kW"), 230, 1, 1.0) == pytest.approx(13.043, abs=0.001)

    def test_amps_pass_through(self):
        assert design_current_a(Load(32, "A"), 400) == 32

    @pytest.mark.parametrize("pf", [0.0, -0.2, 1.01])
    def test_power_factor_outside_range(self, pf):
        with pytest.raises(CircuitInputError, match="power factor"):
            design_current_a(Load(10, "kW"), 400, 3, pf)


class TestParseLoad:
    @pytest.mark.parametrize(
        "text, value, unit",
        [("55 kW", 55, "kW"), ("75hp", 75, "hp"), ("40 KVA", 40, "kVA"), ("32 a", 32, "A"),
         ("7,5 kW", 7.5, "kW"), ("1.2 MW", 1200, "kW")],
    )
    def test_units(self, text, value, unit):
        load = parse_load(text)
        assert (load.value, load.unit) == (pytest.approx(value), unit)

    @pytest.mark.parametrize("text", ["0 kW", "-5 kW"])
    def test_zero_or_negative(self, text):
        with pytest.raises(CircuitInputError, match="greater than zero"):
            parse_load(text)

    def test_unknown_unit(self):
        with pytest.raises(UnknownKeyError, match="kW, hp, kVA or A"):
            parse_load("5 BTU")

    def test_garbage(self):
        with pytest.raises(CircuitInputError, match="does not parse"):
            parse_load("fifty")


class TestDevice:
    def test_standard_series_matches_contract(self):
        # contract.md "Sizing defaults": the standard ratings listed there.
        assert STANDARD_RATINGS_A[:6] == (6, 10, 16, 20, 25, 32)
        assert STANDARD_RATINGS_A[-3:] == (1000, 1250, 1600)

    @pytest.mark.parametrize("ib, expected", [(4.0, 6), (8.0, 10), (93.4, 125), (100.0, 125), (100.1, 160)])
    def test_smallest_rating_at_125_percent(self, ib, expected):
        # the 1.25 option: smallest standard rating >= 1.25 Ib (contract ratings).
        assert select_device(ib, margin=1.25).rating_a == expected

    @pytest.mark.parametrize("ib, expected", [(4.0, 6), (93.4, 100), (100.0, 100), (100.1, 125),
                                              (650.0, 800)])
    def test_default_margin_is_433_1(self, ib, expected):
        # IEC 60364-4-43:2008 433.1: Ib <= In, the smallest contract rating >= Ib (margin 1.0).
        assert select_device(ib).rating_a == expected

    def test_beyond_largest_rating(self):
        with pytest.raises(NoCableLargeEnoughError, match="largest standard device rating"):
            select_device(1500.0, margin=1.25)
        with pytest.raises(NoCableLargeEnoughError, match="largest standard device rating"):
            select_device(1600.5)

    def test_breaker_i2(self):
        # IEC 60898-1 conventional tripping current 1.45 In (from memory).
        assert conventional_operating_current_a("breaker", 63)[0] == pytest.approx(91.35)

    def test_fuse_i2_and_required_iz(self):
        # IEC 60269-1 gG conventional fusing current 1.6 In for In >= 16 A (from memory);
        # IEC 60364-4-43 433.1: I2 <= 1.45 Iz -> Iz >= 1.6/1.45 In = 1.1034 In.
        device = select_device(50, "fuse", margin=1.0)
        assert device.rating_a == 50
        assert required_iz_a(device) == pytest.approx(50 * 1.6 / 1.45)

    def test_breaker_required_iz_is_in(self):
        # With I2 = 1.45 In, 433.1 condition (433.2) is met whenever Iz >= In.
        assert required_iz_a(select_device(40, "breaker", margin=1.0)) == 40


class TestVoltageDrop:
    def test_impedance_formula_by_hand(self):
        # IEC 60228:2004 Table 2: 35 mm² plain copper class 2, 0.524 ohm/km at 20 °C;
        # Annex B correction to 90 °C with alpha 0.00393: 0.524 * (1 + 0.00393 * 70) = 0.66815 ohm/km.
        # Annex G lambda = 0.08 mohm/m.  dU = sqrt(3) Ib L (R cos + X sin), hand calculation:
        # sqrt(3) * 100 A * 100 m * (0.00066815 * 0.85 + 0.00008 * 0.52678) = 10.567 V.
        from cablewright.sizing.voltage_drop import voltage_drop_v

        assert voltage_drop_v(100, 100, 35, "Cu", 3, 0.85, 1, 90.0) == pytest.approx(10.567, abs=0.002)
        # two cables in parallel halve it; single phase uses b = 2 instead of sqrt(3)
        assert voltage_drop_v(100, 100, 35, "Cu", 3, 0.85, 2, 90.0) == pytest.approx(10.567 / 2, abs=0.002)
        assert voltage_drop_v(100, 100, 35, "Cu", 1, 0.85, 1, 90.0) == pytest.approx(10.567 * 2 / math.sqrt(3), abs=0.003)

    def test_annex_g_formula(self):
        # IEC 60364-5-52:2009 Annex G: u = b (rho1 L/S cos + lambda L sin) Ib, du = 100 u / U0,
        # rho1 = 0.0225 ohm mm²/m (Cu), lambda = 0.08 mohm/m, b = 1 three-phase.
        # (0.0225 * 100 / 35 * 0.85 + 0.00008 * 100 * 0.52678) * 100 = 5.8857 V; / 230.94 V = 2.549 %.
        from cablewright.sizing.voltage_drop import annex_g_drop_percent

        assert annex_g_drop_percent(100, 100, 35, "Cu", 3, 0.85, 400) == pytest.approx(2.549, abs=0.002)
        # aluminium: rho1 = 0.036 ohm mm²/m
        expected = (0.036 * 100 / 35 * 0.85 + 0.00008 * 100 * 0.52678) * 100 / (400 / math.sqrt(3)) * 100
        assert annex_g_drop_percent(100, 100, 35, "Al", 3, 0.85, 400) == pytest.approx(expected, rel=1e-5)

    def test_impedance_and_annex_g_agree_roughly(self):
        # Annex G's rho1 = 1.25 rho20 stands for about 80 °C; the impedance form at 90 °C is a
        # few per cent higher, never lower.
        from cablewright.sizing.voltage_drop import (
            annex_g_drop_percent,
            drop_percent,
            voltage_drop_v,
        )

        for csa in (2.5, 16, 95, 240):
            exact = drop_percent(voltage_drop_v(50, 80, csa, "Cu", 3, 0.9, 1, 90.0), 400)
            simple = annex_g_drop_percent(50, 80, csa, "Cu", 3, 0.9, 400)
            assert simple * 0.95 < exact < simple * 1.15
