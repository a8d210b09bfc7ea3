"""Fuzz ``routes`` with random bytes and mutated sample drawings (issue 18).

Property: whatever the bytes, ``cablewright routes FILE --json`` ends with a contract exit
code (0, 1 or 2), never an internal error or a traceback, and whatever it prints on
stdout is JSON without NaN or infinity (RFC 8259, section 6).  The inputs are random
bytes and mutations of ``sample_drawings/pumping_station.dxf`` and ``.ifc``: a byte
flipped, a slice cut out, the file cut short, a number replaced by a hostile one
(``nan``, ``inf``, ``1e308``, ``-0``, a 400-digit number), a line duplicated.
Time-bounded: a fixed number of examples per input kind, derandomized so every run is
the same.
"""

from __future__ import annotations

import re
from pathlib import Path

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from test_hostile_input import assert_clean, run_cli

ROOT = Path(__file__).resolve().parents[1]
SAMPLES = ROOT / "sample_drawings"
CSV = SAMPLES / "pumping_station_circuits.csv"
DXF = (SAMPLES / "pumping_station.dxf").read_bytes()

HOSTILE_NUMBERS = [b"nan", b"inf", b"-inf", b"1e308", b"-1e308", b"-0", b"1" * 400, b"1e-320", b""]
NUMBER = re.compile(rb"-?\d+\.\d+(?:[eE][-+]?\d+)?")

FUZZ = settings(
    max_examples=150,
    deadline=None,
    derandomize=True,
    database=None,
    suppress_health_check=[HealthCheck.too_slow, HealthCheck.function_scoped_fixture],
)


@st.composite
def mutated(draw, base: bytes) -> bytes:
    data = bytearray(base)
    for _ in range(draw(st.integers(1, 3))):
        kind = draw(st.sampled_from(["flip", "cut", "truncate", "number", "duplicate"]))
        if not data:
            break
        i = draw(st.integers(0, len(data) - 1))
        if kind == "flip":
            data[i] = draw(st.integers(0, 255))
        elif kind == "cut":
            del data[i : i + draw(st.integers(1, 400))]
        elif kind == "truncate":
            del data[i:]
        elif kind == "number":
            numbers = list(NUMBER.finditer(data))
            if numbers:
                m = numbers[draw(st.integers(0, len(numbers) - 1))]
                data[m.start() : m.end()] = draw(st.sampled_from(HOSTILE_NUMBERS))
        else:
            j = data.find(b"\n", i)
            k = data.find(b"\n", j + 1)
            if 0 <= j < k:
                data[k:k] = data[j:k]
    return bytes(data)


def _check(tmp_path: Path, name: str, data: bytes, *extra: str) -> None:
    path = tmp_path / name
    path.write_bytes(data)
    code, out, err = run_cli(["routes", str(path), "--circuits", str(CSV), "--json", *extra])
    assert_clean(code, out, err)


@settings(FUZZ, max_examples=60)
@given(data=st.binary(max_size=2000))
def test_random_bytes(tmp_path_factory, data):
    d = tmp_path_factory.mktemp("bytes")
    _check(d, "random.dxf", data)
    _check(d, "random.ifc", data)


@FUZZ
@given(data=mutated(DXF))
def test_mutated_dxf(tmp_path_factory, data):
    _check(tmp_path_factory.mktemp("dxf"), "mutated.dxf", data)
    _check(tmp_path_factory.mktemp("dxf"), "mutated.dxf", data, "--recover")


@pytest.mark.skipif(pytest.importorskip("ifcopenshell") is None, reason="ifcopenshell")
@FUZZ
@given(data=mutated((SAMPLES / "pumping_station.ifc").read_bytes()))
def test_mutated_ifc(tmp_path_factory, data):
    _check(tmp_path_factory.mktemp("ifc"), "mutated.ifc", data)
    _check(tmp_path_factory.mktemp("ifc"), "mutated.ifc", data, "--recover")
