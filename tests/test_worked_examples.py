"""End-to-end worked examples: published handbook examples, then cases of our own.

Published examples
------------------
[EIG2008] Schneider Electric, *Electrical installation guide* 2008, Chapter G
"Sizing and protection of conductors", 3 "Determination of voltage drop":

* Example 2 (Fig. G30, page G23): a 3-phase 4-wire 70 mm² copper line, 50 m,
  150 A, feeding three single-phase 2.5 mm² copper lighting circuits, 20 m,
  20 A each.  The guide reads K from Figure G28 (0.55 V/A/km for the line,
  18 V/A/km for the lighting circuit) and finds 4.125 V phase-to-phase =
  2.38 V phase-to-neutral on the line, 7.2 V on the lighting circuit,
  9.6 V = 4.2 % in total.
* Example 1 (Fig. G29, page G22): a 3-phase 35 mm² copper cable, 50 m, feeding
  a 400 V motor of 100 A at cos φ 0.8 (K = 1 V/A/km, 5 V in the cable) and
  500 A at cos φ 0.35 while starting (K = 0.52 V/A/km).  The page itself was
  confirmed (its formulae: R = 22.5 Ω·mm²/km / S for copper, X = 0.08 Ω/km,
  cos φ 0.8 running, 0.35 starting, and that "example no. 1 after Figure
  G28" uses the start-up column); the example's numbers are quoted from
  memory.

The guide's K values come from the formula of its Figure G27, which is
IEC 60364-5-52:2009 Annex G (ρ1 = 0.0225 Ω·mm²/m, λ = 0.08 mΩ/m): our
``annex_g_percent``.  Our selection itself uses IEC 60228 resistances at the
insulation's maximum temperature, which the guide does not; only the Annex G
figure is compared.

The guide chooses no device and no method for these circuits; we size them
with ``device_margin=1.0`` (In = the smallest standard rating >= Ib, no
margin) and methods for which the guide's cross-section is the first one
that carries In, so that the whole ``size_circuit`` path reproduces the
guide's cable and its voltage drop.

Not matched: the 2018 edition of the same guide (Chapter G, Example 2, Fig. G32)
reads 0.59 V/A/km and 19 V/A/km from its Fig. G30 and ends at 10.1 V = 4.4 %;
those K values correspond to about 23.7 Ω·mm²/km instead of Annex G's 22.5.
We keep IEC 60364-5-52:2009 Annex G, so we reproduce the 2008 edition.
"""

from __future__ import annotations

import json
import math

import pytest
from cablewright.sizing.config import SizingConfig
from cablewright.sizing.model import CircuitSpec, Load, Stretch
from cablewright.sizing.select import size_circuit
from cablewright.sizing.voltage_drop import annex_g_drop_percent

from cablewright.cli import main

NO_MARGIN = SizingConfig(device_margin=1.0)
#: The cases of our own below were worked by hand with a 1.25 margin and the
#: resistance at the maximum conductor temperature (the defaults before issue 15);
#: both stay options of the config, so the hand calculations are kept with them.
MARGIN_125_MAX_TEMP = SizingConfig(device_margin=1.25, conductor_temp_for_vd="max")


def _v_per_a_km_line(percent: float, voltage_ll_v: float, current_a: float, length_m: float) -> float:
    """Phase-to-phase volts per ampere per km, from a 3-phase Annex G percentage."""
    volts_ll = percent / 100.0 * voltage_ll_v
    return volts_ll / (current_a * length_m / 1000.0)


# --------------------------------------------------------------------------- #
# [EIG2008] Chapter G, 3, Example 2, Fig. G30, page G23
# --------------------------------------------------------------------------- #


def _example2_line():
    # 150 A balanced, 400 V, lighting load: the guide reads the cos φ = 1 column.
    # Method E, PVC: IEC 60364-5-52:2009 Table B.52.10 column E (3 loaded):
    # 50 mm² 153 A < In 160 A, 70 mm² 196 A >= 160 A -> the guide's 70 mm².
    spec = CircuitSpec("EIG-EX2-LINE", Load(150, "A"), 400.0, phases=3, power_factor=1.0,
                       insulation="PVC", design_length_m=50.0,
                       stretches=(Stretch(method="E"),))
    return size_circuit(spec, NO_MARGIN)


def test_eig2008_example2_line_size_and_k():
    """[EIG2008] Example 2: 70 mm² line, K = 0.55 V/A/km, 4.125 V = 2.38 V phase-to-neutral."""
    r = _example2_line()
    assert r.load_current_a == pytest.approx(150.0)
    # In: smallest standard rating >= 150 A (contract.md list): 160 A.
    assert r.device_rating_a == 160
    assert r.correction_factor == pytest.approx(1.0)  # 30 °C, alone: B.52.14 / B.52.20
    assert r.required_capacity_a == pytest.approx(160.0, abs=0.05)
    assert r.cable.csa_mm2 == 70
    assert r.cable.parallel == 1
    assert r.cable.capacity_a == pytest.approx(196.0)  # B.52.10 E, 70 mm², 3 loaded
    k = _v_per_a_km_line(r.voltage_drop.annex_g_percent, 400.0, 150.0, 50.0)
    # The guide prints 0.55 for sqrt(3) x 22.5 / 70 = 0.557: within one unit of
    # its last printed digit.
    assert k == pytest.approx(0.55, abs=0.01)
    phase_neutral_v = r.voltage_drop.annex_g_percent / 100.0 * 400.0 / math.sqrt(3.0)
    assert phase_neutral_v == pytest.approx(2.38, abs=0.05)


def test_eig2008_example2_lighting_circuit_through_cli(tmp_path, capsys):
    """[EIG2008] Example 2: 2.5 mm² lighting circuit, 18 V/A/km, 7.2 V; total 4.2 %.

    Run through ``cablewright calc --json`` with a config setting the device
    margin to 1.0.  Method C, PVC: IEC 60364-5-52:2009 Table B.52.2 column C
    (2 loaded): 1.5 mm² 19.5 A < In 20 A, 2.5 mm² 27 A -> the guide's 2.5 mm².
    """
    config = tmp_path / "no_margin.toml"
    # the example is about ampacity and drop: disconnection (with the assumed Ze) only reported
    config.write_text("[sizing]\ndevice_margin = 1.0\ndisconnection_upsize = false\n", encoding="utf-8")
    code = main(["calc", "--load", "20 A", "--voltage", "230", "--phases", "1",
                 "--power-factor", "1", "--length", "20", "--method", "C",
                 "--insulation", "PVC", "--config", str(config), "--json"])
    out = capsys.readouterr().out
    circuit = json.loads(out)["circuits"][0]
    assert code in (0, 1)  # 1 only if a later check (disconnection) fails
    assert circuit["load_current_a"] == pytest.approx(20.0)
    assert circuit["device_rating_a"] == 20
    assert circuit["cable"]["csa_mm2"] == 2.5
    assert circuit["cable"]["capacity_a"] == pytest.approx(27.0)
    # Annex G single phase: 2 x 0.0225 x 20 / 2.5 x 20 = 7.2 V, the guide's 18 x 20 x 0.02.
    lighting_v = circuit["voltage_drop"]["annex_g_percent"] / 100.0 * 230.0
    assert lighting_v == pytest.approx(7.2, abs=0.02)  # JSON rounds the percentage to 0.01
    line_pn_v = _example2_line().voltage_drop.annex_g_percent / 100.0 * 400.0 / math.sqrt(3.0)
    total_pct = 100.0 * (lighting_v + line_pn_v) / 230.0
    assert round(lighting_v + line_pn_v, 1) == 9.6
    assert round(total_pct, 1) == 4.2


# --------------------------------------------------------------------------- #
# [EIG2008] Chapter G, 3, Example 1, Fig. G29, page G22 (numbers from memory)
# --------------------------------------------------------------------------- #


def test_eig2008_example1_motor_cable_running_and_starting():
    """[EIG2008] Example 1: 35 mm², 50 m, 100 A cos φ 0.8 -> K 1 V/A/km, 5 V; start K 0.52."""
    # Method C, PVC, IEC 60364-5-52:2009 Table B.52.4 column C (3 loaded):
    # 25 mm² 96 A < In 100 A, 35 mm² 119 A -> the guide's 35 mm².
    spec = CircuitSpec("EIG-EX1", Load(100, "A"), 400.0, phases=3, power_factor=0.8,
                       load_type="motor", insulation="PVC", design_length_m=50.0,
                       stretches=(Stretch(method="C"),))
    r = size_circuit(spec, NO_MARGIN)
    assert r.device_rating_a == 100
    assert r.cable.csa_mm2 == 35
    assert r.cable.capacity_a == pytest.approx(119.0)
    k_run = _v_per_a_km_line(r.voltage_drop.annex_g_percent, 400.0, 100.0, 50.0)
    # sqrt(3) (22.5/35 x 0.8 + 0.08 x 0.6) = 0.974; the guide prints 1.
    assert round(k_run, 1) == 1.0
    assert k_run * 100 * 0.05 == pytest.approx(5.0, abs=0.15)
    # Starting: 500 A at cos φ 0.35: sqrt(3)(22.5/35 x 0.35 + 0.08 x 0.937) = 0.520.
    start_pct = annex_g_drop_percent(500, 50, 35, "Cu", 3, 0.35, 400)
    k_start = _v_per_a_km_line(start_pct, 400.0, 500.0, 50.0)
    assert k_start == pytest.approx(0.52, abs=0.005)


# --------------------------------------------------------------------------- #
# Cases of our own, worked by hand from the printed cells of
# IEC 60364-5-52:2009 Annex B, IEC 60228:2004 Table 2 and the contract's
# former defaults, now set explicitly (margin 1.25, breaker I2 = 1.45 In up to 125 A, 1.30 In above,
# voltage drop at 70 °C PVC / 90 °C XLPE, X = 0.08 mΩ/m).
# --------------------------------------------------------------------------- #


def test_parallel_cables_copper_xlpe_tray():
    """600 A on a perforated tray, XLPE Cu, alone: 2 x 185 mm² in parallel.

    In >= 1.25 x 600 = 750 A -> 800 A; I2 = 1.30 x 800 = 1040 A, 1040/1.45 =
    717 A < 800, so Iz >= 800 A.  Largest single cable, B.52.12 E 300 mm²:
    621 A < 800 -> two cables; B.52.20 (perforated tray, touching, 1 tray,
    2 cables) 0.88.  150 mm²: 2 x 399 x 0.88 = 702.2 A < 800;
    185 mm²: 2 x 456 x 0.88 = 802.6 A >= 800.
    """
    spec = CircuitSpec("OWN-PAR", Load(600, "A"), 400.0, design_length_m=30.0,
                       stretches=(Stretch(method="E"),))
    r = size_circuit(spec, MARGIN_125_MAX_TEMP)
    assert r.device_rating_a == 800
    assert r.cable.parallel == 2
    assert r.cable.csa_mm2 == 185
    assert r.grouping_factor == pytest.approx(0.88)
    assert r.cable.capacity_a == pytest.approx(2 * 456 * 0.88, abs=0.05)
    assert r.cable.capacity_a >= r.device_rating_a


def test_aluminium_xlpe_tray():
    """120 A, Al XLPE on a tray, alone: 70 mm².

    In >= 150 A -> 160 A; I2 = 1.30 x 160 = 208 A, /1.45 = 143.4 A < 160.
    B.52.13 column E (3 loaded): 50 mm² 146 A < 160; 70 mm² 187 A.
    """
    spec = CircuitSpec("OWN-AL", Load(120, "A"), 400.0, conductor="Al", design_length_m=20.0,
                       stretches=(Stretch(method="E"),))
    r = size_circuit(spec, MARGIN_125_MAX_TEMP)
    assert r.device_rating_a == 160
    assert r.cable.conductor == "Al"
    assert r.cable.csa_mm2 == 70
    assert r.cable.capacity_a == pytest.approx(187.0)


def test_pvc_clipped_hot_and_grouped():
    """40 A, PVC Cu clipped to a wall (C), 40 °C, 3 circuits: 16 mm².

    In >= 50 A -> 50 A.  B.52.14 PVC 40 °C: 0.87; B.52.17 item 2 (single layer
    on a wall, touching), 3 circuits: 0.79; product 0.6873.  Required
    tabulated current 50 / 0.6873 = 72.7 A; B.52.4 column C (3 loaded):
    10 mm² 57 A, 16 mm² 76 A.  Iz = 76 x 0.6873 = 52.2 A.
    """
    spec = CircuitSpec("OWN-PVC", Load(40, "A"), 400.0, insulation="PVC", design_length_m=15.0,
                       stretches=(Stretch(method="C", other_cables=2, ambient_c=40.0),))
    r = size_circuit(spec, MARGIN_125_MAX_TEMP)
    assert r.device_rating_a == 50
    assert r.correction_factor == pytest.approx(0.87 * 0.79)
    assert r.required_capacity_a == pytest.approx(50 / (0.87 * 0.79), abs=0.05)
    assert r.cable.csa_mm2 == 16
    assert r.cable.capacity_a == pytest.approx(76 * 0.87 * 0.79, abs=0.05)


def test_single_phase_voltage_drop():
    """5 kW, 230 V single phase, cos φ 1, PVC clipped (C), 10 m: 4 mm², 1.04 %.

    Ib = 5000 / 230 = 21.74 A; In >= 27.2 A -> 32 A.  B.52.2 column C
    (2 loaded): 2.5 mm² 27 A < 32; 4 mm² 36 A.  IEC 60228 Table 2: 4 mm²
    4.61 Ω/km at 20 °C, x (1 + 0.00393 x 50) = 5.516 Ω/km at 70 °C.
    ΔU = 2 x 21.74 x 0.010 km x 5.516 = 2.398 V = 1.04 %.
    """
    spec = CircuitSpec("OWN-1PH", Load(5, "kW"), 230.0, phases=1, power_factor=1.0,
                       insulation="PVC", design_length_m=10.0, stretches=(Stretch(method="C"),))
    r = size_circuit(spec, MARGIN_125_MAX_TEMP)
    assert r.load_current_a == pytest.approx(5000 / 230, rel=1e-6)
    assert r.device_rating_a == 32
    assert r.cable.cores == 3
    assert r.cable.csa_mm2 == 4
    assert r.voltage_drop.volts == pytest.approx(2.398, abs=0.01)
    assert r.voltage_drop.percent == pytest.approx(1.04, abs=0.01)


def test_voltage_drop_drives_the_size_up():
    """32 A single phase, 60 m, PVC clipped (C), cos φ 0.85: 6 mm² by capacity, 10 mm² by drop.

    In >= 40 A -> 40 A; B.52.2 column C (2 loaded) 4 mm² 36 A, 6 mm² 46 A.
    ΔU = 2 I L (R cos φ + X sin φ), sin φ = 0.527, X = 0.08 Ω/km:
    6 mm²: R70 = 3.08 x 1.1965 = 3.685 Ω/km -> 2 x 32 x 0.06 x (3.132 + 0.042)
    = 12.19 V = 5.30 % > 5 %;
    10 mm²: R70 = 1.83 x 1.1965 = 2.190 Ω/km -> 3840e-3 x (1.861 + 0.042)
    = 7.31 V = 3.18 %.
    """
    spec = CircuitSpec("OWN-VD", Load(32, "A"), 230.0, phases=1, power_factor=0.85,
                       insulation="PVC", design_length_m=60.0, stretches=(Stretch(method="C"),))
    r = size_circuit(spec, MARGIN_125_MAX_TEMP)
    assert r.device_rating_a == 40
    assert r.cable.csa_mm2 == 10
    assert r.cable.governed_by == "voltage_drop"
    assert r.voltage_drop.percent == pytest.approx(3.18, abs=0.02)
    assert r.cable.capacity_a == pytest.approx(63.0)  # B.52.2 C, 10 mm², 2 loaded
