"""The drop from the origin as its own check, ``voltage_drop_origin``.

IEC 60364-5-52:2009 525 and Annex G (G.52.1, Table G.52.1) hold the limit between the
origin of the installation and the equipment: the drops of circuits in series add
(a final circuit's own drop plus its feeders').  Table G.52.1, low-voltage
installation supplied from a public distribution network: lighting 3 %, other uses
5 % (published table).  The sample schedule is read with the csv module; the report
summary is read from the HTML, the drawing's schedule rows and the JSON/CSV rows are
read from the writers, so the outputs are seen to agree.
"""

from __future__ import annotations

import csv
import html
from pathlib import Path

import pytest
from cablewright.annotate.drawing.schedule_table import schedule_rows as drawing_rows
from cablewright.annotate.jsonout import outcome_to_dict
from cablewright.annotate.report import render_report_html
from cablewright.annotate.schedule_files import schedule_rows
from cablewright.sizing.chain import ORIGIN_DROP_CHECK, origin_drop_check
from cablewright.sizing.model import CheckResult, VoltageDrop

from cablewright import pipeline
from cablewright.config import load_settings

ROOT = Path(__file__).resolve().parents[1]
DXF = ROOT / "sample_drawings" / "pumping_station.dxf"
CSV = ROOT / "sample_drawings" / "pumping_station_circuits.csv"
#: IEC 60364-5-52:2009 Table G.52.1, public LV supply: lighting (%).
TABLE_G521_LIGHTING_PUBLIC_PCT = 3.0


@pytest.fixture(scope="module")
def job():
    settings = load_settings(None)  # what `cablewright demo` runs with (no config)
    return pipeline.size_measurement(pipeline.measure_drawing(DXF, CSV, settings), settings)


@pytest.fixture(scope="module")
def schedule():
    with CSV.open(newline="", encoding="utf-8-sig") as fh:
        return {row["circuit"]: row for row in csv.DictReader(fh)}


def _check(outcome, name):
    return next(c for c in outcome.sizing.checks if c.name == name)


def _by_id(job):
    return {o.circuit_id: o for o in job.outcomes}


def test_l01_fails_the_drop_from_the_origin_through_its_feeder(job, schedule):
    out = _by_id(job)
    row = schedule["L-01"]
    feeder = next(cid for cid, r in schedule.items() if r["to"] == row["from"])  # F-DB2 feeds DB-2
    assert feeder == "F-DB2" and schedule[feeder]["from"] == "MSB-1"
    own = _check(out["L-01"], "voltage_drop").value
    upstream = _check(out[feeder], "voltage_drop").value
    origin = _check(out["L-01"], ORIGIN_DROP_CHECK)
    assert origin.result is CheckResult.FAIL
    assert origin.value == pytest.approx(own + upstream)  # G.52.1: drops in series add
    assert float(row["vd_limit_pct"]) == origin.limit == TABLE_G521_LIGHTING_PUBLIC_PCT
    assert round(origin.value, 2) == 3.15 and origin.value > origin.limit  # the figure of issue 12
    assert "G.52.1" in origin.source and "525" in origin.source and feeder in origin.source
    # its own drop passes: only the check from the origin fails
    assert _check(out["L-01"], "voltage_drop").passed
    assert out["L-01"].status == "fail"
    assert any(m.startswith("voltage drop from the origin 3.15 %") for m in out["L-01"].messages)


def test_a_circuit_fed_at_the_origin_has_it_not_applicable(job, schedule):
    out = _by_id(job)
    fed_at_origin = [cid for cid, r in schedule.items()
                     if not any(other["to"] == r["from"] for other in schedule.values())]
    assert "F-DB2" in fed_at_origin and "F-MCC1" in fed_at_origin
    for cid in fed_at_origin:
        check = _check(out[cid], ORIGIN_DROP_CHECK)
        assert check.result is CheckResult.NOT_APPLICABLE
        assert check.value == _check(out[cid], "voltage_drop").value  # its own drop
        assert "fed at the origin" in check.message
        assert out[cid].sizing.voltage_drop.cumulative_percent == pytest.approx(check.value)


def test_every_sized_circuit_has_the_check_and_status_agrees_with_the_checks(job):
    for o in job.outcomes:
        if o.sizing is None or o.sizing.voltage_drop is None:
            continue
        names = [c.name for c in o.sizing.checks]
        assert names.count(ORIGIN_DROP_CHECK) == 1
        assert names.index(ORIGIN_DROP_CHECK) == names.index("voltage_drop") + 1
        failed = any(c.failed for c in o.sizing.checks)
        if o.status != "error":
            assert (o.status == "fail") == failed, o.circuit_id


def test_summary_json_schedule_and_drawing_agree(job):
    failing = [o.circuit_id for o in job.outcomes if o.status == "fail"]
    assert failing == ["L-01"]
    failed_checks = [(o.circuit_id, c.name) for o in job.outcomes if o.sizing is not None
                     for c in o.sizing.checks if c.failed]
    assert failed_checks == [("L-01", ORIGIN_DROP_CHECK)]
    page = render_report_html(job.outcomes, title="t", drawing_name=DXF.name, preview_png=None,
                              cautions="design aid")
    summary = page[page.index("<h2>Summary</h2>"):page.index("<h2>Schedule</h2>")]
    cells = [c.split("</td>")[0] for c in summary.split('<td class="num">')[1:]]
    circuits, ok, warning, fail, error, made, passed, failed, not_checked, not_applicable = cells[:10]
    assert (circuits, fail, failed) == (str(len(job.outcomes)), "1", "1")
    assert int(made) == int(passed) + int(failed)
    assert "#c-L-01" in summary and html.escape("voltage drop from the origin 3.15 %") in summary
    data = outcome_to_dict(_by_id(job)["L-01"])
    entry = next(c for c in data["checks"] if c["name"] == ORIGIN_DROP_CHECK)
    assert (entry["result"], entry["passed"], entry["limit"]) == ("fail", False, 3.0)
    assert round(entry["value"], 2) == 3.15
    rows = {r["circuit"]: r for r in schedule_rows(job.outcomes)}
    assert rows["L-01"]["status"] == "fail" and "from the origin 3.15 %" in rows["L-01"]["messages"]
    assert rows["L-01"]["vd from origin [%]"] == pytest.approx(entry["value"], abs=0.01)
    drawn = {r[0]: r for r in drawing_rows(job.outcomes)}
    assert drawn["L-01"][-1] == "fail"
    assert all(drawn[o.circuit_id][-1] == o.status for o in job.outcomes)


def test_the_rule_sets_total_limit_is_used_when_it_has_one():
    # NEC: 5 % for feeder and branch together, NFPA 70:2023 215.2(A)(2) Informational Note No. 2
    vd = VoltageDrop(4.0, 2.9, 3.0, 0.0, 2.9, total_limit_percent=5.0,
                     total_limit_source="NFPA 70:2023 215.2(A)(2) Informational Note No. 2")
    ok = origin_drop_check(vd, [("F-1", 1.8)], 4.7)
    assert ok.passed and ok.limit == 5.0 and "215.2(A)(2)" in ok.source
    assert origin_drop_check(vd, [("F-1", 2.2)], 5.1).failed


def test_loops_and_unsized_feeders_leave_it_not_checked():
    from cablewright.extract.model import ScheduleRow
    from cablewright.sizing.config import SizingConfig
    from cablewright.sizing.model import CircuitSpec, Load, SizingResult, Stretch
    from cablewright.sizing.select import size_circuit

    from cablewright.pipeline import _with_chain_drops

    tags = {"P-1": ("MSB", "DB1"), "P-2": ("DB1", "M2"), "P-10": ("DB11", "DB10"),
            "P-11": ("DB10", "DB11"), "P-12": ("DB11", "M12"), "F-9": ("MSB", "DB9"),
            "L-9": ("DB9", "M9")}
    rows = {cid: ScheduleRow("test.csv", i + 2, cid, a, b) for i, (cid, (a, b)) in enumerate(tags.items())}
    results = {cid: size_circuit(CircuitSpec(
        circuit_id=cid, load=Load(20.0, "kW"), voltage_v=400.0, phases=3, power_factor=0.9,
        load_type="general", conductor="Cu", insulation="XLPE", design_length_m=15.0,
        stretches=(Stretch(method="E"),)), SizingConfig()) for cid in tags}
    results["F-9"] = SizingResult("F-9", "error", ("could not be routed",))  # F-9 not sized
    out = _with_chain_drops(results, rows)
    origin = {cid: next((c for c in r.checks if c.name == ORIGIN_DROP_CHECK), None) for cid, r in out.items()}
    assert origin["P-1"].result is CheckResult.NOT_APPLICABLE
    assert origin["P-2"].result is CheckResult.PASS
    assert origin["P-2"].value == pytest.approx(out["P-1"].voltage_drop.percent + out["P-2"].voltage_drop.percent)
    for cid in ("P-10", "P-11", "P-12"):
        assert origin[cid].result is CheckResult.NOT_CHECKED and "loop" in origin[cid].message
    assert origin["L-9"].result is CheckResult.NOT_CHECKED and "F-9" in origin["L-9"].message
    assert out["L-9"].voltage_drop.cumulative_percent is None  # not understated as its own drop
    assert origin["F-9"] is None  # not sized: no checks at all
