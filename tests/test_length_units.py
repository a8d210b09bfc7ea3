"""Lengths in the rule set's unit (issue 17 item 4): feet under NEC, metres under IEC.

Sources: 1 ft = 0.3048 m exactly (international yard and pound agreement, 1959;
NIST SP 811, 2008, B.8 "foot = 3.048 E-01 m"), checked against ezdxf's own unit
table (``ezdxf.units.conversion_factor``, a general-purpose library); a route of
30.48 m is 100 ft by that definition.  The sample drawing sized with the NEC
config shows feet on the drawing's schedule table, in the CSV/XLSX headers and
the report, each value the metres of ``schedule.json`` (which keeps metres,
contract.md) divided by 0.3048 within the printed precision of both.
"""

from __future__ import annotations

import contextlib
import csv
import io
import json
import re
from dataclasses import replace
from pathlib import Path

import ezdxf
import ezdxf.units
import openpyxl
import pytest
from cablewright.annotate.rows import FOOT, METRE, length_unit, rows
from cablewright.annotate.schedule_files import schedule_table, write_schedule_csv
from test_annotate_fixtures import outcomes

from cablewright.cli import main

ROOT = Path(__file__).resolve().parents[1]
DRAWING = ROOT / "sample_drawings" / "pumping_station.dxf"
CIRCUITS = ROOT / "sample_drawings" / "pumping_station_circuits.csv"
NEC_CONFIG = ROOT / "sample_drawings" / "pumping_station_nec.toml"
#: DXF $INSUNITS codes (DXF reference, HEADER section): 2 feet, 6 metres.
INSUNITS_FT, INSUNITS_M = 2, 6


def test_the_foot_is_0_3048_m_as_ezdxf_has_it():
    # international yard and pound agreement (1959): 1 ft = 0.3048 m exactly
    assert FOOT.metres_per_unit == 0.3048
    assert FOOT.of(0.3048) == 1.0 and FOOT.of(30.48) == pytest.approx(100.0, abs=1e-12)
    assert FOOT.of(1.0) == pytest.approx(ezdxf.units.conversion_factor(INSUNITS_M, INSUNITS_FT), rel=1e-9)
    assert METRE.of(12.71) == 12.71


def test_the_rule_set_chooses_the_unit_and_the_setting_overrides_it():
    assert length_unit("nec") is FOOT and length_unit("iec") is METRE
    assert length_unit("nec", "m") is METRE and length_unit("iec", "ft") is FOOT


def test_a_route_of_30_48_m_is_100_ft_in_the_schedule_file(tmp_path):
    outs = outcomes()
    first = outs[0]
    route = replace(first.route, routed_length_m=30.48, design_length_m=60.96)
    outs[0] = replace(first, route=route)
    path = write_schedule_csv(tmp_path / "s.csv", outs, FOOT)
    with path.open(encoding="utf-8-sig", newline="") as fh:
        table = list(csv.DictReader(fh))
    row = table[0]
    assert float(row["routed length [ft]"]) == 100.0
    assert float(row["design length [ft]"]) == 200.0
    # two cables in parallel: 2 x 200 ft to order
    assert int(row["parallel"]) == 2 and float(row["cable to order [ft]"]) == 400.0
    assert "routed length [m]" not in row


def test_json_keeps_metres_whatever_the_unit():
    outs = outcomes()
    headers, table = schedule_table(outs, FOOT)
    assert "routed length [ft]" in headers
    assert rows(outs, FOOT)[0].routed_length_m == outs[0].route.routed_length_m  # metres in the row


def _run(args):
    out, err = io.StringIO(), io.StringIO()
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
        code = main(args)
    return code, out.getvalue()


@pytest.fixture(scope="module")
def nec_run(tmp_path_factory):
    out = tmp_path_factory.mktemp("nec-ft")
    code, text = _run(["size", str(DRAWING), "--circuits", str(CIRCUITS), "--config", str(NEC_CONFIG),
                       "--out", str(out), "--json"])
    assert code in (0, 1)
    return out, json.loads(text)


def _ft(metres: float) -> float:
    return metres / 0.3048  # international foot (1959)


def test_nec_schedule_files_are_in_feet(nec_run):
    out, doc = nec_run
    by_id = {c["id"]: c for c in doc["circuits"]}
    with (out / "schedule.csv").open(encoding="utf-8-sig", newline="") as fh:
        table = list(csv.DictReader(fh))
    assert {"routed length [ft]", "design length [ft]", "cable to order [ft]"} <= set(table[0])
    for row in table:
        route = by_id[row["circuit"]]["route"]
        # JSON metres rounded to 0.01 m, feet to 0.01 ft: within both half-steps
        tolerance = 0.005 + _ft(0.005)
        assert float(row["routed length [ft]"]) == pytest.approx(_ft(route["routed_length_m"]), abs=tolerance)
        assert float(row["design length [ft]"]) == pytest.approx(_ft(route["design_length_m"]), abs=tolerance)
    sheet = openpyxl.load_workbook(out / "schedule.xlsx")["schedule"]
    headers = [c.value for c in sheet[1]]
    column = headers.index("routed length [ft]")
    assert sheet.cell(row=2, column=column + 1).number_format == '0.0" ft"'
    boq = openpyxl.load_workbook(out / "schedule.xlsx")["BOQ"]
    boq_headers = [c.value for c in boq[1]]
    assert "length to order [ft]" in boq_headers
    ordered = {q["cable"]: q["length_to_order_m"] for q in doc["quantities"]}
    for line in boq.iter_rows(min_row=2, values_only=True):
        if line[0] == "cable":  # printed to 0.1 ft; JSON metres to 0.1 m at most
            assert line[4] == pytest.approx(_ft(ordered[line[1]]), abs=0.05 + _ft(0.05))


def test_nec_drawing_table_and_labels_are_in_feet(nec_run):
    out, doc = nec_run
    dxf = ezdxf.readfile(out / "pumping_station_annotated.dxf")
    texts = [e.text for e in dxf.modelspace().query("MTEXT")]
    column = next(t for t in texts if t.startswith("order ft"))
    values = column.split("\\P")[1:]
    expected = [_ft(c["route"]["design_length_m"] * c["cable"]["parallel"]) for c in doc["circuits"]]
    assert len(values) == len(expected)
    for shown, ft in zip(values, expected, strict=True):
        # printed to 0.1 ft from the unrounded metres; the JSON's metres are to 0.01 m
        assert float(shown) == pytest.approx(ft, abs=0.05 + _ft(0.005) * 2)
    notes = " ".join(texts + [e.dxf.text for e in dxf.modelspace().query("TEXT")])
    assert "authority having jurisdiction" in notes


def test_nec_report_lists_feet_and_defers_to_the_authority(nec_run):
    out, doc = nec_run
    html = (out / "report.html").read_text(encoding="utf-8")
    first = doc["circuits"][0]
    shown = f"{_ft(first['route']['routed_length_m']):.1f} ft"
    assert f'<td class="num">{shown}</td>' in html
    assert re.search(r"Route: routed length [0-9.]+ ft", html)
    assert "<th>length to order</th>" in html and re.search(r"<td class=\"num\">[0-9.]+ ft</td>", html)
    caution = re.search(r'<div class="caution">([^<]*)</div>', html).group(1)
    assert "authority having jurisdiction" in caution


def test_nec_with_length_unit_m_keeps_metres(tmp_path):
    config = tmp_path / "nec_m.toml"
    config.write_text('[sizing]\nstandard = "nec"\n\n[annotate]\nlength_unit = "m"\n', encoding="utf-8")
    code, _ = _run(["size", str(DRAWING), "--circuits", str(CIRCUITS), "--config", str(config),
                    "--out", str(tmp_path / "out"), "--json"])
    assert code in (0, 1)
    with (tmp_path / "out" / "schedule.csv").open(encoding="utf-8-sig", newline="") as fh:
        header = next(csv.reader(fh))
    assert "routed length [m]" in header and not any("[ft]" in h for h in header)


def test_calc_under_nec_shows_feet():
    code, text = _run(["calc", "--load", "55 kW", "--length", "120", "--standard", "nec"])
    assert code in (0, 1)
    assert f"over {120 / 0.3048:g} ft" in text  # 393.701 ft
    code, text = _run(["calc", "--load", "55 kW", "--length", "120"])
    assert "over 120 m" in text


def test_label_length_to_order_in_feet():
    from cablewright.annotate.drawing.labels import label_fields

    first = outcomes()[0]  # 72.2 m design length, 2 cables in parallel
    assert label_fields(first)["length"] == f"order {72.2 * 2:.0f} m"
    assert label_fields(first, "ft")["length"] == f"order {72.2 * 2 / 0.3048:.0f} ft"  # 474 ft
