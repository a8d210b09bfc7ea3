"""Third harmonics, IEC 60364-5-52:2009 Annex E (Table E.52.1 and its worked example)."""

from __future__ import annotations

import pytest
from cablewright.core.errors import OutOfRangeError
from cablewright.sizing.capacity_tables import sizes_for, tabulated_capacity
from cablewright.sizing.config import SizingConfig
from cablewright.sizing.fields import spec_from_fields
from cablewright.sizing.harmonics import harmonic_sizing, neutral_current_a, table_e52_1
from cablewright.sizing.model import CircuitSpec, Load, Stretch
from cablewright.sizing.select import size_circuit
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st


@pytest.mark.parametrize("h, basis, factor", [
    (0, "phase", 1.0), (15, "phase", 1.0),          # IEC 60364-5-52:2009 Table E.52.1 row 1
    (15.1, "phase", 0.86), (33, "phase", 0.86),     # row 2
    (33.1, "neutral", 0.86), (45, "neutral", 0.86),  # row 3
    (45.1, "neutral", 1.0), (80, "neutral", 1.0),   # row 4
])
def test_table_e52_1_rows(h, basis, factor):
    row = table_e52_1(h)
    assert (row.basis, row.factor) == (basis, factor)


def test_table_e52_1_out_of_range():
    with pytest.raises(OutOfRangeError, match="E.52.1"):
        table_e52_1(-1)
    with pytest.raises(OutOfRangeError, match="E.52.1"):
        table_e52_1(101)


def _smallest_pvc_c(current_a: float, factor: float) -> float:
    """Smallest Cu PVC size whose B.52.4 column C (3 loaded) current x factor carries ``current_a``."""
    for s in sizes_for("C", "Cu", "PVC", 3):
        if tabulated_capacity("C", "Cu", "PVC", 3, s).current_a * factor >= current_a:
            return s
    raise AssertionError("no size")


@pytest.mark.parametrize("h, neutral, sized_on, csa", [
    # IEC 60364-5-52:2009 Annex E, example: 39 A, four-core PVC cable clipped to a wall
    # (method C, Table B.52.4): no harmonics 6 mm² (41 A); 20 %: 39/0.86 = 45 A -> 10 mm²;
    # 40 %: neutral 39 x 0.4 x 3 = 46.8 A, /0.86 = 54.4 A -> 10 mm²;
    # 50 %: neutral 39 x 0.5 x 3 = 58.5 A, factor 1 -> 16 mm².
    (0, 0.0, 39.0, 6),
    (20, 23.4, 39.0 / 0.86, 10),
    (40, 46.8, 46.8 / 0.86, 10),
    (50, 58.5, 58.5, 16),
])
def test_annex_e_worked_example(h, neutral, sized_on, csa):
    s = harmonic_sizing(39.0, h, envelope=False)
    assert neutral_current_a(39.0, h) == pytest.approx(neutral)
    assert s.current_a / s.factor == pytest.approx(sized_on, abs=0.05)
    assert _smallest_pvc_c(s.current_a, s.factor) == csa


@pytest.mark.parametrize("h, csa", [(0, 6), (20, 10), (40, 10), (50, 16)])
def test_annex_e_worked_example_through_the_selection(h, csa):
    """The same four cases through size_circuit: In = 40 A (smallest contract rating >= 39 A,
    IEC 60364-4-43:2008 433.1), so Iz x factor >= max(In, neutral current) gives the
    standard's sizes (IEC 60364-5-52:2009 Annex E example)."""
    spec = CircuitSpec("E-EX", Load(39, "A"), 400.0, insulation="PVC", cores=4,
                       stretches=(Stretch(method="C"),),
                       # a stiff supply (Ze given), so disconnection is not what this example is about
                       extra=(("third_harmonic_pct", str(h)), ("ze_ohm", "0.1")))
    r = size_circuit(spec, SizingConfig())
    assert r.device_rating_a == 40
    assert r.cable.csa_mm2 == csa, r.messages
    assert r.status in ("ok", "warning")
    if h > 33:
        assert any(c.name == "neutral_current" and c.passed for c in r.checks)


def test_not_applicable_without_a_neutral_in_the_cable():
    # Table E.52.1 is for four- and five-core cables (Annex E, E.1)
    assert harmonic_sizing(39.0, 40, phases=3, cores=3).factor == 1.0
    assert harmonic_sizing(39.0, 40, phases=1, cores=3).basis == "not_applicable"


def test_envelope_at_45_percent():
    # Literal Table E.52.1: 46 % asks 3 x 0.46 = 1.38 Ib, less than 45 %: 3 x 0.45 / 0.86 = 1.570 Ib.
    literal = harmonic_sizing(100.0, 46, envelope=False)
    kept = harmonic_sizing(100.0, 46)
    assert literal.current_a / literal.factor == pytest.approx(138.0)
    assert kept.current_a / kept.factor == pytest.approx(100 * 3 * 0.45 / 0.86)


def test_schedule_column_and_config_default():
    # schedule column third_harmonic_pct (contract.md, Extensions) and a default per load type
    cfg = SizingConfig(third_harmonic_pct_by_load_type={"general": 20.0})
    base = {"load": "39 A", "insulation": "PVC", "cores": "4"}
    from_config = size_circuit(spec_from_fields("H1", base, cfg, 0.0, (Stretch(method="C"),)), cfg)
    from_column = size_circuit(spec_from_fields("H2", {**base, "third_harmonic_pct": "50"}, cfg,
                                                0.0, (Stretch(method="C"),)), cfg)
    assert from_config.cable.csa_mm2 == 10 and from_column.cable.csa_mm2 == 16
    assert any(f.name == "harmonics" and f.value == 0.86 for f in from_config.factors)
    bad = size_circuit(spec_from_fields("H3", {**base, "third_harmonic_pct": "lots"}, cfg,
                                        0.0, (Stretch(method="C"),)), cfg)
    assert bad.status == "error" and "third_harmonic_pct" in bad.messages[0]


@settings(max_examples=80, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(st.floats(1.0, 500.0), st.floats(0.0, 99.0), st.floats(0.0, 20.0),
       st.sampled_from(("C", "E", "B2", "D1")))
def test_more_harmonics_never_a_smaller_cable(load_a, h, more, method):
    """Property: raising the third-harmonic content never gives less copper (Annex E)."""
    def size(pct):
        spec = CircuitSpec("H", Load(load_a, "A"), 400.0, cores=4, design_length_m=30.0,
                           stretches=(Stretch(method=method),),
                           extra=(("third_harmonic_pct", f"{pct:.6f}"),))
        return size_circuit(spec)
    a, b = size(h), size(min(100.0, h + more))
    if a.cable is None or b.cable is None:
        assert not (a.cable is None and b.cable is not None)
        return
    assert b.cable.parallel * b.cable.csa_mm2 >= a.cable.parallel * a.cable.csa_mm2 - 1e-9
