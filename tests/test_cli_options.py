"""The command line of issue 10 item 6 (contract.md "Extensions", "Command line").

``--version``; ``calc`` takes every schedule column as an option (underscores
as hyphens); a value that does not parse or an unknown choice is one line and
exit code 2, listing the choices; ``--standard nec`` is one line, exit 2; the
terminal tables fit 100 columns and give a reason for every failing circuit;
``size`` says on stderr when the circuits come from the drawing's attributes.
Independent values: the design current of 55 kW at 400 V, cos phi 0.85, is
P / (sqrt(3) U cos phi) = 93.4 A (IEC 60050-131 power relations).
"""

from __future__ import annotations

import json
import math
from importlib.metadata import version
from pathlib import Path

import pytest
from cablewright.sizing.fields import SCHEDULE_FIELDS

from cablewright.cli import build_parser, main

ROOT = Path(__file__).resolve().parents[1]
DRAWING = ROOT / "sample_drawings" / "pumping_station.dxf"
CIRCUITS = ROOT / "sample_drawings" / "pumping_station_circuits.csv"

#: Further schedule columns the sizing reads (README "Further schedule columns",
#: contract.md "Extensions"); the drawing-only ones (via, to_x/y/z) are not calc's.
FURTHER_COLUMNS = ("starter", "curve", "magnetic_a", "ze_ohm", "earthing", "clearing_time_s",
                   "let_through_ka2s", "third_harmonic_pct")


def _calc_options() -> set[str]:
    parser = build_parser()
    sub = next(a for a in parser._actions if a.dest == "command")
    return {s for a in sub.choices["calc"]._actions for s in a.option_strings}


def test_version(capsys):
    assert main(["--version"]) == 0
    assert capsys.readouterr().out.strip() == f"cablewright {version('cablewright')}"


@pytest.mark.parametrize("column", SCHEDULE_FIELDS + FURTHER_COLUMNS)
def test_calc_takes_every_schedule_column(column):
    assert "--" + column.replace("_", "-") in _calc_options()


def test_calc_options_reach_the_sizing(capsys):
    # Ze given: the check says where Ze came from; curve D: Ia = 20 In (IEC 60898-1 Table 7)
    code = main(["calc", "--load", "7.5 kW", "--length", "30", "--ze-ohm", "0.4", "--curve", "D",
                 "--earthing", "TN-S", "--json"])
    doc = json.loads(capsys.readouterr().out)["circuits"][0]
    dis = next(c for c in doc["checks"] if c["name"] == "disconnection")
    assert "Ze 0.400" in dis["source"] and "schedule ze_ohm" in dis["source"]
    assert "type D" in dis["source"] and "20 In" in dis["source"]
    assert code in (0, 1)


@pytest.mark.parametrize(("args", "needle"), [
    (["--load", "lots"], "does not parse"),
    (["--load", "10 parsecs"], "unknown"),
    (["--load", "10 kW", "--ze-ohm", "abc"], "not a number"),
    (["--load", "10 kW", "--fault-ka", "x"], "not a number"),
    (["--load", "10 kW", "--length", "far"], "not a number"),
    (["--load", "10 kW", "--insulation", "rubber"], "XLPE, EPR, PVC"),
    (["--load", "10 kW", "--conductor", "steel"], "Cu, Al"),
    (["--load", "10 kW", "--method", "Z9"], "A1, A2, B1"),
    (["--load", "10 kW", "--phases", "2"], "3, 1"),
    (["--load", "10 kW", "--curve", "K"], "B, C, D"),
    (["--load", "10 kW", "--starter", "magic"], "dol, star_delta, soft, drive"),
    (["--load", "10 kW", "--standard", "bs"], "iec, nec"),
])
def test_calc_unusable_value_is_one_line_exit_2(capsys, args, needle):
    code = main(["calc", *args])
    captured = capsys.readouterr()
    assert code == 2
    lines = captured.err.strip().splitlines()
    assert len(lines) == 1 and needle in lines[0], captured.err
    assert "Traceback" not in captured.err and captured.out == ""


def test_calc_choices_are_case_insensitive_and_epr_reads_the_xlpe_columns(capsys):
    # IEC 60364-5-52:2009 Annex B tables head their 90 °C columns "XLPE or EPR".
    assert main(["calc", "--load", "10 kW", "--insulation", "epr", "--json"]) == 0
    epr = json.loads(capsys.readouterr().out)["circuits"][0]["cable"]
    assert main(["calc", "--load", "10 kW", "--insulation", "XLPE", "--json"]) == 0
    xlpe = json.loads(capsys.readouterr().out)["circuits"][0]["cable"]
    assert epr["csa_mm2"] == xlpe["csa_mm2"] and epr["capacity_a"] == xlpe["capacity_a"]


def test_readme_calc_example_passes_and_fits_100_columns(capsys):
    code = main(["calc", "--load", "55 kW", "--voltage", "400", "--length", "120", "--method", "E",
                 "--ambient", "40", "--group", "6", "--fault-ka", "25"])
    out = capsys.readouterr().out
    assert code == 0, out
    assert max(len(line) for line in out.splitlines()) <= 100
    ib = 55000 / (math.sqrt(3) * 400 * 0.85)
    assert f"{ib:.1f} A" in out


def test_size_table_fits_100_columns_with_a_reason_for_fails(tmp_path, capsys):
    code = main(["size", str(DRAWING), "--circuits", str(CIRCUITS), "--out", str(tmp_path / "o")])
    out = capsys.readouterr().out
    assert code == 1
    lines = out.splitlines()
    assert max(len(line) for line in lines) <= 100
    header = lines[0].split()
    assert header[-1] == "reason"
    at = next(i for i, line in enumerate(lines) if line.startswith("L-01 "))
    reason = lines[at][len(lines[0]) - len("reason"):]
    for line in lines[at + 1:]:  # the wrapped rest of the reason column
        if line[:1].strip():
            break
        reason += line.strip()
    # the sample's drop from the origin, named as its check (IEC 60364-5-52:2009 G.52.1)
    assert "voltage_drop_origin" in reason.replace(" ", "")


def test_size_says_when_circuits_come_from_attributes(tmp_path, capsys):
    import ezdxf

    doc = ezdxf.new(units=6)  # metres
    msp = doc.modelspace()
    msp.add_line((0, 0), (20, 0), dxfattribs={"layer": "ROUTE-TRAY"})
    for tag, x, extra in (("DB-1", 0, {}), ("L-1", 20, {"CIRCUIT": "C-1", "FROM": "DB-1", "LOAD": "2 kW"})):
        block = doc.blocks.new(name=f"B-{tag}")
        for i, name in enumerate(["TAG", *extra]):
            block.add_attdef(name, (0, -i))
        ref = msp.add_blockref(f"B-{tag}", (x, 1))
        ref.add_auto_attribs({"TAG": tag, **extra})
    path = tmp_path / "attrs.dxf"
    doc.saveas(path)
    code = main(["routes", str(path)])
    err = capsys.readouterr().err
    assert "no --circuits schedule given" in err and "equipment attributes of attrs.dxf" in err
    assert code in (0, 1)


def test_calc_standard_nec_sizes_in_awg(capsys):
    # NFPA 70:2023: 25 hp, 460 V three-phase: FLC 34 A (Table 430.250); conductors at
    # 125 % = 42.5 A (430.22) -> 8 AWG Cu, 75 °C column 50 A (Table 310.16, 110.14(C)).
    code = main(["calc", "--load", "25 hp", "--voltage", "460", "--load-type", "motor",
                 "--standard", "nec", "--length", "30", "--json"])
    c = json.loads(capsys.readouterr().out)["circuits"][0]
    assert code == 0 and c["load_current_a"] == pytest.approx(34.0)
    assert c["cable"]["size_label"] == "8 AWG" and c["cable"]["csa_mm2"] == pytest.approx(8.37, abs=0.01)
