"""``cablewright calc`` against the outside contract (/work/shared/contract.md).

Checked here: per-circuit errors give exit code 1, ``"status": "error"`` in
``--json``, exactly one clear line on standard error and no traceback
(contract.md, "Commands"); a bad ``--config`` gives exit code 2; ``--json``
prints only a JSON document with the contract's keys ("JSON output"), and no
``route``/``grouping`` for ``calc``.  The JSON is checked with the standard
library's ``json`` parser.
"""

from __future__ import annotations

import json

import pytest

from cablewright.cli import main

CIRCUIT_KEYS = {
    "id", "from", "to", "status", "messages", "load_current_a", "device_rating_a", "method",
    "correction_factor", "required_capacity_a", "cable", "voltage_drop",
}
CABLE_KEYS = {"conductor", "insulation", "cores", "csa_mm2", "parallel", "capacity_a", "governed_by"}
VD_KEYS = {"volts", "percent", "limit_percent"}
GOVERNED_BY = {"capacity", "voltage_drop", "short_circuit", "motor_start", "disconnection", "minimum"}


def _run(capsys, *args: str):
    code = main(["calc", *args])
    captured = capsys.readouterr()
    return code, captured.out, captured.err


BAD_CIRCUITS = [
    pytest.param(["--load", "10 kW", "--power-factor", "1.2"], "power factor", id="pf-above-1"),
    pytest.param(["--load", "10 kW", "--power-factor", "0"], "power factor", id="pf-zero"),
    pytest.param(["--load", "10 kW", "--power-factor", "-0.5"], "power factor", id="pf-negative"),
    pytest.param(["--load", "0 kW"], "greater than zero", id="zero-load"),
    pytest.param(["--load", "-5 kW"], "greater than zero", id="negative-load"),
    # IEC 60364-5-52:2009 Table B.52.14 ends at 80 °C (PVC at 60 °C)
    pytest.param(["--load", "10 kW", "--ambient", "95"], "95", id="ambient-beyond-table"),
    # 1200 A -> In 1600 A (the largest rating); Al on method A1 with 9 other
    # circuits cannot reach Iz >= 1600 A with 8 cables of the largest size.
    pytest.param(["--load", "1200 A", "--method", "A1", "--group", "10", "--conductor", "Al"],
                 "parallel", id="beyond-every-cable"),
    pytest.param(["--load", "5000 A"], "rating", id="beyond-every-device"),
]


@pytest.mark.parametrize(("args", "needle"), BAD_CIRCUITS)
def test_bad_circuit_is_error_exit_1_one_line(capsys, args, needle):
    code, out, err = _run(capsys, *args, "--json")
    assert code == 1
    assert "Traceback" not in err and "Traceback" not in out
    lines = err.strip().splitlines()
    assert len(lines) == 1, err
    assert needle.lower() in lines[0].lower()
    circuit = json.loads(out)["circuits"][0]
    assert circuit["status"] == "error"
    assert len(circuit["messages"]) == 1
    assert circuit["messages"][0] in lines[0]
    assert circuit["cable"] is None


@pytest.mark.parametrize(("args", "needle"), BAD_CIRCUITS[:3])
def test_bad_circuit_without_json_also_exit_1(capsys, args, needle):
    code, out, err = _run(capsys, *args)
    assert code == 1
    assert "Traceback" not in err
    assert len(err.strip().splitlines()) == 1
    assert needle in err


@pytest.mark.parametrize("content", [
    "[sizing]\nbogus_key = 1\n",            # unknown key
    "this is [[[ not toml\n",               # does not parse
    pytest.param("[sizing]\ndevice_margin = \"big\"\n", id="wrong-value-type"),
    pytest.param("[environment]\nambient_air_c = \"hot\"\n", id="wrong-value-type-env"),
])
def test_bad_config_exit_2(tmp_path, capsys, content):
    path = tmp_path / "bad.toml"
    path.write_text(content, encoding="utf-8")
    code, out, err = _run(capsys, "--load", "10 kW", "--config", str(path), "--json")
    assert code == 2
    assert "Traceback" not in err
    lines = err.strip().splitlines()
    assert len(lines) == 1 and str(path) in lines[0]
    assert out == ""


def test_missing_config_file_exit_2(tmp_path, capsys):
    code, out, err = _run(capsys, "--load", "10 kW", "--config", str(tmp_path / "absent.toml"))
    assert code == 2
    assert "Traceback" not in err and len(err.strip().splitlines()) == 1


def test_json_document_has_the_contract_keys(capsys):
    code, out, err = _run(capsys, "--load", "55 kW", "--length", "120", "--method", "E",
                          "--ambient", "40", "--group", "6", "--json")
    assert code in (0, 1)
    doc = json.loads(out)  # stdout is one JSON document and nothing else
    assert set(doc) >= {"circuits"}
    (circuit,) = doc["circuits"]
    assert CIRCUIT_KEYS <= set(circuit)
    assert "route" not in circuit and "grouping" not in circuit
    assert CABLE_KEYS <= set(circuit["cable"])
    assert VD_KEYS <= set(circuit["voltage_drop"])
    assert circuit["status"] in ("ok", "warning", "fail", "error")
    assert circuit["cable"]["governed_by"] in GOVERNED_BY
    assert circuit["method"] == "E"
    # 55 kW / (sqrt(3) x 400 V x 0.85) = 93.4 A (IEC 60050-131, P = sqrt(3) U I cos φ)
    assert circuit["load_current_a"] == pytest.approx(93.4, abs=0.05)
    # B.52.14 XLPE 40 °C 0.91 x B.52.20 perforated tray, 6 cables 0.76 = 0.6916
    assert circuit["correction_factor"] == pytest.approx(0.91 * 0.76, abs=0.001)
    # exit code follows the status (contract.md: 0 passes, 1 fails)
    assert code == (0 if circuit["status"] in ("ok", "warning") else 1)
    for line in err.strip().splitlines():
        assert "Traceback" not in line


def test_json_ok_circuit_exit_0(capsys):
    # 10 A, 10 m on a tray: every check passes with the defaults.  No Ze and no
    # fault level given: the config's assumed Ze is used and said (issue 15 item 3),
    # so the status is "warning" (exit 0), never a silent "ok".
    code, out, err = _run(capsys, "--load", "10 A", "--length", "10", "--json")
    circuit = json.loads(out)["circuits"][0]
    assert circuit["status"] == "warning", circuit["messages"]
    assert circuit["ze_assumed"] is True and "Ze assumed" in " ".join(circuit["messages"])
    assert all(c["result"] in ("pass", "not_checked") for c in circuit["checks"])
    assert code == 0
    assert err == ""


def test_text_output_exit_code_matches_json(capsys):
    args = ["--load", "55 kW", "--length", "120", "--method", "E", "--ambient", "40", "--group", "6"]
    code_text, out_text, _ = _run(capsys, *args)
    code_json, out_json, _ = _run(capsys, *args, "--json")
    assert code_text == code_json
    assert "Traceback" not in out_text
    status = json.loads(out_json)["circuits"][0]["status"]
    assert status.upper() in out_text


def test_the_documented_default_config_loads_and_changes_nothing(capsys):
    # cablewright/default_config.toml lists every default: loading it must give the same result.
    from pathlib import Path

    default = Path(__file__).resolve().parents[1] / "cablewright" / "default_config.toml"
    code_a, out_a, _ = _run(capsys, "--load", "30 kW", "--length", "80", "--json")
    code_b, out_b, _ = _run(capsys, "--load", "30 kW", "--length", "80", "--json", "--config", str(default))
    assert code_a == code_b
    assert out_a == out_b
