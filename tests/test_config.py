"""The TOML config reaches every stage: drawing conventions, routes, sizing, IFC."""

from __future__ import annotations

import pytest
from cablewright.core.errors import ConfigError

from cablewright.config import load_settings
from cablewright.pipeline import drawing_config, ifc_config


def _settings(tmp_path, text):
    path = tmp_path / "c.toml"
    path.write_text(text, encoding="utf-8")
    return load_settings(path)


def test_route_layers_and_allowances_from_the_config(tmp_path):
    s = _settings(tmp_path, """
[drawing]
units = "ft"
snap_tolerance_m = 0.1
[drawing.route_layers]
"E-TRAY-LV" = ["tray", "E"]
[drawing.layer_patterns]
"DUCT-*" = ["duct", "D1"]
[routes]
slack_fraction = 0.1
end_allowance_m = 2.0
""")
    cfg = drawing_config(s)
    assert cfg.units == "ft" and cfg.snap_tolerance_m == 0.1
    assert cfg.layer_kind("e-tray-lv") == ("tray", "E")
    assert cfg.layer_kind("DUCT-North") == ("duct", "D1")
    assert cfg.layer_kind("ROUTE-TRAY") == ("tray", "E")  # the contract's defaults stay
    assert (cfg.slack_fraction, cfg.end_allowance_m) == (0.1, 2.0)


def test_sizing_and_environment_keys(tmp_path):
    s = _settings(tmp_path, """
[sizing]
device_kind = "fuse"
[sizing.vd_limits_pct]
lighting = 3.0
[environment]
ambient_air_c = 40.0
""")
    assert s.sizing.device_kind == "fuse"
    assert s.sizing.vd_limit_pct("lighting") == 3.0
    assert s.sizing.vd_limit_pct("motor") == 5.0  # the other load types keep the default
    assert s.sizing.ambient_air_c == 40.0


def test_ifc_section_builds_the_reader_config(tmp_path):
    cfg = ifc_config(_settings(tmp_path, '[ifc]\ntag_sources = ["Name", "Tag"]\nbelow_ground_z_m = -0.5\n'))
    assert cfg.tag_sources == ("Name", "Tag") and cfg.below_ground_z_m == -0.5


@pytest.mark.parametrize("text, word", [
    ("[drawing]\nsnap = 1\n", "snap"),
    ("[drawing.route_layers]\nX = [\"shelf\", \"E\"]\n", "containment"),
    ("[ifc]\nbogus = 1\n", "bogus"),
    ("[colours]\nx = 1\n", "colours"),
])
def test_unknown_or_bad_keys_name_the_file(tmp_path, text, word):
    with pytest.raises(ConfigError, match=word) as info:
        s = _settings(tmp_path, text)
        drawing_config(s)
        ifc_config(s)
    assert "c.toml" in str(info.value)
