"""Properties of the NEC rule set that must hold for any circuit (hypothesis).

The reasons are in NFPA 70:2023, not in our code: a longer run only raises the voltage
drop (Chapter 9 Table 9 Note 2, drop proportional to length); a hotter ambient lowers the
factor of Table 310.15(B)(1)(1); more current-carrying conductors in the raceway lower the
factor of Table 310.15(C)(1); a larger load asks a larger device (240.6(A)) and more
ampacity (210.19(A), 215.2(A)).  None of them may give less conductor (sets, then area).

One step in the code itself is not monotone, and is pinned below: 110.14(C)(1) reads the
60 °C column up to 100 A and the 75 °C column above, so the load property is checked with
the termination temperature held (schedule ``termination_c``).
"""

from __future__ import annotations

from cablewright.sizing.config import SizingConfig
from cablewright.sizing.model import CircuitSpec, Load, Stretch
from cablewright.sizing.nec.select import size_circuit_nec
from cablewright.sizing.nec.tables import ampacity_a, area_cmil
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

NEC = SizingConfig(standard="nec")
FAST = settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.too_slow])


@st.composite
def circuits(draw):
    phases = draw(st.sampled_from((1, 3)))
    return dict(
        load_a=draw(st.floats(1.0, 1500.0)),
        length_m=draw(st.floats(0.0, 300.0)),
        containment=draw(st.sampled_from(("conduit", "clipped", "tray", "buried"))),
        ambient_c=draw(st.floats(10.0, 50.0)),
        others=draw(st.integers(0, 12)),
        conductor=draw(st.sampled_from(("Cu", "Al"))),
        phases=phases,
        voltage=draw(st.sampled_from((208.0, 480.0) if phases == 3 else (120.0, 240.0))),
        power_factor=draw(st.floats(0.6, 1.0)),
        continuous=draw(st.sampled_from(("yes", "no"))),
        termination=draw(st.sampled_from((None, "75"))),
        load_type=draw(st.sampled_from(("general", "feeder", "lighting"))),
    )


def _spec(c: dict) -> CircuitSpec:
    extra = (("continuous", c["continuous"]),)
    if c["termination"] is not None:
        extra += (("termination_c", c["termination"]),)
    return CircuitSpec(
        "P", Load(c["load_a"], "A"), c["voltage"], phases=c["phases"],
        power_factor=c["power_factor"], conductor=c["conductor"], load_type=c["load_type"],
        design_length_m=c["length_m"], extra=extra,
        stretches=(Stretch(containment=c["containment"], other_cables=c["others"],
                           ambient_c=c["ambient_c"]),),
    )


def _drop_unmet(result) -> bool:
    return any(c.name == "voltage_drop" and not c.passed for c in result.checks)


def _never_less(base: dict, worse: dict) -> None:
    a = size_circuit_nec(_spec(base), NEC)
    b = size_circuit_nec(_spec(worse), NEC)
    if a.cable is None:
        assert b.cable is None, (base, worse, b.cable)
        return
    if b.cable is None or _drop_unmet(b):
        return  # beyond every size and set count: an error or the capacity-only fallback
    assert b.cable.parallel >= a.cable.parallel, (base, worse, a.cable, b.cable)
    if b.cable.parallel == a.cable.parallel:
        assert b.cable.csa_mm2 >= a.cable.csa_mm2 - 1e-9, (base, worse, a.cable, b.cable)


@FAST
@given(circuits(), st.floats(1.0, 300.0))
def test_longer_run_never_smaller(c, extra_m):
    _never_less(c, {**c, "length_m": c["length_m"] + extra_m})


@FAST
@given(circuits(), st.floats(1.0, 1.5))
def test_larger_load_never_smaller(c, factor):
    c = {**c, "termination": "75"}
    _never_less(c, {**c, "load_a": c["load_a"] * factor})


@FAST
@given(circuits(), st.floats(1.0, 15.0))
def test_hotter_ambient_never_smaller(c, delta_c):
    _never_less(c, {**c, "ambient_c": min(60.0, c["ambient_c"] + delta_c)})


@FAST
@given(circuits(), st.integers(1, 10))
def test_more_conductors_in_the_raceway_never_smaller(c, more):
    _never_less(c, {**c, "others": c["others"] + more})


@FAST
@given(circuits())
def test_ok_means_the_termination_column_carries_the_125_percent(c):
    # 210.19(A)(1)(a) / 215.2(A)(1)(a) with 110.14(C): sets x the termination column's
    # ampacity >= 125 % of a continuous load (100 % of one that is not).
    r = size_circuit_nec(_spec(c), NEC)
    if r.status != "ok":
        return
    size = next(s for s in ("14", "12", "10", "8", "6", "4", "3", "2", "1", "1/0", "2/0", "3/0",
                            "4/0", "250", "300", "350", "400", "500", "600", "750", "1000")
                if r.cable.size_label.split()[0] == s)
    temp = 75 if c["termination"] == "75" or r.device_rating_a > 100 else 60
    need = (1.25 if c["continuous"] == "yes" else 1.0) * c["load_a"]
    assert r.cable.parallel * ampacity_a(size, c["conductor"], temp) >= need - 1e-6
    assert r.cable.parallel == 1 or area_cmil(size) >= area_cmil("1/0")  # 310.10(G)(1)


def test_the_100_a_step_of_110_14_c_is_the_code_not_a_fault():
    # Hand-worked: 80 A continuous -> 100 A device, 60 °C column (110.14(C)(1)(a)): 100 A
    # needs 1 AWG (110 A; 2 AWG 95 A).  81 A continuous -> 101.25 A, 110 A device, 75 °C
    # column (110.14(C)(1)(b)): 2 AWG (115 A) carries it.  A larger load, a smaller conductor.
    small = size_circuit_nec(CircuitSpec("S", Load(80, "A"), 480, stretches=(Stretch(containment="conduit"),)), NEC)
    large = size_circuit_nec(CircuitSpec("L", Load(81, "A"), 480, stretches=(Stretch(containment="conduit"),)), NEC)
    assert (small.device_rating_a, small.cable.size_label) == (100, "1 AWG")
    assert (large.device_rating_a, large.cable.size_label) == (110, "2 AWG")
