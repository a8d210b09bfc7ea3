"""Outputs under attack (issue 18 items 1, 3, 8, 9, 10): nothing injected, nothing partial.

- Formula injection: read back with openpyxl (no formula cell) and the ``csv``
  module (formula-like text begins with a single quote, OWASP "CSV Injection").
- Inputs are never outputs; batch folders unique and inside ``--out``; a lock
  keeps a second run off; stale staging is cleared.
- An internal error is one line, exit 2, the output folder as it was.
- Text longer than DXF allows (DXF Reference, "Group Code Value Types": 2049
  bytes from AutoCAD 2000) is cut on the drawing and whole in the schedule.
- Two runs give the same bytes; ``kill -9`` at several moments leaves the whole
  old or the whole new output set.
"""

from __future__ import annotations

import csv
import fcntl
import hashlib
import os
import shutil
import signal
import subprocess
import sys
import time
from pathlib import Path

import ezdxf
import openpyxl
import pytest
from cablewright.annotate.schedule_files import FORMULA_LEADS, _csv_cell, _text_styles
from cablewright.annotate.text_limits import ELLIPSIS, encoded_size

from cablewright.cli import main

ROOT = Path(__file__).resolve().parents[1]
SAMPLES = ROOT / "sample_drawings"
DRAWING = SAMPLES / "pumping_station.dxf"
CIRCUITS = SAMPLES / "pumping_station_circuits.csv"
INJECTED = ("=HYPERLINK(\"http://x\",\"y\")", "+1+2", "-3-4", "@SUM(1)")


def _digest(path: Path) -> str:
    return hashlib.sha256(path.read_bytes()).hexdigest()


def _tree(folder: Path) -> dict[str, str]:
    """Every entry of a folder (hidden ones too) -> its digest ("dir" for folders)."""
    if not folder.exists():
        return {}
    return {str(p.relative_to(folder)): ("dir" if p.is_dir() else _digest(p)) for p in sorted(folder.rglob("*"))}


def _schedule_rows() -> list[list[str]]:
    with open(CIRCUITS, encoding="utf-8-sig", newline="") as fh:
        return list(csv.reader(fh))


def _write_schedule(path: Path, rows: list[list[str]]) -> Path:
    with open(path, "w", encoding="utf-8", newline="") as fh:
        csv.writer(fh).writerows(rows)
    return path


def _run(argv: list[str], capsys) -> tuple[int, list[str]]:
    code = main(argv)
    err = capsys.readouterr().err
    assert "Traceback" not in err
    return code, err.strip().splitlines()


# -- 1. formula injection -------------------------------------------------------------


@pytest.fixture(scope="module")
def injected_run(tmp_path_factory):
    folder = tmp_path_factory.mktemp("inject")
    rows = _schedule_rows()
    for row, cid in zip(rows[1:], INJECTED, strict=False):
        row[0] = cid
    schedule = _write_schedule(folder / "injected.csv", rows)
    out = folder / "out"
    code = main(["size", str(DRAWING), "--circuits", str(schedule), "--out", str(out), "--json"])
    assert code in (0, 1)
    return out


def test_xlsx_has_no_formula_cell(injected_run):
    wb = openpyxl.load_workbook(injected_run / "schedule.xlsx")  # not read-only: every cell's type
    ws = wb.active
    kinds = {cell.data_type for row in ws.iter_rows() for cell in row}
    assert "f" not in kinds
    ids = [ws.cell(row=r, column=1).value for r in range(2, ws.max_row + 1)]
    for cid in INJECTED:
        assert cid in ids  # the text itself, kept whole
    for row in ws.iter_rows(min_row=2):
        if row[0].value in INJECTED:
            assert row[0].data_type == "s" and row[0].quotePrefix
        current = row[4]  # "load current [A]": a number stays a number
        assert current.value is None or current.data_type == "n"
    import zipfile

    with zipfile.ZipFile(injected_run / "schedule.xlsx") as archive:
        assert b"<f>" not in archive.read("xl/worksheets/sheet1.xml")


def test_csv_formula_like_cells_begin_with_a_quote(injected_run):
    with open(injected_run / "schedule.csv", encoding="utf-8-sig", newline="") as fh:
        rows = list(csv.reader(fh))
    ids = [r[0] for r in rows[1:]]
    for cid in INJECTED:
        assert "'" + cid in ids
    for row in rows[1:]:
        for cell in row:
            if cell.startswith(FORMULA_LEADS):
                float(cell)  # only real numbers may begin with - or +


@pytest.mark.parametrize("text", ["\tcmd", "\rcmd", "=1", "+1", "-x", "@x"])
def test_every_formula_lead_is_quoted(text):
    assert _csv_cell(text) == "'" + text
    assert _text_styles(None, [-5.0, "P-101"], []) is None and _csv_cell(-5.0) == "-5.0"  # numbers stay numbers
    assert _csv_cell("P-101") == "P-101"


# -- 9. text limits -------------------------------------------------------------------


def test_long_circuit_id_cut_on_drawing_whole_in_schedule(tmp_path, capsys):
    rows = _schedule_rows()
    long_id = "L" + "x" * 3000 + "-END"
    rows[1][0] = long_id
    schedule = _write_schedule(tmp_path / "long.csv", rows)
    out = tmp_path / "out"
    code, _ = _run(["size", str(DRAWING), "--circuits", str(schedule), "--out", str(out)], capsys)
    assert code in (0, 1)
    doc = ezdxf.readfile(out / f"{DRAWING.stem}_annotated.dxf")
    limit = 2049  # DXF Reference, "Group Code Value Types", AutoCAD 2000 and later
    texts = [e.dxf.text for e in doc.modelspace().query("TEXT")]
    cut = [t for t in texts if t.startswith("Lxxx")]
    assert cut and all(t.endswith(ELLIPSIS) for t in cut)
    assert all(encoded_size(t, doc.dxfversion) <= limit for t in texts)
    auditor = doc.audit()
    assert not auditor.has_errors
    with open(out / "schedule.csv", encoding="utf-8-sig", newline="") as fh:
        assert long_id in [r[0] for r in csv.reader(fh)]


# -- 8. inputs are never outputs ------------------------------------------------------


def test_run_pointed_at_its_own_output_schedule_is_refused(tmp_path, capsys):
    out = tmp_path / "OUT"
    out.mkdir()
    schedule = out / "schedule.csv"
    shutil.copy(CIRCUITS, schedule)
    before = _tree(out)
    code, lines = _run(["size", str(DRAWING), "--circuits", str(schedule), "--out", str(out)], capsys)
    assert code == 2 and len(lines) == 1
    assert "schedule" in lines[0] and "inside the output folder" in lines[0]
    assert _tree(out) == before  # byte-identical, nothing added
    assert sorted(p.name for p in tmp_path.iterdir()) == ["OUT"]


@pytest.mark.parametrize("role", ["config", "drawing", "out-is-drawing"])
def test_other_inputs_inside_out_refused(tmp_path, capsys, role):
    out = tmp_path / "OUT"
    out.mkdir()
    drawing, config = DRAWING, None
    if role == "drawing":
        drawing = out / "plant.dxf"
        shutil.copy(DRAWING, drawing)
    elif role == "config":
        config = out / "c.toml"
        config.write_text("", encoding="utf-8")
    argv = ["size", str(drawing), "--circuits", str(CIRCUITS), "--out", str(out)]
    if role == "out-is-drawing":
        drawing = tmp_path / "plant.dxf"
        shutil.copy(DRAWING, drawing)
        argv = ["size", str(drawing), "--circuits", str(CIRCUITS), "--out", str(drawing)]
    if config:
        argv += ["--config", str(config)]
    before = _tree(tmp_path)
    code, lines = _run(argv, capsys)
    assert code == 2 and len(lines) == 1, lines
    assert _tree(tmp_path) == before


def test_batch_same_names_two_folders_inside_out(tmp_path, capsys):
    for site in ("a", "b"):
        (tmp_path / site).mkdir()
        shutil.copy(DRAWING, tmp_path / site / "plant.dxf")
        shutil.copy(CIRCUITS, tmp_path / site / "plant_circuits.csv")
    odd = tmp_path / "c"
    odd.mkdir()
    shutil.copy(DRAWING, odd / "...dxf")
    shutil.copy(CIRCUITS, odd / "..._circuits.csv")
    out = tmp_path / "out"
    code = main(["size", str(tmp_path / "a" / "plant.dxf"), str(tmp_path / "b" / "plant.dxf"),
                 str(odd / "...dxf"), "--out", str(out)])
    err = capsys.readouterr().err
    assert code in (0, 1), err
    assert sorted(p.name for p in out.iterdir()) == ["drawing", "plant", "plant-2"]
    assert (out / "plant" / "plant_annotated.dxf").exists()
    assert (out / "plant-2" / "plant_annotated.dxf").exists()
    assert "plant-2" in err  # the collision is listed
    assert sorted(p.name for p in tmp_path.iterdir()) == ["a", "b", "c", "out"]  # nothing outside --out


def test_second_run_on_a_locked_out_is_refused(tmp_path, capsys):
    out = tmp_path / "out"
    lock = tmp_path / ".out.cablewright.lock"
    with open(lock, "w") as fh:
        fcntl.flock(fh.fileno(), fcntl.LOCK_EX | fcntl.LOCK_NB)  # another run holds it
        code, lines = _run(["size", str(DRAWING), "--circuits", str(CIRCUITS), "--out", str(out)], capsys)
    assert code == 2 and len(lines) == 1 and "another cablewright run" in lines[0]
    assert not out.exists()


def test_stale_staging_cleared_and_fallback_swap(tmp_path, capsys, monkeypatch):
    import cablewright.outputs as outputs

    out = tmp_path / "out"
    out.mkdir()
    (out / "mine.txt").write_text("the user's own file", encoding="utf-8")
    stale = tmp_path / ".out.cablewright-stage-dead"
    stale.mkdir()
    (stale / "schedule.csv").write_text("half", encoding="utf-8")
    monkeypatch.setattr(outputs, "_exchange", lambda a, b: False)  # a file system without exchange
    code, _ = _run(["size", str(DRAWING), "--circuits", str(CIRCUITS), "--out", str(out)], capsys)
    assert code in (0, 1)
    assert sorted(p.name for p in tmp_path.iterdir()) == ["out"]
    assert (out / "mine.txt").read_text(encoding="utf-8") == "the user's own file"  # carried over
    assert (out / "schedule.json").exists()


def test_interrupted_two_rename_swap_puts_the_old_set_back(tmp_path):
    from cablewright.outputs import _clean_stale

    old = tmp_path / ".out.cablewright-old-123"
    old.mkdir()
    (old / "schedule.csv").write_text("old", encoding="utf-8")
    _clean_stale(tmp_path / "out")
    assert (tmp_path / "out" / "schedule.csv").read_text(encoding="utf-8") == "old"


# -- 3. internal errors ---------------------------------------------------------------


def test_internal_error_one_line_exit_2_out_as_before(tmp_path, capsys, monkeypatch):
    import cablewright.sizing.select as select

    out = tmp_path / "out"
    assert main(["size", str(DRAWING), "--circuits", str(CIRCUITS), "--out", str(out), "--json"]) in (0, 1)
    capsys.readouterr()
    before = _tree(tmp_path)

    def boom(*args, **kwargs):
        raise RuntimeError("boom")

    monkeypatch.setattr(select, "_size", boom)
    code, lines = _run(["size", str(DRAWING), "--circuits", str(CIRCUITS), "--out", str(out)], capsys)
    assert code == 2
    assert lines == [f"cablewright: internal error in sizing on {DRAWING}: RuntimeError: boom (please report)"]
    assert _tree(tmp_path) == before
    fresh = tmp_path / "fresh"
    code, lines = _run(["size", str(DRAWING), "--circuits", str(CIRCUITS), "--out", str(fresh)], capsys)
    assert code == 2 and not fresh.exists()  # no empty folder
    code = main(["size", str(DRAWING), "--circuits", str(CIRCUITS), "--out", str(fresh), "--debug"])
    assert code == 2 and "Traceback" in capsys.readouterr().err  # only with --debug


# -- 10. determinism and kill -9 ------------------------------------------------------


def _size_cmd(out: Path, circuits: Path = CIRCUITS) -> list[str]:
    return [sys.executable, "-m", "cablewright", "size", str(DRAWING), "--circuits", str(circuits),
            "--out", str(out), "--json"]


def _env(seed: str) -> dict[str, str]:
    return {**os.environ, "PYTHONHASHSEED": seed}


@pytest.fixture(scope="module")
def reference(tmp_path_factory):
    """The new output set, sized in a process of its own; and how long that took."""
    folder = tmp_path_factory.mktemp("ref")
    started = time.monotonic()
    done = subprocess.run(_size_cmd(folder / "new"), env=_env("1"), capture_output=True, check=False)
    assert done.returncode in (0, 1), done.stderr
    return folder / "new", time.monotonic() - started


def test_two_runs_byte_identical(reference, tmp_path):
    new, _ = reference
    done = subprocess.run(_size_cmd(tmp_path / "again"), env=_env("2"), capture_output=True, check=False)
    assert done.returncode in (0, 1)
    assert _tree(tmp_path / "again") == _tree(new)  # other hash seed, other time: same bytes


def test_kill_9_leaves_whole_old_or_whole_new(reference, tmp_path):
    new_ref, seconds = reference
    old_ref = tmp_path / "old_ref"  # an older set: every file different from the new one
    shutil.copytree(new_ref, old_ref)
    for path in old_ref.iterdir():
        path.write_bytes(path.read_bytes() + b"\nolder run\n")
    old, new = _tree(old_ref), _tree(new_ref)
    out = tmp_path / "work" / "out"
    seen = set()
    for delay_s in (0.0, 0.7, 2.5):  # after the staging folder appears: during the write and after
        shutil.rmtree(out.parent, ignore_errors=True)
        out.parent.mkdir()
        shutil.copytree(old_ref, out)
        proc = subprocess.Popen(_size_cmd(out), stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
        deadline = time.monotonic() + 4 * seconds + 30
        while proc.poll() is None and time.monotonic() < deadline:
            if any(p.name.startswith(".out.cablewright-stage-") for p in out.parent.iterdir()):
                break
            time.sleep(0.005)
        time.sleep(delay_s)
        proc.send_signal(signal.SIGKILL)
        proc.wait()
        state = _tree(out)
        assert state in (old, new), sorted(set(state) ^ set(new))
        seen.add("new" if state == new else "old")
    assert "old" in seen  # at least one kill landed before the swap


def test_ifc_outputs_byte_identical(tmp_path, capsys):
    # The sized IFC copy's new GlobalIds are name-based (RFC 4122 uuid5), the
    # plan view's dates fixed: two runs, the same bytes.
    model = SAMPLES / "pumping_station.ifc"
    trees = []
    for name in ("one", "two"):
        code = main(["size", str(model), "--circuits", str(CIRCUITS), "--out", str(tmp_path / name), "--json"])
        assert code in (0, 1)
        trees.append(_tree(tmp_path / name))
    capsys.readouterr()
    assert trees[0] == trees[1] and f"{model.stem}_sized.ifc" in trees[0]
    import ifcopenshell

    ids = [e.GlobalId for e in ifcopenshell.open(str(tmp_path / "one" / f"{model.stem}_sized.ifc")).by_type("IfcRoot")]
    assert len(ids) == len(set(ids))  # ISO 16739-1: GlobalId unique within the model
