"""Broken and hostile schedules (issue 18 item 7, issue 10 item 4): one line, exit 2, nothing written.

The files come from :mod:`hostile_corpus` (generated here, none checked in).
Each refused case asserts the exit code of contract.md ("2 the input could not
be used"), exactly one line on standard error naming the problem, no traceback,
no output folder and the schedule unchanged.
"""

from __future__ import annotations

import hashlib
from pathlib import Path

import hostile_corpus as corpus
import pytest
from cablewright.extract.schedule import KNOWN_COLUMNS, read_schedule
from cablewright.sizing.fields import SCHEDULE_FIELDS

from cablewright.cli import main

ROOT = Path(__file__).resolve().parents[1]
DRAWING = ROOT / "sample_drawings" / "pumping_station.dxf"


def _digest(path: Path) -> str:
    return hashlib.sha256(path.read_bytes()).hexdigest()


@pytest.mark.parametrize("case", list(corpus.REFUSED), ids=lambda c: c.__name__)
def test_refused_schedule_one_line_exit_2_nothing_written(case, tmp_path, capsys):
    schedule = case(tmp_path)
    before = _digest(schedule)
    out = tmp_path / "out"
    code = main(["size", str(DRAWING), "--circuits", str(schedule), "--out", str(out)])
    err = capsys.readouterr().err
    lines = err.strip().splitlines()
    assert code == 2, err
    assert len(lines) == 1, err
    assert "Traceback" not in err and "internal error" not in err
    for words in corpus.REFUSED[case]:
        assert words in lines[0], (words, lines[0])
    assert not out.exists()
    assert sorted(p.name for p in tmp_path.iterdir()) == [schedule.name]  # no lock, no staging
    assert _digest(schedule) == before


@pytest.mark.parametrize("bom", [True, False])
def test_utf16_schedule_is_read(tmp_path, bom, caplog):
    # The same rows as UTF-8 (Python's codecs as the reference decoder).
    path = corpus.utf16_schedule(tmp_path, bom)
    rows = read_schedule(path)
    assert [(r.circuit_id, r.from_tag, r.to_tag) for r in rows] == [
        ("F-MCC1", "MSB-1", "MCC-1"), ("F-DB2", "MSB-1", "DB-2")]
    assert dict(rows[0].fields)["load"] == "45 kW"
    warned = " ".join(r.message for r in caplog.records)
    assert ("no byte-order mark" in warned) == (not bom)


def test_windows_1252_fallback_said_once(tmp_path, caplog):
    path = tmp_path / "latin.csv"
    path.write_bytes("circuit,from,to,load,notes\nF-MCC1,MSB-1,MCC-1,45 kW,Pumpe f\xfcr Becken\n".encode("cp1252"))
    rows = read_schedule(path)
    assert dict(rows[0].fields)["notes"] == "Pumpe für Becken"  # cp1252 0xFC is ü (Python codecs)
    said = [r.message for r in caplog.records if "Windows-1252" in r.message]
    assert len(said) == 1


def test_newline_in_quoted_field_is_kept(tmp_path):
    # RFC 4180 section 2.6: a quoted field may hold a line break; it stays in the cell.
    path = tmp_path / "s.csv"
    path.write_text('circuit,from,to,load,notes\nF-MCC1,MSB-1,MCC-1,45 kW,"line one\nline two"\n'
                    "F-DB2,MSB-1,DB-2,20 kW,\n", encoding="utf-8")
    rows = read_schedule(path)
    assert [r.circuit_id for r in rows] == ["F-MCC1", "F-DB2"]
    assert dict(rows[0].fields)["notes"] == "line one\nline two"


def test_extra_columns_listed_once_as_ignored(tmp_path, caplog):
    path = tmp_path / "s.csv"
    path.write_text("circuit,from,to,load,Notes,owner\nF-MCC1,MSB-1,MCC-1,45 kW,x,y\n"
                    "F-DB2,MSB-1,DB-2,20 kW,,\n", encoding="utf-8")
    rows = read_schedule(path)
    assert dict(rows[0].fields)["notes"] == "x"  # kept
    said = [r.message for r in caplog.records if "ignored" in r.message]
    assert len(said) == 1 and "Notes" in said[0] and "owner" in said[0]


@pytest.mark.parametrize("header,intended", [
    ("powerfactor", "power_factor"), ("load type", "load_type"), ("Load-Type", "load_type"),
    ("vd_limit", "vd_limit_pct"), ("phase", "phases"), ("insulaton", "insulation"),
])
def test_misspelt_header_names_the_intended_column(tmp_path, header, intended):
    from cablewright.core.errors import ScheduleError

    path = tmp_path / "s.csv"
    path.write_text(f"circuit,from,to,load,{header}\nF-MCC1,MSB-1,MCC-1,45 kW,1\n", encoding="utf-8")
    with pytest.raises(ScheduleError) as info:
        read_schedule(path)
    assert repr(header) in str(info.value) and repr(intended) in str(info.value)


def test_header_case_alone_is_not_a_misspelling(tmp_path):
    # contract.md: header names are case-insensitive.
    path = tmp_path / "s.csv"
    path.write_text("Circuit,FROM,To,Load,Power_Factor\nF-MCC1,MSB-1,MCC-1,45 kW,0.9\n", encoding="utf-8")
    assert dict(read_schedule(path)[0].fields)["power_factor"] == "0.9"


def test_every_field_the_sizing_reads_is_a_known_column():
    assert set(SCHEDULE_FIELDS) <= set(KNOWN_COLUMNS)


def test_zip_bomb_refused_before_parsing(tmp_path, monkeypatch):
    # openpyxl must never be asked to open it: the size check comes first.
    import openpyxl
    from cablewright.core.errors import ScheduleError

    def forbidden(*args, **kwargs):  # pragma: no cover - reached only if the guard fails
        raise AssertionError("parsed")

    monkeypatch.setattr(openpyxl, "load_workbook", forbidden)
    for case in (corpus.xlsx_zip_bomb, corpus.xlsx_huge_extent, corpus.xlsx_billion_laughs):
        with pytest.raises(ScheduleError):
            read_schedule(case(tmp_path))


def test_total_unpacked_size_bounded(tmp_path, monkeypatch):
    import cablewright.extract.schedule as schedule
    from cablewright.core.errors import ScheduleError

    path = tmp_path / "ok.xlsx"
    path.write_bytes(corpus._workbook_bytes([corpus.HEADER.split(","), corpus.ROW.split(",")]))
    assert read_schedule(path)[0].circuit_id == "F-MCC1"
    monkeypatch.setattr(schedule, "MAX_XLSX_UNPACKED_BYTES", 1000)
    with pytest.raises(ScheduleError, match="unpacks to"):
        read_schedule(path)
