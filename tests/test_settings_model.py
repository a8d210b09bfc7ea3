"""The settings model (cablewright/config.py) and the documented defaults.

Checked: every section and key comes from the stages' config dataclasses;
unknown sections and keys, wrong types and values out of range are refused at
start-up, before any drawing is read, one line each naming the file, section,
key and the nearest key or the allowed range (issue 10 item 1, issue 18 item 5);
``default_config.toml`` lists exactly the model's keys with the code's defaults,
a unit and a source (issue 10 item 2).  Physical bounds: absolute zero
-273.15 °C (ISO 80000-5:2019 item 5-1); LV means up to 1000 V a.c.
(IEC 60364-1:2005 clause 11); cmax of IEC 60909-0:2016 Table 1 is 1.05 or 1.10.
"""

from __future__ import annotations

import dataclasses
import re
import sys
from pathlib import Path

import pytest
from cablewright.core.errors import ConfigError
from cablewright.sizing.config import SizingConfig

from cablewright import config as config_module
from cablewright.cli import main
from cablewright.config import DEFAULT_CONFIG, Settings, load_settings, settings_keys

if sys.version_info >= (3, 11):
    import tomllib
else:  # pragma: no cover
    import tomli as tomllib

ROOT = Path(__file__).resolve().parents[1]
DRAWING = ROOT / "sample_drawings" / "pumping_station.dxf"
CIRCUITS = ROOT / "sample_drawings" / "pumping_station_circuits.csv"

UNITS = {"_mm2": "mm²", "_k_m_w": "K·m/W", "_ka2s": "kA²s", "_ka": "kA", "_ohm": "Ω",
         "_pct": "%", "_mm": "mm", "_m": "m", "_c": "°C", "_a": "A", "_v": "V", "_s": "s"}
SOURCE_WORDS = ("IEC", "ISO", "IFC", "DXF", "contract.md", "common practice", "from memory",
                "cablewright")


def _unit(name: str) -> str | None:
    return next((u for suffix, u in UNITS.items() if name.endswith(suffix)), None)


def _write(tmp_path, text: str) -> Path:
    path = tmp_path / "c.toml"
    path.write_text(text, encoding="utf-8")
    return path


def _problems(tmp_path, text: str) -> list[str]:
    with pytest.raises(ConfigError) as info:
        load_settings(_write(tmp_path, text))
    lines = str(info.value).splitlines()
    assert all(line.startswith(str(tmp_path / "c.toml")) for line in lines), lines
    return lines


# ------------------------------------------------------------- the documented file
def _documented() -> dict[tuple[str, str], tuple[bool, str]]:
    """(section, key) -> (commented out, comment) of every key line in the default file."""
    out: dict[tuple[str, str], tuple[bool, str]] = {}
    section = None
    header = re.compile(r"^\[([\w.]+)\]\s*(?:#\s*(.*))?$")
    key = re.compile(r"^(#\s*)?([A-Za-z_]\w*)\s*=\s*(.+?)\s+#\s*(.+)$")
    for raw in DEFAULT_CONFIG.read_text(encoding="utf-8").splitlines():
        line = raw.strip()
        m = header.match(line)
        if m:
            parts = m.group(1).split(".")
            if len(parts) == 2:
                out[(parts[0], parts[1])] = (False, m.group(2) or "")
                section = None  # entries of a table are its values
            else:
                section = parts[0]
            continue
        m = key.match(line)
        if m and section is not None:
            out[(section, m.group(2))] = (bool(m.group(1)), m.group(4))
    return out


def _suggested_line(section: str, name: str) -> str:
    key = settings_keys()[section][name]
    unit = _unit(name)
    value = key.default
    if isinstance(value, bool):
        shown = "true" if value else "false"
    elif isinstance(value, str):
        shown = f'"{value}"'
    elif isinstance(value, tuple):
        shown = "[" + ", ".join(f'"{v}"' if isinstance(v, str) else f"{v:g}" for v in value) + "]"
    elif value is None:
        return f"# {name} = <example>   # {f'[{unit}] ' if unit else ''}what it means; not set: ...; (source)"
    elif key.is_table:
        return f"[{section}.{name}]   # {f'[{unit}] ' if unit else ''}what it means (source), then its entries"
    else:
        shown = f"{value!r}"
    return f"{name} = {shown}   # {f'[{unit}] ' if unit else ''}what it means (source: standard and clause, or common practice)"


def test_every_key_of_the_model_is_in_the_default_file_and_no_other():
    documented = set(_documented())
    model = {(s, k) for s, keys in settings_keys().items() for k in keys}
    missing = sorted(model - documented)
    extra = sorted(documented - model)
    assert not missing, "add to cablewright/default_config.toml: " + "; ".join(
        f"under [{s}]: {_suggested_line(s, k)}" for s, k in missing)
    assert not extra, "cablewright/default_config.toml documents keys the code does not have: " + ", ".join(
        f"[{s}] {k} (remove it, or add the field to the stage's config dataclass)" for s, k in extra)


def test_the_default_file_holds_the_code_defaults():
    loaded = load_settings(DEFAULT_CONFIG)
    defaults = Settings()
    for section, keys in settings_keys().items():
        for name, key in keys.items():
            got = getattr(getattr(loaded, key.target), key.field)
            want = getattr(getattr(defaults, key.target), key.field)
            assert got == want, (f"[{section}] {name}: default_config.toml says {got!r}, the code "
                                 f"{want!r}; make them agree")


def test_commented_keys_have_no_default_and_their_examples_are_valid(tmp_path):
    documented = _documented()
    text = DEFAULT_CONFIG.read_text(encoding="utf-8")
    for (section, name), (commented, _) in documented.items():
        key = settings_keys()[section][name]
        assert commented == (key.default is None), (
            f"[{section}] {name}: write it {'commented out (no default)' if key.default is None else 'as a key'}")
    # every example, uncommented, passes the validation
    uncommented = re.sub(r"(?m)^# ([a-z_]+ = )", r"\1", text)
    load_settings(_write(tmp_path, uncommented))


def test_every_key_line_gives_its_unit_and_source():
    for (section, name), (_, comment) in _documented().items():
        unit = _unit(name)
        if unit:
            assert f"[{unit}]" in comment, f"[{section}] {name}: write its unit as [{unit}] in the comment"
        assert any(word in comment for word in SOURCE_WORDS), (
            f"[{section}] {name}: name the source in the comment (standard and clause, "
            "contract.md, common practice, from memory, or cablewright's choice)")


def test_the_nine_keys_that_lived_only_in_code_are_documented():
    # issue 10: disconnection_upsize, earthing, ze_ohm, breaker_curve, clearing_time_s,
    # default_fault_ka, motor_start_dip_pct, starters, pe_rule
    documented = _documented()
    for name in ("disconnection_upsize", "earthing", "ze_ohm", "breaker_curve", "clearing_time_s",
                 "default_fault_ka", "motor_start_dip_pct", "starters", "pe_rule"):
        assert ("sizing", name) in documented, name


def test_the_default_file_parses_as_toml_with_the_known_sections():
    data = tomllib.loads(DEFAULT_CONFIG.read_text(encoding="utf-8"))
    assert set(data) == set(settings_keys())


# ------------------------------------------------------------- derived from the dataclasses
def test_a_field_added_to_a_stage_config_is_a_typed_key_at_once(tmp_path, monkeypatch):
    # What a sizing change does: add a field to SizingConfig; nothing in config.py changes.
    extended = dataclasses.make_dataclass(
        "SizingConfigPlus", [("harmonic_derating_pct", float, dataclasses.field(default=15.0)),
                             ("check_harmonics", bool, dataclasses.field(default=True))],
        bases=(SizingConfig,), frozen=True)
    extended.__hash__ = SizingConfig.__hash__
    monkeypatch.setattr(config_module, "SizingConfig", extended)
    settings = load_settings(_write(tmp_path, "[sizing]\nharmonic_derating_pct = 20\n"))
    assert settings.sizing.harmonic_derating_pct == 20.0
    assert settings.sizing.check_harmonics is True
    (line,) = _problems(tmp_path, "[sizing]\ncheck_harmonics = 1\n")
    assert "check_harmonics" in line and "true or false" in line
    (line,) = _problems(tmp_path, "[sizing]\nharmonic_derating_pct = 150\n")
    assert "out of range" in line and "<= 100" in line  # a percentage, from its unit
    (line,) = _problems(tmp_path, "[sizing]\nharmonic_derating_pc = 20\n")
    assert "nearest known: harmonic_derating_pct" in line


# ------------------------------------------------------------- unknown keys and types
@pytest.mark.parametrize(("section", "typo", "nearest"), [
    ("drawing", "snap_tolerence_m", "snap_tolerance_m"),
    ("routes", "slack_fration", "slack_fraction"),
    ("sizing", "device_margn", "device_margin"),
    ("environment", "ambient_air", "ambient_air_c"),
    ("annotate", "lable_layer", "label_layer"),
    ("ifc", "tag_source", "tag_sources"),
])
def test_a_misspelt_key_in_each_section_names_the_nearest(tmp_path, section, typo, nearest):
    (line,) = _problems(tmp_path, f"[{section}]\n{typo} = 1\n")
    assert f"[{section}] {typo}" in line and f"nearest known: {nearest}" in line


def test_a_misspelt_table_entry_and_section(tmp_path):
    lines = _problems(tmp_path, "[sizing.vd_limits_pct]\nmotr = 4.0\n[colours]\nx = 1\n")
    assert len(lines) == 2
    assert "[sizing.vd_limits_pct] motr" in lines[0] and "nearest known: motor" in lines[0]
    assert "[colours]" in lines[1] and "nearest known: [" in lines[1]


def test_a_key_in_the_wrong_section_says_where_it_belongs(tmp_path):
    (line,) = _problems(tmp_path, "[sizing]\nambient_air_c = 35\n")
    assert "belongs in [environment]" in line


@pytest.mark.parametrize(("text", "needle"), [
    ('[sizing]\ndevice_margin = "big"\n', "must be a number"),
    ("[sizing]\nmax_parallel = 2.5\n", "whole number"),
    ("[sizing]\ndisconnection_upsize = 1\n", "true or false"),
    ("[annotate]\nlabel_layer = 5\n", "text in quotes"),
    ("[annotate]\nsheet_mm = [800]\n", "list of 2 values"),
    ('[ifc]\ntag_sources = "Tag"\n', "list of texts"),
    ('[sizing]\ndevice_kind = "relay"\n', "breaker, fuse"),
    ('[sizing]\nbreaker_curve = "K"\n', "B, C, D"),
    ('[drawing.route_layers]\nX = ["shelf", "E"]\n', "containment"),
    ('[drawing.route_layers]\nX = ["tray", "Q"]\n', "method"),
])
def test_a_wrong_type_or_choice_is_one_line(tmp_path, text, needle):
    (line,) = _problems(tmp_path, text)
    assert needle in line


def test_choices_are_case_insensitive(tmp_path):
    s = load_settings(_write(tmp_path, '[sizing]\ndevice_kind = "Fuse"\nbreaker_curve = "b"\n'))
    assert (s.sizing.device_kind, s.sizing.breaker_curve) == ("fuse", "B")


# ------------------------------------------------------------- ranges (issue 18 item 5)
@pytest.mark.parametrize(("section", "key", "value", "allowed"), [
    ("drawing", "snap_tolerance_m", "0", "> 0"),
    ("drawing", "snap_tolerance_m", "-0.05", "> 0"),
    ("drawing", "snap_tolerance_m", "nan", "finite"),
    ("drawing", "snap_tolerance_m", "inf", "finite"),
    ("drawing", "snap_tolerance_m", "50.0", "<= 1"),
    ("drawing", "max_tail_m", "0", "> 0"),
    ("routes", "slack_fraction", "-0.05", ">= 0"),
    ("environment", "ambient_air_c", "nan", "finite"),
    ("environment", "ambient_air_c", "-300", "> -273.15"),
    ("environment", "ground_c", "-274", "> -273.15"),
    ("environment", "soil_resistivity_k_m_w", "0", "> 0"),
    ("sizing", "device_margin", "0", ">= 1"),
    ("sizing", "device_margin", "0.8", ">= 1"),
    ("sizing", "standard_ratings_a", "[]", "non-empty"),
    ("sizing", "standard_ratings_a", "[10, -16]", "> 0"),
    ("sizing", "voltage_3ph_v", "11000", "<= 1000"),
    ("sizing", "power_factor", "1.2", "<= 1"),
    ("sizing", "c_max", "1.5", "<= 1.1"),
    ("sizing", "ze_ohm", "-0.1", ">= 0"),
    ("sizing", "motor_start_dip_pct", "0", "> 0"),
    ("annotate", "colors", "{label = 300}", "<= 256"),
    ("annotate", "crowd_fraction", "0", "> 0"),
])
def test_a_value_out_of_range_names_the_value_and_the_range(tmp_path, section, key, value, allowed):
    (line,) = _problems(tmp_path, f"[{section}]\n{key} = {value}\n")
    assert f"[{section}" in line and key in line and allowed in line
    if not value.startswith(("[", "{")):
        assert f"{key} = {value}" in line  # the value as written


def test_every_problem_of_a_file_is_one_line(tmp_path):
    lines = _problems(tmp_path, "[drawing]\nsnap_tolerance_m = 0\n[routes]\nslack_fraction = -1\n"
                                "[sizing]\ndevice_margn = 1.1\n[annotate]\nlable_layer = \"X\"\n")
    assert len(lines) == 4


def test_nec_is_a_rule_set_and_others_are_refused(tmp_path):
    assert load_settings(_write(tmp_path, '[sizing]\nstandard = "nec"\n')).sizing.standard == "nec"
    (line,) = _problems(tmp_path, '[sizing]\nstandard = "bs"\n')
    assert "standard" in line and "nec" in line


def test_a_good_file_reaches_every_stage(tmp_path):
    s = load_settings(_write(tmp_path, """
[drawing]
snap_tolerance_m = 0.1
[drawing.route_layers]
"e-tray-lv" = ["Tray", "e"]
[routes]
slack_fraction = 0.1
[sizing]
disconnection_upsize_max_steps = 1
standard_ratings_a = [16, 10]
[sizing.starters]
soft = [3.0, 0.45]
[environment]
ambient_air_c = 40
[annotate]
label_layer = "MY-LABELS"
[annotate.colors]
label = 3
[ifc]
below_ground_kind = ["buried", "D2"]
"""))
    assert s.drawing.snap_tolerance_m == 0.1 and s.drawing.layer_kind("E-TRAY-LV") == ("tray", "E")
    assert s.drawing.layer_kind("ROUTE-TRAY") == ("tray", "E")  # defaults kept
    assert s.drawing.slack_fraction == 0.1
    assert s.sizing.disconnection_upsize_max_steps == 1 and s.sizing.standard_ratings_a == (16.0, 10.0)
    assert s.sizing.starters["soft"] == (3.0, 0.45) and s.sizing.starters["dol"] == (7.0, 0.3)
    assert s.sizing.ambient_air_c == 40.0
    assert s.annotate.label_layer == "MY-LABELS" and s.annotate.colors["label"] == 3
    assert s.annotate.colors["notes"] == 1
    assert s.ifc.below_ground_kind == ("buried", "D2")


# ------------------------------------------------------------- before any drawing is read
def _no_drawing_read(monkeypatch):
    def refuse(*_args, **_kwargs):
        raise AssertionError("a drawing was read before the config was validated")

    import cablewright.extract as extract

    import cablewright.commands_drawing as commands_drawing

    monkeypatch.setattr(commands_drawing, "measure_drawing", refuse)
    monkeypatch.setattr(extract, "measure", refuse)


BAD_CONFIGS = [
    pytest.param("[annotate]\nlable_layer = \"X\"\n", "lable_layer", id="annotate-typo"),
    pytest.param("[drawing]\nsnap_tolerance_m = 0\n", "snap_tolerance_m", id="drawing-range"),
    pytest.param("[routes]\nslack = 0.1\n", "slack", id="routes-typo"),
    pytest.param("[sizing]\ndevice_margin = \"big\"\n", "device_margin", id="sizing-type"),
    pytest.param("[environment]\nambient_air_c = nan\n", "ambient_air_c", id="environment-nan"),
    pytest.param("[ifc]\nbogus = 1\n", "bogus", id="ifc-typo"),
]


@pytest.mark.parametrize(("text", "key"), BAD_CONFIGS)
@pytest.mark.parametrize("command", ["size", "routes", "batch"])
def test_a_bad_config_stops_every_drawing_command_before_reading(
        tmp_path, monkeypatch, capsys, text, key, command):
    _no_drawing_read(monkeypatch)
    config = _write(tmp_path, text)
    out = tmp_path / "out"
    if command == "size":
        argv = ["size", str(DRAWING), "--circuits", str(CIRCUITS), "--config", str(config), "--out", str(out)]
    elif command == "batch":
        argv = ["size", str(DRAWING), str(DRAWING), "--config", str(config), "--out", str(out)]
    else:
        argv = ["routes", str(DRAWING), "--circuits", str(CIRCUITS), "--config", str(config)]
    code = main(argv)
    err = capsys.readouterr().err
    assert code == 2
    lines = err.strip().splitlines()
    assert len(lines) == 1 and key in lines[0] and "c.toml" in lines[0], err
    assert "Traceback" not in err
    assert not out.exists()


@pytest.mark.parametrize(("text", "key"), BAD_CONFIGS)
def test_a_bad_config_stops_calc(tmp_path, capsys, text, key):
    code = main(["calc", "--load", "10 kW", "--config", str(_write(tmp_path, text))])
    captured = capsys.readouterr()
    assert code == 2 and captured.out == ""
    assert key in captured.err and len(captured.err.strip().splitlines()) == 1
