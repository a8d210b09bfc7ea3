"""``size``, ``routes`` and ``demo`` through the command line: exit codes, JSON, outputs.

Lengths are checked against the sample generator's own coordinates (its
``pumping_station_expected.json``, computed without the extraction code).
"""

from __future__ import annotations

import csv
import hashlib
import json
import shutil
from pathlib import Path

import ezdxf
import pytest

from cablewright.cli import main

ROOT = Path(__file__).resolve().parents[1]
SAMPLES = ROOT / "sample_drawings"
DRAWING = SAMPLES / "pumping_station.dxf"
CIRCUITS = SAMPLES / "pumping_station_circuits.csv"
EXPECTED = json.loads((SAMPLES / "pumping_station_expected.json").read_text())
CONTRACT_KEYS = {"id", "from", "to", "status", "messages", "load_current_a", "device_rating_a",
                 "route", "grouping", "method", "correction_factor", "required_capacity_a",
                 "cable", "voltage_drop"}


def _digest(path: Path) -> str:
    return hashlib.sha256(path.read_bytes()).hexdigest()


@pytest.fixture(scope="module")
def sized(tmp_path_factory):
    out = tmp_path_factory.mktemp("size")
    before = _digest(DRAWING)
    import contextlib
    import io

    stdout, stderr = io.StringIO(), io.StringIO()
    with contextlib.redirect_stdout(stdout), contextlib.redirect_stderr(stderr):
        code = main(["size", str(DRAWING), "--circuits", str(CIRCUITS), "--out", str(out), "--json"])
    return code, json.loads(stdout.getvalue()), stderr.getvalue(), out, before


def test_size_json_on_stdout_is_the_schedule_files_circuits(sized):
    """stdout is written piece by piece (commands_drawing._print_json): the same circuits as
    schedule.json, whole JSON ending in one newline."""
    _, doc, _, out, _ = sized
    written = json.loads((out / "schedule.json").read_text(encoding="utf-8"))
    assert doc["circuits"] == written["circuits"] and len(doc["circuits"]) >= 15


def test_size_json_follows_the_contract(sized):
    code, doc, _, _, _ = sized
    circuits = doc["circuits"]
    assert len(circuits) == len(EXPECTED["circuits"]) if "circuits" in EXPECTED else len(circuits) >= 15
    for c in circuits:
        assert CONTRACT_KEYS <= set(c), c["id"]
        assert set(c["cable"]) >= {"conductor", "insulation", "cores", "csa_mm2", "parallel",
                                   "capacity_a", "governed_by"}
        assert set(c["voltage_drop"]) >= {"volts", "percent", "limit_percent"}
        assert set(c["grouping"]) >= {"circuits_in_group", "cables_in_group", "governing_segment", "factor"}
        assert c["status"] in ("ok", "warning", "fail", "error")
    # the sample fails one circuit on purpose: L-01, a lighting circuit at the end of the
    # sub-board feeder, exceeds the 3 % lighting limit of Table G.52.1 from the origin;
    # exit 1.  MOV-1, a 100 m run on a 6 A D-curve breaker, is upsized for disconnection
    # (the default since issue 10)
    assert code == 1
    assert {c["id"] for c in circuits if c["status"] == "fail"} == {"L-01"}
    mov = next(c for c in circuits if c["id"] == "MOV-1")
    assert mov["status"] == "ok" and mov["cable"]["governed_by"] == "disconnection"


def test_size_lengths_match_the_generator(sized):
    _, doc, _, _, _ = sized
    expected = EXPECTED["circuits"] if "circuits" in EXPECTED else EXPECTED
    for c in doc["circuits"]:
        want = expected[c["id"]]["routed_length_m"]
        assert c["route"]["routed_length_m"] == pytest.approx(want, rel=0.005), c["id"]


def test_size_capacity_rule_holds_for_every_sized_circuit(sized):
    # IEC 60364-4-43:2008 433.1: Ib <= In <= Iz for every circuit that passes.  In of
    # Iz is that of the device protecting the cable against overload: the circuit's
    # device, or for a star-delta motor's two cables the overload relay in the delta
    # windings (issue 15 item 11), as the "capacity" check states it.
    _, doc, _, _, _ = sized
    for c in doc["circuits"]:
        if c["status"] in ("ok", "warning"):
            capacity = next(k for k in c["checks"] if k["name"] == "capacity")
            overload_in = capacity["value"]
            if not any(m.startswith("star-delta:") for m in c["messages"]):
                assert overload_in == c["device_rating_a"], c["id"]
            assert c["load_current_a"] <= c["device_rating_a"], c["id"]
            assert overload_in <= c["cable"]["capacity_a"] + 0.05, c["id"]
            assert c["voltage_drop"]["percent"] <= c["voltage_drop"]["limit_percent"]


def test_size_writes_every_output_and_keeps_the_input(sized):
    _, doc, _, out, before = sized
    names = {p.name for p in out.iterdir()}
    assert {"pumping_station_annotated.dxf", "schedule.csv", "schedule.xlsx", "schedule.json",
            "report.html", "preview.png"} <= names
    assert not [n for n in names if n.startswith(".")], "staging folder left behind"
    assert _digest(DRAWING) == before
    assert json.loads((out / "schedule.json").read_text())["circuits"] == doc["circuits"]
    with open(out / "schedule.csv", newline="", encoding="utf-8-sig") as fh:
        assert len(list(csv.DictReader(fh))) == len(doc["circuits"])
    annotated = ezdxf.readfile(out / "pumping_station_annotated.dxf")
    labels = [e for e in annotated.modelspace() if e.dxf.layer == "CW-CABLE-LABEL"]
    for c in doc["circuits"]:
        size = f"{c['cable']['csa_mm2']} mm²"
        assert any(c["id"] in e.plain_text() and size in e.plain_text() for e in labels
                   if e.dxftype() in ("TEXT", "MTEXT")), c["id"]


def test_size_twice_keeps_the_label_count(sized, tmp_path):
    _, _, _, out, _ = sized
    first = out / "pumping_station_annotated.dxf"
    code = main(["size", str(first), "--circuits", str(CIRCUITS), "--out", str(tmp_path), "--json"])
    assert code == 1
    again = ezdxf.readfile(tmp_path / "pumping_station_annotated_annotated.dxf")
    count = lambda doc: sum(1 for e in doc.modelspace() if e.dxf.layer == "CW-CABLE-LABEL")  # noqa: E731
    assert count(again) == count(ezdxf.readfile(first))


def test_routes_json_has_only_measuring_keys(capsys):
    code = main(["routes", str(DRAWING), "--circuits", str(CIRCUITS), "--json"])
    doc = json.loads(capsys.readouterr().out)
    assert code == 0
    for c in doc["circuits"]:
        assert set(c) == {"id", "from", "to", "status", "messages", "route", "grouping"}
        assert c["grouping"]["circuits_in_group"] >= 1


@pytest.mark.parametrize("content", [b"", b"\x00\x01garbage" * 50, b"0\nSECTION\n2\nHEADER\n9\n$ACADVER"])
def test_unusable_drawing_is_exit_2_with_one_line(tmp_path, capsys, content):
    bad = tmp_path / "bad.dxf"
    bad.write_bytes(content)
    out = tmp_path / "out"
    code = main(["size", str(bad), "--circuits", str(CIRCUITS), "--out", str(out)])
    err = capsys.readouterr().err.strip().splitlines()
    assert code == 2
    assert len(err) == 1 and "bad.dxf" in err[0] and "Traceback" not in err[0]
    assert not out.exists() or not any(out.iterdir())


def test_schedule_missing_a_column_is_exit_2(tmp_path, capsys):
    schedule = tmp_path / "circuits.csv"
    schedule.write_text("circuit,from,to\nX-1,MCC-1,P-101\n")
    code = main(["routes", str(DRAWING), "--circuits", str(schedule)])
    err = capsys.readouterr().err
    assert code == 2 and "load" in err and "circuits.csv" in err


def test_unknown_tag_fails_that_circuit_only(tmp_path, capsys):
    rows = CIRCUITS.read_text(encoding="utf-8").splitlines()
    rows[1] = rows[1].replace("MCC-1", "MCC-9", 1) if ",MCC-1," in rows[1] else rows[1]
    broken = rows[0] + "\n" + rows[1].split(",", 1)[0] + ",MSB-1,NO-SUCH-TAG," + rows[1].split(",", 3)[3] + "\n" + "\n".join(rows[2:]) + "\n"
    schedule = tmp_path / "circuits.csv"
    schedule.write_text(broken, encoding="utf-8")
    code = main(["routes", str(DRAWING), "--circuits", str(schedule), "--json"])
    captured = capsys.readouterr()
    doc = json.loads(captured.out)
    statuses = {c["id"]: c["status"] for c in doc["circuits"]}
    assert code == 1
    assert list(statuses.values()).count("error") == 1
    assert "NO-SUCH-TAG" in captured.err and "Traceback" not in captured.err
    assert sum(1 for s in statuses.values() if s == "ok") == len(statuses) - 1


def test_failure_while_writing_leaves_no_output(tmp_path, monkeypatch, capsys):
    import cablewright.annotate.schedule_files as schedule_files

    def broken(path, outcomes, *more, **options):
        Path(path).write_text("half")
        raise OSError("disk full")

    monkeypatch.setattr(schedule_files, "write_schedule_xlsx", broken)
    out = tmp_path / "out"
    code = main(["size", str(DRAWING), "--circuits", str(CIRCUITS), "--out", str(out)])
    assert code == 2
    assert "disk full" in capsys.readouterr().err
    # issue 18: no empty folder, no staging folder, no lock file left beside it
    assert not out.exists()
    assert list(tmp_path.iterdir()) == []


def test_batch_mode_sizes_each_drawing_in_its_own_folder(tmp_path, capsys):
    folder = tmp_path / "drawings"
    folder.mkdir()
    for name in ("hall_a", "hall_b"):
        shutil.copy(DRAWING, folder / f"{name}.dxf")
        shutil.copy(CIRCUITS, folder / f"{name}_circuits.csv")
    (folder / "broken.dxf").write_bytes(b"not a drawing")
    out = tmp_path / "out"
    code = main(["size", str(folder), "--out", str(out), "--jobs", "2"])
    err = capsys.readouterr().err
    assert code == 2  # the broken drawing; the others still done
    for name in ("hall_a", "hall_b"):
        assert (out / name / f"{name}_annotated.dxf").exists()
        assert (out / name / "schedule.json").exists()
    assert "broken.dxf" in err


def test_demo_runs(tmp_path, capsys):
    assert main(["demo", "--out", str(tmp_path / "demo")]) == 0
    assert (tmp_path / "demo" / "report.html").exists()
    assert "demo outputs are in" in capsys.readouterr().out
